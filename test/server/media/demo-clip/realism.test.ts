/**
 * Realism options of the synthetic runner clip (scripts/demo-clip; a test fixture with known
 * truth, not a real camera or a data set). Bounds are recomputed here from the stated amplitudes
 * [calc]; the encoded clip is read back with ffmpeg's decoder as the outside reference.
 */
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { createCanvas, loadImage } from '@napi-rs/canvas';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ALL_REALISM, generateRunnerClip, type GroundTruth } from '../../../../scripts/demo-clip/clip';
import { buildGroundTruth, type ClipSpec, type LandmarkName } from '../../../../scripts/demo-clip/ground-truth';
import { flickerGain, shakeOffsetPx } from '../../../../scripts/demo-clip/realism';
import { ffmpegRun, tempDir } from '../fixtures';

const spec: ClipSpec = { fps: 120, width: 1280, height: 720, seconds: 1, hipExtensionDeg: 8, facing: 'right' };

describe('camera shake and flicker (pure)', () => {
  it('shake stays within ±2.5 px at 1280 wide and moves at most 0.25 px between frames at 120 fps', () => {
    // [calc] amplitude 2.5 × (0.5 + 0.3 + 0.2) = 2.5 px; fastest change 2π × 2.5 × (0.5·0.7 + 0.3·1.9 + 0.2·4.3) / 120 = 0.233 px per frame.
    let previous = shakeOffsetPx(0, 120, 1280, ALL_REALISM);
    for (let i = 1; i < 600; i++) {
      const o = shakeOffsetPx(i, 120, 1280, ALL_REALISM);
      expect(Math.abs(o.x)).toBeLessThanOrEqual(2.5);
      expect(Math.abs(o.y)).toBeLessThanOrEqual(2.5);
      expect(Math.hypot(o.x - previous.x, o.y - previous.y)).toBeLessThanOrEqual(0.25 * Math.SQRT2);
      previous = o;
    }
    expect(shakeOffsetPx(10, 120, 1280, {})).toEqual({ x: 0, y: 0 });
    expect(shakeOffsetPx(10, 120, 1280, ALL_REALISM)).toEqual(shakeOffsetPx(10, 120, 1280, { ...ALL_REALISM }));
  });

  it('flicker keeps brightness within ±8 % (5 % ripple + 3 % drift) and is off by default', () => {
    for (let i = 0; i < 600; i++) {
      const g = flickerGain(i, 120, ALL_REALISM);
      expect(g).toBeGreaterThanOrEqual(0.92);
      expect(g).toBeLessThanOrEqual(1.08);
    }
    expect(flickerGain(5, 120, undefined)).toBe(1);
  });
});

describe('ground truth with realism', () => {
  const plain = buildGroundTruth(spec);
  const real = buildGroundTruth({ ...spec, realism: ALL_REALISM });

  it('every landmark moves with the camera offset it records, and angles do not change', () => {
    for (const i of [0, 17, 64, 119]) {
      const o = real.frames[i]!.cameraOffsetPx;
      for (const side of ['near', 'far'] as const)
        for (const k of Object.keys(real.frames[i]!.landmarks[side]) as LandmarkName[]) {
          const p = real.frames[i]!.landmarks[side][k];
          const q = plain.frames[i]!.landmarks[side][k];
          expect(p.x).toBeCloseTo(q.x + o.x, 2);
          expect(p.y).toBeCloseTo(q.y + o.y, 2);
        }
      expect(real.angles[i]!.near.thighDeg).toBeCloseTo(plain.angles[i]!.near.thighDeg, 1);
    }
  });

  it('lists far-side markers the near leg covers, for several frames in a row; none when occlusion is off', () => {
    const kneeHidden = real.frames.filter((f) => f.hiddenFar.includes('knee')).map((f) => f.index);
    expect(kneeHidden.length).toBeGreaterThanOrEqual(8);
    expect(kneeHidden.some((f, i) => kneeHidden[i + 7] === f + 7)).toBe(true);
    expect(buildGroundTruth({ ...spec, realism: { ...ALL_REALISM, occlusion: false } }).frames.every((f) => f.hiddenFar.length === 0)).toBe(
      true,
    );
  });
});

describe('an encoded clip with every realism option on (640×360, 60 fps, 0.5 s)', () => {
  let dir = '';
  let cleanup = async () => {};
  let video = '';
  let truth: GroundTruth;
  beforeAll(async () => {
    ({ dir, cleanup } = await tempDir('realism'));
    video = path.join(dir, 'real.mp4');
    truth = await generateRunnerClip({
      outFile: video,
      fps: 60,
      width: 640,
      height: 360,
      seconds: 0.5,
      hipExtensionDeg: 10,
      facing: 'right',
      preset: 'ultrafast',
      realism: ALL_REALISM,
    });
  }, 120_000);
  afterAll(() => cleanup());

  async function grey(index: number): Promise<(x: number, y: number) => number> {
    const png = path.join(dir, `f${index}.png`);
    await ffmpegRun(['-i', video, '-vf', `select=eq(n\\,${index})`, '-frames:v', '1', png]);
    const img = await loadImage(await readFile(png));
    const ctx = createCanvas(img.width, img.height).getContext('2d');
    ctx.drawImage(img, 0, 0);
    const data = ctx.getImageData(0, 0, img.width, img.height).data;
    return (x, y) => {
      const i = (Math.round(y) * img.width + Math.round(x)) * 4;
      return Math.min(data[i]!, data[i + 1]!, data[i + 2]!);
    };
  }

  it('ffmpeg decodes the white near-hip marker at the shaken ground-truth pixel, and a covered far marker is not visible', async () => {
    const covered = truth.frames.find((f) => f.hiddenFar.includes('knee'))!;
    for (const f of [truth.frames[5]!, covered]) {
      const at = await grey(f.index);
      const hip = f.landmarks.near.hip;
      expect(at(hip.x, hip.y), `frame ${f.index} hip`).toBeGreaterThan(170);
    }
    const at = await grey(covered.index);
    const knee = covered.landmarks.far.knee;
    // The far marker is light grey (#D8DCDA); under the near leg (amber) the darkest channel is low.
    expect(at(knee.x, knee.y)).toBeLessThan(150);
  });
});
