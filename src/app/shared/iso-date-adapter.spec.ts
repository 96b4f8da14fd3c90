import { LOCALE_ID } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { DateAdapter, MAT_DATE_FORMATS } from '@angular/material/core';
import { DATE_FIELD_DISPLAY, DATE_TEXT_INPUT, ISO_DATE_FORMATS, IsoDateAdapter, provideIsoDateAdapter } from './iso-date-adapter';
import { parseMonthText, toIsoDate } from './dates';

describe("IsoDateAdapter (the app's en-GB date fields)", () => {
  let adapter: IsoDateAdapter;
  const parse = (text: string) => adapter.parse(text, DATE_TEXT_INPUT);
  const iso = (text: string) => {
    const d = parse(text);
    return d && adapter.isValid(d) ? toIsoDate(d) : 'invalid';
  };

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideIsoDateAdapter(), { provide: LOCALE_ID, useValue: 'en-GB' }] });
    adapter = TestBed.inject(DateAdapter) as IsoDateAdapter;
  });

  it('is what the app provides: typed text read by parseDateText, the field showing the date in words', () => {
    expect(adapter).toBeInstanceOf(IsoDateAdapter);
    expect(TestBed.inject(MAT_DATE_FORMATS)).toBe(ISO_DATE_FORMATS);
    expect(ISO_DATE_FORMATS.parse.dateInput).toBe(DATE_TEXT_INPUT);
    expect(ISO_DATE_FORMATS.display.dateInput).toBe(DATE_FIELD_DISPLAY);
  });

  it('shows a date in words, as the app shows dates elsewhere (d MMM y, en-GB)', () => {
    expect(adapter.format(new Date(1990, 3, 5), DATE_FIELD_DISPLAY)).toBe('5 Apr 1990');
    expect(adapter.format(new Date(2024, 11, 31, 23, 59), DATE_FIELD_DISPLAY)).toBe('31 Dec 2024');
  });

  it('reads ISO, day/month/year (en-GB order) and words, to local midnight, and round-trips what it shows', () => {
    const parsed = parse('1990-04-05')!;
    expect([parsed.getFullYear(), parsed.getMonth(), parsed.getDate(), parsed.getHours()]).toEqual([1990, 3, 5, 0]);
    expect(iso('14/03/2024')).toBe('2024-03-14');
    expect(iso('4/5/1990')).toBe('1990-05-04'); // day first, as en-GB writes it
    expect(iso('14.03.2024')).toBe('2024-03-14');
    expect(iso('14 Mar 2024')).toBe('2024-03-14');
    expect(iso('14 march 2024')).toBe('2024-03-14');
    expect(iso('5 Sept 2026')).toBe('2026-09-05');
    expect(iso('  2021-06-30 ')).toBe('2021-06-30');
    for (const d of [new Date(2000, 0, 1), new Date(2020, 1, 29), new Date(2026, 8, 5), new Date(1999, 11, 31)]) {
      expect(toIsoDate(parse(adapter.format(d, DATE_FIELD_DISPLAY)))).toBe(toIsoDate(d));
    }
  });

  it('treats empty text as no date', () => {
    expect(parse('')).toBeNull();
    expect(parse('   ')).toBeNull();
    expect(adapter.parse(null, DATE_TEXT_INPUT)).toBeNull();
  });

  it('refuses other shapes instead of guessing (two-digit years, month first in words, run-together digits)', () => {
    for (const text of ['04/05/90', '1990/04/05', '1990-4-5', 'April 5 1990', '19900405', '5 Ap 1990', 'soon']) {
      expect(iso(text), text).toBe('invalid');
    }
  });

  it('refuses days that do not exist', () => {
    for (const text of ['2020-02-30', '29/02/2021', '2020-13-01', '31/04/2020', '0/10/2020', '30 Feb 2020']) {
      expect(iso(text), text).toBe('invalid');
    }
  });

  it('keeps calendar labels in words', () => {
    expect(adapter.format(new Date(2020, 1, 3), ISO_DATE_FORMATS.display.monthYearA11yLabel)).toMatch(/February.*2020/);
  });
});

describe('parseMonthText (a month typed where the browser has no month picker)', () => {
  it('reads 2024-03, 03/2024, 3.2024, Mar 2024 and March 2024 as 2024-03', () => {
    for (const text of ['2024-03', '03/2024', '3/2024', '3.2024', 'Mar 2024', 'March 2024', ' mar. 2024 ']) {
      expect(parseMonthText(text), text).toBe('2024-03');
    }
    expect(parseMonthText('Sept 2026')).toBe('2026-09');
  });

  it('refuses anything else', () => {
    for (const text of ['', '2024-3', '13/2024', '0/2024', 'Ma 2024', '2024', 'March', '03/24']) {
      expect(parseMonthText(text), text).toBeNull();
    }
  });
});
