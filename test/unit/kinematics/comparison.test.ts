/**
 * Re-test comparison: the measurement-error table against REFERENCES.md ("Measurement error")
 * and compareMeasures' pairing, step-weighted means, verdicts at one precision, the 7-step rule
 * (Dingenen et al. 2018 [pub]) and the direction of a change.
 */
import { describe, expect, it } from 'vitest';
import type { ClipMeasures, Measure, MeasureKey } from '../../../src/contracts/measures';
import type { Side } from '../../../src/contracts/assessment';
import {
  BETTER_DIRECTIONS,
  compareMeasures,
  formatValue,
  MEASUREMENT_ERROR,
  thresholdText,
  VERDICT_LABELS,
  verdictText,
  visitMeans,
} from '../../../src/kinematics';

const measure = (key: MeasureKey, side: Side | null, mean: number | null, unit = '°', n = 8): Measure => ({
  key,
  label: key,
  unit,
  side,
  event: null,
  status: mean === null ? 'not_enough_data' : 'ok',
  mean,
  sd: mean === null ? null : 1,
  n: mean === null ? 0 : n,
  values: [],
  derivation: '',
});

const clip = (clipId: number, measures: Measure[]): ClipMeasures => ({
  kinematicsVersion: 'test',
  clipId,
  hasScale: false,
  measures,
  angles: [],
  notes: [],
});

const row = (rows: ReturnType<typeof compareMeasures>, key: MeasureKey, side: Side | null) => {
  const r = rows.find((x) => x.key === key && x.side === side);
  if (!r) throw new Error(`no row ${key} ${side}`);
  return r;
};

describe('MEASUREMENT_ERROR — thresholds as in REFERENCES.md', () => {
  it('[pub] Dingenen et al. 2018 SDD: foot inclination upper 2.3°, tibia inclination upper 4.8°', () => {
    expect(MEASUREMENT_ERROR.foot_angle_initial_contact).toMatchObject({ value: 2.3, unit: '°', evidence: 'pub' });
    expect(MEASUREMENT_ERROR.foot_angle_initial_contact!.source).toContain('Dingenen et al. 2018');
    expect(MEASUREMENT_ERROR.shank_angle_initial_contact).toMatchObject({ value: 4.8, evidence: 'pub' });
    expect(MEASUREMENT_ERROR.shank_angle_initial_contact!.source).toContain('tibia inclination');
  });

  it('[pub] Dingenen et al. 2018 SDD: knee flexion at midstance upper 3.8°, the nearest published figure for peak knee flexion', () => {
    expect(MEASUREMENT_ERROR.knee_flexion_peak_stance).toMatchObject({ value: 3.8, evidence: 'pub' });
    expect(MEASUREMENT_ERROR.knee_flexion_peak_stance!.derivation).toContain('nearest published figure');
  });

  it('[calc] from [pub] Damsted et al. 2015: knee at foot strike, half the upper 95 % prediction-interval width, 14 / 2 = 7.0° (derived like the hip)', () => {
    expect(MEASUREMENT_ERROR.knee_flexion_initial_contact).toMatchObject({ value: 14 / 2, unit: '°', evidence: 'calc' });
    expect(MEASUREMENT_ERROR.knee_flexion_initial_contact!.source).toContain('Damsted et al. 2015');
    expect(MEASUREMENT_ERROR.knee_flexion_initial_contact!.source).toContain('knee at foot strike, widths 9–14°');
    expect(MEASUREMENT_ERROR.knee_flexion_initial_contact!.derivation).toContain('±W/2');
  });

  it('[calc] from [pub] Damsted et al. 2015: half the upper hip 95 % prediction-interval width, 11 / 2 = 5.5° (our interpretation: a difference inside ±W/2 is expected 95 % of the time)', () => {
    for (const key of ['hip_extension_toe_off', 'hip_extension_toe_off_rel_trunk'] as const) {
      expect(MEASUREMENT_ERROR[key]).toMatchObject({ value: 11 / 2, evidence: 'calc' });
      expect(MEASUREMENT_ERROR[key]!.source).toContain('Damsted et al. 2015');
      expect(MEASUREMENT_ERROR[key]!.derivation).toContain('±W/2');
    }
  });

  it('has no threshold for measures without a published figure', () => {
    expect(MEASUREMENT_ERROR.cadence).toBeUndefined();
    expect(MEASUREMENT_ERROR.trunk_lean).toBeUndefined();
  });
});

describe('compareMeasures', () => {
  it('[calc] hip extension at toe-off 4° → 11° is beyond measurement error (7 > 5.5)', () => {
    const rows = compareMeasures(
      [clip(1, [measure('hip_extension_toe_off', 'right', 4)])],
      [clip(2, [measure('hip_extension_toe_off', 'right', 11)])],
    );
    expect(row(rows, 'hip_extension_toe_off', 'right')).toMatchObject({
      baseline: 4,
      retest: 11,
      change: 7,
      unit: '°',
      verdict: 'beyond_measurement_error',
    });
    expect(VERDICT_LABELS.beyond_measurement_error).toBe('Beyond measurement error');
  });

  it('[calc]/[pub] knee flexion at IC 2° → 4° is within (2 < 7.0); peak knee 45° → 40° beyond (5 > 3.8), a decrease judged by its size', () => {
    const rows = compareMeasures(
      [clip(1, [measure('knee_flexion_initial_contact', 'left', 2), measure('knee_flexion_peak_stance', 'left', 45)])],
      [clip(2, [measure('knee_flexion_initial_contact', 'left', 4), measure('knee_flexion_peak_stance', 'left', 40)])],
    );
    expect(row(rows, 'knee_flexion_initial_contact', 'left')).toMatchObject({ change: 2, verdict: 'within_measurement_error' });
    expect(row(rows, 'knee_flexion_peak_stance', 'left')).toMatchObject({ change: -5, verdict: 'beyond_measurement_error' });
  });

  it('pairs by key and side, averaging clip means of the same side', () => {
    const base = [
      clip(1, [measure('hip_extension_toe_off', 'right', 4), measure('hip_extension_toe_off', 'left', 3)]),
      clip(2, [measure('hip_extension_toe_off', 'right', 6)]),
    ];
    const re = [clip(3, [measure('hip_extension_toe_off', 'right', 8), measure('hip_extension_toe_off', 'left', 6)])];
    const rows = compareMeasures(base, re);
    expect(row(rows, 'hip_extension_toe_off', 'right')).toMatchObject({
      baseline: 5,
      retest: 8,
      change: 3,
      verdict: 'within_measurement_error',
    });
    expect(row(rows, 'hip_extension_toe_off', 'left')).toMatchObject({ baseline: 3, retest: 6, change: 3 });
  });

  it('says "no threshold" without a published figure and "not measured" when either visit lacks the mean', () => {
    const rows = compareMeasures(
      [clip(1, [measure('cadence', null, 168, 'steps/min'), measure('foot_angle_initial_contact', 'right', null)])],
      [
        clip(2, [
          measure('cadence', null, 176, 'steps/min'),
          measure('foot_angle_initial_contact', 'right', 10),
          measure('trunk_lean', 'right', 7),
        ]),
      ],
    );
    expect(row(rows, 'cadence', null)).toMatchObject({ change: 8, unit: 'steps/min', threshold: null, verdict: 'no_threshold' });
    expect(row(rows, 'foot_angle_initial_contact', 'right')).toMatchObject({
      baseline: null,
      retest: 10,
      change: null,
      verdict: 'not_measured',
    });
    expect(row(rows, 'trunk_lean', 'right')).toMatchObject({ baseline: null, retest: 7, verdict: 'not_measured' });
  });
});

describe('one precision: the verdict judges the change as shown', () => {
  const knee = (base: number, re: number) =>
    row(
      compareMeasures(
        [clip(1, [measure('knee_flexion_peak_stance', 'left', base)])],
        [clip(2, [measure('knee_flexion_peak_stance', 'left', re)])],
      ),
      'knee_flexion_peak_stance',
      'left',
    );

  it("[pub] a change shown as +3.8° against Dingenen et al. 2018's ±3.8° is within, even when the raw change is 3.84°", () => {
    const r = knee(40, 43.84);
    expect(formatValue(r.change, r.unit, { signed: true })).toBe('+3.8°');
    expect(thresholdText(r.threshold!)).toBe('±3.8°');
    expect(r.verdict).toBe('within_measurement_error');
  });

  it('[pub] a change shown as +3.9° is beyond: 40.0° → 43.85° (shown 43.9°, half away from zero)', () => {
    const r = knee(40, 43.85);
    expect(r.change).toBe(3.9);
    expect(formatValue(r.change, r.unit, { signed: true })).toBe('+3.9°');
    expect(r.verdict).toBe('beyond_measurement_error');
  });

  it('the change is the difference of the means as shown, so the columns subtract: 10.04° → 13.86° reads 10.0 → 13.9, +3.9', () => {
    const r = knee(10.04, 13.86);
    expect([formatValue(r.baseline, '°'), formatValue(r.retest, '°'), formatValue(r.change, '°', { signed: true })]).toEqual([
      '10.0°',
      '13.9°',
      '+3.9°',
    ]);
    expect(r.verdict).toBe('beyond_measurement_error');
  });

  it('counts a change exactly at the threshold as within', () => {
    const rows = compareMeasures(
      [clip(1, [measure('foot_angle_initial_contact', 'right', 10)])],
      [clip(2, [measure('foot_angle_initial_contact', 'right', 12.3)])],
    );
    // 12.3 − 10 is 2.3000000000000007 in floating point: shown and judged as 2.3, within the 2.3° SDD.
    expect(row(rows, 'foot_angle_initial_contact', 'right')).toMatchObject({ change: 2.3, verdict: 'within_measurement_error' });
  });
});

describe('[pub] Dingenen et al. 2018: thresholds are for means of at least 7 steps', () => {
  it('says "too few steps to judge" below 7 steps in either visit, with the counts', () => {
    const rows = compareMeasures(
      [clip(1, [measure('hip_extension_toe_off', 'right', 4, '°', 8)])],
      [clip(2, [measure('hip_extension_toe_off', 'right', 11, '°', 6)])],
    );
    const r = row(rows, 'hip_extension_toe_off', 'right');
    expect(r).toMatchObject({ change: 7, baselineSteps: 8, retestSteps: 6, verdict: 'too_few_steps' });
    expect(VERDICT_LABELS.too_few_steps).toBe('Too few steps to judge');
    expect(verdictText(r)).toBe('Too few steps to judge (8 and 6 steps; 7 needed in each visit)');
  });

  it('adds the steps of several clips: 3 + 4 = 7 steps is judged', () => {
    const rows = compareMeasures(
      [clip(1, [measure('hip_extension_toe_off', 'right', 4, '°', 3)]), clip(2, [measure('hip_extension_toe_off', 'right', 4, '°', 4)])],
      [clip(3, [measure('hip_extension_toe_off', 'right', 11, '°', 7)])],
    );
    expect(row(rows, 'hip_extension_toe_off', 'right')).toMatchObject({ baselineSteps: 7, verdict: 'beyond_measurement_error' });
  });

  it('a measure without a threshold stays "no published threshold" whatever its steps', () => {
    const rows = compareMeasures(
      [clip(1, [measure('trunk_lean', 'right', 7, '°', 2)])],
      [clip(2, [measure('trunk_lean', 'right', 9, '°', 2)])],
    );
    expect(row(rows, 'trunk_lean', 'right').verdict).toBe('no_threshold');
  });
});

describe('visit means weighted by the steps of each clip', () => {
  it('[calc] clips of 2 steps at 4° and 8 steps at 9° → (2·4 + 8·9) / 10 = 8.0°, not the plain mean 6.5°', () => {
    const visit = [
      clip(1, [measure('hip_extension_toe_off', 'right', 4, '°', 2)]),
      clip(2, [measure('hip_extension_toe_off', 'right', 9, '°', 8)]),
    ];
    expect(visitMeans(visit).find((v) => v.key === 'hip_extension_toe_off')!.mean).toBeCloseTo((2 * 4 + 8 * 9) / 10, 12);
    const rows = compareMeasures(visit, visit);
    expect(row(rows, 'hip_extension_toe_off', 'right')).toMatchObject({ baselineSteps: 10, retestSteps: 10 });
  });

  it('[calc] cadence pools the time of all steps: 10 steps of 0.35 s and 30 steps of 0.40 s → 60 ÷ 0.3875 s = 154.84 steps/min', () => {
    const pooled = 60 / ((10 * 0.35 + 30 * 0.4) / 40);
    expect(pooled).toBeCloseTo(154.84, 2);
    const visit = [
      clip(1, [measure('cadence', null, 60 / 0.35, 'steps/min', 10)]),
      clip(2, [measure('cadence', null, 60 / 0.4, 'steps/min', 30)]),
    ];
    expect(visitMeans(visit)[0]!.mean).toBeCloseTo(pooled, 9);
  });
});

describe('the direction of a change', () => {
  const pair = (key: MeasureKey, base: number, re: number, unit = '°') =>
    row(compareMeasures([clip(1, [measure(key, 'right', base, unit)])], [clip(2, [measure(key, 'right', re, unit)])]), key, 'right');

  it('[trade] hip extension at toe-off: more, toward the textbook ~10°, is better; less is worse; above 10° both ways is only larger / smaller', () => {
    expect(BETTER_DIRECTIONS.hip_extension_toe_off).toMatchObject({ low: 10, high: null, evidence: 'trade' });
    const up = pair('hip_extension_toe_off', 4, 11);
    expect(up).toMatchObject({ direction: 'better', verdict: 'beyond_measurement_error' });
    expect(verdictText(up)).toBe('Beyond measurement error · better');
    expect(pair('hip_extension_toe_off', 11, 4).direction).toBe('worse');
    expect(pair('hip_extension_toe_off', 12, 20).direction).toBe('larger');
    expect(pair('hip_extension_toe_off', 20, 12).direction).toBe('smaller');
  });

  it('[pub] Lieberman et al. 2015: a more vertical shank at initial contact is better', () => {
    expect(BETTER_DIRECTIONS.shank_angle_initial_contact!.source).toContain('Lieberman et al. 2015');
    expect(pair('shank_angle_initial_contact', 9, 2).direction).toBe('better');
    expect(pair('shank_angle_initial_contact', 2, 9).direction).toBe('worse');
  });

  it('no better direction for knee flexion (published figures point both ways): larger / smaller; equal shown values are unchanged', () => {
    expect(BETTER_DIRECTIONS.knee_flexion_peak_stance).toBeUndefined();
    const r = pair('knee_flexion_peak_stance', 45, 40);
    expect(r).toMatchObject({ direction: 'smaller', verdict: 'beyond_measurement_error' });
    expect(verdictText(r)).toBe('Beyond measurement error · smaller');
    expect(pair('knee_flexion_peak_stance', 45.01, 44.99).direction).toBe('unchanged');
  });

  it('within measurement error says no direction in words', () => {
    expect(verdictText(pair('knee_flexion_peak_stance', 45, 43))).toBe('Within measurement error');
  });
});
