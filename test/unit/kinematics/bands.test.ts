/**
 * Default reference bands against REFERENCES.md (each value with its tag), evaluateBand, the
 * foot-strike classifier, and the spring-mass estimate.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { MeasureKey, ReferenceBand } from '../../../src/contracts/measures';
import {
  classifyFootStrike,
  DEFAULT_REFERENCE_BANDS,
  evaluateBand,
  findBand,
  MEASURE_DEFINITIONS,
  springMassVerticalOscillation,
} from '../../../src/kinematics';

const band = (key: MeasureKey): ReferenceBand => {
  const b = DEFAULT_REFERENCE_BANDS.find((x) => x.key === key);
  if (!b) throw new Error(`no default band for ${key}`);
  return b;
};

describe('DEFAULT_REFERENCE_BANDS — values as in REFERENCES.md', () => {
  it('[pub] Heiderscheit et al. 2011, Table 3: knee flexion at IC 17.8 ± 4.0° and peak 46.3 ± 4.5° as mean ± 1 SD', () => {
    expect(band('knee_flexion_initial_contact')).toMatchObject({ low: 13.8, high: 21.8, unit: '°', evidence: 'pub' });
    expect(band('knee_flexion_initial_contact').context).toContain('mean ± 1 SD');
    expect(band('knee_flexion_initial_contact').source).toContain('Heiderscheit et al. 2011, Med Sci Sports Exerc 43(2):296–302, Table 3');
    expect(band('knee_flexion_peak_stance')).toMatchObject({ low: 41.8, high: 50.8, evidence: 'pub' });
  });
  it('[pub] Teng & Powers 2014: trunk lean 7.3 ± 3.6°', () => {
    expect(band('trunk_lean')).toMatchObject({ low: 3.7, high: 10.9, evidence: 'pub' });
    expect(band('trunk_lean').source).toContain('Teng & Powers 2014, J Orthop Sports Phys Ther 44(10):785–792');
  });
  it('[trade] hip extension at toe-off about 10° (textbook rule of thumb, no single source)', () => {
    expect(band('hip_extension_toe_off')).toMatchObject({ low: 10, high: null, evidence: 'trade' });
    expect(band('hip_extension_toe_off').source).toMatch(/Common practice in the trade/);
  });
  it('[pub] Mo et al. 2021 foot-strike cut-offs −0.8° / 7.4°; [pub] Patoz et al. 2019 duty factor 27.6 % / 28.8 %', () => {
    expect(band('foot_angle_initial_contact')).toMatchObject({ low: -0.8, high: 7.4, evidence: 'pub' });
    expect(band('duty_factor')).toMatchObject({ low: 27.6, high: 28.8, unit: '%', evidence: 'pub' });
  });
  it('[pub numbers, authors from memory] de Ruiter et al. 2019: cadence 165 ± 8 steps/min', () => {
    expect(band('cadence')).toMatchObject({ low: 157, high: 173, unit: 'steps/min', evidence: 'pub' });
    expect(band('cadence').source).toMatch(/from memory/);
  });
  it('every band names a known measure in that measure’s unit, with a citation and context', () => {
    for (const b of DEFAULT_REFERENCE_BANDS) {
      expect(MEASURE_DEFINITIONS[b.key].unit).toBe(b.unit);
      expect(b.source.length).toBeGreaterThan(10);
      expect(b.context.length).toBeGreaterThan(10);
    }
    expect(new Set(DEFAULT_REFERENCE_BANDS.map((b) => b.key)).size).toBe(DEFAULT_REFERENCE_BANDS.length);
  });
});

describe('evaluateBand / findBand', () => {
  const b: ReferenceBand = { key: 'cadence', low: 157, high: 173, unit: 'steps/min', context: 'c', source: 's', evidence: 'pub' };
  it('below / within (limits inclusive) / above; open ends; non-finite → null', () => {
    expect(evaluateBand(150, b)?.position).toBe('below');
    expect(evaluateBand(157, b)?.position).toBe('within');
    expect(evaluateBand(173, b)?.position).toBe('within');
    expect(evaluateBand(180, b)?.position).toBe('above');
    expect(evaluateBand(9, { ...b, low: 10, high: null })?.position).toBe('below');
    expect(evaluateBand(1e6, { ...b, low: 10, high: null })?.position).toBe('within');
    expect(evaluateBand(Number.NaN, b)).toBeNull();
  });
  it('the first band with the key and unit applies (a clinic’s own band listed first wins)', () => {
    const own = { ...b, low: 170, high: 180 };
    expect(findBand([own, b], 'cadence', 'steps/min')).toBe(own);
    expect(findBand([b], 'cadence', 'Hz')).toBeNull();
  });
});

describe('[pub] Mo et al. 2021 foot-strike classifier (forefoot ≤ −0.8°, rearfoot ≥ 7.4°, midfoot between)', () => {
  it('classifies at and around the cut-offs, judging the angle as shown (to 0.1°)', () => {
    expect(classifyFootStrike(-0.8)).toBe('forefoot');
    expect(classifyFootStrike(-0.75)).toBe('forefoot'); // shown as −0.8°
    expect(classifyFootStrike(-0.74)).toBe('midfoot'); // shown as −0.7°
    expect(classifyFootStrike(7.34)).toBe('midfoot'); // shown as 7.3°
    expect(classifyFootStrike(7.4)).toBe('rearfoot');
    expect(classifyFootStrike(7.35)).toBe('rearfoot'); // shown as 7.4°
    expect(classifyFootStrike(14.744)).toBe('rearfoot'); // the worked-example foot angle
  });

  it('the class and the band flag follow one rule: exactly −0.8° is forefoot and below, exactly 7.4° rearfoot and above', () => {
    const foot = band('foot_angle_initial_contact');
    expect(classifyFootStrike(-0.8)).toBe('forefoot');
    expect(evaluateBand(-0.8, foot)?.position).toBe('below');
    expect(classifyFootStrike(7.4)).toBe('rearfoot');
    expect(evaluateBand(7.4, foot)?.position).toBe('above');
    // 7.4 reached by arithmetic carries binary dust (7.3999999999999995): still the shown 7.4°.
    expect(classifyFootStrike(7.3 + 0.1)).toBe('rearfoot');
    expect(evaluateBand(7.3 + 0.1, foot)?.position).toBe('above');
    const asClass = { below: 'forefoot', within: 'midfoot', above: 'rearfoot' } as const;
    fc.assert(
      fc.property(fc.double({ min: -30, max: 40, noNaN: true }), (deg) => {
        expect(classifyFootStrike(deg)).toBe(asClass[evaluateBand(deg, foot)!.position]);
      }),
      { numRuns: 300 },
    );
  });

  it('[pub] Patoz et al. 2019 duty-factor limits belong to the middle class (< 27.6 % aerial, > 28.8 % terrestrial)', () => {
    expect(evaluateBand(27.6, band('duty_factor'))?.position).toBe('within');
    expect(evaluateBand(28.8, band('duty_factor'))?.position).toBe('within');
    expect(evaluateBand(28.85, band('duty_factor'))?.position).toBe('above'); // shown as 28.9 %
  });
});

describe('spring-mass vertical oscillation (Morin et al. 2005 method [pub]; formula from memory, REFERENCES.md [calc])', () => {
  it('tc 0.25 s, tf 0.10 s → Fmax 2.199 BW, stance drop 5.997 cm, flight rise 1.226 cm, total 7.224 cm', () => {
    const e = springMassVerticalOscillation(0.25, 0.1)!;
    expect(e.peakForceBw).toBeCloseTo(2.199, 3);
    expect(e.stanceDropM * 100).toBeCloseTo(5.997, 3);
    expect(e.flightRiseM * 100).toBeCloseTo(1.226, 3);
    expect(e.totalM * 100).toBeCloseTo(7.224, 2);
    // Independent recomputation: (π/2)(0.1/0.25 + 1), g = 9.81.
    const f = (Math.PI / 2) * 1.4;
    expect(((f * 9.81 * 0.0625) / Math.PI ** 2 - (9.81 * 0.0625) / 8) * 100).toBeCloseTo(5.997, 3);
  });
  it('no estimate without a positive contact time or with negative flight', () => {
    expect(springMassVerticalOscillation(0, 0.1)).toBeNull();
    expect(springMassVerticalOscillation(0.25, -0.01)).toBeNull();
  });
  it('[calc] no flight (tf 0 s, walking-like contact) still gives an estimate: Fmax π/2 BW, drop g·tc²·(1/(2π) − 1/8) = 2.09 cm', () => {
    const e = springMassVerticalOscillation(0.25, 0)!;
    expect(e.peakForceBw).toBeCloseTo(Math.PI / 2, 9);
    expect(e.flightRiseM).toBe(0);
    // Independent recomputation with g = 9.81: 9.81 × 0.0625 × (0.159155 − 0.125) = 0.020941 m.
    expect(e.totalM * 100).toBeCloseTo(9.81 * 0.0625 * (1 / (2 * Math.PI) - 1 / 8) * 100, 2);
  });
});
