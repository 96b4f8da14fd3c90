import { EnvironmentProviders, Injectable, makeEnvironmentProviders } from '@angular/core';
import { DateAdapter, MAT_DATE_FORMATS, MatDateFormats, NativeDateAdapter } from '@angular/material/core';
import { parseDateText } from './dates';

/**
 * How a date field shows its date: in words, as the app shows dates everywhere else ("14 Mar 2024",
 * the en-GB `d MMM y`), so the day and month typed can never be read the wrong way round unseen.
 */
export const DATE_FIELD_DISPLAY = { day: 'numeric', month: 'short', year: 'numeric' } as const;

/** The name of the typed-text format ({@link parseDateText}: ISO, day/month/year, or words). */
export const DATE_TEXT_INPUT = 'date-text';

/** The hint under every date field: the en-GB order people type in, and the calendar. */
export const DATE_FIELD_HINT = 'Day/month/year, e.g. 14/03/2024';

/** Picker formats: the field shows the date in words, typed text is read by {@link parseDateText}. */
export const ISO_DATE_FORMATS: MatDateFormats = {
  parse: { dateInput: DATE_TEXT_INPUT },
  display: {
    dateInput: DATE_FIELD_DISPLAY,
    monthYearLabel: { year: 'numeric', month: 'short' },
    dateA11yLabel: { year: 'numeric', month: 'long', day: 'numeric' },
    monthYearA11yLabel: { year: 'numeric', month: 'long' },
  },
};

/**
 * A `NativeDateAdapter` for the app's locale (en-GB): typed text is `2024-03-14`, `14/03/2024` (day
 * first, four-digit year) or `14 Mar 2024`, and the field then shows the date in words in the
 * locale ("14 Mar 2024"), so which day was taken is always in sight. Any other shape, or a day that
 * does not exist (30/02/2020), parses as an invalid date: the datepicker reports
 * `matDatepickerParse`, the field shows an error and keeps the text typed. Empty text is "no date"
 * (null). What the API stores is unchanged: `toIsoDate` of the control's `Date`.
 */
@Injectable()
export class IsoDateAdapter extends NativeDateAdapter {
  override parse(value: unknown, parseFormat?: unknown): Date | null {
    if (value === null || value === undefined) return null;
    if (value instanceof Date) return this.clone(value);
    if (typeof value === 'number') return super.parse(value, parseFormat);
    const text = String(value).trim();
    if (text === '') return null;
    return parseDateText(text) ?? this.invalid();
  }
}

/** App-wide date adapter and formats for every `MatDatepicker`. */
export function provideIsoDateAdapter(): EnvironmentProviders {
  return makeEnvironmentProviders([
    { provide: DateAdapter, useClass: IsoDateAdapter },
    { provide: MAT_DATE_FORMATS, useValue: ISO_DATE_FORMATS },
  ]);
}
