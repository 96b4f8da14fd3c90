/**
 * Re-test comparison: the measurement-error table against REFERENCES.md ("Measurement error")
 * and compareMeasures' pairing, means and verdicts.
 */
import { describe, expect, it } from 'vitest';
import type { ClipMeasures, Measure, MeasureKey } from '../../../src/contracts/measures';
import type { Side } from '../../../src/contracts/assessment';
import { compareMeasures, MEASUREMENT_ERROR, VERDICT_LABELS } from '../../../src/kinematics';

const measure = (key: MeasureKey, side: Side | null, mean: number | null, unit = '°'): Measure => ({
  key,
  label: key,
  unit,
  side,
  event: null,
  status: mean === null ? 'not_enough_data' : 'ok',
  mean,
  sd: mean === null ? null : 1,
  n: mean === null ? 0 : 8,
  values: [],
  derivation: '',
});

const clip = (clipId: number, measures: Measure[]): ClipMeasures => ({ kinematicsVersion: 'test', clipId, hasScale: false, measures, angles: [], notes: [] });

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

  it('[pub] Dingenen et al. 2018 SDD: knee flexion at midstance upper 3.8°, the nearest published figure for knee at IC and peak', () => {
    for (const key of ['knee_flexion_initial_contact', 'knee_flexion_peak_stance'] as const) {
      expect(MEASUREMENT_ERROR[key]).toMatchObject({ value: 3.8, evidence: 'pub' });
      expect(MEASUREMENT_ERROR[key]!.derivation).toContain('nearest published figure');
    }
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
    const rows = compareMeasures([clip(1, [measure('hip_extension_toe_off', 'right', 4)])], [clip(2, [measure('hip_extension_toe_off', 'right', 11)])]);
    expect(row(rows, 'hip_extension_toe_off', 'right')).toMatchObject({ baseline: 4, retest: 11, change: 7, unit: '°', verdict: 'beyond_measurement_error' });
    expect(VERDICT_LABELS.beyond_measurement_error).toBe('Beyond measurement error');
  });

  it('[pub] knee flexion at IC 2° → 4° is within measurement error (2 < 3.8); a decrease is judged by its size', () => {
    const rows = compareMeasures(
      [clip(1, [measure('knee_flexion_initial_contact', 'left', 2), measure('knee_flexion_peak_stance', 'left', 45)])],
      [clip(2, [measure('knee_flexion_initial_contact', 'left', 4), measure('knee_flexion_peak_stance', 'left', 40)])],
    );
    expect(row(rows, 'knee_flexion_initial_contact', 'left')).toMatchObject({ change: 2, verdict: 'within_measurement_error' });
    expect(row(rows, 'knee_flexion_peak_stance', 'left')).toMatchObject({ change: -5, verdict: 'beyond_measurement_error' });
  });

  it('pairs by key and side, averaging clip means of the same side', () => {
    const base = [clip(1, [measure('hip_extension_toe_off', 'right', 4), measure('hip_extension_toe_off', 'left', 3)]), clip(2, [measure('hip_extension_toe_off', 'right', 6)])];
    const re = [clip(3, [measure('hip_extension_toe_off', 'right', 8), measure('hip_extension_toe_off', 'left', 6)])];
    const rows = compareMeasures(base, re);
    expect(row(rows, 'hip_extension_toe_off', 'right')).toMatchObject({ baseline: 5, retest: 8, change: 3, verdict: 'within_measurement_error' });
    expect(row(rows, 'hip_extension_toe_off', 'left')).toMatchObject({ baseline: 3, retest: 6, change: 3 });
  });

  it('says "no threshold" without a published figure and "not measured" when either visit lacks the mean', () => {
    const rows = compareMeasures(
      [clip(1, [measure('cadence', null, 168, 'steps/min'), measure('foot_angle_initial_contact', 'right', null)])],
      [clip(2, [measure('cadence', null, 176, 'steps/min'), measure('foot_angle_initial_contact', 'right', 10), measure('trunk_lean', 'right', 7)])],
    );
    expect(row(rows, 'cadence', null)).toMatchObject({ change: 8, unit: 'steps/min', threshold: null, verdict: 'no_threshold' });
    expect(row(rows, 'foot_angle_initial_contact', 'right')).toMatchObject({ baseline: null, retest: 10, change: null, verdict: 'not_measured' });
    expect(row(rows, 'trunk_lean', 'right')).toMatchObject({ baseline: null, retest: 7, verdict: 'not_measured' });
  });

  it('counts a change exactly at the threshold as within', () => {
    const rows = compareMeasures([clip(1, [measure('foot_angle_initial_contact', 'right', 10)])], [clip(2, [measure('foot_angle_initial_contact', 'right', 12.3)])]);
    // 12.3 − 10 is 2.3000000000000007 in floating point: still "within" the 2.3° SDD.
    expect(row(rows, 'foot_angle_initial_contact', 'right').verdict).toBe('within_measurement_error');
  });
});
