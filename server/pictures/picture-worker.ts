/**
 * Worker-thread entry: decodes and re-encodes one picture with jimp off the main thread (a 12 MP
 * JPEG takes seconds of pure JavaScript; the server keeps answering meanwhile). Receives
 * `{ kind, bytes }`, answers `{ ok: true, result }` or `{ ok: false, code, message }`.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { processLogo, processPicture } from './picture-processing';
import { PictureError } from './picture-error';
import type { PictureJob, PictureReply } from './picture-pool';

const job = workerData as PictureJob;
const bytes = Buffer.from(job.bytes);
(job.kind === 'logo' ? processLogo(bytes) : processPicture(bytes)).then(
  (result) => parentPort!.postMessage({ ok: true, result } satisfies PictureReply),
  (err: unknown) => {
    const reply: PictureReply =
      err instanceof PictureError
        ? { ok: false, code: err.code, message: err.message }
        : { ok: false, code: 'undecodable', message: 'The picture could not be decoded. Send it again as a JPEG or PNG.' };
    parentPort!.postMessage(reply);
  },
);
