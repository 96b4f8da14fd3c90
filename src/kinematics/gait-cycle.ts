/**
 * Gait-cycle curves: joint angles over the gait cycle, normalised 0–100 % from one initial contact
 * to the next of the same side, mean ± sample SD over every stride whose frames all carry the
 * angle, with the stride's events as percentages (toe-off, the other side's contact). Pure.
 *
 * Normalising: at p % the time is t = IC + p/100 · (next IC − IC) frames, and the value is read by
 * straight-line interpolation between the frames on either side of t (exact at whole frames).
 * Proposed events not yet accepted are not used.
 */
import type { FrameLandmarks, GaitEventMark } from '../contracts/annotations';
import { SIDES, type Side } from '../contracts/assessment';
import type { PoseAngles } from './angles';
import { buildGaitCycles } from './events';
import { FrameStore } from './frame-angles';
import type { PlaneFrame } from './geometry';
import { mean, sampleSd } from './stats';

/** Points per curve: 0, 1, …, 100 %. */
export const CYCLE_POINTS = 101;

/** Angles drawn over the cycle (degrees; conventions as in `angles.ts`). */
export type CycleAngleKey = 'thighDeg' | 'kneeFlexionDeg' | 'ankleDeg' | 'footDeg' | 'trunkDeg';

/** The cycle angles in display order, with names. */
export const CYCLE_ANGLES: readonly { key: CycleAngleKey; label: string; short: string }[] = [
  { key: 'thighDeg', label: 'Hip: thigh from vertical (+ flexion)', short: 'Hip' },
  { key: 'kneeFlexionDeg', label: 'Knee flexion', short: 'Knee' },
  { key: 'ankleDeg', label: 'Ankle (+ dorsiflexion)', short: 'Ankle' },
  { key: 'footDeg', label: 'Foot from horizontal (+ toe up)', short: 'Foot' },
  { key: 'trunkDeg', label: 'Trunk lean (+ forward)', short: 'Trunk' },
];

/** Mean ± SD of one angle over the cycle. */
export interface CycleCurve {
  key: CycleAngleKey;
  /** Mean at 0, 1, …, 100 % (null before any stride). */
  mean: number[];
  /** Sample SD at each point (0 with one stride). */
  sd: number[];
  /** Strides averaged. */
  strides: number;
}

/** A stride event as a percentage of the cycle, mean ± SD over the strides used. */
export interface CycleMarker {
  meanPct: number;
  sdPct: number;
  strides: number;
}

/** One side's curves. */
export interface SideCycleCurves {
  side: Side;
  /** Strides with landmarks on every frame (any angle). */
  strides: number;
  /** Only angles with at least one whole stride. */
  curves: CycleCurve[];
  toeOff: CycleMarker | null;
  /** The other side's initial contact inside the stride (a step), as a percentage. */
  otherContact: CycleMarker | null;
  /** Strides left out, in words (frames without landmarks). */
  excluded: string[];
}

/**
 * Values of `valueAt(frame)` over one stride at 0 … 100 % (`points` evenly spaced), by
 * straight-line interpolation between frames; null when a frame it needs has no value.
 */
export function normaliseCycle(
  valueAt: (frame: number) => number | undefined,
  icFrame: number,
  nextIcFrame: number,
  points = CYCLE_POINTS,
): number[] | null {
  const span = nextIcFrame - icFrame;
  if (!(span > 0) || points < 2) return null;
  const out: number[] = [];
  for (let i = 0; i < points; i++) {
    const t = icFrame + (i / (points - 1)) * span;
    const f0 = Math.floor(t + 1e-9);
    const frac = t - f0;
    const a = valueAt(f0);
    if (a === undefined || !Number.isFinite(a)) return null;
    if (frac < 1e-9) {
      out.push(a);
      continue;
    }
    const b = valueAt(f0 + 1);
    if (b === undefined || !Number.isFinite(b)) return null;
    out.push(a + (b - a) * frac);
  }
  return out;
}

function marker(values: number[]): CycleMarker | null {
  if (!values.length) return null;
  return { meanPct: mean(values)!, sdPct: sampleSd(values) ?? 0, strides: values.length };
}

/**
 * Curves of both sides from a clip's landmarks and events (null for a side with no stride whose
 * every frame has its landmarks). Strides come from `buildGaitCycles` (clean IC → TO → IC).
 */
export function gaitCycleCurves(
  landmarks: readonly FrameLandmarks[],
  events: readonly GaitEventMark[],
  plane: PlaneFrame,
): Record<Side, SideCycleCurves | null> {
  const store = new FrameStore(landmarks, plane);
  const { strides, steps } = buildGaitCycles(events.filter((e) => e.origin !== 'proposed'));
  const out = { left: null, right: null } as Record<Side, SideCycleCurves | null>;
  for (const side of SIDES) {
    const mine = strides.filter((s) => s.side === side);
    const excluded: string[] = [];
    const series: Record<CycleAngleKey, number[][]> = { thighDeg: [], kneeFlexionDeg: [], ankleDeg: [], footDeg: [], trunkDeg: [] };
    const toeOffs: number[] = [];
    const others: number[] = [];
    let used = 0;
    for (const s of mine) {
      const angles = (f: number): PoseAngles | undefined => store.angles(f, side);
      let whole = true;
      for (let f = s.icFrame; f <= s.nextIcFrame && whole; f++) if (!angles(f)) whole = false;
      if (!whole) {
        excluded.push(`Stride at frames ${s.icFrame}–${s.nextIcFrame}: some frames have no ${side} landmarks.`);
        continue;
      }
      used++;
      const span = s.nextIcFrame - s.icFrame;
      toeOffs.push(((s.toFrame - s.icFrame) / span) * 100);
      const step = steps.find((st) => st.fromSide === side && st.icFrame === s.icFrame && st.nextIcFrame < s.nextIcFrame);
      if (step) others.push(((step.nextIcFrame - s.icFrame) / span) * 100);
      for (const { key } of CYCLE_ANGLES) {
        const curve = normaliseCycle((f) => angles(f)?.[key], s.icFrame, s.nextIcFrame);
        if (curve) series[key].push(curve);
      }
    }
    if (!used) {
      if (mine.length) out[side] = { side, strides: 0, curves: [], toeOff: null, otherContact: null, excluded };
      continue;
    }
    const curves: CycleCurve[] = [];
    for (const { key } of CYCLE_ANGLES) {
      const rows = series[key];
      if (!rows.length) continue;
      const m: number[] = [];
      const sd: number[] = [];
      for (let i = 0; i < CYCLE_POINTS; i++) {
        const at = rows.map((r) => r[i]!);
        m.push(mean(at)!);
        sd.push(sampleSd(at) ?? 0);
      }
      curves.push({ key, mean: m, sd, strides: rows.length });
    }
    out[side] = { side, strides: used, curves, toeOff: marker(toeOffs), otherContact: marker(others), excluded };
  }
  return out;
}
