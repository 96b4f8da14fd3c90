/**
 * Inputs shared by the still and summary benchmarks: the synthetic runner's 1280×720 frame and
 * landmarks (scripts/demo-clip and its ground truth; made-up motion, not a data set).
 */
import { createCanvas } from '@napi-rs/canvas';
import { buildGroundTruth, frameTimeS, modelForClip } from '../../../scripts/demo-clip/ground-truth';
import { drawFrame } from '../../../scripts/demo-clip/render';
import type { FrameLandmarks } from '../../../src/contracts/annotations';
import type { StillPanelInput } from '../../../server/render/still-render';

export const W = 1280;
export const H = 720;

const SPEC = { fps: 120, width: W, height: H, seconds: 1.5, hipExtensionDeg: 8, facing: 'right' as const, beltSpeedMps: 3 };

/**
 * The synthetic runner's frame at its first right toe-off, as the extraction step would store
 * it: a JPEG at the working size, with light sensor-like noise so it is not unrealistically easy
 * to decode or compress (about the size of an extracted 1280×720 camera frame).
 */
export async function frameJpeg(seed = 1): Promise<Buffer> {
  const { model, timing, layout } = modelForClip(SPEC);
  const truth = buildGroundTruth(SPEC);
  const index = truth.events.near.toeOff[0]!;
  const canvas = createCanvas(W, H);
  const ctx = canvas.getContext('2d');
  drawFrame(ctx, model.pose(frameTimeS(index, SPEC, timing)), layout, { width: W, height: H }, SPEC.beltSpeedMps);
  const img = ctx.getImageData(0, 0, W, H);
  let s = seed * 2654435761;
  for (let i = 0; i < img.data.length; i += 4) {
    s = (s * 1103515245 + 12345) >>> 0;
    const n = ((s >>> 16) % 7) - 3;
    for (let k = 0; k < 3; k++) img.data[i + k] = Math.max(0, Math.min(255, img.data[i + k]! + n));
  }
  ctx.putImageData(img, 0, 0);
  return canvas.encode('jpeg', 80);
}

/** One panel at a right toe-off of the synthetic runner, both sides marked. */
export function runnerPanel(image: Buffer): StillPanelInput {
  const truth = buildGroundTruth(SPEC);
  const frame = truth.frames[truth.events.near.toeOff[0]!]!;
  const landmarks: FrameLandmarks[] = [
    { frame: frame.index, side: 'right', points: frame.landmarksNormalised.near },
    { frame: frame.index, side: 'left', points: frame.landmarksNormalised.far },
  ];
  return {
    image,
    frameSize: { width: W, height: H },
    landmarks,
    nearSide: 'right',
    direction: 'left_to_right',
    scale: null,
    heading: 'Re-test · 24 Nov 2026 · Right toe-off · 0.43 s',
  };
}

export const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
export const p95 = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(xs.length * 0.95))]!;
