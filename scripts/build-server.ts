/**
 * Bundles the server (with its migrations) into `dist/server/main.mjs` for `npm start`: plain
 * Node then runs it, without a TypeScript loader in memory. npm packages stay external.
 */
import path from 'node:path';
import { build } from 'esbuild';

export const SERVER_BUNDLE = 'dist/server/main.mjs';
/** The worker process's bundle (server/worker.ts): `npm start` runs it for the drawing kinds (`DRAW_APART`). */
export const WORKER_BUNDLE = 'dist/server/worker.mjs';

/**
 * Node's flags for the server process `npm start` runs (the upload-memory benchmark starts it the same way):
 * - a young generation of 4 MB semi-spaces instead of 16: V8 then holds about 24 MB less heap, and the
 *   64 KB buffers a streaming upload arrives in are collected every few MB instead of piling up. 2 MB
 *   saved a little more but doubled the server's CPU per uploaded MB; 4 MB costs none measurably
 *   (README "Performance");
 * - `--expose-gc`: after a burst of drawing (stills, summaries) the worker runs one full collection,
 *   so what the drawing left goes at once (`releaseDrawingMemory` in server/render/fonts.ts).
 * No `--enable-source-maps`: Node parses the bundle's whole source map into memory at start-up (about
 * 25 MB held for good); the bundle is not minified and each module in it starts with its source path,
 * so a stack trace still reads. Set `NODE_OPTIONS=--enable-source-maps` to see TypeScript positions.
 */
export const SERVER_NODE_ARGS: readonly string[] = ['--max-semi-space-size=4', '--expose-gc'];

/**
 * The C library's allocator settings for the server process (the environment's own values win): two
 * arenas rather than one per thread that ever allocated (Skia's and libuv's threads each kept theirs),
 * and buffers of 128 KB or more always mapped on their own, so freeing one (a drawn picture, a video
 * frame) gives the memory back to the system rather than leaving a hole in the heap.
 */
export const SERVER_ENV: Readonly<Record<string, string>> = { MALLOC_ARENA_MAX: '2', MALLOC_MMAP_THRESHOLD_: '131072' };

/**
 * Bundles the server sources under `root` (this tree by default; a benchmark passes an earlier
 * revision's exported sources) into `outdir`.
 */
export async function buildServer(root = '.', outdir = 'dist/server'): Promise<void> {
  await build({
    // The picture worker runs in its own thread and is loaded from beside main.mjs (and worker.mjs).
    entryPoints: {
      main: path.join(root, 'server/main.ts'),
      worker: path.join(root, 'server/worker.ts'),
      'picture-worker': path.join(root, 'server/pictures/picture-worker.ts'),
    },
    outdir,
    outExtension: { '.js': '.mjs' },
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    packages: 'external',
    sourcemap: 'linked',
    sourcesContent: false,
    logLevel: 'warning',
  });
}

if (import.meta.url === `file://${process.argv[1]}`) {
  await buildServer();
  console.log(`built ${SERVER_BUNDLE}`);
}
