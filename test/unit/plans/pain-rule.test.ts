/**
 * The pain-monitoring rule: pain during exercise may reach 5/10 if it settles by the next morning
 * and does not rise week to week — Silbernagel et al. 2007, Am J Sports Med 35:897–906, as listed
 * in REFERENCES.md with the [mem] tag: recalled from memory, not re-read. "Settled" as at most
 * 2/10 next morning is our operational default, marked common practice [trade].
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEFAULT_PAIN_RULE, type PainRule } from '../../../src/contracts/plans';
import { addDays, painAlerts, type PainLog } from '../../../src/plans-rules';

const TODAY = '2026-12-10'; // a Thursday; its week starts 2026-12-07
const log = (date: string, painDuring: number, morningPain: number | null = null): PainLog => ({ date, painDuring, morningPain });
const kinds = (logs: PainLog[], rule: PainRule = DEFAULT_PAIN_RULE, today = TODAY) => painAlerts(logs, rule, today).map((a) => a.kind);

describe('pain-monitoring rule (Silbernagel et al. 2007 [mem], from memory)', () => {
  it('default rule from memory: pain during may reach 5/10, not more', () => {
    expect(DEFAULT_PAIN_RULE.maxDuring).toBe(5);
    expect(DEFAULT_PAIN_RULE.noWeeklyRise).toBe(true);
    expect(DEFAULT_PAIN_RULE.morningMustSettle).toBe(true);
    expect(kinds([log('2026-12-09', 5, 1)])).toEqual([]);
    expect(kinds([log('2026-12-09', 6, 1)])).toEqual(['during_above_max']);
  });

  it('from memory: pain must settle by the next morning (settled = ≤ 2/10, common practice)', () => {
    expect(kinds([log('2026-12-09', 4, 2)])).toEqual([]);
    const alerts = painAlerts([log('2026-12-08', 3, 1), log('2026-12-09', 4, 4)], DEFAULT_PAIN_RULE, TODAY);
    expect(alerts).toEqual([
      { kind: 'not_settled', date: '2026-12-09', value: 4, limit: 2, message: 'Pain the morning after 9 Dec was 4/10; settled means at most 2/10.' },
    ]);
  });

  it('from memory: pain must not rise week to week (weekly means of pain during and of morning pain)', () => {
    const lastWeek = [log('2026-11-30', 2, 1), log('2026-12-02', 3, 1)]; // means 2.5 and 1.0
    const thisWeek = [log('2026-12-08', 3, 2), log('2026-12-09', 4, 1)]; // means 3.5 and 1.5
    const alerts = painAlerts([...lastWeek, ...thisWeek], DEFAULT_PAIN_RULE, TODAY);
    expect(alerts.map((a) => a.kind)).toEqual(['weekly_rise_during', 'weekly_rise_morning']);
    expect(alerts[0]).toMatchObject({ date: '2026-12-07', value: 3.5, limit: 2.5 });
    expect(alerts[0]!.message).toBe('Pain during rose week over week: mean 2.5/10 in the week of 30 Nov, 3.5/10 in the week of 7 Dec.');
    expect(alerts[1]).toMatchObject({ value: 1.5, limit: 1 });
  });

  it('from memory: steady or falling weekly pain is within the rule', () => {
    expect(kinds([log('2026-12-01', 4, 2), log('2026-12-08', 4, 2)])).toEqual([]);
    expect(kinds([log('2026-12-01', 5, 2), log('2026-12-08', 3, 1)])).toEqual([]);
  });

  it('compares only neighbouring weeks, and only while the latest session is recent', () => {
    // A gap week: nothing to compare with.
    expect(kinds([log('2026-11-24', 1, 0), log('2026-12-08', 4, 1)])).toEqual([]);
    // Latest session 3 weeks old: no rise alert any more.
    expect(kinds([log('2026-11-10', 1, 0), log('2026-11-17', 3, 1)])).toEqual([]);
    // The same pair 14 days before today still alerts.
    expect(kinds([log('2026-11-20', 1, 0), log('2026-11-27', 3, 1)], DEFAULT_PAIN_RULE, '2026-12-10')).toEqual(['weekly_rise_during', 'weekly_rise_morning']);
  });

  it('limit alerts look at the last 7 days only (today included) and name the worst session', () => {
    expect(kinds([log('2026-12-03', 8, 6)])).toEqual([]);
    const alerts = painAlerts([log('2026-12-04', 7), log('2026-12-06', 9), log('2026-12-09', 9)], DEFAULT_PAIN_RULE, TODAY);
    expect(alerts.find((a) => a.kind === 'during_above_max')).toMatchObject({ date: '2026-12-09', value: 9, limit: 5 });
  });

  it('a coach can edit the rule per plan: a stricter limit, or no morning or weekly checks', () => {
    const logs = [log('2026-12-01', 1, 0), log('2026-12-08', 4, 3)];
    expect(kinds(logs)).toEqual(['not_settled', 'weekly_rise_during', 'weekly_rise_morning']);
    expect(kinds(logs, { ...DEFAULT_PAIN_RULE, maxDuring: 3 })).toContain('during_above_max');
    expect(kinds(logs, { ...DEFAULT_PAIN_RULE, morningMustSettle: false, noWeeklyRise: false })).toEqual([]);
    expect(kinds(logs, { ...DEFAULT_PAIN_RULE, settledMorningMax: 3, noWeeklyRise: false })).toEqual([]);
  });

  it('sessions dated after today are ignored', () => {
    expect(kinds([log('2026-12-11', 9, 9)])).toEqual([]);
  });

  it('property: no alert ever fires when every score is 0', () => {
    const day = fc.integer({ min: -30, max: 0 }).map((n) => addDays(TODAY, n));
    fc.assert(fc.property(fc.array(day, { maxLength: 30 }), (days) => {
      expect(painAlerts(days.map((d) => log(d, 0, 0)), DEFAULT_PAIN_RULE, TODAY)).toEqual([]);
    }));
  });

  it('property: an alert about the limit fires exactly when a recent score is above it', () => {
    const entry = fc.record({ offset: fc.integer({ min: 0, max: 6 }), during: fc.integer({ min: 0, max: 10 }) });
    fc.assert(fc.property(fc.array(entry, { minLength: 1, maxLength: 20 }), fc.integer({ min: 0, max: 10 }), (entries, max) => {
      const logs = entries.map((e) => log(addDays(TODAY, -e.offset), e.during));
      const fired = kinds(logs, { ...DEFAULT_PAIN_RULE, maxDuring: max }).includes('during_above_max');
      expect(fired).toBe(entries.some((e) => e.during > max));
    }));
  });
});
