/**
 * Runs picture processing in worker threads, at most {@link MAX_PARALLEL} at a time, after the
 * cheap header checks in the caller's thread (a refused file never reaches a worker).
 */
import { Worker } from 'node:worker_threads';
import { PictureError, type PictureErrorCode } from './picture-error';
import { checkPictureHeader } from './picture-sniff';
import type { EncodedImage, ProcessedPicture } from './picture-processing';

/** What a worker is asked to do. */
export interface PictureJob {
  kind: 'picture' | 'logo';
  bytes: Uint8Array;
}

/** What a worker answers. */
export type PictureReply = { ok: true; result: ProcessedPicture | EncodedImage } | { ok: false; code: PictureErrorCode; message: string };

/** Pictures processed at once (the machine's other work keeps the rest of its cores). */
export const MAX_PARALLEL = 2;

/** Processes pictures away from the request thread. */
export interface PictureProcessor {
  /** A demonstration picture: upright JPEG of long side 1600 and its 400 px thumbnail, metadata-free. */
  picture(bytes: Buffer): Promise<ProcessedPicture>;
  /** A clinic logo: upright PNG of long side 600, transparency kept. */
  logo(bytes: Buffer): Promise<EncodedImage>;
}

/**
 * Starts the worker script: the bundled `picture-worker.mjs` beside `main.mjs` in a build; under
 * tsx or vitest the TypeScript source, loaded through tsx's API (a worker does not inherit the
 * parent's loader).
 */
function startWorker(job: PictureJob): Worker {
  const options = { workerData: job, resourceLimits: { maxOldGenerationSizeMb: 1536 } };
  if (!import.meta.url.endsWith('.ts')) return new Worker(new URL('./picture-worker.mjs', import.meta.url), options);
  const source = new URL('./picture-worker.ts', import.meta.url).href;
  const boot = `import('tsx/esm/api').then(({ tsImport }) => tsImport(${JSON.stringify(source)}, ${JSON.stringify(import.meta.url)}))`;
  return new Worker(boot, { ...options, eval: true });
}

const toBuffer = (img: EncodedImage): EncodedImage => ({ ...img, bytes: Buffer.from(img.bytes) });

export function workerPictureProcessor(): PictureProcessor {
  let running = 0;
  const waiting: (() => void)[] = [];
  const slot = async () => {
    if (running >= MAX_PARALLEL) await new Promise<void>((resolve) => waiting.push(resolve));
    running++;
  };
  const release = () => {
    running--;
    waiting.shift()?.();
  };

  async function run(job: PictureJob): Promise<PictureReply> {
    await slot();
    try {
      return await new Promise<PictureReply>((resolve, reject) => {
        const worker = startWorker(job);
        let replied = false;
        worker.once('message', (reply: PictureReply) => {
          replied = true;
          resolve(reply);
          void worker.terminate();
        });
        // A worker that dies on a picture (out of memory on a hostile file) refuses that picture; the server goes on.
        const died = () => reject(new PictureError('undecodable', 'The picture could not be processed. Send a smaller JPEG or PNG.'));
        worker.once('error', died);
        worker.once('exit', () => {
          if (!replied) died();
        });
      });
    } finally {
      release();
    }
  }

  async function processed<T>(kind: PictureJob['kind'], bytes: Buffer): Promise<T> {
    checkPictureHeader(bytes);
    const reply = await run({ kind, bytes: new Uint8Array(bytes) });
    if (!reply.ok) throw new PictureError(reply.code, reply.message);
    return reply.result as T;
  }

  return {
    async picture(bytes) {
      const r = await processed<ProcessedPicture>('picture', bytes);
      return { source: r.source, full: toBuffer(r.full), thumb: toBuffer(r.thumb) };
    },
    async logo(bytes) {
      return toBuffer(await processed<EncodedImage>('logo', bytes));
    },
  };
}
