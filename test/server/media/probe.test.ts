/**
 * probeVideo against the outside reference: ffprobe/ffmpeg themselves (Debian ffmpeg 5.1), on
 * clips generated here with lavfi `testsrc2` at known fps, size and duration.
 */
import { open } from 'node:fs/promises';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sniffContainer } from '../../../server/media/magic';
import { probeVideo } from '../../../server/media/probe';
import { brightCentroid, ffmpegFirstFrameGray, ffmpegRun, ffprobeCounted, makeClip, tempDir, withRotateTag } from './fixtures';

let dir = '';
let cleanup = async () => {};
beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('probe'));
});
afterAll(() => cleanup());

const clipName = (fps: number, w: number, h: number) => path.join(dir, `src-${fps}fps-${w}x${h}.mp4`);

describe.each([30, 60, 120, 240])('testsrc2 at %i fps', (fps) => {
  it.each([
    [320, 180],
    [180, 320],
  ])(
    '%ix%i: fps, size and frame count match ffprobe -count_frames and the lavfi generation parameters (outside reference)',
    async (width, height) => {
      const seconds = 1;
      const file = await makeClip(clipName(fps, width, height), { fps, width, height, seconds });
      const [probe, reference] = await Promise.all([probeVideo(file), ffprobeCounted(file)]);

      // generation parameters
      expect(probe.fps).toBe(fps);
      expect(probe.frameCount).toBe(fps * seconds);
      expect(probe.durationS).toBeCloseTo(seconds, 2);
      expect([probe.width, probe.height, probe.displayWidth, probe.displayHeight]).toEqual([width, height, width, height]);
      // ffprobe -count_frames (decodes every frame)
      expect(probe.frameCount).toBe(reference.nbReadFrames);
      expect([probe.width, probe.height]).toEqual([reference.width, reference.height]);
      expect(`${probe.fps}/1`).toBe(reference.avgFrameRate);
      expect(probe).toMatchObject({ codec: 'h264', rotation: 0, variableFrameRate: false, hasAudio: false, frameCountSource: 'nb_frames' });
      expect(probe.formatName).toContain('mp4');
    },
  );
});

describe('rotation (outside reference: ffprobe side data and ffmpeg autorotate on a corner marker)', () => {
  let marker = '';
  beforeAll(async () => {
    marker = await makeClip(path.join(dir, 'marker.mp4'), { fps: 30, width: 320, height: 180, seconds: 0.2, source: 'corner-marker' });
  });

  // ffmpeg 5.1: `-metadata:s:v rotate=T` stores a display matrix that ffprobe reports as rotation T
  // (counter-clockwise), so T = -90 is the phone-portrait case that needs 90° clockwise.
  it.each([
    // tag, ffprobe side-data rotation, clockwise rotation, where ffmpeg's autorotate puts the top-left marker
    [-90, -90, 90, 'top-right'],
    [90, 90, 270, 'bottom-left'],
    [180, -180, 180, 'bottom-right'],
  ] as const)('rotate tag %i → ffprobe rotation %i → probe.rotation %i, marker lands %s', async (tag, sideData, clockwise, corner) => {
    const file = await withRotateTag(marker, path.join(dir, `marker-rot${tag}.mp4`), tag);
    const probe = await probeVideo(file);
    const reference = await ffprobeCounted(file);
    expect(reference.rotation).toBe(sideData);
    expect(probe.rotation).toBe(clockwise);
    const quarter = clockwise % 180 !== 0;
    const [dw, dh] = quarter ? [180, 320] : [320, 180];
    expect([probe.width, probe.height, probe.displayWidth, probe.displayHeight]).toEqual([320, 180, dw, dh]);

    const gray = await ffmpegFirstFrameGray(file, dw, dh);
    expect(gray.length).toBe(dw * dh); // ffmpeg's autorotated frame has the displayed size
    const c = brightCentroid(gray, dw);
    const seen = `${c.y < dh / 2 ? 'top' : 'bottom'}-${c.x < dw / 2 ? 'left' : 'right'}`;
    expect(seen).toBe(corner);
    // The same corner follows from turning the stored frame `clockwise` degrees clockwise.
    const turned = { 90: 'top-right', 180: 'bottom-right', 270: 'bottom-left' }[clockwise];
    expect(turned).toBe(corner);
  });
});

describe('containers (outside reference: the ffmpeg muxer that wrote the file)', () => {
  it.each([
    ['mp4', 'mp4', ['-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p']],
    ['mov', 'mov', ['-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p']],
    ['3gp', '3gp', ['-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p']],
    ['mkv', 'mkv', ['-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p']],
    ['webm', 'webm', ['-c:v', 'libvpx', '-deadline', 'realtime', '-b:v', '200k']],
    ['avi', 'avi', ['-c:v', 'mpeg4', '-q:v', '5']],
  ] as const)(
    '.%s: sniffContainer says %s, probeVideo counts 15 frames at 30 fps like ffprobe -count_frames (outside reference)',
    async (ext, kind, codecArgs) => {
      const file = path.join(dir, `c.${ext}`);
      await ffmpegRun(['-f', 'lavfi', '-i', 'testsrc2=size=320x180:rate=30', '-t', '0.5', ...codecArgs, file]);
      const handle = await open(file, 'r');
      const head = Buffer.alloc(4096);
      const { bytesRead } = await handle.read(head, 0, head.length, 0);
      await handle.close();
      expect(sniffContainer(head.subarray(0, bytesRead))).toBe(kind);

      const [probe, reference] = await Promise.all([probeVideo(file), ffprobeCounted(file)]);
      expect(probe.frameCount).toBe(reference.nbReadFrames);
      expect(probe.frameCount).toBe(15);
      expect(probe.fps).toBe(30);
      // Matroska/WebM do not state a frame count: probeVideo counts by decoding.
      expect(probe.frameCountSource).toBe(ext === 'mkv' || ext === 'webm' ? 'count_frames' : 'nb_frames');
    },
  );

  it('a clip with a sound track reports hasAudio; frame count matches ffprobe -count_frames (outside reference)', async () => {
    const file = path.join(dir, 'with-audio.mp4');
    await makeClip(file, { width: 320, height: 180, fps: 30, seconds: 0.5, audio: true });
    const probe = await probeVideo(file);
    expect(probe.hasAudio).toBe(true);
    expect(probe.frameCount).toBe((await ffprobeCounted(file)).nbReadFrames);
  });

  it('a variable-frame-rate clip is flagged (timestamps 20 ms / 40 ms alternating); frame count matches ffprobe -count_frames (outside reference)', async () => {
    const file = path.join(dir, 'vfr.mp4');
    await ffmpegRun([
      '-f',
      'lavfi',
      '-i',
      'testsrc2=size=320x180:rate=50',
      '-t',
      '1',
      '-vf',
      "settb=1/1000,setpts='floor(N/2)*60+mod(N,2)*20'",
      '-fps_mode',
      'passthrough',
      '-c:v',
      'libx264',
      '-preset',
      'ultrafast',
      '-pix_fmt',
      'yuv420p',
      file,
    ]);
    const [probe, reference] = await Promise.all([probeVideo(file), ffprobeCounted(file)]);
    expect(probe.frameCount).toBe(reference.nbReadFrames);
    expect(probe.variableFrameRate).toBe(true);
  });
});
