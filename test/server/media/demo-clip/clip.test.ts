/**
 * End to end at small size: render the synthetic runner (a test fixture, not a published
 * source), encode it, and check the encoded clip against its own ground truth, using ffprobe and
 * ffmpeg's decoder as the outside reference.
 */
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { loadImage, createCanvas } from '@napi-rs/canvas';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateRunnerClip, groundTruthPath, type GroundTruth } from '../../../../scripts/demo-clip/clip';
import { extractFrames } from '../../../../server/media/extract';
import { ffmpegRun, ffprobeCounted, tempDir } from '../fixtures';

let dir = '';
let cleanup = async () => {};
let video = '';
let truth: GroundTruth;

beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('runner'));
  video = path.join(dir, 'runner.mp4');
  truth = await generateRunnerClip({ outFile: video, fps: 30, width: 320, height: 180, seconds: 1, hipExtensionDeg: 11, facing: 'right' });
});
afterAll(() => cleanup());

/** Decodes frame `index` with ffmpeg to PNG and returns its RGBA pixels. */
async function decodedFrame(index: number): Promise<{ rgba: Uint8ClampedArray; width: number }> {
  const png = path.join(dir, `frame-${index}.png`);
  await ffmpegRun(['-i', video, '-vf', `select=eq(n\\,${index})`, '-frames:v', '1', png]);
  const img = await loadImage(await readFile(png));
  const ctx = createCanvas(img.width, img.height).getContext('2d');
  ctx.drawImage(img, 0, 0);
  return { rgba: ctx.getImageData(0, 0, img.width, img.height).data, width: img.width };
}

/** Brightest pixel (min of R, G, B) within ±radius px of a point. */
function brightestNear(rgba: Uint8ClampedArray, width: number, x: number, y: number, radius: number): number[] {
  let best = [0, 0, 0];
  for (let dy = -radius; dy <= radius; dy++) {
    for (let dx = -radius; dx <= radius; dx++) {
      const i = ((Math.round(y) + dy) * width + Math.round(x) + dx) * 4;
      const px = [rgba[i]!, rgba[i + 1]!, rgba[i + 2]!];
      if (Math.min(...px) > Math.min(...best)) best = px;
    }
  }
  return best;
}

describe('encoded synthetic runner clip (320×180, 30 fps, 1 s)', () => {
  it('frame count matches ffprobe -count_frames (outside reference) and the ground truth', async () => {
    const reference = await ffprobeCounted(video);
    expect(reference.nbReadFrames).toBe(truth.frameCount);
    expect(truth.frameCount).toBe(30);
    expect([reference.width, reference.height]).toEqual([320, 180]);
    expect(reference.avgFrameRate).toBe('30/1');
    const onDisk = JSON.parse(await readFile(groundTruthPath(video), 'utf8')) as GroundTruth;
    expect(onDisk.frameCount).toBe(truth.frameCount);
    expect(onDisk.events).toEqual(truth.events);
  });

  it('a frame decoded by ffmpeg shows the white near-hip marker at the ground-truth pixel (±1 px, compression tolerance)', async () => {
    for (const index of [0, 13, 29]) {
      const { rgba, width } = await decodedFrame(index);
      const hip = truth.frames[index]!.landmarks.near.hip;
      const [r, g, b] = brightestNear(rgba, width, hip.x, hip.y, 1);
      expect(Math.min(r!, g!, b!)).toBeGreaterThan(190);
      // 10 px above the hip is the trunk (slate), clearly not a marker
      const trunk = brightestNear(rgba, width, hip.x, hip.y - 10, 0);
      expect(Math.min(...trunk)).toBeLessThan(140);
    }
  });

  it.each(['zscale', 'swscale'] as const)(
    '%s: extracted JPEGs keep the rendered colours (full range): background #CCD6D1 and the white hip marker',
    async (scaler) => {
      const out = path.join(dir, `colours-${scaler}`);
      await extractFrames(video, out, { scaler });
      const img = await loadImage(await readFile(path.join(out, 'frames', '000014.jpg')));
      const ctx = createCanvas(img.width, img.height).getContext('2d');
      ctx.drawImage(img, 0, 0);
      const rgba = ctx.getImageData(0, 0, img.width, img.height).data;
      const bg = brightestNear(rgba, img.width, 10, 10, 0);
      [0xcc, 0xd6, 0xd1].forEach((c, i) => expect(Math.abs(bg[i]! - c)).toBeLessThanOrEqual(8));
      const hip = truth.frames[13]!.landmarks.near.hip;
      expect(Math.min(...brightestNear(rgba, img.width, hip.x, hip.y, 1))).toBeGreaterThan(190);
    },
  );

  it('extractFrames turns the clip into one JPEG per ground-truth frame', async () => {
    const manifest = await extractFrames(video, path.join(dir, 'frames-out'));
    expect(manifest.frameCount).toBe(truth.frameCount);
    expect([manifest.width, manifest.height]).toEqual([320, 180]);
    manifest.timestampsMs.forEach((t, i) => expect(t).toBeCloseTo(truth.frames[i]!.timeMs, 1));
  });
});
