/**
 * The working state of one clip's measures and the helpers every measure builder shares: turning
 * per-step values into a `Measure` (mean ± SD, reference band), reading a value at each gait event,
 * and checking that a stance or stride is marked densely enough. Internal to `src/kinematics`. Pure.
 */
import { GAIT_EVENT_LABELS, type GaitEventKind, type GaitEventMark } from '../contracts/annotations';
import type { Side } from '../contracts/assessment';
import type { Measure, MeasureKey } from '../contracts/measures';
import type { PoseAngles, SidePose } from './angles';
import { evaluateBand, findBand } from './bands';
import type { FrameClock, GaitCycles } from './events';
import type { FrameStore } from './frame-angles';
import { MEASURE_DEFINITIONS, type ClipMeasureInput } from './measure-definitions';
import { mean, sampleSd } from './stats';

export const sideWord = (s: Side) => s;
export const Cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
export const fmt = (v: number, d = 1) => v.toFixed(d);
export const framesList = (fs: readonly (number | string)[]) => (fs.length <= 6 ? fs.join(', ') : `${fs.slice(0, 6).join(', ')}, …`);
export const otherWord = (s: Side) => (s === 'left' ? 'right' : 'left');

/** Per-clip working state shared by the measure builders. */
export interface Ctx {
  input: ClipMeasureInput;
  clock: FrameClock;
  mPerPx: number | null;
  cycles: GaitCycles;
  /** Valid (in-range, whole-frame) events. */
  events: GaitEventMark[];
  store: FrameStore;
  timingNote: string;
}

/**
 * A measure from its per-step `values`: mean ± sample SD and where the mean sits against the
 * clinic's band, or not_enough_data with `missing` when there are no values. `n` is the number of
 * steps behind it (default: one per value); `meanOf` replaces the plain mean of the values where
 * the definition says otherwise (cadence = 60 ÷ mean step time, not the mean of per-step rates).
 */
export function build(
  ctx: Ctx,
  key: MeasureKey,
  side: Side | null,
  values: number[],
  derivation: string,
  missing: string,
  n = values.length,
  meanOf?: number,
): Measure {
  const d = MEASURE_DEFINITIONS[key];
  const base = { key, label: d.label, unit: d.unit, side, event: d.event, derivation };
  if (values.length === 0) return { ...base, status: 'not_enough_data', mean: null, sd: null, n: 0, values: [], missing };
  const m = meanOf ?? mean(values)!;
  const out: Measure = { ...base, status: 'ok', mean: m, sd: sampleSd(values), n, values };
  const band = findBand(ctx.input.bands, key, d.unit);
  const ev = band ? evaluateBand(m, band) : null;
  if (ev) out.band = ev;
  return out;
}

/** Distinct valid event frames of one side and kind, in order. */
export function eventFrames(ctx: Ctx, side: Side, kind: GaitEventKind): number[] {
  const fs = new Set<number>();
  for (const e of ctx.events) if (e.side === side && e.kind === kind) fs.add(e.frame);
  return [...fs].sort((a, b) => a - b);
}

/**
 * A measure read at one gait event per step: `read` gives the value on an event frame, or
 * undefined when the landmarks it needs are not there.
 */
export function atEvent(
  ctx: Ctx,
  key: MeasureKey,
  side: Side,
  kind: GaitEventKind,
  needs: string,
  read: (frame: number) => number | undefined,
  derivation: string,
): Measure {
  const frames = eventFrames(ctx, side, kind);
  const ev = GAIT_EVENT_LABELS[kind].toLowerCase();
  if (frames.length === 0) return build(ctx, key, side, [], derivation, `No ${sideWord(side)} ${ev} marked.`);
  const values: number[] = [];
  const without: number[] = [];
  for (const f of frames) {
    const v = read(f);
    if (v === undefined || !Number.isFinite(v)) without.push(f);
    else values.push(v);
  }
  const coverage = without.length
    ? ` ${values.length} of ${frames.length} ${ev}s had ${needs} marked (missing on frames ${framesList(without)}).`
    : '';
  return build(
    ctx,
    key,
    side,
    values,
    derivation + coverage,
    `${Cap(needs)} not marked on the ${sideWord(side)} side at any ${ev} (frames ${framesList(frames)}).`,
  );
}

export const angleAt = (ctx: Ctx, frame: number, side: Side): PoseAngles | undefined => ctx.store.angles(frame, side);
export const poseAt = (ctx: Ctx, frame: number, side: Side): SidePose<'px'> | undefined => ctx.store.pose(frame, side);

/** Frames in [from, to] where `has(frame)` holds, and whether no gap (incl. the ends) exceeds maxGap. */
export function coverage(from: number, to: number, maxGap: number, has: (f: number) => boolean): { frames: number[]; covered: boolean } {
  const frames: number[] = [];
  for (let f = from; f <= to; f++) if (has(f)) frames.push(f);
  if (frames.length === 0) return { frames, covered: false };
  let covered = frames[0]! - from <= maxGap && to - frames[frames.length - 1]! <= maxGap;
  for (let i = 1; covered && i < frames.length; i++) if (frames[i]! - frames[i - 1]! > maxGap) covered = false;
  return { frames, covered };
}
