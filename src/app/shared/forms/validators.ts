import { AbstractControl, ValidationErrors, ValidatorFn } from '@angular/forms';
import { parseMonthText, startOfDay, toIsoMonth } from '../dates';

/** `YYYY-MM` with a real month number. */
export const MONTH_PATTERN = /^\d{4}-(0[1-9]|1[0-2])$/;

/**
 * The control must equal the sibling control `otherName` (e.g. "confirm password").
 * Error: `{ mismatch: true }`. Re-run it when the other control changes.
 */
export function sameAs(otherName: string): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const other = control.parent?.get(otherName);
    if (!other || !control.value) return null;
    return control.value === other.value ? null : { mismatch: true };
  };
}

/** A `Date` value must not be after `today()`. Error: `{ futureDate: true }`. */
export function notFutureDate(today: () => Date = () => new Date()): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const value = control.value as unknown;
    if (!(value instanceof Date) || Number.isNaN(value.getTime())) return null;
    return startOfDay(value) > startOfDay(today()) ? { futureDate: true } : null;
  };
}

/**
 * A month value — `YYYY-MM` from a month picker, or typed where the browser has none: `03/2024`,
 * `Mar 2024` ({@link parseMonthText}) — must be a real month (`{ pattern }`) and not after the
 * current month (`{ futureMonth: true }`). Empty values pass; combine with `Validators.required`.
 */
export function pastMonth(today: () => Date = () => new Date()): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const value = control.value as unknown;
    if (typeof value !== 'string' || value === '') return null;
    const month = parseMonthText(value);
    if (month === null) return { pattern: { requiredPattern: 'YYYY-MM', actualValue: value } };
    return month > toIsoMonth(today()) ? { futureMonth: true } : null;
  };
}

/** Trimmed text must not be empty (a name of spaces is not a name). Error: `{ required: true }`. */
export const requiredTrimmed: ValidatorFn = (control: AbstractControl): ValidationErrors | null =>
  typeof control.value === 'string' && control.value.trim() === '' ? { required: true } : null;

/**
 * A number control must hold a whole number (a quantity); empty passes (combine with
 * `Validators.required`). "1,5" read by `appDecimalInput` is 1.5 and is refused, not taken as 15.
 * Error: `{ wholeNumber: true }`.
 */
export const wholeNumber: ValidatorFn = (control: AbstractControl): ValidationErrors | null => {
  const value = control.value as unknown;
  if (value === null || value === undefined || value === '') return null;
  return typeof value === 'number' && Number.isInteger(value) ? null : { wholeNumber: true };
};
