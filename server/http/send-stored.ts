import type { Response } from 'express';
import { pipeline } from 'node:stream/promises';
import { AppError, NotFoundError } from '../errors';
import type { ByteRange, MediaStore } from '../storage/media-store';

/** How a stored object is answered. */
export interface SendStoredOptions {
  type: string;
  /** `Cache-Control` (media is always `private`). */
  cacheControl: string;
  /** `Content-Disposition`, for downloads. */
  disposition?: string;
  /** Whether `Range` requests are answered with the bytes asked for (206), as video players need. */
  ranges?: boolean;
}

/**
 * Streams a stored object as the answer (never a whole file in memory); a key with no object is a
 * 404. With `ranges`, one satisfiable byte range is answered 206 with its bytes, an unsatisfiable
 * one 416, several ranges or a malformed header with the whole object. A client that goes away
 * mid-answer just ends the stream.
 */
export async function sendStored(res: Response, store: MediaStore, key: string, o: SendStoredOptions): Promise<void> {
  const info = await store.stat(key);
  if (!info) throw new NotFoundError('File');
  let range: ByteRange | undefined;
  if (o.ranges) {
    res.setHeader('Accept-Ranges', 'bytes');
    const asked = res.req.headers.range ? res.req.range(info.size) : undefined;
    if (asked === -1) {
      res.setHeader('Content-Range', `bytes */${info.size}`);
      throw new AppError(416, 'range_not_satisfiable', `The byte range asked for is outside the file (${info.size} bytes).`);
    }
    if (Array.isArray(asked) && asked.type === 'bytes' && asked.length === 1) range = { start: asked[0]!.start, end: asked[0]!.end };
  }
  const body = await store.get(key, range);
  res.status(range ? 206 : 200);
  res.setHeader('Content-Type', o.type);
  res.setHeader('Content-Length', String(range ? range.end - range.start + 1 : info.size));
  if (range) res.setHeader('Content-Range', `bytes ${range.start}-${range.end}/${info.size}`);
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
