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
import { GAIT_EVENT_LABELS } from '../contracts/annotations';
import type { Side } from '../contracts/assessment';
import type { ClipMeasures, Measure, MeasureKey } from '../contracts/measures';
import { angleMeasures } from './angle-measures';
import { buildGaitCycles, eventWarnings, frameQuantisationMs, makeFrameClock, validateEvents } from './events';
import { angleSamples, FrameStore } from './frame-angles';
import { metresPerPixel, type PlaneFrame } from './geometry';
import { build, fmt, type Ctx } from './measure-context';
import { KINEMATICS_VERSION, MEASURE_KEYS, MIN_STEPS_FOR_RELIABLE_MEAN, SIDE_ORDER, type ClipMeasureInput } from './measure-definitions';
import { symmetryIndexPct } from './stats';
import { timingMeasures, untimed } from './step-timing';

function symmetry(
  ctx: Ctx,
  key: 'symmetry_contact_time' | 'symmetry_hip_extension_toe_off',
  source: Measure[],
  what: string,
  unit: string,
  d: number,
): Measure {
  const L = source.find((m) => m.side === 'left');
  const R = source.find((m) => m.side === 'right');
  const formula = 'Symmetry index = |L − R| ÷ mean(L, R) × 100 % (0 % = symmetric), from each side’s mean.';
  if (!L || !R || L.status !== 'ok' || R.status !== 'ok')
    return build(
      ctx,
      key,
      null,
      [],
      formula,
      `Needs ${what} on both sides (${[L, R]
        .filter((m) => m?.status !== 'ok')
        .map((m) => m?.side ?? '?')
        .join(' and ')} missing).`,
    );
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

  // Events: proposals wait for the coach's acceptance and are not measured.
  const confirmed = annotations.events.filter((e) => e.origin !== 'proposed');
  const waiting = annotations.events.length - confirmed.length;
  if (waiting > 0) notes.push(`${waiting} proposed event${waiting === 1 ? '' : 's'} not counted until accepted.`);
  const problems = validateEvents(confirmed, frameCount);
  for (const p of problems) notes.push(`Event marks: ${p}`);
  const events = confirmed.filter(
    (e) =>
      Number.isInteger(e.frame) &&
      e.frame >= 0 &&
      e.frame < frameCount &&
      (e.side === 'left' || e.side === 'right') &&
      e.kind in GAIT_EVENT_LABELS,
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
    notes.push(
      'No scale bar: angles and times are unaffected, but heel-ahead-of-hip, vertical oscillation and overground lengths need one.',
    );

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
  const angles = angleSamples(store, clock);

  const hasScale = mPerPx !== null || (input.surface === 'treadmill' && input.beltSpeedMps !== null && input.beltSpeedMps > 0);
  return { kinematicsVersion: KINEMATICS_VERSION, clipId: input.clipId, hasScale, measures, angles, notes };
}

const sideRank = (s: Side | null) => (s === null ? 0 : s === 'left' ? 1 : 2);
