/**
 * Edges of the plan rules that the worked cases in the other files leave open: which session an
 * alert names, future and same-day sessions, the 14-day window's last day, missing morning checks,
 * every criterion's words. Every expected value is worked out by hand in the comments; the pain
 * rule is the default of REFERENCES.md (Silbernagel et al. 2007 [mem], from memory) and the plans
 * are invented to test the logic.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEFAULT_PAIN_RULE, type ProgressionCriterion } from '../../../src/contracts/plans';
import {
  allSetsDone,
  checkCriterion,
  dayOf,
  describeCriterion,
  evaluateProgression,
  newestFirst,
  painAlerts,
  weeklyAdherence,
  weeklyMean,
  type PainLog,
  type StageLog,
} from '../../../src/plans-rules';
import { dayText } from '../../../src/plans-rules/dates';

const TODAY = '2026-12-10'; // a Thursday; its week starts Monday 2026-12-07
const log = (date: string, painDuring: number, morningPain: number | null = null): PainLog => ({ date, painDuring, morningPain });
const kinds = (logs: PainLog[], today = TODAY) => painAlerts(logs, DEFAULT_PAIN_RULE, today).map((a) => a.kind);

describe('which session a limit alert names', () => {
  it('the highest pain during, not the latest: 9/10 on 6 Dec before 7/10 on 9 Dec names 6 Dec', () => {
    const a = painAlerts([log('2026-12-06', 9), log('2026-12-09', 7)], DEFAULT_PAIN_RULE, TODAY);
    expect(a).toEqual([
      {
        kind: 'during_above_max',
        date: '2026-12-06',
        value: 9,
        limit: 5,
        message: "Pain 9/10 during on 6 Dec — above this plan's limit of 5/10.",
      },
    ]);
  });

  it('of two equal scores the later day, in whatever order they were logged', () => {
    const later = (logs: PainLog[]) => painAlerts(logs, DEFAULT_PAIN_RULE, TODAY)[0]!.date;
    expect(later([log('2026-12-09', 8), log('2026-12-06', 8)])).toBe('2026-12-09');
    expect(later([log('2026-12-06', 8), log('2026-12-09', 8)])).toBe('2026-12-09');
  });

  it('the worst unsettled morning, not the latest: 6/10 after 6 Dec before 4/10 after 9 Dec names 6 Dec', () => {
    const a = painAlerts([log('2026-12-06', 2, 6), log('2026-12-09', 2, 4)], DEFAULT_PAIN_RULE, TODAY);
    expect(a).toEqual([
      {
        kind: 'not_settled',
        date: '2026-12-06',
        value: 6,
        limit: 2,
        message: 'Morning pain did not settle (≤ 2/10): 6/10 the morning after 6 Dec.',
      },
    ]);
  });
});

describe('the 7 days of the limit alerts', () => {
  it('include the session exactly 6 days before today (4 Dec for 10 Dec), not the one 7 days before', () => {
    expect(painAlerts([log('2026-12-04', 8)], DEFAULT_PAIN_RULE, TODAY)).toMatchObject([{ kind: 'during_above_max', date: '2026-12-04' }]);
    expect(kinds([log('2026-12-03', 8)])).toEqual([]);
  });
});

describe('the weekly rise', () => {
  const rising = [log('2026-11-30', 2), log('2026-12-01', 2), log('2026-12-08', 4), log('2026-12-09', 4)]; // 2 → 4

  it('counts a session logged today (the week of 7 Dec has 4 and 4 → rise 2 → 4)', () => {
    expect(kinds([log('2026-11-30', 2), log('2026-12-01', 2), log('2026-12-09', 4), log('2026-12-10', 4)])).toEqual(['weekly_rise_during']);
  });

  it('finds the latest session whatever order the log is in', () => {
    expect(kinds([rising[2]!, rising[3]!, rising[0]!, rising[1]!])).toEqual(['weekly_rise_during']);
  });

  it('leaves out sessions dated after today: two at 4/10 next week do not hide this week’s rise', () => {
    expect(kinds([...rising, log('2026-12-15', 4), log('2026-12-16', 4)])).toEqual(['weekly_rise_during']);
  });

  it('stops alerting once the latest session is 14 days old (13 days still alerts, pain-rule.test.ts)', () => {
    // Weeks of 16 Nov (1, 1) and 23 Nov (3, 3): a rise, but the latest session, 26 Nov, is 14 days before 10 Dec.
    expect(kinds([log('2026-11-16', 1), log('2026-11-17', 1), log('2026-11-23', 3), log('2026-11-26', 3)])).toEqual([]);
  });

  it('needs two scores in the newer week too: one 5/10 session after a week of 1/10 and 1/10 is no trend', () => {
    // This week (7 Dec) has one session, so the weeks of 30 Nov (one session: 5) and 23 Nov (1, 1) are compared;
    // 30 Nov has a single score, so nothing is compared at all.
    expect(kinds([log('2026-11-23', 1), log('2026-11-24', 1), log('2026-12-01', 5), log('2026-12-08', 5)])).toEqual([]);
  });

  it('a missing morning check is left out of the weekly mean, not read as 0', () => {
    // Morning: week of 30 Nov 2, 2 (mean 2); week of 7 Dec 4, –, 4 (mean 4, not 8/3 = 2.7): a rise of 2.
    const logs = [
      log('2026-11-30', 1, 2),
      log('2026-12-01', 1, 2),
      log('2026-12-07', 1, 4),
      log('2026-12-08', 1, null),
      log('2026-12-09', 1, 4),
    ];
    const a = painAlerts(logs, { ...DEFAULT_PAIN_RULE, morningMustSettle: false }, TODAY);
    expect(a).toEqual([
      {
        kind: 'weekly_rise_morning',
        date: '2026-12-07',
        value: 4,
        limit: 2,
        message: 'Weekly pain rising: 2 → 4 (mean next-morning pain, week of 30 Nov → week of 7 Dec).',
      },
    ]);
  });

  it('weeklyMean: the mean of one week’s scores, sessions without a score left out', () => {
    const logs = [
      log('2026-11-29', 9, 9),
      log('2026-11-30', 2, 1),
      log('2026-12-02', 3, null),
      log('2026-12-06', 4, 2),
      log('2026-12-07', 9, 9),
    ];
    // Week of 30 Nov (Mon 30 Nov – Sun 6 Dec): during 2, 3, 4 → 3; morning 1, 2 → 1.5.
    expect(weeklyMean(logs, '2026-11-30', (l) => l.painDuring)).toBe(3);
    expect(weeklyMean(logs, '2026-11-30', (l) => l.morningPain)).toBe(1.5);
    expect(weeklyMean(logs, '2026-11-16', (l) => l.painDuring)).toBeNull();
  });
});

describe('calendar words and days', () => {
  it('names every month the way a sentence reads it: "1 Jan" … "31 Dec"', () => {
    const months = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
    months.forEach((m, i) => expect(dayText(`2026-${String(i + 1).padStart(2, '0')}-05`)).toBe(`5 ${m}`));
    expect(dayText('2026-12-31')).toBe('31 Dec');
  });

  it('the UTC day of a timestamp or a Date: 23:30 at UTC−2 is already the next day', () => {
    expect(dayOf('2026-12-09T23:30:00-02:00')).toBe('2026-12-10');
    expect(dayOf(new Date(Date.UTC(2026, 11, 9, 23, 59)))).toBe('2026-12-09');
  });
});

describe('weekly adherence from a backdated session', () => {
  it('starts at the week of a session logged before the stage started', () => {
    // Stage from Monday 7 Dec (3 a week); a session backdated to Wednesday 2 Dec opens the week of 30 Nov.
    expect(weeklyAdherence([{ start: '2026-12-07', end: null, sessionsPerWeek: 3 }], ['2026-12-02', '2026-12-08'], '2026-12-09')).toEqual([
      { weekStart: '2026-11-30', done: 1, prescribed: 0 },
      { weekStart: '2026-12-07', done: 1, prescribed: 3 },
    ]);
  });
});

let nextId = 100;
const session = (date: string, painDuring: number, morningPain: number | null, sets: [number, number][] = [[3, 3]]): StageLog => ({
  id: nextId++,
  date,
  painDuring,
  morningPain,
  sets: sets.map(([setsPrescribed, setsDone]) => ({ setsPrescribed, setsDone })),
});
const check = (c: ProgressionCriterion, logs: StageLog[], startedAt: string | null = '2026-11-20T09:00:00.000Z') =>
  checkCriterion(c, newestFirst(logs), DEFAULT_PAIN_RULE, startedAt, TODAY);

describe('progression criteria, one at a time (invented plans)', () => {
  it('all sets done: every prescribed set ticked, more is fine, none logged is not done', () => {
    expect(allSetsDone({ sets: [] })).toBe(false);
    expect(
      allSetsDone({
        sets: [
          { setsPrescribed: 3, setsDone: 3 },
          { setsPrescribed: 2, setsDone: 2 },
        ],
      }),
    ).toBe(true);
    expect(allSetsDone({ sets: [{ setsPrescribed: 3, setsDone: 4 }] })).toBe(true);
    expect(
      allSetsDone({
        sets: [
          { setsPrescribed: 3, setsDone: 3 },
          { setsPrescribed: 2, setsDone: 1 },
        ],
      }),
    ).toBe(false);
  });

  it('settled by morning: too few sessions, one unsettled morning, a missing check, all settled', () => {
    const c: ProgressionCriterion = { kind: 'settled_by_morning', sessions: 3 };
    expect(check(c, [session('2026-12-05', 2, 1), session('2026-12-08', 2, 1)])).toEqual({
      criterion: c,
      met: false,
      detail: '2 sessions logged in this stage; 3 needed.',
    });
    // Newest first: 9 Dec 4/10 (not settled), 8 Dec 1/10, 5 Dec 1/10.
    expect(check(c, [session('2026-12-05', 2, 1), session('2026-12-08', 2, 1), session('2026-12-09', 2, 4)])).toEqual({
      criterion: c,
      met: false,
      detail: 'Next-morning pain after the last 3 sessions: 4, 1, 1 (settled = at most 2/10).',
    });
    expect(check(c, [session('2026-12-05', 2, null), session('2026-12-08', 2, 0), session('2026-12-09', 2, null)]).detail).toBe(
      'Next-morning pain after the last 3 sessions: –, 0, – (settled = at most 2/10). 2 morning checks missing.',
    );
    expect(check(c, [session('2026-12-05', 2, 2), session('2026-12-08', 2, 0), session('2026-12-09', 2, 1)]).met).toBe(true);
  });

  it('pain during at most 3/10: exactly the 3 sessions needed, all at 3 or less, is met', () => {
    const c: ProgressionCriterion = { kind: 'pain_during_at_most', max: 3, sessions: 3 };
    expect(check(c, [session('2026-12-05', 3, 1), session('2026-12-08', 0, 1), session('2026-12-09', 2, 1)])).toEqual({
      criterion: c,
      met: true,
      detail: 'Pain during on the last 3 sessions: 2, 0, 3 (each must be at most 3/10).',
    });
  });

  it('all sets done on the last N: too few, met, and one short', () => {
    const c: ProgressionCriterion = { kind: 'all_sets_done', sessions: 2 };
    expect(check(c, [session('2026-12-08', 2, 1)])).toMatchObject({ met: false, detail: '1 session logged in this stage; 2 needed.' });
    expect(check(c, [session('2026-12-05', 2, 1), session('2026-12-08', 2, 1)])).toEqual({
      criterion: c,
      met: true,
      detail: 'All sets done on 2 of the last 2 sessions.',
    });
    // Only the last two count: an unfinished older session does not matter, an unfinished newest one does.
    expect(check(c, [session('2026-12-01', 2, 1, [[3, 0]]), session('2026-12-05', 2, 1), session('2026-12-08', 2, 1)]).met).toBe(true);
    expect(check(c, [session('2026-12-05', 2, 1), session('2026-12-08', 2, 1, [[3, 2]])]).detail).toBe(
      'All sets done on 1 of the last 2 sessions.',
    );
  });

  it('sessions logged: 2 of 3 is not enough, 3 of 3 is', () => {
    const c: ProgressionCriterion = { kind: 'sessions_logged', sessions: 3 };
    const two = [session('2026-12-05', 2, 1), session('2026-12-08', 2, 1)];
    expect(check(c, two)).toEqual({ criterion: c, met: false, detail: '2 sessions logged of 3 needed.' });
    expect(check(c, [...two, session('2026-12-09', 2, 1)])).toMatchObject({ met: true, detail: '3 sessions logged of 3 needed.' });
  });

  it('weeks in the stage: not started yet, and a start given as a plain day (20 Nov → 10 Dec = 20 days)', () => {
    const c: ProgressionCriterion = { kind: 'weeks_in_stage', weeks: 3 };
    expect(check(c, [], null)).toEqual({ criterion: c, met: false, detail: 'The stage has not started yet.' });
    expect(check(c, [], '2026-11-20')).toEqual({ criterion: c, met: false, detail: '20 days in this stage of 21 needed.' });
    expect(check({ kind: 'weeks_in_stage', weeks: 1 }, [], '2026-12-09')).toMatchObject({
      met: false,
      detail: '1 day in this stage of 7 needed.',
    });
  });

  it('ready only when every criterion is met: one met and one not is not ready', () => {
    const logs = [session('2026-12-05', 2, 1), session('2026-12-08', 2, 1)];
    const stage = {
      id: 1,
      startedAt: '2026-12-01',
      criteria: [
        { kind: 'sessions_logged', sessions: 2 },
        { kind: 'weeks_in_stage', weeks: 2 },
      ] as ProgressionCriterion[],
    };
    const r = evaluateProgression(stage, logs, DEFAULT_PAIN_RULE, TODAY, 2);
    expect(r.checks.map((x) => x.met)).toEqual([true, false]);
    expect(r.ready).toBe(false);
  });

  it('describes every kind of criterion in plain words', () => {
    expect(describeCriterion({ kind: 'settled_by_morning', sessions: 2 })).toBe('Settled by next morning after the last 2 sessions');
    expect(describeCriterion({ kind: 'all_sets_done', sessions: 1 })).toBe('All sets done on the last 1 session');
    expect(describeCriterion({ kind: 'sessions_logged', sessions: 4 })).toBe('At least 4 sessions logged in this stage');
    expect(describeCriterion({ kind: 'weeks_in_stage', weeks: 1 })).toBe('At least 1 week in this stage');
    expect(describeCriterion({ kind: 'weeks_in_stage', weeks: 2 })).toBe('At least 2 weeks in this stage');
  });

  it('newest first: by day (newest first), then by entry id (highest first), whatever the input order', () => {
    const rows = [
      { id: 5, date: '2026-12-01' },
      { id: 2, date: '2026-12-08' },
      { id: 9, date: '2026-12-03' },
      { id: 7, date: '2026-12-08' },
      { id: 1, date: '2026-12-09' },
    ];
    expect(newestFirst(rows).map((r) => r.id)).toEqual([1, 7, 2, 9, 5]);
    // Any order: compared with sorting "day, then id padded to 6 digits" as text, descending.
    const key = (r: { id: number; date: string }) => `${r.date}#${String(r.id).padStart(6, '0')}`;
    const row = fc.record({ id: fc.integer({ min: 1, max: 999_999 }), date: fc.constantFrom('2026-12-01', '2026-12-02', '2026-12-08') });
    fc.assert(
      fc.property(fc.uniqueArray(row, { selector: (r) => r.id, maxLength: 12 }), (list) => {
        const expected = list.map(key).sort().reverse();
        expect(newestFirst(list).map(key)).toEqual(expected);
      }),
    );
  });
});
