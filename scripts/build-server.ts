/**
 * Bundles the server (with its migrations) into `dist/server/main.mjs` for `npm start`: plain
 * Node then runs it, without a TypeScript loader in memory. npm packages stay external.
 */
import { build } from 'esbuild';

export const SERVER_BUNDLE = 'dist/server/main.mjs';

export async function buildServer(): Promise<void> {
  await build({
    entryPoints: ['server/main.ts'],
    outfile: SERVER_BUNDLE,
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
