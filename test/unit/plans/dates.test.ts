import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { addDays, daysBetween, isIsoDate, weekStart } from '../../../src/plans-rules';

describe('plan calendar days', () => {
  it('weeks start on Monday (ISO 8601): 2026-12-06 is a Sunday, 2026-12-07 a Monday', () => {
    expect(weekStart('2026-12-06')).toBe('2026-11-30');
    expect(weekStart('2026-12-07')).toBe('2026-12-07');
    expect(weekStart('2026-12-13')).toBe('2026-12-07');
    expect(weekStart('2027-01-01')).toBe('2026-12-28');
  });

  it('adds days across months, years and leap days', () => {
    expect(addDays('2028-02-28', 1)).toBe('2028-02-29');
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01');
    expect(addDays('2026-03-01', -1)).toBe('2026-02-28');
    expect(daysBetween('2026-12-01', '2026-12-15')).toBe(14);
  });

  it('knows real dates from look-alikes', () => {
    expect(isIsoDate('2026-02-28')).toBe(true);
    expect(isIsoDate('2026-02-30')).toBe(false);
    expect(isIsoDate('2026-2-3')).toBe(false);
  });

  it('property: weekStart is a Monday no more than 6 days before the date', () => {
    const day = fc.integer({ min: 0, max: 20_000 }).map((n) => addDays('2000-01-01', n));
    fc.assert(
      fc.property(day, (d) => {
        const w = weekStart(d);
        const gap = daysBetween(w, d);
        expect(gap).toBeGreaterThanOrEqual(0);
        expect(gap).toBeLessThanOrEqual(6);
        expect(new Date(`${w}T00:00:00Z`).getUTCDay()).toBe(1);
        expect(weekStart(addDays(w, 6))).toBe(w);
      }),
    );
  });
});
