import { EnvironmentProviders, Injectable, makeEnvironmentProviders } from '@angular/core';
import { DateAdapter, MAT_DATE_FORMATS, MatDateFormats, NativeDateAdapter } from '@angular/material/core';
import { parseIsoDate, toIsoDate } from './dates';

/** The one format people type and read dates in: unambiguous in every locale. */
export const ISO_DATE_INPUT = 'YYYY-MM-DD';

/** Picker formats: the text field uses `YYYY-MM-DD`; calendar labels stay in words. */
export const ISO_DATE_FORMATS: MatDateFormats = {
  parse: { dateInput: ISO_DATE_INPUT },
  display: {
    dateInput: ISO_DATE_INPUT,
    monthYearLabel: { year: 'numeric', month: 'short' },
    dateA11yLabel: { year: 'numeric', month: 'long', day: 'numeric' },
    monthYearA11yLabel: { year: 'numeric', month: 'long' },
  },
};

/**
 * A `NativeDateAdapter` whose text form is `YYYY-MM-DD` (local calendar date), so "04/05/1990"
 * can never mean two different days. Typed text in any other shape, or a day that does not exist
 * (2020-02-30), parses as an invalid date: the datepicker then reports `matDatepickerParse` and the
 * field shows an error instead of guessing. Empty text is "no date" (null).
 */
@Injectable()
export class IsoDateAdapter extends NativeDateAdapter {
  override parse(value: unknown, parseFormat?: unknown): Date | null {
    if (value === null || value === undefined) return null;
    if (value instanceof Date) return this.clone(value);
    if (typeof value === 'number') return super.parse(value, parseFormat);
    const text = String(value).trim();
    if (text === '') return null;
    return parseIsoDate(text) ?? this.invalid();
  }

  override format(date: Date, displayFormat: object | string): string {
    if (displayFormat === ISO_DATE_INPUT) {
      const text = toIsoDate(date);
      if (text === null) throw Error('IsoDateAdapter: Cannot format invalid date.');
      return text;
    }
    return super.format(date, displayFormat as object);
  }
}

/** App-wide date adapter and formats for every `MatDatepicker`. */
export function provideIsoDateAdapter(): EnvironmentProviders {
  return makeEnvironmentProviders([
    { provide: DateAdapter, useClass: IsoDateAdapter },
    { provide: MAT_DATE_FORMATS, useValue: ISO_DATE_FORMATS },
  ]);
}
