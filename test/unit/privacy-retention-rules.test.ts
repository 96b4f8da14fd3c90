import { describe, expect, it } from 'vitest';
import { latestOf, pastRetention, retentionCutoff } from '../../server/privacy/retention-rules';

// Calendar arithmetic worked out by hand [calc].
describe('retention rules', () => {
  it('the cutoff is the same day and time N calendar months back, clamped to a shorter month’s end', () => {
    expect(retentionCutoff(new Date('2026-12-05T10:00:00Z'), 6).toISOString()).toBe('2026-06-05T10:00:00.000Z');
    expect(retentionCutoff(new Date('2027-03-31T08:30:00Z'), 1).toISOString()).toBe('2027-02-28T08:30:00.000Z');
    expect(retentionCutoff(new Date('2028-03-31T00:00:00Z'), 1).toISOString()).toBe('2028-02-29T00:00:00.000Z');
    expect(retentionCutoff(new Date('2027-01-15T00:00:00Z'), 13).toISOString()).toBe('2025-12-15T00:00:00.000Z');
  });

  it('an athlete is past retention only when their last activity is before the cutoff; a date counts to its end', () => {
    const now = new Date('2026-12-05T12:00:00Z');
    expect(pastRetention('2026-06-05T11:59:59Z', 6, now)).toBe(true);
    expect(pastRetention('2026-06-05T12:00:00Z', 6, now)).toBe(false);
    expect(pastRetention('2026-06-04', 6, now)).toBe(true);
    expect(pastRetention('2026-06-05', 6, now)).toBe(false);
    expect(pastRetention('not a date', 6, now)).toBe(false);
  });

  it('the last activity is the latest of dates and times, a date counting to its end', () => {
    expect(latestOf(['2026-01-02T10:00:00Z', null, '2026-01-02', undefined])).toBe('2026-01-02');
    expect(latestOf(['2026-01-01', '2026-01-02T00:00:01Z'])).toBe('2026-01-02T00:00:01Z');
    expect(latestOf([null])).toBeNull();
  });
});
