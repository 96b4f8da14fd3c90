/**
 * The assessment form's shape, validators and the mapping between the API's `Assessment` and
 * `AssessmentWrite` and the form's value. Speeds are typed as the coach reads them off the belt
 * or watch: km/h or mph as a number, paces as `m:ss` per km or per mile. No DOM here.
 */
import { AbstractControl, FormControl, FormGroup, NonNullableFormBuilder, ValidationErrors, ValidatorFn, Validators } from '@angular/forms';
import type { Assessment, AssessmentWrite } from '../../contracts/api';
import {
  AssessmentKind,
  BELT_SPEED_LIMITS_MPS,
  FilmSurface,
  INCLINE_LIMITS,
  SPEED_UNIT_LABELS,
  SpeedUnit,
  formatPace,
  fromMetresPerSecond,
  parsePace,
  toMetresPerSecond,
} from '../../contracts/assessment';
import type { DistanceUnit } from '../../contracts/intake';
import { parseIsoDate, toIsoDate } from './dates';

/**
 * Text limits of an assessment. They mirror the server's validation (not yet in
 * `src/contracts`); a longer text would still come back as a 422 on the field.
 */
export { ASSESSMENT_TEXT_LIMITS } from '../../contracts/assessment';
import { ASSESSMENT_TEXT_LIMITS } from '../../contracts/assessment';
/** Earliest visit date the server accepts. */
export const EARLIEST_ASSESSMENT_DATE = '2000-01-01';

export type SpeedFormGroup = FormGroup<{
  /** As typed: "12.5" for km/h or mph, "5:30" for a pace. Empty = not recorded. */
  value: FormControl<string>;
  unit: FormControl<SpeedUnit>;
}>;

export type AssessmentFormGroup = FormGroup<{
  date: FormControl<Date | null>;
  kind: FormControl<AssessmentKind>;
  surface: FormControl<FilmSurface>;
  speed: SpeedFormGroup;
  inclinePercent: FormControl<number | null>;
  shoes: FormControl<string>;
  cameraNotes: FormControl<string>;
  notes: FormControl<string>;
}>;

export type AssessmentFormValue = ReturnType<AssessmentFormGroup['getRawValue']>;

/** Paces are typed as minutes:seconds; speeds as a plain number. */
export function isPaceUnit(unit: SpeedUnit): boolean {
  return unit === 's_per_km' || unit === 's_per_mile';
}

/** How a speed reads on screen: "12.5 km/h", "7.8 mph", "5:30 min/km", "8:51 min/mile". */
export function formatSpeed(mps: number | null, unit: SpeedUnit): string {
  if (mps === null || !Number.isFinite(mps) || mps <= 0) return 'Not recorded';
  return `${speedToText(mps, unit)} ${SPEED_UNIT_LABELS[unit]}`;
}

/** The form's text for a stored speed: one decimal for km/h and mph, `m:ss` for paces. */
export function speedToText(mps: number, unit: SpeedUnit): string {
  const value = fromMetresPerSecond(mps, unit);
  return isPaceUnit(unit) ? formatPace(value) : String(Math.round(value * 10) / 10);
}

/**
 * Reads typed speed text in `unit`: km/h and mph as a positive number (a decimal comma is
 * fine), paces with `parsePace` (`m:ss`, or minutes like "5.5") as seconds. Empty text is null
 * (no speed recorded); anything else that is not a speed is `'invalid'`.
 */
export function readSpeed(text: string, unit: SpeedUnit): number | null | 'invalid' {
  const t = text.trim();
  if (t === '') return null;
  if (isPaceUnit(unit)) {
    const seconds = parsePace(t);
    return seconds !== null && seconds > 0 ? seconds : 'invalid';
  }
  if (!/^\d+([.,]\d+)?$/.test(t)) return 'invalid';
  const value = Number(t.replace(',', '.'));
  return value > 0 ? value : 'invalid';
}

/**
 * Speed text typed in `from` re-expressed in `to` (when the coach switches the unit after
 * typing): "12" km/h → "7.5" mph → "8:03" min/mile. Text that is not a speed stays as typed.
 */
export function convertSpeedText(text: string, from: SpeedUnit, to: SpeedUnit): string {
  if (from === to) return text;
  const read = readSpeed(text, from);
  return typeof read === 'number' ? speedToText(toMetresPerSecond(read, from), to) : text;
}

/**
 * The accepted range (BELT_SPEED_LIMITS_MPS) as text in `unit`, rounded inwards so the values
 * shown are themselves accepted: "3.6"–"36" km/h, "1:40"–"16:40" min/km (fastest pace first).
 */
export function speedLimitsText(unit: SpeedUnit): { low: string; high: string } {
  const a = fromMetresPerSecond(BELT_SPEED_LIMITS_MPS.min, unit);
  const b = fromMetresPerSecond(BELT_SPEED_LIMITS_MPS.max, unit);
  const [lo, hi] = a < b ? [a, b] : [b, a];
  if (isPaceUnit(unit)) {
    return { low: formatPace(Math.ceil(lo - 1e-9)), high: formatPace(Math.floor(hi + 1e-9)) };
  }
  return { low: String(Math.ceil(lo * 10 - 1e-9) / 10), high: String(Math.floor(hi * 10 + 1e-9) / 10) };
}

/** Whether a speed typed in `unit` lies within BELT_SPEED_LIMITS_MPS once converted to m/s. */
export function speedInRange(value: number, unit: SpeedUnit): boolean {
  const mps = toMetresPerSecond(value, unit);
  return mps >= BELT_SPEED_LIMITS_MPS.min - 1e-9 && mps <= BELT_SPEED_LIMITS_MPS.max + 1e-9;
}

/**
 * Validator of the speed text; reads the unit from the sibling `unit` control.
 * Errors: `{ speedFormat: { pace } }` for text that is not a speed, `{ speedRange: { low, high } }`
 * outside the accepted range.
 */
export const speedValue: ValidatorFn = (control: AbstractControl): ValidationErrors | null => {
  const unit = (control.parent?.get('unit')?.value as SpeedUnit | undefined) ?? 'kmh';
  const read = readSpeed(String(control.value ?? ''), unit);
  if (read === null) return null;
  if (read === 'invalid') return { speedFormat: { pace: isPaceUnit(unit) } };
  return speedInRange(read, unit) ? null : { speedRange: speedLimitsText(unit) };
};

/** The message under the speed field for the control's error (empty when it has none). */
export function speedErrorText(control: AbstractControl, unit: SpeedUnit): string {
  const errors = control.errors;
  if (!errors) return '';
  if (typeof errors['server'] === 'string') return errors['server'];
  if (errors['speedFormat']) {
    return isPaceUnit(unit)
      ? `Enter a pace as minutes:seconds, e.g. ${unit === 's_per_km' ? '5:30' : '8:45'}`
      : `Enter a number, e.g. ${unit === 'kmh' ? '12.5' : '7.5'}`;
  }
  if (errors['speedRange']) {
    const { low, high } = errors['speedRange'] as { low: string; high: string };
    return isPaceUnit(unit)
      ? `Enter a pace between ${low} and ${high} ${SPEED_UNIT_LABELS[unit]}`
      : `Enter a speed between ${low} and ${high} ${SPEED_UNIT_LABELS[unit]}`;
  }
  return 'Speed is not valid';
}

/** Baseline for an athlete's first assessment, Re-test once a Baseline exists. */
export function defaultKind(existing: readonly Pick<Assessment, 'kind'>[]): AssessmentKind {
  return existing.some((a) => a.kind === 'baseline') ? 'retest' : 'baseline';
}

/** What a new assessment starts with. */
export function newAssessmentValue(kind: AssessmentKind, distanceUnit: DistanceUnit = 'km', today: Date = new Date()): AssessmentFormValue {
  return {
    date: new Date(today.getFullYear(), today.getMonth(), today.getDate()),
    kind,
    surface: 'treadmill',
    speed: { value: '', unit: distanceUnit === 'mi' ? 'mph' : 'kmh' },
    inclinePercent: null,
    shoes: '',
    cameraNotes: '',
    notes: '',
  };
}

/** The form's value for a stored assessment (editing). */
export function assessmentToFormValue(a: Assessment): AssessmentFormValue {
  return {
    date: parseIsoDate(a.date),
    kind: a.kind,
    surface: a.surface,
    speed: { value: a.speedMps !== null ? speedToText(a.speedMps, a.speedUnit) : '', unit: a.speedUnit },
    inclinePercent: a.inclinePercent,
    shoes: a.shoes ?? '',
    cameraNotes: a.cameraNotes ?? '',
    notes: a.notes ?? '',
  };
}

/** The assessment form, filled with `value`. Incline only applies on a treadmill. */
export function createAssessmentForm(fb: NonNullableFormBuilder, value: AssessmentFormValue): AssessmentFormGroup {
  const form: AssessmentFormGroup = fb.group({
    date: fb.control<Date | null>(value.date, Validators.required),
    kind: fb.control<AssessmentKind>(value.kind, Validators.required),
    surface: fb.control<FilmSurface>(value.surface, Validators.required),
    speed: fb.group({
      value: fb.control(value.speed.value, speedValue),
      unit: fb.control<SpeedUnit>(value.speed.unit),
    }),
    inclinePercent: fb.control<number | null>(value.inclinePercent, [
      Validators.min(INCLINE_LIMITS.min),
      Validators.max(INCLINE_LIMITS.max),
    ]),
    shoes: fb.control(value.shoes, Validators.maxLength(ASSESSMENT_TEXT_LIMITS.shoes)),
    cameraNotes: fb.control(value.cameraNotes, Validators.maxLength(ASSESSMENT_TEXT_LIMITS.cameraNotes)),
    notes: fb.control(value.notes, Validators.maxLength(ASSESSMENT_TEXT_LIMITS.notes)),
  });
  syncIncline(form);
  // The speed text is read in the chosen unit: check it again when the unit changes.
  const { value: speedText, unit } = form.controls.speed.controls;
  unit.valueChanges.subscribe(() => speedText.updateValueAndValidity());
  return form;
}

/** Enables the incline field on a treadmill and disables it elsewhere (hidden, not validated). */
export function syncIncline(form: AssessmentFormGroup): void {
  const incline = form.controls.inclinePercent;
  const treadmill = form.controls.surface.value === 'treadmill';
  if (treadmill && incline.disabled) incline.enable({ emitEvent: false });
  if (!treadmill && incline.enabled) incline.disable({ emitEvent: false });
}

function trimmedOrNull(text: string): string | null {
  const trimmed = text.trim();
  return trimmed === '' ? null : trimmed;
}

/**
 * The API body for a (valid) form value: date as `YYYY-MM-DD`; speed as typed in its unit
 * (paces in seconds) or null when left empty; incline only on a treadmill; empty text as null.
 */
export function formValueToWrite(value: AssessmentFormValue): AssessmentWrite {
  const read = readSpeed(value.speed.value, value.speed.unit);
  const incline = value.inclinePercent;
  return {
    date: toIsoDate(value.date) ?? '',
    kind: value.kind,
    surface: value.surface,
    speed: typeof read === 'number' ? { value: read, unit: value.speed.unit } : null,
    inclinePercent: value.surface === 'treadmill' && incline !== null && Number.isFinite(incline) ? incline : null,
    shoes: trimmedOrNull(value.shoes),
    cameraNotes: trimmedOrNull(value.cameraNotes),
    notes: trimmedOrNull(value.notes),
  };
}
