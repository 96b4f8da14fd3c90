/**
 * The small arithmetic under every figure: descriptive statistics, how a change is judged against
 * a published measurement error, and how numbers are written per unit. Every expected value is
 * worked by hand in the test ([calc]); thresholds follow REFERENCES.md: at least 7 steps per visit
 * (Dingenen et al. 2018 [pub]) and a change equal to the threshold is within it.
 */
import { describe, expect, it } from 'vitest';
import {
  bandRange,
  changeDirection,
  decimalsFor,
  formatMeasure,
  formatValue,
  judgeChange,
  mean,
  median,
  MIN_STEPS_TO_JUDGE,
  roundForUnit,
  roundHalfAway,
  sampleSd,
  symmetryIndexPct,
} from '../../../src/kinematics';

describe('descriptive statistics [calc]', () => {
  it('mean and sample SD (n − 1): 2, 4, 4, 4, 5, 5, 7, 9 → mean 5, SD √(32/7) = 2.138', () => {
    const v = [2, 4, 4, 4, 5, 5, 7, 9];
    expect(mean(v)).toBe(5);
    expect(sampleSd(v)).toBeCloseTo(Math.sqrt(32 / 7), 12);
    expect(sampleSd([3, 5])).toBeCloseTo(Math.SQRT2, 12);
    expect(sampleSd([4])).toBeNull();
    expect(sampleSd([])).toBeNull();
    expect(mean([])).toBeNull();
    expect(mean([-1.5])).toBe(-1.5);
  });

  it('median of odd and even counts, in any order: 9, 1, 5 → 5; 8, 2, 6, 4 → 5', () => {
    expect(median([9, 1, 5])).toBe(5);
    expect(median([8, 2, 6, 4])).toBe(5);
    expect(median([10, 2])).toBe(6);
    expect(median([7])).toBe(7);
    expect(median([])).toBeNull();
    expect(median([-3, -10, 20])).toBe(-3);
  });

  it('symmetry index |L − R| ÷ mean(L, R) × 100: 0.24 s and 0.26 s → 8 %; only for two positive values', () => {
    expect(symmetryIndexPct(0.24, 0.26)).toBeCloseTo(8, 10);
    expect(symmetryIndexPct(0.26, 0.24)).toBeCloseTo(8, 10);
    expect(symmetryIndexPct(170, 170)).toBe(0);
    expect(symmetryIndexPct(0, 1)).toBeNull();
    expect(symmetryIndexPct(1, 0)).toBeNull();
    expect(symmetryIndexPct(-1, 2)).toBeNull();
    expect(symmetryIndexPct(Number.NaN, 2)).toBeNull();
  });
});

describe('judging a change against measurement error', () => {
  const threshold = { value: 5.5, unit: '°', source: 'Damsted et al. 2015', evidence: 'calc' as const, derivation: '' };
  const enough = { baseline: 8, retest: 8 };

  it('needs both means, a published figure and 7 steps in each visit (Dingenen et al. 2018 [pub])', () => {
    expect(MIN_STEPS_TO_JUDGE).toBe(7);
    expect(judgeChange(null, threshold, enough)).toBe('not_measured');
    expect(judgeChange(7, null, enough)).toBe('no_threshold');
    expect(judgeChange(7, threshold, { baseline: 6, retest: 8 })).toBe('too_few_steps');
    expect(judgeChange(7, threshold, { baseline: 8, retest: 6 })).toBe('too_few_steps');
    expect(judgeChange(7, threshold, { baseline: 7, retest: 7 })).toBe('beyond_measurement_error');
  });

  it('beyond only when larger than the threshold, either way: ±5.5° → 5.6 beyond, 5.5 within, −5.6 beyond', () => {
    expect(judgeChange(5.6, threshold, enough)).toBe('beyond_measurement_error');
    expect(judgeChange(5.5, threshold, enough)).toBe('within_measurement_error');
    expect(judgeChange(-5.6, threshold, enough)).toBe('beyond_measurement_error');
    expect(judgeChange(-5.5, threshold, enough)).toBe('within_measurement_error');
    expect(judgeChange(0, threshold, enough)).toBe('within_measurement_error');
  });

  it('direction: nearer the target is better, farther worse; on target or without one, larger or smaller', () => {
    // Target "at least 10°" (hip extension at toe-off, common practice [trade]).
    const atLeast10 = { low: 10, high: null, better: 'more extension', source: '', evidence: 'trade' } as never;
    expect(changeDirection(4, 11, atLeast10)).toBe('better');
    expect(changeDirection(11, 4, atLeast10)).toBe('worse');
    expect(changeDirection(12, 14, atLeast10)).toBe('larger'); // both on target
    expect(changeDirection(14, 12, atLeast10)).toBe('smaller');
    expect(changeDirection(6, 6, atLeast10)).toBe('unchanged');
    // Target "at most 8 cm": 10 → 9 is nearer.
    const atMost8 = { low: null, high: 8, better: 'less', source: '', evidence: 'trade' } as never;
    expect(changeDirection(10, 9, atMost8)).toBe('better');
    expect(changeDirection(9, 10, atMost8)).toBe('worse');
    // A band 165–175: 160 → 180 is 5 below, then 5 above: equally far, so just larger.
    const band = { low: 165, high: 175, better: 'in band', source: '', evidence: 'pub' } as never;
    expect(changeDirection(160, 180, band)).toBe('larger');
    expect(changeDirection(180, 172, band)).toBe('better');
    expect(changeDirection(3, 2, null)).toBe('smaller');
    expect(changeDirection(2, 3, null)).toBe('larger');
  });
});

describe('numbers per unit', () => {
  it('decimals: whole steps/min, strides/min and mm, 3 for seconds, 2 for metres, 1 for degrees, % and cm', () => {
    expect(['steps/min', 'strides/min', 'mm', 's', 'm', '°', '%', 'cm'].map(decimalsFor)).toEqual([0, 0, 0, 3, 2, 1, 1, 1]);
    expect(roundForUnit(171.5, 'steps/min')).toBe(172);
    expect(roundForUnit(0.3504, 's')).toBe(0.35);
    expect(roundForUnit(1.055, 'm')).toBe(1.06);
  });

  it('writes values with their unit: "171 steps/min", "0.350 s", "2.10 m", "12.5°", "35.7 %", "—" when missing', () => {
    expect(formatValue(171.43, 'steps/min')).toBe('171 steps/min');
    expect(formatValue(0.35, 's')).toBe('0.350 s');
    expect(formatValue(2.1, 'm')).toBe('2.10 m');
    expect(formatValue(12.529, '°')).toBe('12.5°');
    expect(formatValue(35.71, '%')).toBe('35.7%');
    expect(formatValue(-3.04, '°', { signed: true })).toBe('\u22123.0°');
    expect(formatValue(2, 'steps/min', { signed: true })).toBe('+2 steps/min');
    expect(formatValue(null, '°')).toBe('—');
    expect(formatValue(Number.POSITIVE_INFINITY, '°')).toBe('—');
    expect(formatValue(5, '')).toBe('5.0');
  });

  it('mean ± SD, without SD for one step or a missing SD, and "Not enough data" otherwise', () => {
    expect(formatMeasure({ mean: 22.45, sd: 1.25, unit: '°', n: 8, status: 'ok' })).toBe('22.5 ± 1.3°');
    expect(formatMeasure({ mean: 171.4, sd: 2.6, unit: 'steps/min', n: 6, status: 'ok' })).toBe('171 ± 3 steps/min');
    expect(formatMeasure({ mean: 22.45, sd: 1.25, unit: '°', n: 1, status: 'ok' })).toBe('22.5°');
    expect(formatMeasure({ mean: 22.45, sd: null, unit: '°', n: 3, status: 'ok' })).toBe('22.5°');
    expect(formatMeasure({ mean: null, sd: null, unit: '°', n: 0, status: 'ok' })).toBe('Not enough data');
    expect(formatMeasure({ mean: 5, sd: 1, unit: '°', n: 3, status: 'not_enough_data' })).toBe('Not enough data');
  });

  it('band ranges: "13.8–21.8°", "≥ 10°", "≤ 8 cm", the true minus, "No limits"', () => {
    expect(bandRange({ low: 13.8, high: 21.8, unit: '°' })).toBe('13.8–21.8°');
    expect(bandRange({ low: 10, high: null, unit: '°' })).toBe('≥ 10°');
    expect(bandRange({ low: null, high: 8, unit: 'cm' })).toBe('≤ 8 cm');
    // A negative end: "to", not a dash beside the minus sign (foot band of Mo et al. 2021, REFERENCES.md).
    expect(bandRange({ low: -0.8, high: 7.4, unit: '°' })).toBe('\u22120.8 to 7.4°');
    expect(bandRange({ low: -5, high: -2, unit: 'cm' })).toBe('\u22125 to \u22122 cm');
    expect(bandRange({ low: 0, high: 3.5, unit: '°' })).toBe('0–3.5°');
    expect(bandRange({ low: 157, high: 173, unit: 'steps/min' })).toBe('157–173 steps/min');
    expect(bandRange({ low: 27.6, high: 28.8, unit: '%' })).toBe('27.6–28.8%');
    expect(bandRange({ low: null, high: null, unit: '°' })).toBe('No limits');
  });

  it('rounds half away from zero on the decimal text, never to −0', () => {
    expect(roundHalfAway(2.675, 2)).toBe(2.68);
    expect(roundHalfAway(-2.675, 2)).toBe(-2.68);
    expect(roundHalfAway(-0.04, 1)).toBe(0);
    expect(Object.is(roundHalfAway(-0.04, 1), -0)).toBe(false);
    expect(roundHalfAway(9.95, 1)).toBe(10);
    expect(roundHalfAway(1.5e-7, 6)).toBe(0);
    expect(roundHalfAway(0.00000051, 6)).toBe(0.000001);
    expect(roundHalfAway(Number.NaN, 1)).toBeNaN();
    expect(roundHalfAway(12.5, 0)).toBe(13);
  });
});
