/**
 * Published reference bands (from REFERENCES.md only, with their evidence tags), band evaluation,
 * and the foot-strike classifier. Pure.
 *
 * A band is [low, high] in the measure's unit; either end may be null (one-sided). For a cut-off
 * classification (foot strike, duty factor) the band spans the middle class, so "below", "within"
 * and "above" name the three classes — the band's `context` says which is which.
 */
import type { BandEvaluation, MeasureKey, ReferenceBand } from '../contracts/measures';
import { roundForUnit } from './format';

/** Unit strings used by measures and bands (they must match for a band to apply). */
export const UNITS = {
  deg: '°',
  s: 's',
  m: 'm',
  cm: 'cm',
  pct: '%',
  stepsPerMin: 'steps/min',
} as const;

/** Mo et al. 2021 foot-strike angle cut-offs, degrees (foot angle relative to standing posture). */
export const FOOT_STRIKE_CUTOFFS_DEG = { forefootAtOrBelow: -0.8, rearfootAtOrAbove: 7.4 } as const;

/** Foot-strike classes. */
export type FootStrike = 'rearfoot' | 'midfoot' | 'forefoot';

/**
 * Foot-strike class from the foot angle at initial contact (heel→toe from horizontal, + toe up):
 * forefoot ≤ −0.8°, rearfoot ≥ 7.4°, midfoot between (Mo et al. 2021, Res Sports Med [pub]).
 * The SAME rule as the foot-angle band's flag ({@link bandPosition}: the angle as shown, to 0.1°,
 * with the cut-offs belonging to the outer classes), so "−0.8° · forefoot" is never flagged
 * "within" (midfoot). The cut-offs assume the angle is taken relative to the standing posture;
 * Trailframe's foot angle is relative to the horizontal unless the caller subtracts a
 * standing-frame offset first.
 */
export function classifyFootStrike(footAngleDeg: number, band: ReferenceBand = FOOT_STRIKE_BAND): FootStrike {
  const position = bandPosition(footAngleDeg, band);
  return position === 'below' ? 'forefoot' : position === 'above' ? 'rearfoot' : 'midfoot';
}

/** Duty-factor cut-offs at 12 km/h, percent (Patoz et al. 2019, Sports 7:233 [pub]). */
export const DUTY_FACTOR_CUTOFFS_PCT = { aerialBelow: 27.6, terrestrialAbove: 28.8 } as const;

/** Mean ± 1 SD as a band [mean − sd, mean + sd], rounded to 0.1 to avoid float dust. */
const meanSd = (m: number, sd: number): { low: number; high: number } => ({
  low: Math.round((m - sd) * 10) / 10,
  high: Math.round((m + sd) * 10) / 10,
});

/**
 * Default reference bands, straight from REFERENCES.md. One band per measure that has a published
 * or trade figure; measures without one (shank angle, heel ahead of hip, lengths, times other than
 * duty factor and cadence, vertical oscillation, symmetry) have no default band. Mean ± SD figures
 * become a band of mean ± 1 SD, stated in `context`.
 */
export const DEFAULT_REFERENCE_BANDS: ReferenceBand[] = [
  {
    key: 'hip_extension_toe_off',
    low: 10,
    high: null,
    unit: UNITS.deg,
    context:
      'Textbook rule of thumb: about 10° of hip extension at toe-off (thigh from vertical). Below = less extension than that; the optimal amount is not known (Souza 2016).',
    source:
      'Common practice in the trade, no single source. See Souza 2016, Phys Med Rehabil Clin N Am 27(1):217–236 (a slow runner with ~10° peak hip extension needed no intervention)',
    evidence: 'trade',
  },
  {
    key: 'knee_flexion_initial_contact',
    ...meanSd(17.8, 4.0),
    unit: UNITS.deg,
    context: 'Treadmill, preferred step rate: 17.8 ± 4.0°; band = mean ± 1 SD',
    source: 'Heiderscheit et al. 2011, Med Sci Sports Exerc 43(2):296–302, Table 3',
    evidence: 'pub',
  },
  {
    key: 'knee_flexion_peak_stance',
    ...meanSd(46.3, 4.5),
    unit: UNITS.deg,
    context:
      'Peak knee flexion in loading, treadmill, preferred step rate: 46.3 ± 4.5°; band = mean ± 1 SD. Well under 45° suggests poor shock absorption (Souza 2016)',
    source: 'Heiderscheit et al. 2011, Med Sci Sports Exerc 43(2):296–302, Table 3',
    evidence: 'pub',
  },
  {
    key: 'trunk_lean',
    ...meanSd(7.3, 3.6),
    unit: UNITS.deg,
    context: 'Trunk lean over stance at 3.4 m/s, self-selected posture: 7.3 ± 3.6°; band = mean ± 1 SD',
    source: 'Teng & Powers 2014, J Orthop Sports Phys Ther 44(10):785–792',
    evidence: 'pub',
  },
  {
    key: 'foot_angle_initial_contact',
    low: FOOT_STRIKE_CUTOFFS_DEG.forefootAtOrBelow,
    high: FOOT_STRIKE_CUTOFFS_DEG.rearfootAtOrAbove,
    unit: UNITS.deg,
    context:
      'Foot-strike classification, not a norm: below (≤ −0.8°) forefoot, within midfoot, above (≥ 7.4°) rearfoot. Cut-offs assume the angle relative to standing posture',
    source: 'Mo et al. 2021, Res Sports Med',
    evidence: 'pub',
  },
  {
    key: 'cadence',
    ...meanSd(165, 8),
    unit: UNITS.stepsPerMin,
    context: 'Preferred cadence outdoors at 3.0 m/s: 165 ± 8 steps/min; band = mean ± 1 SD',
    source: 'de Ruiter et al. 2019, Eur J Sport Sci (numbers as published; author list from memory)',
    evidence: 'pub',
  },
  {
    key: 'duty_factor',
    low: DUTY_FACTOR_CUTOFFS_PCT.aerialBelow,
    high: DUTY_FACTOR_CUTOFFS_PCT.terrestrialAbove,
    unit: UNITS.pct,
    context:
      'Classification at 12 km/h, not a norm: below (< 27.6 %) "aerial", above (> 28.8 %) "terrestrial", within = neither. Duty factor = contact ÷ stride time',
    source: 'Patoz et al. 2019, Sports 7:233',
    evidence: 'pub',
  },
];

/** The default foot-strike band (Mo et al. 2021 cut-offs), which {@link classifyFootStrike} uses. */
const FOOT_STRIKE_BAND: ReferenceBand = DEFAULT_REFERENCE_BANDS.find((b) => b.key === 'foot_angle_initial_contact')!;

/**
 * Bands whose limits belong to the classes outside them: Mo et al. 2021 put −0.8° in forefoot and
 * 7.4° in rearfoot (≤ / ≥). Every other band includes its limits (Patoz et al. 2019: aerial
 * < 27.6 %, terrestrial > 28.8 %; mean ± 1 SD bands; "at least 10°").
 */
export const BAND_LIMITS_OUTSIDE: ReadonlySet<MeasureKey> = new Set<MeasureKey>(['foot_angle_initial_contact']);

/**
 * THE rule that places a value against a band, used by every band flag and class: the value is
 * taken as it is shown (rounded to its unit's decimals by the one rounding rule, so "7.4°" is
 * judged as 7.4 whatever binary dust it carries), then below `low` / above `high` / within; a
 * null limit is open; at a limit it is within, except for {@link BAND_LIMITS_OUTSIDE}. Null when
 * the value is not a finite number.
 */
export function bandPosition(value: number, band: ReferenceBand): BandEvaluation['position'] | null {
  if (!Number.isFinite(value)) return null;
  const v = roundForUnit(value, band.unit);
  const outside = BAND_LIMITS_OUTSIDE.has(band.key);
  if (band.low !== null && (v < band.low || (outside && v === band.low))) return 'below';
  if (band.high !== null && (v > band.high || (outside && v === band.high))) return 'above';
  return 'within';
}

/** Where a value sits against a band, by {@link bandPosition}; null when the value is not finite. */
export function evaluateBand(value: number, band: ReferenceBand): BandEvaluation | null {
  const position = bandPosition(value, band);
  return position === null ? null : { band, position };
}

/** The first band in `bands` for `key` whose unit matches `unit` (the clinic's order decides). */
export function findBand(bands: readonly ReferenceBand[], key: MeasureKey, unit: string): ReferenceBand | null {
  return bands.find((b) => b.key === key && b.unit === unit) ?? null;
}
