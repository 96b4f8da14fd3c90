/**
 * The one number formatter of overlay labels, the measures panel, the comparison, stills and the
 * PDF: round half away from zero on the number's decimal text, true minus, never −0.0. Checks are
 * against decimal arithmetic done by hand (worked examples) and an integer-only oracle, never
 * against the formatter's own output.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { formatAngleLabel, formatMeasure, formatNumber, formatValue, round1, roundHalfAway, sidedLabel } from '../../../src/kinematics';

describe('formatNumber — round half away from zero on the decimal text', () => {
  it('22.45 → "22.5" although the nearest double is 22.4499999…, which toFixed rounds down', () => {
    expect((22.45).toFixed(1)).toBe('22.4'); // the trap
    expect(formatNumber(22.45, 1)).toBe('22.5');
    expect(formatNumber(-22.45, 1)).toBe('\u221222.5');
    expect(formatNumber(2.675, 2)).toBe('2.68');
    expect(formatNumber(1.005, 2)).toBe('1.01');
    expect(formatNumber(0.05, 1)).toBe('0.1');
    expect(formatNumber(9.95, 1)).toBe('10.0');
    expect(formatNumber(99.95, 1)).toBe('100.0');
    expect(formatNumber(0.5, 0)).toBe('1');
    expect(formatNumber(-0.5, 0)).toBe('\u22121');
    expect(formatNumber(171.42857142857142, 0)).toBe('171');
    expect(formatNumber(0.35, 3)).toBe('0.350');
  });

  it('keeps the true minus sign and never writes −0.0; signed changes get "+"', () => {
    expect(formatNumber(-3, 1)).toBe('\u22123.0');
    expect(formatNumber(-0.04, 1)).toBe('0.0');
    expect(formatNumber(-0, 1)).toBe('0.0');
    expect(formatNumber(-1e-12, 3)).toBe('0.000');
    expect(formatNumber(1.23e-7, 1)).toBe('0.0');
    expect(formatNumber(3.8, 1, { signed: true })).toBe('+3.8');
    expect(formatNumber(-0.04, 1, { signed: true })).toBe('0.0');
    expect(formatNumber(Number.NaN, 1)).toBe('—');
    expect(roundHalfAway(-0.04, 1)).toBe(0);
    expect(Object.is(roundHalfAway(-0.04, 1), -0)).toBe(false);
  });

  it('the same text in every place a figure is shown: value, measure, overlay label, rounding', () => {
    expect(formatValue(22.45, '°')).toBe('22.5°');
    expect(formatValue(-3, '°')).toBe('\u22123.0°');
    expect(formatValue(3.84, '°', { signed: true })).toBe('+3.8°');
    expect(formatMeasure({ mean: 22.45, sd: 1.25, n: 3, unit: '°', status: 'ok' })).toBe('22.5 ± 1.3°');
    expect(formatAngleLabel('knee', 22.45)).toBe('22.5°');
    expect(formatAngleLabel('knee', -22.45)).toBe('\u221222.5°');
    expect(formatAngleLabel('hip', -22.45)).toBe('22.5° ext');
    expect(formatAngleLabel('knee', -0.04)).toBe('0.0°');
    expect(round1(22.45)).toBe(22.5);
  });

  it('fast-check: ties on the decimal text round away from zero (integer-only oracle)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 9_999_999 }), fc.boolean(), (n, negative) => {
        // A number written with two decimals, n / 100, rounded to one decimal by integer arithmetic.
        const text = `${Math.floor(n / 100)}.${String(n % 100).padStart(2, '0')}`;
        const q = Math.floor(n / 10) + (n % 10 >= 5 ? 1 : 0);
        const expected = `${Math.floor(q / 10)}.${q % 10}`;
        const zero = q === 0;
        const value = Number(negative ? `-${text}` : text);
        expect(formatNumber(value, 1)).toBe(negative && !zero ? `\u2212${expected}` : expected);
      }),
      { numRuns: 500 },
    );
  });

  it('fast-check: any finite number reads back within half a unit of the last digit, in the fixed shape', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: 0, max: 3 }), (v, d) => {
        const text = formatNumber(v, d);
        expect(text).toMatch(d === 0 ? /^\u2212?\d+$/ : new RegExp(`^\\u2212?\\d+\\.\\d{${d}}$`));
        expect(text.startsWith('\u2212') && !/[1-9]/.test(text)).toBe(false);
        const back = Number(text.replace('\u2212', '-'));
        expect(Math.abs(back - v)).toBeLessThanOrEqual(0.5 * 10 ** -d + 1e-9 * Math.max(1, Math.abs(v)));
      }),
      { numRuns: 500 },
    );
  });
});

describe('sidedLabel — a measure name with its side, one pair of brackets', () => {
  it('adds "(left)", or puts the side inside a bracket the name already ends with', () => {
    expect(sidedLabel('Knee flexion at initial contact', 'left')).toBe('Knee flexion at initial contact (left)');
    expect(sidedLabel('Hip extension at toe-off (thigh from vertical)', 'right')).toBe(
      'Hip extension at toe-off (thigh from vertical, right)',
    );
    expect(sidedLabel('Cadence', null)).toBe('Cadence');
  });
});
