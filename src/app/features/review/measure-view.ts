/**
 * How computed measures are grouped, worded and formatted in the measures panel. Pure.
 */
import { GAIT_EVENT_LABELS } from '../../../contracts/annotations';
import type { BandEvaluation, Measure, MeasureKey, ReferenceBand } from '../../../contracts/measures';
import { classifyFootStrike } from './kinematics-adapter';
import { bandRange, formatMeasure, formatValue } from '../../../kinematics/format';

export { bandRange, formatMeasure, formatValue };

export interface MeasureGroupDef {
  id: string;
  title: string;
  keys: MeasureKey[];
  /** A sentence shown under the group title. */
  note?: string;
}

/** Steps below which a mean is flagged (test–retest figures assume ≥ 7 steps; Dingenen et al. 2018). */
export const MIN_RELIABLE_STEPS = 7;

export const MEASURE_GROUPS: MeasureGroupDef[] = [
  {
    id: 'hip',
    title: 'Hip & pelvis',
    keys: ['hip_extension_toe_off', 'hip_extension_toe_off_rel_trunk'],
    note:
      'Hip extension at toe-off is read as the thigh (hip → knee) from vertical. Seen from the side in 2D, ' +
      'thigh-from-vertical overstates extension relative to the pelvis by about the pelvic anterior tilt, ' +
      'which a side view cannot see. "Relative to trunk" uses the hip → shoulder line as the reference instead.',
  },
  { id: 'knee', title: 'Knee', keys: ['knee_flexion_initial_contact', 'knee_flexion_peak_stance'] },
  {
    id: 'shank-foot',
    title: 'Shank & foot',
    keys: ['shank_angle_initial_contact', 'foot_angle_initial_contact'],
  },
  { id: 'trunk', title: 'Trunk', keys: ['trunk_lean'] },
  { id: 'timing', title: 'Timing', keys: ['cadence', 'step_time', 'stride_time', 'contact_time', 'flight_time', 'duty_factor'] },
  { id: 'lengths', title: 'Lengths', keys: ['step_length', 'stride_length', 'heel_ahead_of_hip_initial_contact', 'vertical_oscillation'] },
  { id: 'symmetry', title: 'Symmetry', keys: ['symmetry_contact_time', 'symmetry_hip_extension_toe_off'] },
];

export interface MeasureGroup {
  def: MeasureGroupDef;
  measures: Measure[];
}

/** Measures sorted into the panel's groups (keys in group order, left before right). */
export function groupMeasures(measures: readonly Measure[]): MeasureGroup[] {
  const known = new Set(MEASURE_GROUPS.flatMap((g) => g.keys));
  const sideRank = (m: Measure) => (m.side === 'left' ? 0 : m.side === 'right' ? 1 : 2);
  const groups = MEASURE_GROUPS.map((def) => ({
    def,
    measures: measures
      .filter((m) => def.keys.includes(m.key))
      .sort((a, b) => def.keys.indexOf(a.key) - def.keys.indexOf(b.key) || sideRank(a) - sideRank(b)),
  }));
  const other = measures.filter((m) => !known.has(m.key));
  if (other.length) groups.push({ def: { id: 'other', title: 'Other', keys: [] }, measures: [...other] });
  return groups.filter((g) => g.measures.length > 0);
}

/** "Left · Toe-off", "Right", "Both sides". */
export function measureContext(m: Pick<Measure, 'side' | 'event'>): string {
  const side = m.side === 'left' ? 'Left' : m.side === 'right' ? 'Right' : 'Both sides';
  return m.event ? `${side} · ${GAIT_EVENT_LABELS[m.event]}` : side;
}

/** "n = 5 steps", with the reliability note under seven. */
export function stepsText(m: Pick<Measure, 'n' | 'status'>): { text: string; few: boolean } {
  const few = m.n < MIN_RELIABLE_STEPS;
  const text = `n = ${m.n} ${m.n === 1 ? 'step' : 'steps'}`;
  return { text: few ? `${text} (fewer than ${MIN_RELIABLE_STEPS}: less reliable)` : text, few };
}

export interface BandFlag {
  icon: string;
  text: string;
  outside: boolean;
}

/** Icon and words for where the mean sits against the band (never colour alone). */
export function bandFlag(evaluation: BandEvaluation): BandFlag {
  switch (evaluation.position) {
    case 'below':
      return { icon: 'south', text: 'Below the reference band', outside: true };
    case 'above':
      return { icon: 'north', text: 'Above the reference band', outside: true };
    default:
      return { icon: 'check', text: 'Within the reference band', outside: false };
  }
}

export const EVIDENCE_LABELS: Record<ReferenceBand['evidence'], string> = {
  pub: 'Published figure',
  mem: 'From memory, not re-read',
  trade: 'Common practice in the trade',
  calc: 'Worked example',
};

export type FootStrikeClass = 'rearfoot' | 'midfoot' | 'forefoot';

export const FOOT_STRIKE_LABELS: Record<FootStrikeClass, string> = {
  rearfoot: 'Rearfoot strike',
  midfoot: 'Midfoot strike',
  forefoot: 'Forefoot strike',
};

/** Source of the foot-strike cut-offs used below. */
export const FOOT_STRIKE_SOURCE = 'Cut-offs: forefoot ≤ −0.8°, rearfoot ≥ 7.4°, midfoot between (Mo et al. 2021, Res Sports Med).';

/**
 * Foot-strike class from the foot angle at initial contact (toe up +), by the kinematics module's
 * classifier. The published cut-offs are for the foot angle relative to standing; this screen's
 * foot angle is from horizontal, so the class is a guide (the panel says so).
 */
export function footStrikeClass(footAngleDeg: number | null): FootStrikeClass | null {
  if (footAngleDeg === null || !Number.isFinite(footAngleDeg)) return null;
  return classifyFootStrike(footAngleDeg);
}
