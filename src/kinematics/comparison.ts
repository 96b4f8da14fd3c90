/**
 * Re-test comparison: pairs a baseline's measures with a re-test's by key and side, says whether
 * each change is larger than the published measurement error (REFERENCES.md, "Measurement
 * error") and which way it went. Pure; no Angular, no Node, no DOM.
 *
 * One precision: the visit means are compared AS SHOWN (rounded to the unit's decimals by the one
 * rounding rule of `format.ts`), so a change shown as +3.8° against a ±3.8° threshold is within,
 * never "beyond" beside a number that equals the threshold.
 */
import type {
  BetterDirection,
  ChangeDirection,
  ClipMeasures,
  ComparisonRow,
  ComparisonVerdict,
  MeasureKey,
  MeasurementErrorThreshold,
} from '../contracts/measures';
import { DEFAULT_REFERENCE_BANDS } from './bands';
import { formatValue, roundForUnit } from './format';
import { MIN_STEPS_FOR_RELIABLE_MEAN } from './measure-definitions';
import { visitStatistics } from './visit-statistics';

const DINGENEN = 'Dingenen et al. 2018, Phys Ther Sport 33:40–47, smallest detectable differences (mean of ≥ 7 steps)';
const DAMSTED = 'Damsted et al. 2015, Int J Sports Phys Ther 10:147–154, between-day 95 % prediction-interval widths';

/** Thresholds of change beyond measurement error, per measure; measures not listed have none. */
export const MEASUREMENT_ERROR: Partial<Record<MeasureKey, MeasurementErrorThreshold>> = {
  foot_angle_initial_contact: {
    value: 2.3,
    unit: '°',
    source: `${DINGENEN} (foot inclination 1.3–2.3°)`,
    evidence: 'pub',
    derivation: 'Upper smallest detectable difference for foot inclination at initial contact (2.3°).',
  },
  shank_angle_initial_contact: {
    value: 4.8,
    unit: '°',
    source: `${DINGENEN} (tibia inclination 2.2–4.8°)`,
    evidence: 'pub',
    derivation: 'Upper smallest detectable difference for tibia inclination at initial contact (4.8°).',
  },
  knee_flexion_initial_contact: {
    value: 7,
    unit: '°',
    source: `${DAMSTED} (knee at foot strike, widths 9–14°)`,
    evidence: 'calc',
    derivation:
      'Half the upper 95 % prediction-interval width for the knee at foot strike (14° / 2 = 7.0°), derived like the hip figure: a between-day difference inside ±W/2 is expected 95 % of the time.',
  },
  knee_flexion_peak_stance: {
    value: 3.8,
    unit: '°',
    source: `${DINGENEN} (knee flexion at midstance 2.3–3.8°)`,
    evidence: 'pub',
    derivation:
      'Upper smallest detectable difference for knee flexion at midstance (3.8°), the nearest published figure for peak knee flexion in stance.',
  },
  hip_extension_toe_off: {
    value: 5.5,
    unit: '°',
    source: `${DAMSTED} (hip, widths 9–11°)`,
    evidence: 'calc',
    derivation:
      'Half the upper 95 % prediction-interval width for the hip (11° / 2 = 5.5°): a between-day difference inside ±W/2 is expected 95 % of the time.',
  },
  hip_extension_toe_off_rel_trunk: {
    value: 5.5,
    unit: '°',
    source: `${DAMSTED} (hip, widths 9–11°)`,
    evidence: 'calc',
    derivation:
      'Half the upper 95 % prediction-interval width for the hip (11° / 2 = 5.5°): a between-day difference inside ±W/2 is expected 95 % of the time.',
  },
};

/** Shown when a measure has no published threshold. */
export const NO_PUBLISHED_THRESHOLD = 'no published threshold';

/**
 * Steps a visit's mean needs before its change is judged: the published smallest detectable
 * differences are for means of at least 7 steps (Dingenen et al. 2018 [pub]).
 */
export const MIN_STEPS_TO_JUDGE = MIN_STEPS_FOR_RELIABLE_MEAN;

export const VERDICT_LABELS: Record<ComparisonVerdict, string> = {
  beyond_measurement_error: 'Beyond measurement error',
  within_measurement_error: 'Within measurement error',
  too_few_steps: 'Too few steps to judge',
  no_threshold: 'No published threshold',
  not_measured: 'Not measured',
};

export const DIRECTION_LABELS: Record<ChangeDirection, string> = {
  better: 'better',
  worse: 'worse',
  larger: 'larger',
  smaller: 'smaller',
  unchanged: 'unchanged',
};

const hipBand = DEFAULT_REFERENCE_BANDS.find((b) => b.key === 'hip_extension_toe_off')!;
const LIEBERMAN = 'Lieberman et al. 2015, J Exp Biol 218:3406–3414';

/**
 * Measures where one direction is better, with the target and why. Every measure not listed
 * (knee and trunk angles, foot angle, times, lengths, oscillation, hip extension relative to the
 * trunk) has no better direction in the sources: its change is only larger or smaller.
 */
export const BETTER_DIRECTIONS: Partial<Record<MeasureKey, BetterDirection>> = {
  hip_extension_toe_off: {
    low: hipBand.low,
    high: null,
    better: 'more hip extension at toe-off, up to the textbook ~10°',
    source: `Common practice in the trade (textbook about 10° of hip extension at toe-off); Souza 2016, Phys Med Rehabil Clin N Am 27(1):217–236: a runner with ~10° needed no intervention, the optimal amount is not known`,
    evidence: 'trade',
  },
  shank_angle_initial_contact: {
    low: 0,
    high: 0,
    better: 'a more vertical shank at initial contact (nearer 0°)',
    source: `${LIEBERMAN}: land with a fairly vertical tibia`,
    evidence: 'pub',
  },
  heel_ahead_of_hip_initial_contact: {
    low: null,
    high: 0,
    better: 'the heel landing less far ahead of the hip',
    source: `${LIEBERMAN}: foot landing closer to the hip, less overstride`,
    evidence: 'pub',
  },
  symmetry_contact_time: {
    low: null,
    high: 0,
    better: 'less left/right difference (0 % = symmetric)',
    source: 'Common practice in the trade: a smaller asymmetry is the usual aim',
    evidence: 'trade',
  },
  symmetry_hip_extension_toe_off: {
    low: null,
    high: 0,
    better: 'less left/right difference (0 % = symmetric)',
    source: 'Common practice in the trade: a smaller asymmetry is the usual aim',
    evidence: 'trade',
  },
};

/** How far a value is outside the target range (0 inside it). */
function distanceToTarget(v: number, t: BetterDirection): number {
  if (t.low !== null && v < t.low) return t.low - v;
  if (t.high !== null && v > t.high) return v - t.high;
  return 0;
}

/**
 * Which way a change between two shown values went: better / worse when the measure has a better
 * direction and the re-test is nearer to / farther from its target; larger / smaller otherwise
 * (also when both sit on target, or equally far); unchanged when the values are equal.
 */
export function changeDirection(baselineShown: number, retestShown: number, better: BetterDirection | null): ChangeDirection {
  if (retestShown === baselineShown) return 'unchanged';
  if (better) {
    const before = distanceToTarget(baselineShown, better);
    const after = distanceToTarget(retestShown, better);
    if (after < before) return 'better';
    if (after > before) return 'worse';
  }
  return retestShown > baselineShown ? 'larger' : 'smaller';
}

/**
 * The verdict from two visit figures and a threshold, at one precision: not measured without both
 * means; no threshold without a published figure; too few steps below {@link MIN_STEPS_TO_JUDGE}
 * in either visit; else beyond when the change AS SHOWN is larger than the threshold (a change
 * equal to it is within).
 */
export function judgeChange(
  change: number | null,
  threshold: MeasurementErrorThreshold | null,
  steps: { baseline: number; retest: number },
): ComparisonVerdict {
  if (change === null) return 'not_measured';
  if (!threshold) return 'no_threshold';
  if (Math.min(steps.baseline, steps.retest) < MIN_STEPS_TO_JUDGE) return 'too_few_steps';
  return Math.abs(change) > threshold.value ? 'beyond_measurement_error' : 'within_measurement_error';
}

/**
 * One row per measure key and side found in either visit: each visit's step-weighted mean
 * (`visitStatistics`), the change of the means as shown, the verdict ({@link judgeChange}) and the
 * direction ({@link changeDirection}).
 */
export function compareMeasures(baseline: ClipMeasures[], retest: ClipMeasures[]): ComparisonRow[] {
  const a = visitStatistics(baseline);
  const b = visitStatistics(retest);
  const order: string[] = [...a.keys()];
  for (const id of b.keys()) if (!a.has(id)) order.push(id);
  return order.map((id) => {
    const base = a.get(id);
    const re = b.get(id);
    const { key, side } = (base ?? re)!;
    const unit = base?.unit ?? re?.unit ?? '';
    const baselineMean = base?.mean ?? null;
    const retestMean = re?.mean ?? null;
    const shown = (v: number | null) => (v === null ? null : roundForUnit(v, unit));
    const bs = shown(baselineMean);
    const rs = shown(retestMean);
    // Re-rounded so 12.3 − 10.0 is 2.3, not 2.3000000000000007.
    const change = bs !== null && rs !== null ? roundForUnit(rs - bs, unit) : null;
    const threshold = MEASUREMENT_ERROR[key] ?? null;
    const betterDirection = BETTER_DIRECTIONS[key] ?? null;
    const steps = { baseline: base?.steps ?? 0, retest: re?.steps ?? 0 };
    return {
      key,
      side,
      label: base?.label ?? re?.label ?? key,
      unit,
      baseline: baselineMean,
      retest: retestMean,
      baselineSteps: steps.baseline,
      retestSteps: steps.retest,
      change,
      threshold,
      verdict: judgeChange(change, threshold, steps),
      direction: bs !== null && rs !== null ? changeDirection(bs, rs, betterDirection) : null,
      betterDirection,
    };
  });
}

/**
 * The verdict in words, with the direction where the change is beyond measurement error
 * ("Beyond measurement error · better") and the step counts where there are too few
 * ("Too few steps to judge (5 and 9 steps; 7 needed in each visit)").
 */
export function verdictText(row: Pick<ComparisonRow, 'verdict' | 'direction' | 'baselineSteps' | 'retestSteps'>): string {
  const label = VERDICT_LABELS[row.verdict];
  if (row.verdict === 'beyond_measurement_error' && row.direction) return `${label} · ${DIRECTION_LABELS[row.direction]}`;
  if (row.verdict === 'too_few_steps')
    return `${label} (${row.baselineSteps} and ${row.retestSteps} steps; ${MIN_STEPS_TO_JUDGE} needed in each visit)`;
  return label;
}

/** "±3.8°": a threshold as shown beside the change, by the same formatter. */
export function thresholdText(threshold: MeasurementErrorThreshold): string {
  return `±${formatValue(threshold.value, threshold.unit)}`;
}
