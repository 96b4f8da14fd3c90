/**
 * Steps and timing: cadence, step and stride time, step and stride length (belt speed or hip
 * travel), contact and flight time, duty factor, and vertical oscillation of the hip.
 * Internal to `src/kinematics`. Pure.
 */
import type { Side } from '../contracts/assessment';
import type { Measure, MeasureKey } from '../contracts/measures';
import { MEASURE_DEFINITIONS, MEASURE_KEYS, OSCILLATION_MAX_GAP_FRACTION, SIDE_ORDER } from './measure-definitions';
import { build, coverage, fmt, framesList, poseAt, type Ctx } from './measure-context';
import { mean } from './stats';

export function timingMeasures(ctx: Ctx): Measure[] {
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

  // Cadence and step time. Cadence is steps per minute: 60 ÷ the MEAN step time (with one side's
  // contacts only, 120 ÷ the mean stride time — the same number for the same running), never the
  // mean of per-step rates, which would change with which sides' events were marked.
  const perStepTimes = useSteps ? stepTimes : halfStrides;
  const meanStep = mean(perStepTimes);
  put(
    build(
      ctx,
      'cadence',
      null,
      perStepTimes.map((t) => 60 / t),
      useSteps
        ? `60 ÷ mean step time (initial contact of one side → the next of the other), steps per minute; the SD is over each step's 60 ÷ step time. ${timing}`
        : `Only one side's contacts form steps, so 120 ÷ mean stride time (two steps per stride), steps per minute; the SD is over each stride's 120 ÷ stride time. ${timing}`,
      stepsMissing,
      perStepTimes.length,
      meanStep === null ? undefined : 60 / meanStep,
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

export function verticalOscillation(ctx: Ctx): Measure {
  const derivation = `Highest minus lowest hip-marker height over each stride (initial contact → next initial contact of one side), converted with the scale bar, in cm; needs the hip marked at least every ${OSCILLATION_MAX_GAP_FRACTION * 100} % of the stride so the top and bottom are not missed.`;
  if (ctx.mPerPx === null)
    return build(ctx, 'vertical_oscillation', null, [], derivation, 'Needs a scale bar to turn pixels into centimetres.');
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

/** Every timing measure as not_enough_data (no usable fps or timestamps); vertical oscillation needs no time. */
export function untimed(ctx: Ctx): Measure[] {
  const keys: MeasureKey[] = [
    'cadence',
    'step_time',
    'stride_time',
    'step_length',
    'stride_length',
    'contact_time',
    'flight_time',
    'duty_factor',
  ];
  return [
    ...keys.flatMap((k) =>
      (MEASURE_DEFINITIONS[k].perSide ? SIDE_ORDER : [null]).map((side) =>
        build(
          ctx,
          k,
          side,
          [],
          "Times come from the frames' timestamps or frame ÷ fps.",
          'No usable frame rate or timestamps for this clip.',
        ),
      ),
    ),
    verticalOscillation(ctx),
  ];
}
