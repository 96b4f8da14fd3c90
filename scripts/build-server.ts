/**
 * Bundles the server (with its migrations) into `dist/server/main.mjs` for `npm start`: plain
 * Node then runs it, without a TypeScript loader in memory. npm packages stay external.
 */
import { build } from 'esbuild';

export const SERVER_BUNDLE = 'dist/server/main.mjs';

export async function buildServer(): Promise<void> {
  await build({
    // The picture worker runs in its own thread and is loaded from beside main.mjs.
    entryPoints: { main: 'server/main.ts', 'picture-worker': 'server/pictures/picture-worker.ts' },
    outdir: 'dist/server',
    outExtension: { '.js': '.mjs' },
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    packages: 'external',
    sourcemap: 'linked',
    logLevel: 'warning',
  });
}

if (import.meta.url === `file://${process.argv[1]}`) {
  await buildServer();
  console.log(`built ${SERVER_BUNDLE}`);
}
