/**
 * The stored-frame reader hands the follower the same grey pixels ffmpeg decodes from each
 * working-frame JPEG on its own (ffmpeg decoding the file is the outside check).
 */
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { decodeGray } from '../../../server/follow/gray-decode';
import { storedFrameReader } from '../../../server/follow/stored-frames';
import { clipKeys } from '../../../server/storage/media-keys';
import { localMediaStore } from '../../../server/storage/local-media-store';
import { ffmpegRun, tempDir } from '../media/fixtures';

let dir: { dir: string; cleanup: () => Promise<void> };
const W = 96;
const H = 64;
const COUNT = 7;

beforeAll(async () => {
  dir = await tempDir('stored-frames');
  await ffmpegRun([
    '-f',
    'lavfi',
    '-i',
    `testsrc2=size=${W}x${H}:rate=30`,
    '-frames:v',
    String(COUNT),
    '-q:v',
    '3',
    path.join(dir.dir, 'f%06d.jpg'),
  ]);
  const store = localMediaStore(path.join(dir.dir, 'store'));
  for (let i = 0; i < COUNT; i++) {
    await store.put(clipKeys(5).frame(i), await readFile(path.join(dir.dir, `f${String(i + 1).padStart(6, '0')}.jpg`)));
  }
}, 60_000);
afterAll(async () => {
  await dir?.cleanup();
});

describe('storedFrameReader', () => {
  it('frames read forward, then backward across chunks, equal ffmpeg decoding each JPEG alone', async () => {
    const reader = storedFrameReader(localMediaStore(path.join(dir.dir, 'store')), 5, { frameCount: COUNT, width: W, height: H }, 3);
    for (const i of [0, 1, 4, 6, 5, 2, 0]) {
      const got = await reader.read(i);
      const [alone] = await decodeGray(['-i', path.join(dir.dir, `f${String(i + 1).padStart(6, '0')}.jpg`)], W, H);
      expect(got.width).toBe(W);
      expect(Buffer.from(got.data).equals(Buffer.from(alone!.data)), `frame ${i}`).toBe(true);
    }
  });

  it('a frame that is not stored fails the read', async () => {
    const reader = storedFrameReader(localMediaStore(path.join(dir.dir, 'store')), 6, { frameCount: 2, width: W, height: H });
    await expect(reader.read(0)).rejects.toThrow();
  });
});
