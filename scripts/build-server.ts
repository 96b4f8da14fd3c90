/**
 * Bundles the server (with its migrations) into `dist/server/main.mjs` for `npm start`: plain
 * Node then runs it, without a TypeScript loader in memory. npm packages stay external.
 */
import path from 'node:path';
import { build } from 'esbuild';

export const SERVER_BUNDLE = 'dist/server/main.mjs';

/**
 * Bundles the server sources under `root` (this tree by default; a benchmark passes an earlier
 * revision's exported sources) into `outdir`.
 */
export async function buildServer(root = '.', outdir = 'dist/server'): Promise<void> {
  await build({
    // The picture worker runs in its own thread and is loaded from beside main.mjs.
    entryPoints: { main: path.join(root, 'server/main.ts'), 'picture-worker': path.join(root, 'server/pictures/picture-worker.ts') },
    outdir,
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
