/**
 * Inputs that are not usable clips must end in a clear MediaError and leave no frames behind.
 * Outside reference: ffprobe/ffmpeg's own verdicts on the same bytes (checked where it helps).
 */
import { copyFile, readFile, readdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { extractFrames } from '../../../server/media/extract';
import { MediaError, type MediaErrorCode } from '../../../server/media/media-error';
import { probeVideo } from '../../../server/media/probe';
import { ffmpegRun, ffprobeJson, makeClip, tempDir } from './fixtures';

let dir = '';
let cleanup = async () => {};
let good = ''; // moov at the end (ffmpeg's default)
let faststart = ''; // moov first, so a cut file still probes
beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('bad'));
  good = await makeClip(path.join(dir, 'good.mp4'), { fps: 30, width: 320, height: 180, seconds: 2 });
  faststart = await makeClip(path.join(dir, 'faststart.mp4'), { fps: 30, width: 320, height: 180, seconds: 2, movflags: '+faststart' });
});
afterAll(() => cleanup());

async function expectMediaError(p: Promise<unknown>, code: MediaErrorCode): Promise<MediaError> {
  const err = await p.then(
    () => null,
    (e: unknown) => e,
  );
  expect(err).toBeInstanceOf(MediaError);
  const media = err as MediaError;
  expect(media.code).toBe(code);
  expect(media.message.length).toBeGreaterThan(10);
  expect(media.message).not.toContain(dir); // user-facing text never shows server paths
  return media;
}

/** Runs extraction into a fresh folder and checks nothing but the folder itself is left. */
async function expectExtractFails(input: string, code: MediaErrorCode): Promise<MediaError> {
  const out = path.join(dir, `out-${path.basename(input)}`);
  const err = await expectMediaError(extractFrames(input, out), code);
  expect(await readdir(out).catch(() => [])).toEqual([]);
  return err;
}

async function cutInHalf(src: string, name: string): Promise<string> {
  const bytes = await readFile(src);
  const file = path.join(dir, name);
  await writeFile(file, bytes.subarray(0, Math.floor(bytes.length / 2)));
  return file;
}

describe('bad inputs → MediaError, no partial frames', () => {
  it('zero-byte file → empty_file', async () => {
    const file = path.join(dir, 'zero.mp4');
    await writeFile(file, Buffer.alloc(0));
    await expectMediaError(probeVideo(file), 'empty_file');
    await expectExtractFails(file, 'empty_file');
  });

  it('a text file named .mp4 → not_video (ffprobe itself refuses it: outside reference)', async () => {
    const file = path.join(dir, 'notes.mp4');
    await writeFile(file, 'Knee felt fine on the treadmill today.\n'.repeat(50));
    await expect(ffprobeJson(file, ['-show_streams'])).rejects.toThrow();
    await expectMediaError(probeVideo(file), 'not_video');
    await expectExtractFails(file, 'not_video');
  });

  it('a PNG named .mp4 → not_video (ffprobe reads it as png_pipe: outside reference)', async () => {
    const png = path.join(dir, 'still.png');
    await ffmpegRun(['-f', 'lavfi', '-i', 'testsrc2=size=64x64', '-frames:v', '1', png]);
    const file = path.join(dir, 'still.mp4');
    await copyFile(png, file);
    expect((await ffprobeJson(file, ['-show_format'])).format.format_name).toBe('png_pipe');
    await expectMediaError(probeVideo(file), 'not_video');
    await expectExtractFails(file, 'not_video');
  });

  it('audio only (lavfi sine → .m4a) → no_video_stream', async () => {
    const file = path.join(dir, 'sine.m4a');
    await ffmpegRun(['-f', 'lavfi', '-i', 'sine=f=440:d=1', '-c:a', 'aac', file]);
    await expectMediaError(probeVideo(file), 'no_video_stream');
    await expectExtractFails(file, 'no_video_stream');
  });

  it('mp4 cut in half (moov at the end is lost) → truncated', async () => {
    const file = await cutInHalf(good, 'half.mp4');
    await expectMediaError(probeVideo(file), 'truncated');
    await expectExtractFails(file, 'truncated');
  });

  it('faststart mp4 cut in half: ffprobe still accepts it, extraction fails with extract_failed', async () => {
    const file = await cutInHalf(faststart, 'half-faststart.mp4');
    const probe = await probeVideo(file);
    expect(probe.frameCount).toBe(60); // the moov box still lists every frame
    await expectExtractFails(file, 'extract_failed');
  });

  it('corrupt stream that ffprobe accepts (bytes overwritten mid-mdat) → extract_failed, no frames left', async () => {
    const bytes = Buffer.from(await readFile(faststart));
    const mdat = bytes.indexOf('mdat');
    const middle = mdat + Math.floor((bytes.length - mdat) / 2);
    for (let i = middle; i < middle + 4000 && i < bytes.length; i++) bytes[i] = (i * 37) & 0xff;
    const file = path.join(dir, 'corrupt.mp4');
    await writeFile(file, bytes);
    expect((await ffprobeJson(file, ['-show_streams'])).streams[0].nb_frames).toBe('60');
    const probe = await probeVideo(file);
    expect(probe.frameCount).toBe(60);
    const err = await expectExtractFails(file, 'extract_failed');
    expect(err.message).toMatch(/damaged/);
  });

  it('faststart mp4 cut just after its header: ffprobe lists 60 frames but decodes none → extract_failed saying no frame can be read', async () => {
    const bytes = await readFile(faststart);
    const file = path.join(dir, 'header-only.mp4');
    await writeFile(file, bytes.subarray(0, bytes.indexOf('mdat') + 104));
    // Outside reference: ffprobe lists the frames but, counting them, reads none.
    const listed = (await ffprobeJson(file, ['-count_frames', '-select_streams', 'v:0', '-show_streams']).catch(() => null))?.streams[0];
    expect(listed?.nb_frames).toBe('60');
    expect(Number(listed?.nb_read_frames ?? 0)).toBe(0);
    expect((await probeVideo(file)).frameCount).toBe(60);
    const err = await expectExtractFails(file, 'extract_failed');
    expect(err.message).not.toMatch(/after about 0 frames/);
    expect(err.message).toMatch(/none of its frames can be read/i);
  });

  it('a missing file → probe_failed', async () => {
    await expectMediaError(probeVideo(path.join(dir, 'nope.mp4')), 'probe_failed');
  });
});
