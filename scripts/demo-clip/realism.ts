/**
 * Realism options of the synthetic runner clip: what a phone camera adds to a clean drawing.
 * Pure parts (seeded random numbers, camera shake, lighting gain, which far-side markers the near
 * limbs cover) live here; the pixel work is in `render.ts` and `clip.ts`. All of it is a test
 * fixture with known truth, not a model of any real camera.
 */
import type { Point } from '../../src/kinematics/geometry';
import { toPixels, type Layout } from './ground-truth';
import { BODY, type RunnerPose } from './runner-model';

/** What to add to the clean drawing; every option is off unless set. */
export interface RealismOptions {
  /** A textured wall behind the runner (panels, streaks, speckle) instead of a plain colour. */
  texture?: boolean;
  /** Motion blur: each frame averages sub-frames over a 180° shutter (half the frame interval). */
  motionBlur?: boolean;
  /** Sensor noise plus stronger compression (x264 crf 28 unless `crf` is given). */
  compressionNoise?: boolean;
  /** Lighting flicker: mains-frequency brightness ripple (100 Hz sampled by the frame rate) and slow drift. */
  flicker?: boolean;
  /**
   * Far-side markers pass behind the near leg, arm and trunk (as in any side view) and the ground
   * truth lists them as hidden on those frames. Default on; `false` draws them on top of everything.
   */
  occlusion?: boolean;
  /** Slight hand-held camera shake: the whole image moves by a smooth offset of about ±2.5 px at 1280 wide. */
  cameraShake?: boolean;
  /** Seed of every random choice (default 1): the same options render the same pixels. */
  seed?: number;
}

/** Every realism option on (what the marker-following accuracy tests use). */
export const ALL_REALISM: Required<RealismOptions> = {
  texture: true,
  motionBlur: true,
  compressionNoise: true,
  flicker: true,
  occlusion: true,
  cameraShake: true,
  seed: 1,
};

/** Small, fast, seeded random number generator (mulberry32), values in [0, 1). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0 || 1;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Camera offset of frame `index` in pixels (added to every drawn point). A sum of three slow
 * sinusoids per axis with seeded phases: smooth like a hand, within ±2.5 px at 1280 wide.
 */
export function shakeOffsetPx(index: number, fps: number, width: number, realism: RealismOptions | undefined): Point {
  if (!realism?.cameraShake) return { x: 0, y: 0 };
  const rnd = seededRandom((realism.seed ?? 1) * 7919);
  const t = index / fps;
  const amp = 2.5 * (width / 1280);
  const axis = () => {
    const parts = [
      { f: 0.7, a: 0.5 },
      { f: 1.9, a: 0.3 },
      { f: 4.3, a: 0.2 },
    ].map((p) => ({ ...p, phase: rnd() * 2 * Math.PI }));
    return amp * parts.reduce((sum, p) => sum + p.a * Math.sin(2 * Math.PI * p.f * t + p.phase), 0);
  };
  return { x: axis(), y: axis() };
}

/** Brightness gain of frame `index` (1 = unchanged): ±5 % mains ripple seen at `fps` plus ±3 % drift. */
export function flickerGain(index: number, fps: number, realism: RealismOptions | undefined): number {
  if (!realism?.flicker) return 1;
  const t = index / fps;
  return 1 + 0.05 * Math.sin(2 * Math.PI * 100 * t + 0.4) + 0.03 * Math.sin(2 * Math.PI * 0.6 * t);
}

/** Distance from point p to the segment a–b. */
function distToSegment(p: Point, a: Point, b: Point): number {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const len2 = dx * dx + dy * dy;
  const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / len2));
  return Math.hypot(p.x - (a.x + t * dx), p.y - (a.y + t * dy));
}

/** The far-side markers drawn (the far hip and shoulder coincide with the near ones and are not drawn twice). */
export const FAR_MARKERS = ['knee', 'ankle', 'heel', 'toe'] as const;
export type FarMarker = (typeof FAR_MARKERS)[number];

/**
 * Far-side markers whose centre the near leg, near arm or trunk covers on this pose (in metres;
 * the same stroke widths `render.ts` draws). A marker counts as hidden once its centre is within
 * the limb's half width plus a quarter of the marker radius.
 */
export function hiddenFarMarkers(pose: RunnerPose, layout: Layout, farRadiusPx: number): FarMarker[] {
  const px = (p: Point) => toPixels(p, layout);
  const m = (metres: number) => metres * layout.pxPerMetre;
  const elbowAndHand = armPoints(pose.shoulder, pose.near.angles.thighDeg);
  const near = pose.near;
  const toeTip = {
    x: near.heel.x + (near.toe.x - near.heel.x) * (BODY.tipM / BODY.footM),
    y: near.heel.y + (near.toe.y - near.heel.y) * (BODY.tipM / BODY.footM),
  };
  const limbs: Array<[Point, Point, number]> = [
    [pose.hip, near.knee, 0.13],
    [near.knee, near.ankle, 0.09],
    [near.heel, toeTip, 0.09],
    [pose.hip, pose.shoulder, 0.2],
    [pose.shoulder, elbowAndHand.elbow, 0.075],
    [elbowAndHand.elbow, elbowAndHand.hand, 0.065],
  ];
  return FAR_MARKERS.filter((name) => {
    const c = px(pose.far[name]);
    return limbs.some(([a, b, w]) => distToSegment(c, px(a), px(b)) < m(w) / 2 + farRadiusPx / 4);
  });
}

/** Elbow and hand of the arm that swings against the leg of the same side (the elbow bent about 80°). */
export function armPoints(shoulder: Point, sameSideThighDeg: number): { elbow: Point; hand: Point } {
  const upper = (-0.9 * (sameSideThighDeg - 12) * Math.PI) / 180;
  const fore = upper + (80 * Math.PI) / 180;
  const elbow = { x: shoulder.x + BODY.upperArmM * Math.sin(upper), y: shoulder.y - BODY.upperArmM * Math.cos(upper) };
  const hand = { x: elbow.x + BODY.forearmM * Math.sin(fore), y: elbow.y - BODY.forearmM * Math.cos(fore) };
  return { elbow, hand };
}
