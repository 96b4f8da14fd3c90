/**
 * The reference-band form: what each field holds, its checks, and the conversion to the API body.
 * Pure apart from Angular's form classes.
 */
import { AbstractControl, FormControl, FormGroup, ValidationErrors, ValidatorFn, Validators } from '@angular/forms';
import type { MeasureKey, ReferenceBand } from '../../../contracts/measures';
import { MEASURE_DEFINITIONS } from '../../../kinematics/measure-definitions';
import type { ReferenceBandWrite } from '../../core/data/reference-bands-api';

/** On-screen names of the measures a band can belong to. */
export const MEASURE_LABELS: Record<MeasureKey, string> = {
  hip_extension_toe_off: 'Hip extension at toe-off (thigh from vertical)',
  hip_extension_toe_off_rel_trunk: 'Hip extension at toe-off, relative to trunk',
  knee_flexion_initial_contact: 'Knee flexion at initial contact',
  knee_flexion_peak_stance: 'Peak knee flexion in stance',
  shank_angle_initial_contact: 'Shank angle at initial contact',
  foot_angle_initial_contact: 'Foot angle at initial contact',
  trunk_lean: 'Trunk lean',
  heel_ahead_of_hip_initial_contact: 'Heel ahead of hip at initial contact',
  cadence: 'Cadence',
  step_time: 'Step time',
  stride_time: 'Stride time',
  step_length: 'Step length',
  stride_length: 'Stride length',
  contact_time: 'Contact time',
  flight_time: 'Flight time',
  duty_factor: 'Duty factor',
  vertical_oscillation: 'Vertical oscillation',
  symmetry_contact_time: 'Contact time symmetry',
  symmetry_hip_extension_toe_off: 'Hip extension symmetry',
};

export const MEASURE_KEYS = Object.keys(MEASURE_LABELS) as MeasureKey[];

export const EVIDENCE_OPTIONS: { value: ReferenceBand['evidence']; label: string }[] = [
  { value: 'pub', label: 'Published figure (read in the source)' },
  { value: 'mem', label: 'From memory (not re-read)' },
  { value: 'trade', label: 'Common practice in the trade' },
  { value: 'calc', label: 'Worked example (calculated)' },
];

/** Longest texts of a band, characters. */
export const BAND_TEXT_LIMITS = { unit: 20, context: 200, source: 300 } as const;

export type BandForm = FormGroup<{
  low: FormControl<number | null>;
  high: FormControl<number | null>;
  unit: FormControl<string>;
  context: FormControl<string>;
  source: FormControl<string>;
  evidence: FormControl<ReferenceBand['evidence']>;
}>;

/** Group check: at least one limit, and the lower one not above the upper one. */
export const bandLimitsValidator: ValidatorFn = (group: AbstractControl): ValidationErrors | null => {
  const low = group.get('low')?.value as number | null;
  const high = group.get('high')?.value as number | null;
  if (low === null && high === null) return { noLimits: true };
  if (low !== null && high !== null && low > high) return { lowAboveHigh: true };
  return null;
};

const notBlank: ValidatorFn = (c) => (typeof c.value === 'string' && c.value.trim() === '' ? { required: true } : null);
const finite: ValidatorFn = (c) => (c.value === null || Number.isFinite(c.value) ? null : { number: true });

export function bandForm(band: ReferenceBand): BandForm {
  return new FormGroup(
    {
      low: new FormControl<number | null>(band.low, { validators: [finite] }),
      high: new FormControl<number | null>(band.high, { validators: [finite] }),
      unit: new FormControl(band.unit, {
        nonNullable: true,
        validators: [Validators.required, notBlank, Validators.maxLength(BAND_TEXT_LIMITS.unit)],
      }),
      context: new FormControl(band.context, {
        nonNullable: true,
        validators: [Validators.required, notBlank, Validators.maxLength(BAND_TEXT_LIMITS.context)],
      }),
      source: new FormControl(band.source, {
        nonNullable: true,
        validators: [Validators.required, notBlank, Validators.maxLength(BAND_TEXT_LIMITS.source)],
      }),
      evidence: new FormControl(band.evidence, { nonNullable: true, validators: [Validators.required] }),
    },
    { validators: [bandLimitsValidator] },
  );
}

/** The body to send for a form's value (texts trimmed). */
export function bandWrite(value: ReturnType<BandForm['getRawValue']>): ReferenceBandWrite {
  return {
    low: value.low,
    high: value.high,
    unit: value.unit.trim(),
    context: value.context.trim(),
    source: value.source.trim(),
    evidence: value.evidence,
  };
}

/** The unit a band for `key` must be given in: the measure's own (the server refuses any other). */
export function unitOf(key: MeasureKey): string {
  return MEASURE_DEFINITIONS[key]?.unit ?? '';
}

/** A band for a measure that has none yet (the owner fills in the rest). */
export function blankBand(key: MeasureKey): ReferenceBand {
  return { key, low: null, high: null, unit: unitOf(key), context: '', source: '', evidence: 'pub' };
}

/** Whether `band` is the shipped default for its measure (same limits, unit and texts). */
export function isDefaultBand(band: ReferenceBand, defaults: readonly ReferenceBand[]): boolean {
  const d = defaults.find((x) => x.key === band.key);
  return (
    !!d &&
    d.low === band.low &&
    d.high === band.high &&
    d.unit === band.unit &&
    d.context === band.context &&
    d.source === band.source &&
    d.evidence === band.evidence
  );
}

/** Whether a default exists to go back to. */
export function hasDefault(key: MeasureKey, defaults: readonly ReferenceBand[]): boolean {
  return defaults.some((d) => d.key === key);
}

/** Bands in the order of `MEASURE_KEYS`. */
export function sortBands(bands: readonly ReferenceBand[]): ReferenceBand[] {
  return [...bands].sort((a, b) => MEASURE_KEYS.indexOf(a.key) - MEASURE_KEYS.indexOf(b.key));
}
