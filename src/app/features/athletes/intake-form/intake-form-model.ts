/**
 * The intake form's shape, validators and the mapping between the API's `AthleteDetail` /
 * `AthleteIntake` and the form's value. No DOM here: everything is testable on its own.
 */
import {
  AbstractControl,
  FormArray,
  FormControl,
  FormGroup,
  NonNullableFormBuilder,
  ValidationErrors,
  ValidatorFn,
  Validators,
} from '@angular/forms';
import type { AthleteDetail, AthleteIntake, InjuryEntry, PainEntry } from '../../../../contracts/api';
import {
  BodyRegion,
  BodySide,
  DistanceUnit,
  InjuryStatus,
  LIMITS,
  PAIN_MAX,
  PAIN_MIN,
  SURFACES,
  Surface,
  fromKilometres,
  toKilometres,
} from '../../../../contracts/intake';
import { parseIsoDate, parseMonthText, toIsoDate } from '../../../shared/dates';
import { notFutureDate, pastMonth } from '../../../shared/forms/validators';

export type InjuryRowForm = FormGroup<{
  id: FormControl<number | null>;
  region: FormControl<BodyRegion | null>;
  side: FormControl<BodySide | null>;
  when: FormControl<string>;
  status: FormControl<InjuryStatus | null>;
  notes: FormControl<string>;
}>;

export type PainRowForm = FormGroup<{
  region: FormControl<BodyRegion | null>;
  score: FormControl<number>;
}>;

export type IntakeFormGroup = FormGroup<{
  dateOfBirth: FormControl<Date | null>;
  heightCm: FormControl<number | null>;
  distanceUnit: FormControl<DistanceUnit>;
  weeklyDistance: FormControl<number | null>;
  longestRecentRun: FormControl<number | null>;
  goalEvent: FormControl<string>;
  goalDate: FormControl<Date | null>;
  surfaces: FormControl<Surface[]>;
  injuries: FormArray<InjuryRowForm>;
  pain: FormArray<PainRowForm>;
  consents: FormGroup<{ videoRecording: FormControl<boolean>; shareStills: FormControl<boolean> }>;
}>;

export type InjuryRowValue = ReturnType<InjuryRowForm['getRawValue']>;
export type PainRowValue = ReturnType<PainRowForm['getRawValue']>;
export type IntakeFormValue = ReturnType<IntakeFormGroup['getRawValue']>;

/** Largest distance accepted for `unit`, from a limit that is defined in kilometres. */
export function distanceMax(limitKm: { max: number }, unit: DistanceUnit): number {
  return fromKilometres(limitKm.max, unit);
}

/**
 * A distance typed in `from` expressed in `to` (1 mi = 1.609344 km), rounded to 0.1 as the form
 * shows it. The same unit, an empty field or a non-number leave the value as it is.
 */
export function convertDistance(value: number | null, from: DistanceUnit, to: DistanceUnit): number | null {
  if (value === null || value === undefined || !Number.isFinite(value) || from === to) return value;
  return fromKilometres(toKilometres(value, from), to);
}

/**
 * A distance within a kilometre-based limit, converted to the unit chosen in the sibling
 * `distanceUnit` control. Errors use the standard `min` / `max` keys.
 */
export function distanceWithin(limitKm: { min: number; max: number }): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const value = control.value as number | null;
    if (value === null || value === undefined || Number.isNaN(value)) return null;
    const unit = (control.parent?.get('distanceUnit')?.value as DistanceUnit | undefined) ?? 'km';
    const min = fromKilometres(limitKm.min, unit);
    const max = distanceMax(limitKm, unit);
    if (value < min) return { min: { min, actual: value } };
    if (value > max) return { max: { max, actual: value } };
    return null;
  };
}

/** Regions chosen more than once among the pain rows, in first-seen order. */
export function duplicateRegions(rows: readonly { region: BodyRegion | null }[]): BodyRegion[] {
  const seen = new Set<BodyRegion>();
  const dupes = new Set<BodyRegion>();
  for (const { region } of rows) {
    if (!region) continue;
    if (seen.has(region)) dupes.add(region);
    seen.add(region);
  }
  return [...dupes];
}

/** Pain list validator: each region at most once. Error: `{ duplicateRegions: BodyRegion[] }`. */
export const uniquePainRegions: ValidatorFn = (control: AbstractControl): ValidationErrors | null => {
  const rows = (control.value ?? []) as { region: BodyRegion | null }[];
  const dupes = duplicateRegions(rows);
  return dupes.length ? { duplicateRegions: dupes } : null;
};

/** Whole numbers only. Error: `{ integer: true }`. */
export const integer: ValidatorFn = (control: AbstractControl): ValidationErrors | null => {
  const value = control.value as number | null;
  return value === null || value === undefined || Number.isInteger(value) ? null : { integer: true };
};

/** A new injury-history row (empty, or filled from `entry`). */
export function createInjuryRow(
  fb: NonNullableFormBuilder,
  entry?: Partial<InjuryRowValue>,
  today: () => Date = () => new Date(),
): InjuryRowForm {
  return fb.group({
    id: fb.control<number | null>(entry?.id ?? null),
    region: fb.control<BodyRegion | null>(entry?.region ?? null, Validators.required),
    side: fb.control<BodySide | null>(entry?.side ?? null, Validators.required),
    when: fb.control(entry?.when ?? '', [Validators.required, pastMonth(today)]),
    status: fb.control<InjuryStatus | null>(entry?.status ?? null, Validators.required),
    notes: fb.control(entry?.notes ?? '', Validators.maxLength(LIMITS.injuryNotes)),
  });
}

/** A new current-pain row (empty, or filled from `entry`). */
export function createPainRow(fb: NonNullableFormBuilder, entry?: Partial<PainRowValue>): PainRowForm {
  return fb.group({
    region: fb.control<BodyRegion | null>(entry?.region ?? null, Validators.required),
    score: fb.control(entry?.score ?? 0, [Validators.required, Validators.min(PAIN_MIN), Validators.max(PAIN_MAX), integer]),
  });
}

/** The whole intake form, empty. Fill it with `setIntakeFormValue`. */
export function createIntakeForm(fb: NonNullableFormBuilder, today: () => Date = () => new Date()): IntakeFormGroup {
  return fb.group({
    dateOfBirth: fb.control<Date | null>(null, notFutureDate(today)),
    heightCm: fb.control<number | null>(null, [Validators.min(LIMITS.heightCm.min), Validators.max(LIMITS.heightCm.max)]),
    distanceUnit: fb.control<DistanceUnit>('km'),
    weeklyDistance: fb.control<number | null>(null, distanceWithin(LIMITS.weeklyKm)),
    longestRecentRun: fb.control<number | null>(null, distanceWithin(LIMITS.longestRunKm)),
    goalEvent: fb.control('', Validators.maxLength(LIMITS.goalEvent)),
    goalDate: fb.control<Date | null>(null),
    surfaces: fb.control<Surface[]>([]),
    injuries: fb.array<InjuryRowForm>([], Validators.maxLength(LIMITS.injuries)),
    pain: fb.array<PainRowForm>([], uniquePainRegions),
    consents: fb.group({
      videoRecording: fb.control(false),
      shareStills: fb.control(false),
    }),
  });
}

/** What the form shows for an athlete as the API sent it. */
export function detailToFormValue(detail: AthleteDetail): IntakeFormValue {
  return {
    dateOfBirth: parseIsoDate(detail.dateOfBirth),
    heightCm: detail.heightCm,
    distanceUnit: detail.distanceUnit ?? 'km',
    weeklyDistance: detail.weeklyDistance,
    longestRecentRun: detail.longestRecentRun,
    goalEvent: detail.goalEvent ?? '',
    goalDate: parseIsoDate(detail.goalDate),
    surfaces: [...(detail.surfaces ?? [])],
    injuries: (detail.injuries ?? []).map((i) => ({
      id: i.id ?? null,
      region: i.region,
      side: i.side,
      when: i.when,
      status: i.status,
      notes: i.notes ?? '',
    })),
    pain: (detail.pain ?? []).map((p) => ({ region: p.region, score: p.score })),
    consents: {
      videoRecording: detail.consents?.videoRecording?.granted ?? false,
      shareStills: detail.consents?.shareStills?.granted ?? false,
    },
  };
}

/**
 * Replaces the form's content with `value`, rebuilding the injury and pain rows, and marks the
 * form pristine (nothing unsaved).
 */
export function setIntakeFormValue(
  form: IntakeFormGroup,
  fb: NonNullableFormBuilder,
  value: IntakeFormValue,
  today: () => Date = () => new Date(),
): void {
  const { injuries, pain, ...rest } = value;
  // Reuse existing row controls where possible so the rendered rows stay in place.
  resizeRows(form.controls.injuries, injuries.length, () => createInjuryRow(fb, undefined, today));
  resizeRows(form.controls.pain, pain.length, () => createPainRow(fb));
  injuries.forEach((row, i) => form.controls.injuries.at(i).setValue(row, { emitEvent: false }));
  pain.forEach((row, i) => form.controls.pain.at(i).setValue(row, { emitEvent: false }));
  form.patchValue(rest);
  form.markAsPristine();
  form.markAsUntouched();
}

function resizeRows<T extends AbstractControl>(list: FormArray<T>, length: number, create: () => T): void {
  while (list.length > length) list.removeAt(list.length - 1, { emitEvent: false });
  while (list.length < length) list.push(create(), { emitEvent: false });
}

function trimmedOrNull(text: string): string | null {
  const trimmed = text.trim();
  return trimmed === '' ? null : trimmed;
}

function finiteOrNull(value: number | null): number | null {
  return value === null || value === undefined || !Number.isFinite(value) ? null : value;
}

/**
 * The `PUT /api/athletes/:id/intake` body for a (valid) form value: dates as `YYYY-MM-DD`,
 * empty text as null, text trimmed, surfaces in the vocabulary's order without repeats.
 * Injury and pain rows without a region cannot pass validation; if one slips through it is left
 * out rather than sent half-empty.
 */
export function formValueToIntake(value: IntakeFormValue): AthleteIntake {
  const chosen = new Set(value.surfaces);
  const injuries: InjuryEntry[] = [];
  for (const row of value.injuries) {
    if (!row.region || !row.side || !row.status) continue;
    const entry: InjuryEntry = {
      region: row.region,
      side: row.side,
      when: parseMonthText(row.when) ?? row.when.trim(),
      status: row.status,
      notes: row.notes.trim(),
    };
    if (row.id !== null) entry.id = row.id;
    injuries.push(entry);
  }
  const pain: PainEntry[] = [];
  for (const row of value.pain) {
    if (row.region) pain.push({ region: row.region, score: row.score });
  }
  return {
    dateOfBirth: toIsoDate(value.dateOfBirth),
    heightCm: finiteOrNull(value.heightCm),
    distanceUnit: value.distanceUnit,
    weeklyDistance: finiteOrNull(value.weeklyDistance),
    longestRecentRun: finiteOrNull(value.longestRecentRun),
    goalEvent: trimmedOrNull(value.goalEvent),
    goalDate: toIsoDate(value.goalDate),
    surfaces: SURFACES.filter((s) => chosen.has(s)),
    injuries,
    pain,
    consents: {
      videoRecording: value.consents.videoRecording,
      shareStills: value.consents.shareStills,
    },
  };
}
