import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { evalSeries, fitSeries, slopeSeries, smootherstep, solveLinear } from '../../../../scripts/demo-clip/fourier';

describe('fourier helpers', () => {
  it('solveLinear solves a small system (checked by substitution)', () => {
    const a = [
      [2, 1, -1],
      [-3, -1, 2],
      [-2, 1, 2],
    ];
    expect(solveLinear(a, [8, -11, -3]).map((x) => Number(x.toFixed(9)))).toEqual([2, 3, -1]);
  });

  it('a fitted series meets every key value and slope and is periodic', () => {
    fc.assert(
      fc.property(
        fc.array(fc.noBias(fc.integer({ min: -900, max: 900 })), { minLength: 4, maxLength: 4 }),
        fc.noBias(fc.integer({ min: -500, max: 500 })),
        (values, slope) => {
          const phis = [0, 0.21, 0.5, 0.77];
          const s = fitSeries([...phis.map((phi, i) => ({ phi, value: values[i]! / 10 })), { phi: 0.5, slope }], 4);
          return (
            phis.every((phi, i) => Math.abs(evalSeries(s, phi) - values[i]! / 10) < 1e-6) &&
            Math.abs(slopeSeries(s, 0.5) - slope) < 1e-6 &&
            Math.abs(evalSeries(s, 0.3) - evalSeries(s, 1.3)) < 1e-9
          );
        },
      ),
      { numRuns: 200 },
    );
  });

  it('slopeSeries is the derivative of evalSeries (central difference)', () => {
    const s = fitSeries(
      [
        { phi: 0, value: 10 },
        { phi: 0.3, value: -20 },
        { phi: 0.7, value: 40, slope: 0 },
      ],
      3,
    );
    for (const phi of [0.1, 0.45, 0.9]) {
      const h = 1e-6;
      expect(slopeSeries(s, phi)).toBeCloseTo((evalSeries(s, phi + h) - evalSeries(s, phi - h)) / (2 * h), 4);
    }
  });

  it('refuses more conditions than coefficients', () => {
    expect(() =>
      fitSeries(
        [0, 0.2, 0.4, 0.6].map((phi) => ({ phi, value: 1 })),
        1,
      ),
    ).toThrow(/harmonics/);
  });

  it('smootherstep runs 0 → 1 with flat ends', () => {
    expect(smootherstep(0, 1, -1)).toBe(0);
    expect(smootherstep(0, 1, 0.5)).toBeCloseTo(0.5, 12);
    expect(smootherstep(0, 1, 2)).toBe(1);
    expect(smootherstep(0, 1, 1e-4)).toBeLessThan(1e-10);
  });
});
