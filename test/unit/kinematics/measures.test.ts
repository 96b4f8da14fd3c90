/**
 * computeClipMeasures end to end: REFERENCES.md worked examples ([calc]) placed on frames as image
 * fractions with gait events at 240 fps, the "not enough data" paths, and fast-check properties.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { FrameLandmarks, GaitEventMark, LandmarkName } from '../../../src/contracts/annotations';
import type { Direction, Side } from '../../../src/contracts/assessment';
import type { MeasureKey } from '../../../src/contracts/measures';
import { computeClipMeasures, KINEMATICS_VERSION, MEASURE_DEFINITIONS, MEASURE_KEYS } from '../../../src/kinematics';
import { clipInput, ev, IC_POSE, landmarksAt, measureOf, SCALE_1M_400PX, TO_POSE, timingExampleEvents, type MetrePose } from './helpers';

const input = clipInput;
const get = measureOf;

describe('[calc] worked example, REFERENCES.md — timing at 240 fps, treadmill 3.0 m/s, end to end', () => {
  // Independent recomputation from the example's frame counts.
  const stride = 168 / 240;
  const step = 84 / 240;
  const contact = 60 / 240;
  const r = computeClipMeasures(input({ events: timingExampleEvents(4) }));

  it('stride 0.700 s, step 0.350 s, cadence 171.43 steps/min', () => {
    expect(stride).toBeCloseTo(0.7, 12);
    expect(get(r, 'stride_time').mean).toBeCloseTo(0.7, 9);
    expect(get(r, 'step_time').mean).toBeCloseTo(step, 9);
    expect(get(r, 'step_time').mean).toBeCloseTo(0.35, 9);
    expect(get(r, 'cadence').mean).toBeCloseTo(171.43, 2);
    expect(get(r, 'cadence').mean).toBeCloseTo(60 / step, 9);
    expect(get(r, 'cadence')).toMatchObject({ status: 'ok', n: 8, unit: 'steps/min', side: null });
    expect(get(r, 'stride_time').n).toBe(7); // 4 right + 3 left strides
  });
  it('stride length 2.100 m, step length 1.050 m (belt speed × time)', () => {
    expect(get(r, 'stride_length').mean).toBeCloseTo(2.1, 9);
    expect(get(r, 'step_length').mean).toBeCloseTo(1.05, 9);
    expect(get(r, 'step_length').mean).toBeCloseTo(3.0 * step, 9);
  });
  it('contact 0.250 s each side, flight 0.100 s, duty factor 0.3571 (contact ÷ stride time, shown in %)', () => {
    for (const side of ['left', 'right'] as const) {
      expect(get(r, 'contact_time', side)).toMatchObject({ status: 'ok', n: 4, unit: 's' });
      expect(get(r, 'contact_time', side).mean).toBeCloseTo(0.25, 9);
      expect(get(r, 'duty_factor', side).mean! / 100).toBeCloseTo(0.3571, 4);
      expect(get(r, 'duty_factor', side).mean! / 100).toBeCloseTo(contact / stride, 9);
    }
    expect(get(r, 'flight_time').mean).toBeCloseTo(0.1, 9);
    expect(get(r, 'flight_time').mean).toBeCloseTo(step - contact, 9);
  });
  it('symmetric contact gives a 0 % symmetry index; SD is ~0 for identical steps', () => {
    expect(get(r, 'symmetry_contact_time').mean).toBeCloseTo(0, 9);
    expect(get(r, 'symmetry_contact_time').derivation).toContain('|L − R| ÷ mean(L, R) × 100 %');
    expect(get(r, 'step_time').sd).toBeCloseTo(0, 9);
  });
  it('cadence 171.43 sits within the de Ruiter et al. 2019 band [pub]; duty factor 35.7 % above Patoz et al. 2019 (terrestrial) [pub]', () => {
    expect(get(r, 'cadence').band?.position).toBe('within');
    expect(get(r, 'duty_factor', 'right').band?.position).toBe('above');
  });
  it('uses manifest timestamps over fps when given (here 200 fps in the file → stride 0.840 s)', () => {
    const ts = Array.from({ length: 1000 }, (_, i) => i * 5);
    const t = computeClipMeasures(input({ events: timingExampleEvents(2), timestampsMs: ts }));
    expect(get(t, 'stride_time').mean).toBeCloseTo(0.84, 9);
    expect(get(t, 'stride_time').derivation).toContain('timestamps');
    const same = computeClipMeasures(input({ events: timingExampleEvents(2), timestampsMs: ts.map((_, i) => (i * 1000) / 240) }));
    expect(get(same, 'stride_time').mean).toBeCloseTo(0.7, 9);
  });
  it('with one side marked, cadence and step time come from strides (120 ÷ stride time, stride ÷ 2), said so', () => {
    const right = computeClipMeasures(input({ events: timingExampleEvents(3).filter((e) => e.side === 'right') }));
    expect(get(right, 'cadence').mean).toBeCloseTo(171.43, 2);
    expect(get(right, 'cadence').derivation).toMatch(/120 ÷ mean stride time/);
    expect(get(right, 'step_time').mean).toBeCloseTo(0.35, 9);
    expect(get(right, 'flight_time').status).toBe('not_enough_data');
    expect(get(right, 'contact_time', 'left').missing).toBe('No complete left stance (initial contact followed by toe-off) marked.');
  });
});

describe('cadence = 60 ÷ mean step time (steps per minute), uneven steps', () => {
  /**
   * Fixture (not a published source): 30 fps, steps alternating 9 and 13 frames (right IC → left
   * IC 9 frames, left IC → right IC 13 frames; stride 22 frames), contact 5 frames, `strides`
   * right strides ending with a right IC.
   */
  const uneven = (strides: number): GaitEventMark[] => {
    const out: GaitEventMark[] = [];
    for (let k = 0; k < strides; k++) {
      const b = k * 22;
      out.push(
        ev(b, 'right', 'initial_contact'),
        ev(b + 5, 'right', 'toe_off'),
        ev(b + 9, 'left', 'initial_contact'),
        ev(b + 14, 'left', 'toe_off'),
      );
    }
    out.push(ev(strides * 22, 'right', 'initial_contact'));
    return out;
  };
  const at30 = (events: GaitEventMark[]) => computeClipMeasures(input({ events, fps: 30 }));

  it("[calc] the issue's example: 30 fps, steps of 9 and 13 frames → 163.64 steps/min with both sides, one side, or the other", () => {
    // Independent recomputation: mean step (9 + 13) / 2 = 11 frames = 11/30 s; 60 ÷ (11/30) = 163.636…
    const expected = 60 / (11 / 30);
    expect(expected).toBeCloseTo(163.64, 2);
    // The mean of per-step rates would be (60/(9/30) + 60/(13/30)) / 2 = 169.23 — not cadence.
    const meanOfRates = (60 / (9 / 30) + 60 / (13 / 30)) / 2;
    expect(meanOfRates).toBeCloseTo(169.23, 2);
    const both = at30(uneven(3));
    const rightOnly = at30(uneven(3).filter((e) => e.side === 'right'));
    const leftOnly = at30(uneven(3).filter((e) => e.side === 'left'));
    for (const r of [both, rightOnly, leftOnly]) {
      expect(get(r, 'cadence').status).toBe('ok');
      expect(get(r, 'cadence').mean).toBeCloseTo(expected, 9);
    }
    expect(get(both, 'cadence').n).toBe(6);
    expect(get(both, 'step_time').mean).toBeCloseTo(11 / 30, 12);
    // Cadence and mean step time describe the same running: their product is 60 s/min.
    expect(get(both, 'cadence').mean! * get(both, 'step_time').mean!).toBeCloseTo(60, 9);
    expect(get(both, 'cadence').derivation).toContain('60 ÷ mean step time');
  });

  it('[calc] REFERENCES.md timing example recomputed: 240 fps, step 84 frames → 60 ÷ (84/240) = 171.43 steps/min', () => {
    const r = computeClipMeasures(input({ events: timingExampleEvents(4) }));
    expect(get(r, 'cadence').mean).toBeCloseTo(171.43, 2); // the figure REFERENCES.md prints
    expect(get(r, 'cadence').mean).toBeCloseTo(60 / (84 / 240), 9);
  });

  it('an odd number of uneven steps: cadence is 60 ÷ the mean of exactly the steps marked (9, 13, 9 frames → 31/3)', () => {
    // Both sides, three steps: right IC 0 → left IC 9 → right IC 22 → left IC 31.
    const events = [
      ev(0, 'right', 'initial_contact'),
      ev(5, 'right', 'toe_off'),
      ev(9, 'left', 'initial_contact'),
      ev(14, 'left', 'toe_off'),
      ev(22, 'right', 'initial_contact'),
      ev(27, 'right', 'toe_off'),
      ev(31, 'left', 'initial_contact'),
    ];
    const r = at30(events);
    expect(get(r, 'cadence').n).toBe(3);
    expect(get(r, 'cadence').mean).toBeCloseTo(60 / (31 / 3 / 30), 9);
  });

  it('fast-check: for any step lengths, cadence × mean step time = 60, and cadence lies between the slowest and fastest step rates', () => {
    fc.assert(
      // Steps 10–14 frames: within 1.5 × the median, so none is left out as an unmarked cycle.
      fc.property(fc.array(fc.integer({ min: 10, max: 14 }), { minLength: 2, maxLength: 12 }), (steps) => {
        const events: GaitEventMark[] = [];
        let f = 0;
        steps.forEach((len, i) => {
          const side: Side = i % 2 === 0 ? 'right' : 'left';
          events.push(ev(f, side, 'initial_contact'), ev(f + 2, side, 'toe_off'));
          f += len;
        });
        events.push(ev(f, steps.length % 2 === 0 ? 'right' : 'left', 'initial_contact'));
        const r = at30(events);
        const meanStepS = steps.reduce((a, b) => a + b, 0) / steps.length / 30;
        expect(get(r, 'cadence').mean).toBeCloseTo(60 / meanStepS, 6);
        expect(get(r, 'cadence').mean!).toBeLessThanOrEqual(60 / (Math.min(...steps) / 30) + 1e-9);
        expect(get(r, 'cadence').mean!).toBeGreaterThanOrEqual(60 / (Math.max(...steps) / 30) - 1e-9);
      }),
      { numRuns: 60 },
    );
  });
});

/** Timing-example events with the IC pose on every IC frame and the TO pose on every TO frame. */
function workedClip(direction: Direction, strides = 4) {
  const events = timingExampleEvents(strides);
  const landmarks = events
    .filter((e) => e.kind !== 'midstance')
    .map((e) => landmarksAt(e.frame, e.side, (e.kind === 'initial_contact' ? IC_POSE : TO_POSE) as MetrePose, direction));
  return input({ events, landmarks, scale: SCALE_1M_400PX, direction });
}

describe.each(['left_to_right', 'right_to_left'] as const)(
  '[calc] worked example, REFERENCES.md — angles at events end to end, %s',
  (direction) => {
    const r = computeClipMeasures(workedClip(direction));
    it.each(['left', 'right'] as const)(
      '%s: hip extension at toe-off 22.521° (thigh −22.521°), relative to trunk 12.317° (hip rel trunk −12.317°)',
      (side) => {
        expect(get(r, 'hip_extension_toe_off', side)).toMatchObject({ status: 'ok', n: 4, unit: '°', event: 'toe_off' });
        expect(get(r, 'hip_extension_toe_off', side).mean).toBeCloseTo(22.521, 3);
        expect(get(r, 'hip_extension_toe_off_rel_trunk', side).mean).toBeCloseTo(12.317, 3);
        expect(get(r, 'hip_extension_toe_off', side).band?.position).toBe('within'); // ≥ 10° [trade]
      },
    );
    it.each(['left', 'right'] as const)(
      '%s: knee flexion 12.529°, shank 14.036°, foot 14.744° (rearfoot), heel ahead of hip 0.260 m at initial contact',
      (side) => {
        const ic = side === 'right' ? 5 : 4;
        expect(get(r, 'knee_flexion_initial_contact', side)).toMatchObject({ status: 'ok', n: ic, event: 'initial_contact' });
        expect(get(r, 'knee_flexion_initial_contact', side).mean).toBeCloseTo(12.529, 3);
        expect(get(r, 'knee_flexion_initial_contact', side).band?.position).toBe('below'); // under 17.8 − 4.0 [pub Heiderscheit 2011]
        expect(get(r, 'shank_angle_initial_contact', side).mean).toBeCloseTo(14.036, 3);
        const foot = get(r, 'foot_angle_initial_contact', side);
        expect(foot.mean).toBeCloseTo(14.744, 3);
        expect(foot.derivation).toContain(`Contacts: ${ic} rearfoot; the mean classifies as rearfoot.`);
        expect(get(r, 'heel_ahead_of_hip_initial_contact', side).mean).toBeCloseTo(0.26, 6);
        expect(get(r, 'heel_ahead_of_hip_initial_contact', side).unit).toBe('m');
      },
    );
    it('trunk lean over stance = mean of the marked stance frames: (11.310° + 10.204°) ÷ 2', () => {
      expect(get(r, 'trunk_lean', 'right').mean).toBeCloseTo((11.31 + 10.204) / 2, 3);
      expect(get(r, 'trunk_lean', 'right').band?.position).toBe('within'); // 7.3 ± 3.6 [pub Teng & Powers 2014]
    });
    it('peak knee flexion is not given from event frames alone (the peak would be missed)', () => {
      expect(get(r, 'knee_flexion_peak_stance', 'right').status).toBe('not_enough_data');
      expect(get(r, 'knee_flexion_peak_stance', 'right').missing).toMatch(/not marked densely enough/);
    });
    it('hip-extension symmetry 0 %; per-frame angle samples for the chart', () => {
      expect(get(r, 'symmetry_hip_extension_toe_off').mean).toBeCloseTo(0, 9);
      const s = r.angles.find((a) => a.frame === 60 && a.side === 'right')!;
      expect(s.timeMs).toBeCloseTo(250, 9);
      expect(s.thighDeg).toBeCloseTo(-22.521, 3);
      expect(s.footDeg).toBeUndefined(); // the toe-off pose has no heel or toe
      expect(
        r.angles.every((a, i, all) => i === 0 || a.frame > all[i - 1]!.frame || (a.frame === all[i - 1]!.frame && a.side === 'right')),
      ).toBe(true);
    });
  },
);

describe('dense marking: peak knee flexion and vertical oscillation', () => {
  /** Knee flexion φ(f) = 20° + 25°·sin(π·(f − IC)/60) through each right stance (thigh vertical), hip bobbing 3 cm. */
  function denseClip(step = 1) {
    const events = timingExampleEvents(3);
    const landmarks: FrameLandmarks[] = [];
    for (let f = 0; f <= 3 * 168; f += step) {
      const phase = f % 168;
      const phi = phase <= 60 ? 20 + 25 * Math.sin((Math.PI * phase) / 60) : 20;
      const r = (phi * Math.PI) / 180;
      const hipY = 0.9 + 0.03 * Math.cos((2 * Math.PI * f) / 84);
      const knee = { x: 0, y: hipY - 0.45 };
      landmarks.push(
        landmarksAt(
          f,
          'right',
          { hip: { x: 0, y: hipY }, knee, ankle: { x: -0.43 * Math.sin(r), y: knee.y - 0.43 * Math.cos(r) } },
          'left_to_right',
        ),
      );
    }
    return input({ events, landmarks, scale: SCALE_1M_400PX });
  }
  it('[calc] peak of 20° + 25°·sin over stance = 45°; hip 0.93 − 0.87 m = 6.0 cm per stride at 2.5 mm/px', () => {
    const r = computeClipMeasures(denseClip());
    expect(get(r, 'knee_flexion_peak_stance', 'right')).toMatchObject({ status: 'ok', n: 3 });
    expect(get(r, 'knee_flexion_peak_stance', 'right').mean).toBeCloseTo(45, 6);
    expect(get(r, 'knee_flexion_peak_stance', 'right').band?.position).toBe('within'); // 46.3 ± 4.5 [pub]
    expect(get(r, 'vertical_oscillation')).toMatchObject({ status: 'ok', n: 3, unit: 'cm' });
    expect(get(r, 'vertical_oscillation').mean).toBeCloseTo(6, 6);
    expect(get(r, 'vertical_oscillation').derivation).toContain('right hip marker');
  });
  it('every 10th frame is too sparse (limits 10 % of stance = 6 frames, 5 % of stride = 8 frames): not enough data', () => {
    const r = computeClipMeasures(denseClip(10));
    expect(get(r, 'knee_flexion_peak_stance', 'right').status).toBe('not_enough_data');
    expect(get(r, 'vertical_oscillation').status).toBe('not_enough_data');
    expect(get(r, 'vertical_oscillation').missing).toMatch(/not marked densely enough/);
  });
});

describe('lengths overground and symmetry', () => {
  it('[calc] overground at 3.0 m/s: hip travel gives step 1.050 m and stride 2.100 m with the scale bar', () => {
    const events = timingExampleEvents(1);
    const landmarks = events.map((e) => landmarksAt(e.frame, e.side, IC_POSE, 'right_to_left', -1.5 + (3 * e.frame) / 240));
    const r = computeClipMeasures(
      input({ events, landmarks, scale: SCALE_1M_400PX, surface: 'track', beltSpeedMps: null, direction: 'right_to_left' }),
    );
    expect(get(r, 'step_length').mean).toBeCloseTo(1.05, 6);
    expect(get(r, 'stride_length').mean).toBeCloseTo(2.1, 6);
    expect(get(r, 'step_length').derivation).toMatch(/stride length ÷ 2/); // each event frame holds only its own side's hip
    // With both sides marked on every event frame, each step has one marker on both frames.
    const both = events.flatMap((e) =>
      (['left', 'right'] as const).map((s) => landmarksAt(e.frame, s, IC_POSE, 'right_to_left', -1.5 + (3 * e.frame) / 240)),
    );
    const b = computeClipMeasures(
      input({ events, landmarks: both, scale: SCALE_1M_400PX, surface: 'track', beltSpeedMps: null, direction: 'right_to_left' }),
    );
    expect(get(b, 'step_length')).toMatchObject({ status: 'ok', n: 2 });
    expect(get(b, 'step_length').mean).toBeCloseTo(1.05, 6);
    expect(get(b, 'step_length').derivation).not.toMatch(/÷ 2/);
    // The same clip read with the wrong direction: the hip moves backwards → left out, said so.
    const wrong = computeClipMeasures(
      input({ events, landmarks, scale: SCALE_1M_400PX, surface: 'track', beltSpeedMps: null, direction: 'left_to_right' }),
    );
    expect(get(wrong, 'stride_length').status).toBe('not_enough_data');
    expect(get(wrong, 'step_length').derivation).toMatch(/hip moved backwards/);
  });
  it('lengths need belt speed on a treadmill and a scale bar overground', () => {
    const t = computeClipMeasures(input({ events: timingExampleEvents(2), beltSpeedMps: null }));
    expect(get(t, 'stride_length').missing).toMatch(/without a belt speed/);
    expect(t.hasScale).toBe(false);
    const o = computeClipMeasures(input({ events: timingExampleEvents(2), surface: 'road', beltSpeedMps: null }));
    expect(get(o, 'step_length').missing).toMatch(/Needs a scale bar/);
    expect(get(o, 'heel_ahead_of_hip_initial_contact', 'left').missing).toBe('Needs a scale bar to turn pixels into metres.');
  });
  it('[calc] contact 0.250 vs 0.200 s: symmetry index |0.05| ÷ 0.225 × 100 = 22.22 %', () => {
    const events = timingExampleEvents(2).map((e) => (e.side === 'left' && e.kind === 'toe_off' ? { ...e, frame: e.frame - 12 } : e));
    const r = computeClipMeasures(input({ events }));
    expect(get(r, 'contact_time', 'left').mean).toBeCloseTo(0.2, 9);
    expect(get(r, 'symmetry_contact_time').mean).toBeCloseTo((0.05 / 0.225) * 100, 6);
    expect(get(r, 'symmetry_contact_time').mean).toBeCloseTo(22.22, 2);
  });
  it('hip-extension symmetry is undefined when a side does not reach extension (mean ≤ 0), said so', () => {
    const c = workedClip('left_to_right', 2);
    // Left toe-off: thigh at +5° flexion (no extension).
    c.annotations.landmarks = c.annotations.landmarks.map((l) =>
      l.side === 'left' && [144, 312].includes(l.frame)
        ? landmarksAt(l.frame, 'left', { ...TO_POSE, knee: { x: 0.0359, y: 0.51 } }, 'left_to_right')
        : l,
    );
    const r = computeClipMeasures(c);
    expect(get(r, 'hip_extension_toe_off', 'left').mean).toBeLessThan(0);
    expect(get(r, 'symmetry_hip_extension_toe_off').status).toBe('not_enough_data');
    expect(get(r, 'symmetry_hip_extension_toe_off').missing).toMatch(
      /undefined when a side's mean hip extension at toe-off is zero or negative/,
    );
  });
});

describe('shape, notes and missing data', () => {
  it('every MeasureKey appears (per-side ones left then right) with the version and clip id', () => {
    const r = computeClipMeasures(input());
    expect(r.kinematicsVersion).toBe(KINEMATICS_VERSION);
    expect(r.clipId).toBe(7);
    const expected = MEASURE_KEYS.flatMap((k) => (MEASURE_DEFINITIONS[k].perSide ? [`${k}:left`, `${k}:right`] : [`${k}:null`]));
    expect(r.measures.map((m) => `${m.key}:${m.side}`)).toEqual(expected);
    expect(r.measures.every((m) => m.status === 'not_enough_data' && m.mean === null && m.n === 0 && !!m.missing)).toBe(true);
    expect(get(r, 'hip_extension_toe_off', 'left').missing).toBe('No left toe-off marked.');
  });
  it('notes fewer than 7 steps (Dingenen et al. 2018 [pub]) and not when every mean has ≥ 7', () => {
    const few = computeClipMeasures(input({ events: timingExampleEvents(2) }));
    expect(few.notes.join('\n')).toMatch(/Fewer than 7 steps behind: .*Contact time \(left\) n = 2/);
    const many = computeClipMeasures(input({ events: timingExampleEvents(8) }));
    expect(many.notes.some((n) => n.startsWith('Fewer than 7'))).toBe(false);
  });
  it('event problems become notes, and figures still come from the clean parts', () => {
    const events = [...timingExampleEvents(2), ev(20, 'right', 'initial_contact')];
    const r = computeClipMeasures(input({ events }));
    expect(r.notes).toContain('Event marks: Right side: two initial contacts (frames 0 and 20) without a toe-off between.');
    expect(get(r, 'contact_time', 'right').values.every((v) => Math.abs(v - 0.25) < 1e-9 || Math.abs(v - 40 / 240) < 1e-9)).toBe(true);
  });
  it('no usable fps and no timestamps: times are not_enough_data, angles still computed', () => {
    const c = workedClip('left_to_right', 2);
    const r = computeClipMeasures({ ...c, fps: 0 });
    expect(get(r, 'cadence').missing).toBe('No usable frame rate or timestamps for this clip.');
    expect(get(r, 'hip_extension_toe_off', 'right').mean).toBeCloseTo(22.521, 3);
  });
});

// ─── Properties ──────────────────────────────────────────────────────────────────────────────

const NAMES: LandmarkName[] = ['shoulder', 'hip', 'knee', 'ankle', 'heel', 'toe'];
const maybeCoord = fc.oneof(
  { weight: 8, arbitrary: fc.double({ min: -0.2, max: 1.2, noNaN: true }) },
  { weight: 1, arbitrary: fc.constantFrom(Number.NaN, Number.POSITIVE_INFINITY) },
);
const landmarkRow = fc.record({
  frame: fc.integer({ min: 0, max: 120 }),
  side: fc.constantFrom<Side>('left', 'right'),
  points: fc.dictionary(fc.constantFrom(...NAMES), fc.record({ x: maybeCoord, y: maybeCoord })),
});
const eventArb = fc.record({
  frame: fc.integer({ min: -5, max: 130 }),
  side: fc.constantFrom<Side>('left', 'right'),
  kind: fc.constantFrom('initial_contact', 'midstance', 'toe_off' as const),
});
const scaleArb = fc.option(
  fc.record({
    frame: fc.constant(0),
    a: fc.record({ x: maybeCoord, y: maybeCoord }),
    b: fc.record({ x: maybeCoord, y: maybeCoord }),
    lengthM: fc.double({ min: 0, max: 5 }),
  }),
);

describe('fast-check properties of computeClipMeasures', () => {
  it('any marks (missing landmarks, junk events, NaN points, no scale): every figure is finite or not_enough_data with a reason — never NaN', () => {
    fc.assert(
      fc.property(
        fc.array(landmarkRow, { maxLength: 40 }),
        fc.array(eventArb, { maxLength: 30 }),
        scaleArb,
        fc.constantFrom<Direction>('left_to_right', 'right_to_left'),
        fc.constantFrom('treadmill', 'track' as const),
        fc.option(fc.double({ min: 0, max: 8, noNaN: true })),
        fc.constantFrom(240, 30, 0),
        (landmarks, events, scale, direction, surface, belt, fps) => {
          const r = computeClipMeasures(
            input({ landmarks: landmarks as FrameLandmarks[], events, scale, direction, surface, beltSpeedMps: belt, fps }),
          );
          expect(r.measures.length).toBe(MEASURE_KEYS.reduce((n, k) => n + (MEASURE_DEFINITIONS[k].perSide ? 2 : 1), 0));
          for (const m of r.measures) {
            if (m.status === 'ok') {
              expect(Number.isFinite(m.mean)).toBe(true);
              expect(m.sd === null || Number.isFinite(m.sd)).toBe(true);
              expect(m.values.length).toBeGreaterThan(0);
              expect(m.values.every(Number.isFinite)).toBe(true);
              expect(m.n).toBeGreaterThan(0);
            } else {
              expect(m.mean).toBeNull();
              expect(m.values).toEqual([]);
              expect(m.missing && m.missing.length > 5).toBe(true);
            }
          }
          for (const a of r.angles) for (const v of Object.values(a)) if (typeof v === 'number') expect(Number.isFinite(v)).toBe(true);
          expect(JSON.stringify(r)).not.toMatch(/NaN|Infinity/);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('removing one landmark everywhere turns exactly the measures that need it into not_enough_data', () => {
    const needs: Record<LandmarkName, MeasureKey[]> = {
      shoulder: ['hip_extension_toe_off_rel_trunk', 'trunk_lean'],
      hip: [
        'hip_extension_toe_off',
        'hip_extension_toe_off_rel_trunk',
        'knee_flexion_initial_contact',
        'trunk_lean',
        'heel_ahead_of_hip_initial_contact',
      ],
      knee: ['hip_extension_toe_off', 'hip_extension_toe_off_rel_trunk', 'knee_flexion_initial_contact', 'shank_angle_initial_contact'],
      ankle: ['knee_flexion_initial_contact', 'shank_angle_initial_contact'],
      heel: ['foot_angle_initial_contact', 'heel_ahead_of_hip_initial_contact'],
      toe: ['foot_angle_initial_contact'],
    };
    fc.assert(
      fc.property(fc.constantFrom(...NAMES), (drop) => {
        const c = workedClip('left_to_right', 2);
        c.annotations.landmarks = c.annotations.landmarks.map((l) => {
          const points = { ...l.points };
          delete points[drop];
          return { ...l, points };
        });
        const r = computeClipMeasures(c);
        for (const key of needs[drop]) expect(get(r, key, 'right').status).toBe('not_enough_data');
        const unaffected = [
          'hip_extension_toe_off',
          'knee_flexion_initial_contact',
          'shank_angle_initial_contact',
          'foot_angle_initial_contact',
        ] as MeasureKey[];
        for (const key of unaffected.filter((k) => !needs[drop].includes(k))) expect(get(r, key, 'right').status).toBe('ok');
      }),
    );
  });

  it('scaling the runner in the image (scale bar fixed) leaves angles unchanged and scales metre lengths by the same factor', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.3, max: 1.6, noNaN: true }), (k) => {
        const base = workedClip('left_to_right', 2);
        const scaled = workedClip('left_to_right', 2);
        const cx = 0.5;
        const cy = 0.5;
        scaled.annotations.landmarks = scaled.annotations.landmarks.map((l) => ({
          ...l,
          points: Object.fromEntries(Object.entries(l.points).map(([n, p]) => [n, { x: cx + (p.x - cx) * k, y: cy + (p.y - cy) * k }])),
        }));
        const a = computeClipMeasures(base);
        const b = computeClipMeasures(scaled);
        for (const key of [
          'hip_extension_toe_off',
          'hip_extension_toe_off_rel_trunk',
          'knee_flexion_initial_contact',
          'foot_angle_initial_contact',
          'trunk_lean',
        ] as const)
          expect(get(b, key, 'right').mean).toBeCloseTo(get(a, key, 'right').mean!, 9);
        expect(get(b, 'heel_ahead_of_hip_initial_contact', 'right').mean).toBeCloseTo(
          k * get(a, 'heel_ahead_of_hip_initial_contact', 'right').mean!,
          9,
        );
      }),
    );
  });

  it('a right-to-left clip (mirror image, same events) gives the same measures as the left-to-right one', () => {
    fc.assert(
      fc.property(fc.double({ min: -0.3, max: 0.3, noNaN: true }), fc.double({ min: -0.2, max: 0.2, noNaN: true }), (kneeDx, toeDy) => {
        const pose = (base: MetrePose): MetrePose => ({
          ...base,
          knee: { x: base.knee!.x + kneeDx, y: base.knee!.y },
          ...(base.toe ? { toe: { x: base.toe.x, y: base.toe.y + toeDy } } : {}),
        });
        const build = (d: Direction) => {
          const c = workedClip(d, 2);
          c.annotations.landmarks = c.annotations.events
            .filter((e) => e.kind !== 'midstance')
            .map((e) => landmarksAt(e.frame, e.side, pose((e.kind === 'initial_contact' ? IC_POSE : TO_POSE) as MetrePose), d));
          return computeClipMeasures(c);
        };
        const l = build('left_to_right');
        const r = build('right_to_left');
        for (let i = 0; i < l.measures.length; i++) {
          expect(r.measures[i]!.status).toBe(l.measures[i]!.status);
          if (l.measures[i]!.mean !== null) expect(r.measures[i]!.mean).toBeCloseTo(l.measures[i]!.mean!, 9);
        }
      }),
      { numRuns: 50 },
    );
  });
});
