import type { Response } from 'express';
import { pipeline } from 'node:stream/promises';
import { NotFoundError } from '../errors';
import type { MediaStore } from '../storage/media-store';

/** How a stored object is answered. */
export interface SendStoredOptions {
  type: string;
  /** `Cache-Control` (media is always `private`). */
  cacheControl: string;
  /** `Content-Disposition`, for downloads. */
  disposition?: string;
}

/**
 * Streams a stored object as the answer (never a whole file in memory); a key with no object is a
 * 404. A client that goes away mid-answer just ends the stream.
 */
export async function sendStored(res: Response, store: MediaStore, key: string, o: SendStoredOptions): Promise<void> {
  const info = await store.stat(key);
  if (!info) throw new NotFoundError('File');
  const body = await store.get(key);
  res.status(200);
  res.setHeader('Content-Type', o.type);
  res.setHeader('Content-Length', String(info.size));
  res.setHeader('Cache-Control', o.cacheControl);
  if (o.disposition) res.setHeader('Content-Disposition', o.disposition);
  if (res.req.method === 'HEAD') {
    body.destroy();
    res.end();
    return;
  }
  await pipeline(body, res).catch((err: NodeJS.ErrnoException) => {
    if (err.code !== 'ERR_STREAM_PREMATURE_CLOSE') throw err;
  });
}
