/**
 * Clip measures: every `MeasureKey` as mean ± SD over the marked steps, with side, unit, event,
 * n and a derivation in words — or `not_enough_data` with the reason. Never a made-up number:
 * a figure is computed only from what its definition needs (landmarks on the event frame, clean
 * event patterns, a scale for metres, belt speed on a treadmill). Pure.
 *
 * Conventions (DESIGN.md "Kinematics conventions", REFERENCES.md):
 * - landmarks arrive as image fractions (origin top-left, y down); they are converted to a y-up
 *   plane with +x the running direction (right-to-left clips mirrored) before any signed angle;
 * - angles need no scale (aspect-correct pixels); metres need the scale bar (m/px);
 * - SD is the sample SD (n − 1); times come from manifest timestamps when given, else frame ÷ fps.
 */
import { GAIT_EVENT_LABELS, type FrameLandmarks, type GaitEventKind, type GaitEventMark, type ScaleBar } from '../contracts/annotations';
import type { Direction, FilmSurface, Side } from '../contracts/assessment';
import type { AngleSample, ClipMeasures, Measure, MeasureKey, ReferenceBand } from '../contracts/measures';
import { poseAngles, type PoseAngles, type SidePose } from './angles';
import { classifyFootStrike, evaluateBand, findBand, UNITS, type FootStrike } from './bands';
import { buildGaitCycles, eventWarnings, frameQuantisationMs, makeFrameClock, validateEvents, type FrameClock, type GaitCycles } from './events';
import { isFinitePoint, metresPerPixel, planeScale, toPlanePx, type PlaneFrame, type PlanePoint } from './geometry';
import { sidePosePx, trunkPairOf } from './pose';
import { mean, sampleSd, symmetryIndexPct } from './stats';

/** Version of this implementation, stored with every measures snapshot. */
export const KINEMATICS_VERSION = '1.0.0';

/** Fewer steps than this behind a mean earn a note (Dingenen et al. 2018 averaged ≥ 7 steps). */
export const MIN_STEPS_FOR_RELIABLE_MEAN = 7;

/** Peak knee flexion needs the knee angle at least every this fraction of stance. */
export const PEAK_KNEE_MAX_GAP_FRACTION = 0.1;
/** Vertical oscillation needs the hip marked at least every this fraction of the stride. */
export const OSCILLATION_MAX_GAP_FRACTION = 0.05;

/** Everything {@link computeClipMeasures} needs about one clip. */
export interface ClipMeasureInput {
  clipId: number;
  annotations: { landmarks: FrameLandmarks[]; events: GaitEventMark[]; scale: ScaleBar | null };
  /** Working frame size in pixels (the frames the coach marked). */
  frameSize: { width: number; height: number };
  /** Frames per second of the working frames (used when `timestampsMs` is absent or unusable). */
  fps: number;
  /** Per-frame presentation times, ms (the manifest's `timestampsMs`), index = frame. */
  timestampsMs?: number[];
  direction: Direction;
  surface: FilmSurface;
  /** Treadmill belt speed, m/s (null when unknown or overground). */
  beltSpeedMps: number | null;
  /** Bands to evaluate against; the first band with the measure's key and unit applies. */
  bands: ReferenceBand[];
  /** Frames in the clip, to reject events past the end (optional; `timestampsMs.length` otherwise). */
  frameCount?: number;
}

/** What a measure is, independent of any clip. */
export interface MeasureDefinition {
  key: MeasureKey;
  label: string;
  unit: string;
  event: GaitEventKind | null;
  /** One measure per side (left, right) rather than one for both. */
  perSide: boolean;
}

const def = (key: MeasureKey, label: string, unit: string, event: GaitEventKind | null, perSide: boolean): MeasureDefinition => ({
  key,
  label,
  unit,
  event,
  perSide,
});

/** Every measure, in display order. */
export const MEASURE_DEFINITIONS: Readonly<Record<MeasureKey, MeasureDefinition>> = {
  hip_extension_toe_off: def('hip_extension_toe_off', 'Hip extension at toe-off (thigh from vertical)', UNITS.deg, 'toe_off', true),
  hip_extension_toe_off_rel_trunk: def('hip_extension_toe_off_rel_trunk', 'Hip extension at toe-off relative to the trunk', UNITS.deg, 'toe_off', true),
  knee_flexion_initial_contact: def('knee_flexion_initial_contact', 'Knee flexion at initial contact', UNITS.deg, 'initial_contact', true),
  knee_flexion_peak_stance: def('knee_flexion_peak_stance', 'Peak knee flexion in stance', UNITS.deg, null, true),
  shank_angle_initial_contact: def('shank_angle_initial_contact', 'Shank angle at initial contact', UNITS.deg, 'initial_contact', true),
  foot_angle_initial_contact: def('foot_angle_initial_contact', 'Foot angle at initial contact', UNITS.deg, 'initial_contact', true),
  trunk_lean: def('trunk_lean', 'Trunk lean over stance', UNITS.deg, null, true),
  heel_ahead_of_hip_initial_contact: def('heel_ahead_of_hip_initial_contact', 'Heel ahead of hip at initial contact', UNITS.m, 'initial_contact', true),
  cadence: def('cadence', 'Cadence', UNITS.stepsPerMin, null, false),
  step_time: def('step_time', 'Step time', UNITS.s, null, false),
  stride_time: def('stride_time', 'Stride time', UNITS.s, null, false),
  step_length: def('step_length', 'Step length', UNITS.m, null, false),
  stride_length: def('stride_length', 'Stride length', UNITS.m, null, false),
  contact_time: def('contact_time', 'Contact time', UNITS.s, null, true),
  flight_time: def('flight_time', 'Flight time', UNITS.s, null, false),
  duty_factor: def('duty_factor', 'Duty factor', UNITS.pct, null, true),
  vertical_oscillation: def('vertical_oscillation', 'Vertical oscillation of the hip', UNITS.cm, null, false),
  symmetry_contact_time: def('symmetry_contact_time', 'Left/right symmetry of contact time', UNITS.pct, null, false),
  symmetry_hip_extension_toe_off: def('symmetry_hip_extension_toe_off', 'Left/right symmetry of hip extension at toe-off', UNITS.pct, 'toe_off', false),
};

/** Measure keys in display order. */
export const MEASURE_KEYS = Object.keys(MEASURE_DEFINITIONS) as MeasureKey[];

const SIDE_ORDER: readonly Side[] = ['left', 'right'];
const sideWord = (s: Side) => s;
const Cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
const fmt = (v: number, d = 1) => v.toFixed(d);
const framesList = (fs: readonly (number | string)[]) => (fs.length <= 6 ? fs.join(', ') : `${fs.slice(0, 6).join(', ')}, …`);

const THIGH_NOTE =
  'Thigh = hip→knee from the global vertical (+ flexion, − extension), not from the pelvis: 2D thigh-from-vertical overstates hip extension relative to the pelvis by about the pelvic anterior tilt.';

/** Per-clip working state shared by the measure builders. */
interface Ctx {
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
 * Landmarks indexed by frame and side (the last entry for a frame and side wins). Angles are
 * computed once per frame; plane poses are made on demand (only event frames and hip tracks need
 * positions), so a long fully marked clip does not keep tens of thousands of points alive.
 */
class FrameStore {
  /** Frames that have any landmarks, ascending. */
  readonly frames: number[];
  readonly lastFrame: number;
  private readonly entries: Record<Side, (FrameLandmarks | undefined)[]> = { left: [], right: [] };
  private readonly angleBy: Record<Side, (PoseAngles | undefined)[]> = { left: [], right: [] };
  private readonly poseCache: Record<Side, Map<number, SidePose<'px'>>> = { left: new Map(), right: new Map() };

  constructor(
    landmarks: readonly FrameLandmarks[],
    private readonly plane: PlaneFrame,
  ) {
    const seen: number[] = [];
    let last = -1;
    for (const l of landmarks) {
      if (!Number.isInteger(l.frame) || l.frame < 0 || (l.side !== 'left' && l.side !== 'right')) continue;
      if (!this.entries.left[l.frame] && !this.entries.right[l.frame]) seen.push(l.frame);
      this.entries[l.side][l.frame] = l;
      if (l.frame > last) last = l.frame;
    }
    this.frames = seen.sort((a, b) => a - b);
    this.lastFrame = last;
    // Same path as frameAngles()/anglesOfPoses(), unrolled: this loop runs for every marked frame.
    const scale = planeScale(plane);
    for (const f of this.frames) {
      const left = this.entries.left[f];
      const right = this.entries.right[f];
      const pl = left ? sidePosePx(left.points ?? {}, scale) : undefined;
      const pr = right ? sidePosePx(right.points ?? {}, scale) : undefined;
      if (pl) this.angleBy.left[f] = poseAngles(pl, trunkPairOf(pr));
      if (pr) this.angleBy.right[f] = poseAngles(pr, trunkPairOf(pl));
    }
  }

  /** Angles of one side on one frame (absent when the side is not marked there). */
  angles(frame: number, side: Side): PoseAngles | undefined {
    return this.angleBy[side][frame];
  }

  /** One side's plane pose on one frame (pixels, y up, +x running direction), cached. */
  pose(frame: number, side: Side): SidePose<'px'> | undefined {
    const e = this.entries[side][frame];
    if (!e) return undefined;
    let p = this.poseCache[side].get(frame);
    if (!p) this.poseCache[side].set(frame, (p = sidePosePx(e.points ?? {}, this.plane)));
    return p;
  }

  /** The hip of one side on one frame in plane pixels (not cached: hip tracks are long). */
  hip(frame: number, side: Side): PlanePoint<'px'> | undefined {
    const h = this.entries[side][frame]?.points?.hip;
    return isFinitePoint(h) ? toPlanePx(h, this.plane) : undefined;
  }
}

function build(
  ctx: Ctx,
  key: MeasureKey,
  side: Side | null,
  values: number[],
  derivation: string,
  missing: string,
  n = values.length,
): Measure {
  const d = MEASURE_DEFINITIONS[key];
  const base = { key, label: d.label, unit: d.unit, side, event: d.event, derivation };
  if (values.length === 0) return { ...base, status: 'not_enough_data', mean: null, sd: null, n: 0, values: [], missing };
  const m = mean(values)!;
  const out: Measure = { ...base, status: 'ok', mean: m, sd: sampleSd(values), n, values };
  const band = findBand(ctx.input.bands, key, d.unit);
  const ev = band ? evaluateBand(m, band) : null;
  if (ev) out.band = ev;
  return out;
}

/** Distinct valid event frames of one side and kind, in order. */
function eventFrames(ctx: Ctx, side: Side, kind: GaitEventKind): number[] {
  const fs = new Set<number>();
  for (const e of ctx.events) if (e.side === side && e.kind === kind) fs.add(e.frame);
  return [...fs].sort((a, b) => a - b);
}

/**
 * A measure read at one gait event per step: `read` gives the value on an event frame, or
 * undefined when the landmarks it needs are not there.
 */
function atEvent(
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
  const coverage = without.length ? ` ${values.length} of ${frames.length} ${ev}s had ${needs} marked (missing on frames ${framesList(without)}).` : '';
  return build(
    ctx,
    key,
    side,
    values,
    derivation + coverage,
    `${Cap(needs)} not marked on the ${sideWord(side)} side at any ${ev} (frames ${framesList(frames)}).`,
  );
}

const angleAt = (ctx: Ctx, frame: number, side: Side): PoseAngles | undefined => ctx.store.angles(frame, side);
const poseAt = (ctx: Ctx, frame: number, side: Side): SidePose<'px'> | undefined => ctx.store.pose(frame, side);

/** Frames in [from, to] where `has(frame)` holds, and whether no gap (incl. the ends) exceeds maxGap. */
function coverage(from: number, to: number, maxGap: number, has: (f: number) => boolean): { frames: number[]; covered: boolean } {
  const frames: number[] = [];
  for (let f = from; f <= to; f++) if (has(f)) frames.push(f);
  if (frames.length === 0) return { frames, covered: false };
  let covered = frames[0]! - from <= maxGap && to - frames[frames.length - 1]! <= maxGap;
  for (let i = 1; covered && i < frames.length; i++) if (frames[i]! - frames[i - 1]! > maxGap) covered = false;
  return { frames, covered };
}

function angleMeasures(ctx: Ctx, side: Side): Measure[] {
  const out: Measure[] = [];
  const a = (f: number) => angleAt(ctx, f, side);
  const fallbackUsed = (frames: number[]) => frames.some((f) => a(f)?.trunkFromFallback);

  out.push(
    atEvent(
      ctx,
      'hip_extension_toe_off',
      side,
      'toe_off',
      'hip and knee',
      (f) => {
        const t = a(f)?.thighDeg;
        return t === undefined ? undefined : -t;
      },
      `Hip extension = −thigh angle on each toe-off frame, so extension reads positive and a hip that stays flexed reads negative. ${THIGH_NOTE} Mean ± SD (sample SD) over toe-offs.`,
    ),
  );

  const toFrames = eventFrames(ctx, side, 'toe_off');
  out.push(
    atEvent(
      ctx,
      'hip_extension_toe_off_rel_trunk',
      side,
      'toe_off',
      'hip, knee and shoulder',
      (f) => {
        const h = a(f)?.hipRelTrunkDeg;
        return h === undefined ? undefined : -h;
      },
      `Hip extension relative to the trunk line = −(thigh + trunk lean) at toe-off (trunk = hip→shoulder from vertical, + forward). A forward lean lowers it; it does not see the pelvis, so pelvic tilt or lumbar arching under an upright trunk still counts as extension here.${
        fallbackUsed(toFrames) ? ` The trunk came from the ${otherWord(side)} side's shoulder and hip where this side's were not marked.` : ''
      }`,
    ),
  );

  out.push(
    atEvent(
      ctx,
      'knee_flexion_initial_contact',
      side,
      'initial_contact',
      'hip, knee and ankle',
      (f) => a(f)?.kneeFlexionDeg,
      'Knee flexion = thigh − shank on each initial-contact frame (0° = straight) = 180° − the included hip–knee–ankle angle. Mean ± SD over contacts.',
    ),
  );

  out.push(peakKneeFlexion(ctx, side));

  out.push(
    atEvent(
      ctx,
      'shank_angle_initial_contact',
      side,
      'initial_contact',
      'knee and ankle',
      (f) => a(f)?.shankDeg,
      'Shank = knee→ankle from vertical on each initial-contact frame, + when the ankle is ahead of the knee (0° = vertical tibia at landing).',
    ),
  );

  out.push(footAngle(ctx, side));
  out.push(trunkLean(ctx, side));

  const mpp = ctx.mPerPx;
  const heelDerivation =
    'Heel x − hip x on each initial-contact frame, metres along the running direction (+ = heel lands ahead of the hip), converted with the scale bar (m per pixel); assumes the foot lands in the calibrated plane.';
  if (mpp === null) {
    const d = MEASURE_DEFINITIONS.heel_ahead_of_hip_initial_contact;
    out.push({
      key: d.key,
      label: d.label,
      unit: d.unit,
      side,
      event: d.event,
      status: 'not_enough_data',
      mean: null,
      sd: null,
      n: 0,
      values: [],
      derivation: heelDerivation,
      missing: 'Needs a scale bar to turn pixels into metres.',
    });
  } else {
    out.push(
      atEvent(
        ctx,
        'heel_ahead_of_hip_initial_contact',
        side,
        'initial_contact',
        'heel and hip',
        (f) => {
          const p = poseAt(ctx, f, side);
          return p?.heel && p.hip ? (p.heel.x - p.hip.x) * mpp : undefined;
        },
        `${heelDerivation} Scale ${fmt(mpp * 1000, 2)} mm/px.`,
      ),
    );
  }
  return out;
}

const otherWord = (s: Side) => (s === 'left' ? 'right' : 'left');

function peakKneeFlexion(ctx: Ctx, side: Side): Measure {
  const stances = ctx.cycles.stances.filter((s) => s.side === side);
  const derivation = `Largest knee flexion (thigh − shank) over the frames of each stance, initial contact → toe-off; needs hip, knee and ankle marked at least every ${PEAK_KNEE_MAX_GAP_FRACTION * 100} % of the stance so the peak is not missed. Mean ± SD over stances.`;
  if (stances.length === 0)
    return build(ctx, 'knee_flexion_peak_stance', side, [], derivation, `No complete ${side} stance (initial contact followed by toe-off) marked.`);
  const values: number[] = [];
  let sparse = 0;
  for (const s of stances) {
    const maxGap = Math.max(1, Math.floor(PEAK_KNEE_MAX_GAP_FRACTION * (s.toFrame - s.icFrame)));
    const { frames, covered } = coverage(s.icFrame, s.toFrame, maxGap, (f) => angleAt(ctx, f, side)?.kneeFlexionDeg !== undefined);
    if (!covered) {
      sparse++;
      continue;
    }
    let peak = -Infinity;
    for (const f of frames) peak = Math.max(peak, angleAt(ctx, f, side)!.kneeFlexionDeg!);
    values.push(peak);
  }
  return build(
    ctx,
    'knee_flexion_peak_stance',
    side,
    values,
    derivation + (sparse && values.length ? ` ${sparse} of ${stances.length} stances were marked too sparsely and left out.` : ''),
    stances.some((s) => coverage(s.icFrame, s.toFrame, Infinity, (f) => angleAt(ctx, f, side)?.kneeFlexionDeg !== undefined).frames.length > 0)
      ? `Hip, knee and ankle are not marked densely enough through any ${side} stance (need at least every ${PEAK_KNEE_MAX_GAP_FRACTION * 100} % of stance, ${stances.length} stance${stances.length === 1 ? '' : 's'} checked).`
      : `Hip, knee and ankle not marked on any frame of a ${side} stance.`,
  );
}

function footAngle(ctx: Ctx, side: Side): Measure {
  const base =
    'Foot angle = heel→toe from horizontal on each initial-contact frame, + toe up. Foot strike by the cut-offs of Mo et al. 2021 (forefoot ≤ −0.8°, rearfoot ≥ 7.4°, midfoot between), which assume the angle relative to standing posture; this angle is relative to the horizontal (marker offsets of a standing frame not removed).';
  const m = atEvent(ctx, 'foot_angle_initial_contact', side, 'initial_contact', 'heel and toe', (f) => angleAt(ctx, f, side)?.footDeg, base);
  if (m.status === 'ok') {
    const counts: Record<FootStrike, number> = { rearfoot: 0, midfoot: 0, forefoot: 0 };
    for (const v of m.values) counts[classifyFootStrike(v)]++;
    const parts = (['rearfoot', 'midfoot', 'forefoot'] as const).filter((k) => counts[k]).map((k) => `${counts[k]} ${k}`);
    m.derivation += ` Contacts: ${parts.join(', ')}; the mean classifies as ${classifyFootStrike(m.mean!)}.`;
  }
  return m;
}

function trunkLean(ctx: Ctx, side: Side): Measure {
  const stances = ctx.cycles.stances.filter((s) => s.side === side);
  let frameCount = 0;
  let fallback = false;
  const values: number[] = [];
  for (const s of stances) {
    const vs: number[] = [];
    for (let f = s.icFrame; f <= s.toFrame; f++) {
      const a = angleAt(ctx, f, side);
      if (a?.trunkDeg === undefined) continue;
      vs.push(a.trunkDeg);
      if (a.trunkFromFallback) fallback = true;
    }
    if (vs.length) {
      values.push(mean(vs)!);
      frameCount += vs.length;
    }
  }
  const derivation = `Trunk lean = hip→shoulder from vertical (+ forward), averaged over the marked frames of each ${side} stance (initial contact → toe-off), then mean ± SD over stances (${frameCount} frames in all).${
    fallback ? ` The ${otherWord(side)} side's shoulder and hip stood in where this side's were not marked.` : ''
  }`;
  return build(
    ctx,
    'trunk_lean',
    side,
    values,
    derivation,
    stances.length === 0
      ? `No complete ${side} stance (initial contact followed by toe-off) marked.`
      : `Shoulder and hip not marked on any frame of a ${side} stance.`,
  );
}

function timingMeasures(ctx: Ctx): Measure[] {
  const { cycles, clock, input, mPerPx } = ctx;
  const sec = (a: number, b: number) => (clock.timeMs(b) - clock.timeMs(a)) / 1000;
  const timing = ctx.timingNote;
  const out: Partial<Record<MeasureKey, Measure[]>> = {};
  const put = (m: Measure) => (out[m.key] ??= []).push(m);

  const stepTimes = cycles.steps.map((s) => sec(s.icFrame, s.nextIcFrame));
  const strideTimes = cycles.strides.map((s) => sec(s.icFrame, s.nextIcFrame));
  const halfStrides = strideTimes.map((t) => t / 2);
  const useSteps = stepTimes.length > 0;
  const stepsMissing =
    'Needs initial contacts of both sides in turn (one side, then the other, with only that side’s toe-off between), or whole strides of one side.';

  // Cadence and step time.
  put(
    build(
      ctx,
      'cadence',
      null,
      useSteps ? stepTimes.map((t) => 60 / t) : strideTimes.map((t) => 120 / t),
      useSteps
        ? `60 ÷ step time for each step (initial contact of one side → the next of the other), steps per minute. ${timing}`
        : `Only one side's contacts form steps, so 120 ÷ stride time for each stride (two steps per stride; exact as a mean over the stride). ${timing}`,
      stepsMissing,
    ),
  );
  put(
    build(
      ctx,
      'step_time',
      null,
      useSteps ? stepTimes : halfStrides,
      useSteps
        ? `Initial contact of one side → the next initial contact of the other. ${timing}`
        : `Only one side's contacts are marked, so each value is stride time ÷ 2, the mean of the two steps in that stride. ${timing}`,
      stepsMissing,
    ),
  );
  put(
    build(
      ctx,
      'stride_time',
      null,
      strideTimes,
      `Initial contact → the next initial contact of the same side (either side), with one toe-off between. ${timing}`,
      'Needs initial contact, toe-off and the next initial contact of one side.',
    ),
  );

  // Lengths.
  const treadmill = input.surface === 'treadmill';
  const belt = input.beltSpeedMps;
  if (treadmill) {
    const beltOk = belt !== null && Number.isFinite(belt) && belt > 0;
    const noBelt = 'Treadmill clip without a belt speed: step and stride length need it (length = belt speed × time).';
    put(
      build(
        ctx,
        'step_length',
        null,
        beltOk ? (useSteps ? stepTimes : halfStrides).map((t) => belt * t) : [],
        `Belt speed (${beltOk ? fmt(belt, 2) : '?'} m/s) × step time${useSteps ? '' : ' (stride time ÷ 2: only one side forms steps)'}. ${timing}`,
        beltOk ? stepsMissing : noBelt,
      ),
    );
    put(
      build(
        ctx,
        'stride_length',
        null,
        beltOk ? strideTimes.map((t) => belt * t) : [],
        `Belt speed (${beltOk ? fmt(belt, 2) : '?'} m/s) × stride time. ${timing}`,
        beltOk ? 'Needs initial contact, toe-off and the next initial contact of one side.' : noBelt,
      ),
    );
  } else {
    const travel = (fromFrame: number, toFrame: number, sides: Side[]): number | undefined => {
      if (mPerPx === null) return undefined;
      for (const s of sides) {
        const a = poseAt(ctx, fromFrame, s)?.hip;
        const b = poseAt(ctx, toFrame, s)?.hip;
        if (a && b) return (b.x - a.x) * mPerPx;
      }
      return undefined;
    };
    const backwards: string[] = [];
    const forward = (v: number | undefined, where: string): v is number => {
      if (v === undefined) return false;
      if (v <= 0) backwards.push(where);
      return v > 0;
    };
    const stepLen = cycles.steps
      .map((s) => travel(s.icFrame, s.nextIcFrame, [s.fromSide, s.side]))
      .filter((v, i) => forward(v, `${cycles.steps[i]!.icFrame}–${cycles.steps[i]!.nextIcFrame}`));
    const strideLen = cycles.strides
      .map((s) => travel(s.icFrame, s.nextIcFrame, [s.side]))
      .filter((v, i) => forward(v, `${cycles.strides[i]!.icFrame}–${cycles.strides[i]!.nextIcFrame}`));
    const how =
      'Overground: forward travel of the hip marker (the same marker on both frames) between the two initial contacts, converted with the scale bar; assumes a fixed camera and running in the calibrated plane.';
    const noScale = 'Needs a scale bar (overground lengths come from hip-marker travel in metres).';
    const noHip = (what: string) => `Hip not marked on both initial-contact frames of any ${what}, or no ${what} marked.`;
    const back = backwards.length
      ? ` Left out ${backwards.length} where the hip moved backwards (frames ${framesList(backwards)}) — check the running direction.`
      : '';
    const halfStride = stepLen.length === 0 && strideLen.length > 0;
    put(
      build(
        ctx,
        'step_length',
        null,
        halfStride ? strideLen.map((v) => v / 2) : stepLen,
        halfStride
          ? `${how} No step has the same hip marker on both of its frames, so each value is stride length ÷ 2 (the mean of the two steps in that stride).${back}`
          : how + back,
        mPerPx === null ? noScale : noHip('step'),
      ),
    );
    put(build(ctx, 'stride_length', null, strideLen, how + back, mPerPx === null ? noScale : noHip('stride')));
  }

  // Contact time and duty factor per side.
  for (const side of SIDE_ORDER) {
    const st = cycles.stances.filter((s) => s.side === side);
    put(
      build(
        ctx,
        'contact_time',
        side,
        st.map((s) => sec(s.icFrame, s.toFrame)),
        `Initial contact → toe-off of the ${side} foot. ${timing}`,
        `No complete ${side} stance (initial contact followed by toe-off) marked.`,
      ),
    );
  }
  put(
    build(
      ctx,
      'flight_time',
      null,
      cycles.flights.map((f) => sec(f.toFrame, f.icFrame)),
      `Toe-off of one side → the next initial contact of the other side. ${timing}`,
      'Needs a toe-off of one side followed directly by the initial contact of the other side (both sides marked).',
    ),
  );
  for (const side of SIDE_ORDER) {
    const strides = cycles.strides.filter((s) => s.side === side);
    put(
      build(
        ctx,
        'duty_factor',
        side,
        strides.map((s) => (sec(s.icFrame, s.toFrame) / sec(s.icFrame, s.nextIcFrame)) * 100),
        `Contact time ÷ stride time × 100 for each ${side} stride (initial contact → toe-off ÷ initial contact → next initial contact). ${timing}`,
        `No complete ${side} stride (initial contact, toe-off, next initial contact) marked.`,
      ),
    );
  }

  put(verticalOscillation(ctx));

  return MEASURE_KEYS.flatMap((k) => out[k] ?? []);
}

function verticalOscillation(ctx: Ctx): Measure {
  const derivation = `Highest minus lowest hip-marker height over each stride (initial contact → next initial contact of one side), converted with the scale bar, in cm; needs the hip marked at least every ${OSCILLATION_MAX_GAP_FRACTION * 100} % of the stride so the top and bottom are not missed.`;
  if (ctx.mPerPx === null) return build(ctx, 'vertical_oscillation', null, [], derivation, 'Needs a scale bar to turn pixels into centimetres.');
  const mpp = ctx.mPerPx;
  const perSide: Record<Side, number[]> = { left: [], right: [] };
  for (const s of ctx.cycles.strides) {
    const maxGap = Math.max(1, Math.floor(OSCILLATION_MAX_GAP_FRACTION * (s.nextIcFrame - s.icFrame)));
    const { frames, covered } = coverage(s.icFrame, s.nextIcFrame, maxGap, (f) => ctx.store.hip(f, s.side) !== undefined);
    if (!covered) continue;
    let lo = Infinity;
    let hi = -Infinity;
    for (const f of frames) {
      const y = ctx.store.hip(f, s.side)!.y;
      lo = Math.min(lo, y);
      hi = Math.max(hi, y);
    }
    perSide[s.side].push((hi - lo) * mpp * 100);
  }
  const side: Side = perSide.left.length > perSide.right.length ? 'left' : 'right';
  return build(
    ctx,
    'vertical_oscillation',
    null,
    perSide[side],
    `${derivation} Uses the ${side} hip marker over ${side} strides (the side with more usable strides).`,
    ctx.cycles.strides.length === 0
      ? 'No complete stride (initial contact, toe-off, next initial contact) marked.'
      : `The hip is not marked densely enough through any stride (need at least every ${OSCILLATION_MAX_GAP_FRACTION * 100} % of the stride).`,
  );
}

function symmetry(ctx: Ctx, key: 'symmetry_contact_time' | 'symmetry_hip_extension_toe_off', source: Measure[], what: string, unit: string, d: number): Measure {
  const L = source.find((m) => m.side === 'left');
  const R = source.find((m) => m.side === 'right');
  const formula = 'Symmetry index = |L − R| ÷ mean(L, R) × 100 % (0 % = symmetric), from each side’s mean.';
  if (!L || !R || L.status !== 'ok' || R.status !== 'ok')
    return build(ctx, key, null, [], formula, `Needs ${what} on both sides (${[L, R].filter((m) => m?.status !== 'ok').map((m) => m?.side ?? '?').join(' and ')} missing).`);
  const si = symmetryIndexPct(L.mean!, R.mean!);
  const detail = ` Left ${fmt(L.mean!, d)} ${unit} (n = ${L.n}), right ${fmt(R.mean!, d)} ${unit} (n = ${R.n}), |L − R| = ${fmt(Math.abs(L.mean! - R.mean!), d)} ${unit}; n = the smaller side's count.`;
  if (si === null)
    return build(
      ctx,
      key,
      null,
      [],
      formula + detail,
      `The symmetry index is undefined when a side's mean ${what} is zero or negative; compare left and right directly.`,
    );
  return build(ctx, key, null, [si], formula + detail, '', Math.min(L.n, R.n));
}

/**
 * Computes every measure of a clip from its annotations (see the file header for conventions).
 * Each `MeasureKey` appears once (both-sides measures) or twice, left then right (per-side
 * measures), in {@link MEASURE_KEYS} order. `angles` holds, per frame and side, the angles the
 * marked landmarks allow (for the chart). `notes` lists event problems, left-out cycles, timing
 * and scale caveats, and means of fewer than 7 steps.
 */
export function computeClipMeasures(input: ClipMeasureInput): ClipMeasures {
  const { annotations, frameSize, direction } = input;
  const frame: PlaneFrame = { frameSize, direction };
  const frameCount = input.frameCount ?? (input.timestampsMs?.length || Number.POSITIVE_INFINITY);
  const notes: string[] = [];

  // Events.
  const problems = validateEvents(annotations.events, frameCount);
  for (const p of problems) notes.push(`Event marks: ${p}`);
  const events = annotations.events.filter(
    (e) => Number.isInteger(e.frame) && e.frame >= 0 && e.frame < frameCount && (e.side === 'left' || e.side === 'right') && e.kind in GAIT_EVENT_LABELS,
  );
  const cycles = buildGaitCycles(events);
  notes.push(...eventWarnings(events), ...cycles.excluded);

  // Landmarks → plane poses → angles, once per frame.
  const store = new FrameStore(annotations.landmarks, frame);
  let lastFrame = Math.max(0, store.lastFrame);
  for (const e of events) lastFrame = Math.max(lastFrame, e.frame);

  // Time and scale.
  const fpsOk = Number.isFinite(input.fps) && input.fps > 0;
  const clock = makeFrameClock(fpsOk ? input.fps : NaN, input.timestampsMs, lastFrame);
  if (clock.fallbackReason) notes.push(`Timing from frame ÷ fps: ${clock.fallbackReason}.`);
  const timingUsable = clock.source === 'timestamps' || fpsOk;
  const quant = fpsOk ? ` (${fmt(frameQuantisationMs(input.fps))} ms at ${Number(input.fps.toFixed(3))} fps)` : '';
  const timingNote =
    clock.source === 'timestamps'
      ? `Times from the frames' timestamps; each event is ±1 frame${quant}.`
      : `Times = frame ÷ ${Number(input.fps.toFixed(3))} fps; each event is ±1 frame${quant}.`;
  const mPerPx = metresPerPixel(annotations.scale, frameSize);
  if (annotations.scale && mPerPx === null) notes.push('The scale bar has no length in pixels or metres, so it is ignored.');
  if (mPerPx === null)
    notes.push('No scale bar: angles and times are unaffected, but heel-ahead-of-hip, vertical oscillation and overground lengths need one.');

  const ctx: Ctx = {
    input,
    clock,
    mPerPx,
    cycles,
    events,
    store,
    timingNote,
  };
  if (!timingUsable) notes.push('No usable frame rate or timestamps: times, cadence and lengths cannot be computed.');

  // Angle measures: per side, then regrouped into key order.
  const perSide = SIDE_ORDER.flatMap((s) => angleMeasures(ctx, s));
  const timed = timingUsable ? timingMeasures(ctx) : untimed(ctx);
  const all = [...perSide, ...timed];
  const byKey = (k: MeasureKey) => all.filter((m) => m.key === k);
  all.push(symmetry(ctx, 'symmetry_contact_time', byKey('contact_time'), 'contact time', 's', 3));
  all.push(symmetry(ctx, 'symmetry_hip_extension_toe_off', byKey('hip_extension_toe_off'), 'hip extension at toe-off', '°', 1));
  const measures = MEASURE_KEYS.flatMap((k) => all.filter((m) => m.key === k).sort((a, b) => sideRank(a.side) - sideRank(b.side)));

  const thin = measures.filter((m) => m.status === 'ok' && m.n < MIN_STEPS_FOR_RELIABLE_MEAN);
  if (thin.length) {
    const list = thin.map((m) => `${m.label}${m.side ? ` (${m.side})` : ''} n = ${m.n}`).join('; ');
    notes.push(
      `Fewer than ${MIN_STEPS_FOR_RELIABLE_MEAN} steps behind: ${list}. Means of fewer than ${MIN_STEPS_FOR_RELIABLE_MEAN} steps are less reliable (Dingenen et al. 2018 averaged at least 7 steps).`,
    );
  }

  // Per-frame angle samples for the chart.
  const angles: AngleSample[] = [];
  for (const f of store.frames) {
    const timeMs = clock.timeMs(f);
    for (const side of SIDE_ORDER) {
      const a = store.angles(f, side);
      if (!a) continue;
      const s: AngleSample = { frame: f, timeMs: Number.isFinite(timeMs) ? timeMs : 0, side };
      let n = 0;
      if (a.thighDeg !== undefined) (s.thighDeg = a.thighDeg), n++;
      if (a.kneeFlexionDeg !== undefined) (s.kneeFlexionDeg = a.kneeFlexionDeg), n++;
      if (a.shankDeg !== undefined) (s.shankDeg = a.shankDeg), n++;
      if (a.trunkDeg !== undefined) (s.trunkDeg = a.trunkDeg), n++;
      if (a.footDeg !== undefined) (s.footDeg = a.footDeg), n++;
      if (a.hipRelTrunkDeg !== undefined) (s.hipRelTrunkDeg = a.hipRelTrunkDeg), n++;
      if (n > 0) angles.push(s);
    }
  }

  const hasScale = mPerPx !== null || (input.surface === 'treadmill' && input.beltSpeedMps !== null && input.beltSpeedMps > 0);
  return { kinematicsVersion: KINEMATICS_VERSION, clipId: input.clipId, hasScale, measures, angles, notes };
}

/** Every timing measure as not_enough_data (no usable fps or timestamps); vertical oscillation needs no time. */
function untimed(ctx: Ctx): Measure[] {
  const keys: MeasureKey[] = ['cadence', 'step_time', 'stride_time', 'step_length', 'stride_length', 'contact_time', 'flight_time', 'duty_factor'];
  return [
    ...keys.flatMap((k) =>
      (MEASURE_DEFINITIONS[k].perSide ? SIDE_ORDER : [null]).map((side) =>
        build(ctx, k, side, [], 'Times come from the frames\' timestamps or frame ÷ fps.', 'No usable frame rate or timestamps for this clip.'),
      ),
    ),
    verticalOscillation(ctx),
  ];
}

const sideRank = (s: Side | null) => (s === null ? 0 : s === 'left' ? 1 : 2);
