import { TestBed } from '@angular/core/testing';
import { DateAdapter, MAT_DATE_FORMATS } from '@angular/material/core';
import { ISO_DATE_FORMATS, ISO_DATE_INPUT, IsoDateAdapter, provideIsoDateAdapter } from './iso-date-adapter';

describe('IsoDateAdapter', () => {
  let adapter: IsoDateAdapter;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideIsoDateAdapter()] });
    adapter = TestBed.inject(DateAdapter) as IsoDateAdapter;
  });

  it('is what the app provides, with the ISO input format', () => {
    expect(adapter).toBeInstanceOf(IsoDateAdapter);
    expect(TestBed.inject(MAT_DATE_FORMATS)).toBe(ISO_DATE_FORMATS);
    expect(ISO_DATE_FORMATS.parse.dateInput).toBe('YYYY-MM-DD');
    expect(ISO_DATE_FORMATS.display.dateInput).toBe('YYYY-MM-DD');
  });

  it('formats a local date as YYYY-MM-DD', () => {
    expect(adapter.format(new Date(1990, 3, 5), ISO_DATE_INPUT)).toBe('1990-04-05');
    expect(adapter.format(new Date(2024, 11, 31, 23, 59), ISO_DATE_INPUT)).toBe('2024-12-31');
  });

  it('parses YYYY-MM-DD to local midnight and round-trips', () => {
    const parsed = adapter.parse('1990-04-05', ISO_DATE_INPUT)!;
    expect(adapter.isValid(parsed)).toBe(true);
    expect([parsed.getFullYear(), parsed.getMonth(), parsed.getDate(), parsed.getHours()]).toEqual([1990, 3, 5, 0]);
    for (const text of ['2000-01-01', '2020-02-29', '1999-12-31', '2031-07-15']) {
      expect(adapter.format(adapter.parse(text, ISO_DATE_INPUT)!, ISO_DATE_INPUT)).toBe(text);
    }
    expect(adapter.parse('  2021-06-30 ', ISO_DATE_INPUT)!.getDate()).toBe(30);
  });

  it('treats empty text as no date', () => {
    expect(adapter.parse('', ISO_DATE_INPUT)).toBeNull();
    expect(adapter.parse('   ', ISO_DATE_INPUT)).toBeNull();
    expect(adapter.parse(null, ISO_DATE_INPUT)).toBeNull();
  });

  it('rejects other shapes instead of guessing the order', () => {
    for (const text of ['04/05/1990', '05.04.1990', '1990/04/05', '1990-4-5', 'April 5 1990', '19900405']) {
      const parsed = adapter.parse(text, ISO_DATE_INPUT);
      expect(parsed, text).not.toBeNull();
      expect(adapter.isValid(parsed!), text).toBe(false);
    }
  });

  it('rejects days that do not exist', () => {
    for (const text of ['2020-02-30', '2021-02-29', '2020-13-01', '2020-04-31', '2020-00-10']) {
      expect(adapter.isValid(adapter.parse(text, ISO_DATE_INPUT)!), text).toBe(false);
    }
  });

  it('keeps calendar labels in words', () => {
    expect(adapter.format(new Date(2020, 1, 3), ISO_DATE_FORMATS.display.monthYearA11yLabel)).toMatch(/February.*2020/);
  });
});
