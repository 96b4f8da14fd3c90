/**
 * Step timing, lengths, contact/flight time, duty factor and vertical oscillation: edge cases of
 * belt speed, hip travel and marking density, and the explanation texts users read. Expected values
 * are recomputed from frame counts (REFERENCES.md timing example at 240 fps [calc]) or from
 * coordinates chosen here.
 */
import { describe, expect, it } from 'vitest';
import type { FrameLandmarks, GaitEventMark, ScaleBar } from '../../../src/contracts/annotations';
import { computeClipMeasures } from '../../../src/kinematics';
import { buildGaitCycles, makeFrameClock } from '../../../src/kinematics/events';
import { FrameStore } from '../../../src/kinematics/frame-angles';
import { timingMeasures } from '../../../src/kinematics/step-timing';
import { clipInput, ev, IC_POSE, landmarksAt, measureOf, SCALE_1M_400PX, timingExampleEvents } from './helpers';

/** 240 fps: one frame = 1000 ÷ 240 = 4.2 ms. */
const TIMING = 'Times = frame ÷ 240 fps; each event is ±1 frame (4.2 ms at 240 fps).';
const HOW =
  'Overground: forward travel of the hip marker (the same marker on both frames) between the two initial contacts, converted with the scale bar; assumes a fixed camera and running in the calibrated plane.';
const OSC =
  'Highest minus lowest hip-marker height over each stride (initial contact → next initial contact of one side), converted with the scale bar, in cm; needs the hip marked at least every 5 % of the stride so the top and bottom are not missed.';
const STRIDE_MISSING = 'Needs initial contact, toe-off and the next initial contact of one side.';

const run = (over: Parameters<typeof clipInput>[0]) => computeClipMeasures(clipInput(over));

describe('[calc] timing texts and values, REFERENCES.md example at 240 fps (step 84, stride 168, contact 60 frames)', () => {
  it('cadence, step, stride, contact and flight time say what they measure, with the frame rate', () => {
    const r = run({ events: timingExampleEvents(2) });
    const cadence = measureOf(r, 'cadence');
    expect(cadence.derivation).toBe(
      `60 ÷ mean step time (initial contact of one side → the next of the other), steps per minute; the SD is over each step's 60 ÷ step time. ${TIMING}`,
    );
    expect(cadence.values).toEqual(Array.from({ length: 4 }, () => expect.closeTo(60 / (84 / 240), 9)));
    expect(measureOf(r, 'step_time').derivation).toBe(`Initial contact of one side → the next initial contact of the other. ${TIMING}`);
    expect(measureOf(r, 'stride_time').derivation).toBe(
      `Initial contact → the next initial contact of the same side (either side), with one toe-off between. ${TIMING}`,
    );
    expect(measureOf(r, 'contact_time', 'left').derivation).toBe(`Initial contact → toe-off of the left foot. ${TIMING}`);
    expect(measureOf(r, 'flight_time').derivation).toBe(`Toe-off of one side → the next initial contact of the other side. ${TIMING}`);
    expect(measureOf(r, 'flight_time').values).toEqual(Array.from({ length: 4 }, () => expect.closeTo((84 - 60) / 240, 9)));
  });

  it('one side only: step time = stride ÷ 2 and cadence = 120 ÷ stride time, each said so', () => {
    const r = run({ events: timingExampleEvents(2).filter((e) => e.side === 'right') });
    expect(measureOf(r, 'cadence').derivation).toBe(
      `Only one side's contacts form steps, so 120 ÷ mean stride time (two steps per stride), steps per minute; the SD is over each stride's 120 ÷ stride time. ${TIMING}`,
    );
    expect(measureOf(r, 'step_time').derivation).toBe(
      `Only one side's contacts are marked, so each value is stride time ÷ 2, the mean of the two steps in that stride. ${TIMING}`,
    );
    expect(measureOf(r, 'step_time').values).toEqual([expect.closeTo(84 / 240, 9), expect.closeTo(84 / 240, 9)]);
    expect(measureOf(r, 'step_length')).toMatchObject({
      derivation: `Belt speed (3.00 m/s) × step time (stride time ÷ 2: only one side forms steps). ${TIMING}`,
    });
    expect(measureOf(r, 'step_length').mean).toBeCloseTo(3 * (84 / 240), 9);
  });

  it('no steps at all: cadence and step time need contacts of both sides in turn', () => {
    const r = run({ events: [ev(0, 'right', 'initial_contact'), ev(60, 'right', 'toe_off')] });
    expect(measureOf(r, 'cadence')).toMatchObject({
      status: 'not_enough_data',
      missing:
        'Needs initial contacts of both sides in turn (one side, then the other, with only that side’s toe-off between), or whole strides of one side.',
    });
    expect(measureOf(r, 'stride_time').missing).toBe(STRIDE_MISSING);
    expect(measureOf(r, 'flight_time').missing).toBe(
      'Needs a toe-off of one side followed directly by the initial contact of the other side (both sides marked).',
    );
    expect(measureOf(r, 'duty_factor', 'right').missing).toBe(
      'No complete right stride (initial contact, toe-off, next initial contact) marked.',
    );
    expect(measureOf(r, 'contact_time', 'right').values).toEqual([expect.closeTo(60 / 240, 9)]);
  });

  it('duty factor per side = contact ÷ stride × 100: left toe-off 12 frames early → 48/168, right 60/168', () => {
    const events = timingExampleEvents(2).map((e) => (e.side === 'left' && e.kind === 'toe_off' ? { ...e, frame: e.frame - 12 } : e));
    const r = run({ events });
    const left = measureOf(r, 'duty_factor', 'left');
    const right = measureOf(r, 'duty_factor', 'right');
    expect(left.values).toEqual([expect.closeTo((48 / 168) * 100, 9)]);
    expect(right.values).toEqual([expect.closeTo((60 / 168) * 100, 9), expect.closeTo((60 / 168) * 100, 9)]);
    expect(right.derivation).toBe(
      `Contact time ÷ stride time × 100 for each right stride (initial contact → toe-off ÷ initial contact → next initial contact). ${TIMING}`,
    );
  });

  it('no usable frame rate: every timing measure says where times come from and why there are none', () => {
    const r = run({ events: timingExampleEvents(2), fps: 0 });
    for (const m of r.measures.filter((x) => ['cadence', 'step_time', 'contact_time', 'duty_factor', 'stride_length'].includes(x.key))) {
      expect(m).toMatchObject({
        status: 'not_enough_data',
        derivation: "Times come from the frames' timestamps or frame ÷ fps.",
        missing: 'No usable frame rate or timestamps for this clip.',
      });
    }
  });
});

describe('treadmill lengths need a usable belt speed', () => {
  it.each([null, 0, -1, Number.NaN, Number.POSITIVE_INFINITY])('belt speed %s: no lengths, said so', (belt) => {
    const r = run({ events: timingExampleEvents(2), beltSpeedMps: belt });
    const noBelt = 'Treadmill clip without a belt speed: step and stride length need it (length = belt speed × time).';
    expect(measureOf(r, 'step_length')).toMatchObject({
      status: 'not_enough_data',
      derivation: `Belt speed (? m/s) × step time. ${TIMING}`,
      missing: noBelt,
    });
    expect(measureOf(r, 'stride_length')).toMatchObject({
      status: 'not_enough_data',
      derivation: `Belt speed (? m/s) × stride time. ${TIMING}`,
      missing: noBelt,
    });
  });

  it('[calc] 2.5 m/s: step 2.5 × 84/240 = 0.875 m, stride 2.5 × 168/240 = 1.75 m', () => {
    const r = run({ events: timingExampleEvents(2), beltSpeedMps: 2.5 });
    expect(measureOf(r, 'step_length').values).toEqual(Array.from({ length: 4 }, () => expect.closeTo(0.875, 9)));
    expect(measureOf(r, 'stride_length').values).toEqual(Array.from({ length: 3 }, () => expect.closeTo(1.75, 9)));
    expect(measureOf(r, 'step_length').derivation).toBe(`Belt speed (2.50 m/s) × step time. ${TIMING}`);
    expect(measureOf(r, 'stride_length').derivation).toBe(`Belt speed (2.50 m/s) × stride time. ${TIMING}`);
  });

  it('with steps but no strides the step length needs steps marked; the stride length names what it needs', () => {
    const r = run({ events: [ev(0, 'right', 'initial_contact'), ev(60, 'right', 'toe_off'), ev(84, 'left', 'initial_contact')] });
    expect(measureOf(r, 'step_length').values).toEqual([expect.closeTo(3 * (84 / 240), 9)]);
    expect(measureOf(r, 'stride_length').missing).toBe(STRIDE_MISSING);
  });
});

describe('overground lengths from hip travel', () => {
  const over = (events: GaitEventMark[], landmarks: FrameLandmarks[], scale: ScaleBar | null = SCALE_1M_400PX) =>
    run({ events, landmarks, scale, surface: 'track', beltSpeedMps: null });
  /** Both sides' hips on every event frame, the runner `speed` m/s forward (0: standing still). */
  const hips = (events: GaitEventMark[], speed: number) =>
    events.flatMap((e) =>
      (['left', 'right'] as const).map((s) => landmarksAt(e.frame, s, IC_POSE, 'left_to_right', -1 + (speed * e.frame) / 240)),
    );

  it('[calc] 2 m/s: step 2 × 84/240 = 0.700 m, stride 1.400 m, the plain explanation', () => {
    const events = timingExampleEvents(1);
    const r = over(events, hips(events, 2));
    expect(measureOf(r, 'step_length').values).toEqual([expect.closeTo(0.7, 9), expect.closeTo(0.7, 9)]);
    expect(measureOf(r, 'stride_length').values).toEqual([expect.closeTo(1.4, 9)]);
    expect(measureOf(r, 'step_length').derivation).toBe(HOW);
    expect(measureOf(r, 'stride_length').derivation).toBe(HOW);
  });

  it('a hip that does not move (0 m) is left out like one moving backwards, with the frames named', () => {
    const events = timingExampleEvents(1);
    const r = over(events, hips(events, 0));
    expect(measureOf(r, 'stride_length')).toMatchObject({
      status: 'not_enough_data',
      derivation: `${HOW} Left out 3 where the hip moved backwards (frames 0–84, 84–168, 0–168) — check the running direction.`,
      missing: 'Hip not marked on both initial-contact frames of any stride, or no stride marked.',
    });
    expect(measureOf(r, 'step_length').missing).toBe('Hip not marked on both initial-contact frames of any step, or no step marked.');
  });

  it('no scale bar: no lengths and no travel checked; no hips: the plain explanation and what is missing', () => {
    const events = timingExampleEvents(1);
    const noScale = over(events, hips(events, 0), null);
    expect(measureOf(noScale, 'step_length')).toMatchObject({
      status: 'not_enough_data',
      derivation: HOW,
      missing: 'Needs a scale bar (overground lengths come from hip-marker travel in metres).',
    });
    expect(measureOf(noScale, 'stride_length').derivation).toBe(HOW);
    expect(measureOf(noScale, 'stride_length').missing).toBe(
      'Needs a scale bar (overground lengths come from hip-marker travel in metres).',
    );
    const noHips = over(events, []);
    expect(measureOf(noHips, 'step_length')).toMatchObject({
      derivation: HOW,
      missing: 'Hip not marked on both initial-contact frames of any step, or no step marked.',
    });
  });
});

describe('[calc] vertical oscillation', () => {
  /** Hip of `side` every `step` frames over [from, to], height 0.9 + 0.02·cos(2π·f/96) (top on multiples of 96 frames, bottom 48 frames later) m (range 4 cm). */
  const bob = (side: 'left' | 'right', from: number, to: number, step: number) => {
    const out: FrameLandmarks[] = [];
    for (let f = from; f <= to; f += step)
      out.push(landmarksAt(f, side, { hip: { x: 0, y: 0.9 + 0.02 * Math.cos((2 * Math.PI * f) / 96) } }, 'left_to_right'));
    return out;
  };

  it('hip every 8 frames (5 % of a 168-frame stride = 8.4 → 8): 0.92 − 0.88 m = 4.0 cm per right stride, right hip named', () => {
    const r = run({ events: timingExampleEvents(2), landmarks: bob('right', 0, 336, 8), scale: SCALE_1M_400PX });
    const m = measureOf(r, 'vertical_oscillation');
    expect(m).toMatchObject({ status: 'ok', n: 2 });
    expect(m.values).toEqual([expect.closeTo(4, 9), expect.closeTo(4, 9)]);
    expect(m.derivation).toBe(`${OSC} Uses the right hip marker over right strides (the side with more usable strides).`);
  });

  it('the side with more usable strides is used: left when only the left hip is marked; right when both have one', () => {
    const leftOnly = measureOf(
      run({ events: timingExampleEvents(2), landmarks: bob('left', 84, 252, 4), scale: SCALE_1M_400PX }),
      'vertical_oscillation',
    );
    expect(leftOnly).toMatchObject({ status: 'ok', n: 1 });
    expect(leftOnly.mean).toBeCloseTo(4, 9);
    expect(leftOnly.derivation).toBe(`${OSC} Uses the left hip marker over left strides (the side with more usable strides).`);
    // One usable stride each side (right hip through 0–168 only): ties go to the right, with its own range.
    const rightBob = bob('right', 0, 168, 4).map((l) => ({
      ...l,
      points: { hip: { x: l.points!.hip!.x, y: l.points!.hip!.y + (l.frame === 48 ? 0.01 * (400 / 720) : 0) } },
    }));
    const tie = measureOf(
      run({ events: timingExampleEvents(2), landmarks: [...bob('left', 84, 252, 4), ...rightBob], scale: SCALE_1M_400PX }),
      'vertical_oscillation',
    );
    expect(tie.n).toBe(1);
    expect(tie.derivation).toContain('Uses the right hip marker over right strides');
    // Frame 48 (a bottom) lowered by 1 cm (0.01 m × 400 px/m ÷ 720 px of frame height) → range 5 cm.
    expect(tie.mean).toBeCloseTo(5, 6);
  });

  it('too sparse, no strides, no scale bar: not enough data, each with its reason', () => {
    const sparse = measureOf(
      run({ events: timingExampleEvents(2), landmarks: bob('right', 0, 336, 12), scale: SCALE_1M_400PX }),
      'vertical_oscillation',
    );
    expect(sparse).toMatchObject({
      status: 'not_enough_data',
      missing: 'The hip is not marked densely enough through any stride (need at least every 5 % of the stride).',
    });
    const noStride = measureOf(
      run({ events: [ev(0, 'right', 'initial_contact')], landmarks: bob('right', 0, 336, 8), scale: SCALE_1M_400PX }),
      'vertical_oscillation',
    );
    expect(noStride.missing).toBe('No complete stride (initial contact, toe-off, next initial contact) marked.');
    const noScale = measureOf(run({ events: timingExampleEvents(2), landmarks: bob('right', 0, 336, 8) }), 'vertical_oscillation');
    expect(noScale).toMatchObject({
      status: 'not_enough_data',
      derivation: OSC,
      missing: 'Needs a scale bar to turn pixels into centimetres.',
    });
  });
});

describe('timingMeasures itself', () => {
  it('returns measures only, in the order of the measures table (per-side ones left then right)', () => {
    const events = timingExampleEvents(2);
    const frame = { frameSize: { width: 1280, height: 720 }, direction: 'left_to_right' as const };
    const out = timingMeasures({
      input: clipInput({ events }),
      clock: makeFrameClock(240),
      mPerPx: null,
      cycles: buildGaitCycles(events),
      events,
      store: new FrameStore([], frame),
      timingNote: TIMING,
    });
    // The order of the measures table: both-sides figures with side null, per-side ones left then right.
    const expected =
      'cadence null|step_time null|stride_time null|step_length null|stride_length null|contact_time left|contact_time right|flight_time null|duty_factor left|duty_factor right|vertical_oscillation null';
    expect(out.map((m) => `${m.key} ${m.side}`)).toEqual(expected.split('|'));
  });
});
