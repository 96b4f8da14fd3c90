/**
 * Shapes of computed measures (produced by `src/kinematics`, stored by the server as snapshots,
 * shown by the client). Types only.
 */
import type { GaitEventKind } from './annotations';
import type { AssessmentKind, Direction, Side } from './assessment';
import type { Assessment } from './api';

/** Keys of the measures the review workspace shows. */
export type MeasureKey =
  | 'hip_extension_toe_off'
  | 'hip_extension_toe_off_rel_trunk'
  | 'knee_flexion_initial_contact'
  | 'knee_flexion_peak_stance'
  | 'shank_angle_initial_contact'
  | 'foot_angle_initial_contact'
  | 'trunk_lean'
  | 'heel_ahead_of_hip_initial_contact'
  | 'cadence'
  | 'step_time'
  | 'stride_time'
  | 'step_length'
  | 'stride_length'
  | 'contact_time'
  | 'flight_time'
  | 'duty_factor'
  | 'vertical_oscillation'
  | 'symmetry_contact_time'
  | 'symmetry_hip_extension_toe_off';

/** A cited reference band for one measure (the clinic's owner may edit them). */
export interface ReferenceBand {
  key: MeasureKey;
  /** Lower and upper limits in the measure's unit; either may be null (one-sided band). */
  low: number | null;
  high: number | null;
  unit: string;
  /** Short label of the population/condition, e.g. "treadmill, preferred step rate". */
  context: string;
  /** Citation, e.g. "Heiderscheit et al. 2011, Med Sci Sports Exerc 43:296–302, Table 3". */
  source: string;
  /** REFERENCES.md tag: pub, mem, trade, calc. */
  evidence: 'pub' | 'mem' | 'trade' | 'calc';
}

export interface BandEvaluation {
  band: ReferenceBand;
  /** Where the mean sits against the band. */
  position: 'below' | 'within' | 'above';
}

/** One figure: a mean ± SD over the marked steps, or "not enough data". */
export interface Measure {
  key: MeasureKey;
  label: string;
  unit: string;
  side: Side | null;
  /** The gait event it is read at, when it is read at one. */
  event: GaitEventKind | null;
  status: 'ok' | 'not_enough_data';
  mean: number | null;
  sd: number | null;
  /** How many steps (or strides) the mean averages. */
  n: number;
  /** Each step's value, in time order. */
  values: number[];
  /** How the figure is derived, in words (shown on hover/expand). */
  derivation: string;
  /** Why the figure is missing, when it is. */
  missing?: string;
  band?: BandEvaluation;
}

/** Angles on one frame for one side (degrees), for the chart. Missing landmarks → absent angle. */
export interface AngleSample {
  frame: number;
  timeMs: number;
  side: Side;
  thighDeg?: number;
  kneeFlexionDeg?: number;
  shankDeg?: number;
  trunkDeg?: number;
  footDeg?: number;
  hipRelTrunkDeg?: number;
}

export interface ClipMeasures {
  /** Version of `src/kinematics` that computed this. */
  kinematicsVersion: string;
  clipId: number;
  /** Whether a scale (metres per pixel or belt speed) was available for lengths. */
  hasScale: boolean;
  measures: Measure[];
  angles: AngleSample[];
  /** Plain-language warnings, e.g. "Fewer than 7 steps marked: means are less reliable". */
  notes: string[];
}

// ─── Re-test comparison ───────────────────────────────────────────────────────────────────

/** The change a measure must exceed to be more than measurement error, with its citation. */
export interface MeasurementErrorThreshold {
  value: number;
  unit: string;
  source: string;
  /** REFERENCES.md tag: pub (figure as published) or calc (derived from a published figure). */
  evidence: 'pub' | 'calc';
  /** How the figure was derived, in words (shown on hover/expand). */
  derivation: string;
}

/**
 * Whether a change is larger than the published measurement error. `too_few_steps`: a visit's mean
 * averages fewer than 7 steps, fewer than the published thresholds assume (Dingenen et al. 2018).
 */
export type ComparisonVerdict = 'beyond_measurement_error' | 'within_measurement_error' | 'too_few_steps' | 'no_threshold' | 'not_measured';

/**
 * Which way a change went: `better` / `worse` for a measure with a better direction (a cited
 * target, {@link BetterDirection}), `larger` / `smaller` for the others (or when both visits are
 * already on target), `unchanged` when the change as shown is zero.
 */
export type ChangeDirection = 'better' | 'worse' | 'larger' | 'smaller' | 'unchanged';

/** The values a measure is better nearer to, with why and its source. */
export interface BetterDirection {
  /** Target range in the measure's unit (null = open): nearer is better; inside it, neither. */
  low: number | null;
  high: number | null;
  /** In words, e.g. "more hip extension, up to about 10°". */
  better: string;
  source: string;
  /** REFERENCES.md tag. */
  evidence: 'pub' | 'mem' | 'trade' | 'calc';
}

/** One measure and side, baseline against re-test. */
export interface ComparisonRow {
  key: MeasureKey;
  side: Side | null;
  label: string;
  unit: string;
  /** The visit's mean: its clips' means weighted by their step counts; null when not measured. */
  baseline: number | null;
  retest: number | null;
  /** Steps behind each visit's mean (all clips); 0 when not measured. */
  baselineSteps: number;
  retestSteps: number;
  /**
   * Re-test − baseline of the two means AS SHOWN (each rounded to its unit's decimals), so the
   * columns subtract and the verdict judges the number on screen; null when either is missing.
   */
  change: number | null;
  /** Null when no published threshold exists for this measure. */
  threshold: MeasurementErrorThreshold | null;
  verdict: ComparisonVerdict;
  /** Which way the change went (null when not measured). */
  direction: ChangeDirection | null;
  /** Why one direction is better for this measure; null where neither is. */
  betterDirection: BetterDirection | null;
}

/** A ready clip of a compared visit, for the side-by-side viewer. */
export interface ComparisonClip {
  id: number;
  nearSide: Side;
  direction: Direction;
  frameCount: number | null;
}

/** `GET /api/athletes/:id/comparison`. */
export interface AssessmentComparison {
  baseline: Assessment;
  retest: Assessment;
  rows: ComparisonRow[];
  baselineClips: ComparisonClip[];
  retestClips: ComparisonClip[];
}

/** One assessment's means for the trend chart (`GET /api/athletes/:id/measure-trends`). */
export interface MeasureTrendPoint {
  assessmentId: number;
  date: string;
  kind: AssessmentKind;
  /** Mean per measure and side; null when not measured in this visit. */
  values: { key: MeasureKey; side: Side | null; mean: number | null }[];
}

export interface MeasureTrends {
  keys: MeasureKey[];
  points: MeasureTrendPoint[];
}
