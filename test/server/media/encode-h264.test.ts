/**
 * The H.264 encoder fed frame by frame over a pipe: when ffmpeg stops part-way (here it cannot
 * create its output file, as when the clip's folder is removed while an annotated clip renders),
 * the next frame's write fails with ffmpeg's reason instead of waiting forever for ffmpeg to read
 * (a render waiting so held its worker slot for good).
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startH264Encoder } from '../../../server/media/encode-h264';
import { tempDir } from './fixtures';

let dir: { dir: string; cleanup: () => Promise<void> };
beforeAll(async () => {
  dir = await tempDir('encode-h264');
});
afterAll(async () => {
  await dir?.cleanup();
});

describe('startH264Encoder', () => {
  it('a write after ffmpeg stopped fails with its reason; it does not wait for ever', async () => {
    const width = 640;
    const height = 360;
    const encoder = startH264Encoder({ width, height, fps: 30, outFile: path.join(dir.dir, 'gone', 'out.mp4') });
    const frame = Buffer.alloc(width * height * 4, 128);
    const writing = (async () => {
      // ffmpeg reads frames until its encoder is set up, then fails to open the output; the pipe holds two frames.
      for (let i = 0; i < 600; i++) await encoder.write(frame);
      await encoder.finish();
    })();
    await expect(writing).rejects.toThrow(/ffmpeg could not encode the clip/);
    await expect(encoder.done).rejects.toThrow(/ffmpeg could not encode the clip/);
  }, 30_000);
});
