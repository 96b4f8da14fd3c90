/**
 * Stage progression from the stage's own log. The plans and numbers here are invented to test the
 * logic (not clinical thresholds); the pain rule is the default of REFERENCES.md's
 * pain-monitoring entry (Silbernagel et al. 2007 [mem], from memory).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEFAULT_PAIN_RULE, type ProgressionCriterion } from '../../../src/contracts/plans';
import { describeCriterion, evaluateProgression, newestFirst, type StageLog } from '../../../src/plans-rules';

let nextId = 1;
const session = (date: string, painDuring: number, morningPain: number | null = 1, setsDone = 3): StageLog => ({
  id: nextId++,
  date,
  painDuring,
  morningPain,
  sets: [
    { setsPrescribed: 3, setsDone },
    { setsPrescribed: 2, setsDone: Math.min(setsDone, 2) },
  ],
});
const stage = (criteria: ProgressionCriterion[], startedAt: string | null = '2026-11-20T09:00:00.000Z') => ({ id: 7, criteria, startedAt });
const TODAY = '2026-12-10';

describe('stage progression (invented plans)', () => {
  const painCriterion: ProgressionCriterion = { kind: 'pain_during_at_most', max: 3, sessions: 3 };

  it('suggests moving on when pain during ≤ 3/10 on the last 3 sessions and it settles by morning', () => {
    const logs = [session('2026-12-01', 5), session('2026-12-03', 3), session('2026-12-05', 2), session('2026-12-08', 3)];
    const r = evaluateProgression(stage([painCriterion, { kind: 'settled_by_morning', sessions: 3 }]), logs, DEFAULT_PAIN_RULE, TODAY, 8);
    expect(r).toMatchObject({ stageId: 7, ready: true, nextStageId: 8 });
    expect(r.checks[0]!.detail).toBe('Pain during on the last 3 sessions: 3, 2, 3 (each must be at most 3/10).');
  });

  it('does not suggest it while a recent session is above the criterion', () => {
    const logs = [session('2026-12-03', 2), session('2026-12-05', 4), session('2026-12-08', 2)];
    const r = evaluateProgression(stage([painCriterion]), logs, DEFAULT_PAIN_RULE, TODAY, 8);
    expect(r.ready).toBe(false);
    expect(r.checks[0]!.met).toBe(false);
  });

  it('needs enough sessions before judging', () => {
    const r = evaluateProgression(stage([painCriterion]), [session('2026-12-08', 0)], DEFAULT_PAIN_RULE, TODAY, null);
    expect(r.checks[0]).toMatchObject({ met: false, detail: '1 session logged in this stage; 3 needed.' });
  });

  it('a missing morning check is not "settled"', () => {
    const logs = [session('2026-12-05', 2, 1), session('2026-12-08', 2, null)];
    const r = evaluateProgression(stage([{ kind: 'settled_by_morning', sessions: 2 }]), logs, DEFAULT_PAIN_RULE, TODAY, null);
    expect(r.checks[0]).toMatchObject({ met: false });
    expect(r.checks[0]!.detail).toContain('1 morning check missing');
  });

  it('settled uses the plan’s own rule when the coach edits it', () => {
    const logs = [session('2026-12-05', 2, 3), session('2026-12-08', 2, 3)];
    const c: ProgressionCriterion[] = [{ kind: 'settled_by_morning', sessions: 2 }];
    expect(evaluateProgression(stage(c), logs, DEFAULT_PAIN_RULE, TODAY, null).ready).toBe(false);
    expect(evaluateProgression(stage(c), logs, { ...DEFAULT_PAIN_RULE, settledMorningMax: 3 }, TODAY, null).ready).toBe(true);
  });

  it('checks sets, session counts and weeks in the stage', () => {
    const logs = [session('2026-12-05', 2, 1, 3), session('2026-12-08', 2, 1, 2)];
    const r = evaluateProgression(
      stage([
        { kind: 'all_sets_done', sessions: 2 },
        { kind: 'sessions_logged', sessions: 2 },
        { kind: 'weeks_in_stage', weeks: 3 },
      ]),
      logs,
      DEFAULT_PAIN_RULE,
      TODAY,
      null,
    );
    expect(r.checks.map((c) => c.met)).toEqual([false, true, false]);
    expect(r.checks[2]!.detail).toBe('20 days in this stage of 21 needed.');
    expect(evaluateProgression(stage([{ kind: 'weeks_in_stage', weeks: 3 }]), [], DEFAULT_PAIN_RULE, '2026-12-11', null).ready).toBe(true);
    expect(evaluateProgression(stage([{ kind: 'weeks_in_stage', weeks: 1 }], null), [], DEFAULT_PAIN_RULE, TODAY, null).ready).toBe(false);
  });

  it('a stage without checkable criteria never suggests by itself (the coach decides)', () => {
    expect(evaluateProgression(stage([]), [session('2026-12-08', 0)], DEFAULT_PAIN_RULE, TODAY, 8)).toMatchObject({
      ready: false,
      checks: [],
    });
  });

  it('orders sessions by day, then by entry for the same day', () => {
    const a = { id: 1, date: '2026-12-08' };
    const b = { id: 2, date: '2026-12-08' };
    const c = { id: 3, date: '2026-12-01' };
    expect(newestFirst([c, a, b]).map((x) => x.id)).toEqual([2, 1, 3]);
  });

  it('describes criteria in plain words', () => {
    expect(describeCriterion(painCriterion)).toBe('Pain during at most 3/10 on the last 3 sessions');
    expect(describeCriterion({ kind: 'settled_by_morning', sessions: 1 }, DEFAULT_PAIN_RULE)).toBe(
      'Settled by next morning (at most 2/10) after the last 1 session',
    );
  });

  it('property: ready ⇔ the last N pain scores are all ≤ max (pain criterion alone)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.integer({ min: 0, max: 10 }), { maxLength: 12 }),
        fc.integer({ min: 0, max: 10 }),
        fc.integer({ min: 1, max: 5 }),
        (scores, max, n) => {
          const logs = scores.map((s, i) => ({
            id: i + 1,
            date: `2026-11-${String(i + 1).padStart(2, '0')}`,
            painDuring: s,
            morningPain: 0,
            sets: [],
          }));
          const r = evaluateProgression(stage([{ kind: 'pain_during_at_most', max, sessions: n }]), logs, DEFAULT_PAIN_RULE, TODAY, null);
          const expected = scores.length >= n && scores.slice(-n).every((s) => s <= max);
          expect(r.ready).toBe(expected);
        },
      ),
    );
  });
});
