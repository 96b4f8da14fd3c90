/**
 * A frame reader over a clip's stored working frames (JPEGs in the MediaStore): each chunk of
 * frames is read by key and decoded to grey in one ffmpeg run, so following a clip neither builds
 * paths nor decodes the original again.
 */
import type { MediaStore } from '../storage/media-store';
import { clipKeys } from '../storage/media-keys';
import { readSmall } from '../storage/stored-objects';
import { chunkedFrameReader, decodeGray } from './gray-decode';
import type { FrameReader } from './marker-follower';

/** Reads frames `0 … frameCount − 1` of clip `clipId` (working frames of `width × height`) as grey images. */
export function storedFrameReader(
  store: MediaStore,
  clipId: number,
  meta: { frameCount: number; width: number; height: number },
  chunk = 48,
): FrameReader {
  const keys = clipKeys(clipId);
  return chunkedFrameReader(
    meta,
    async (first, count) => {
      const jpegs: Buffer[] = [];
      for (let i = first; i < first + count; i++) jpegs.push(await readSmall(store, keys.frame(i)));
      return decodeGray(['-f', 'image2pipe', '-c:v', 'mjpeg', '-i', 'pipe:0'], meta.width, meta.height, Buffer.concat(jpegs));
    },
    chunk,
  );
}
