import type { LogEntry } from '../../contracts/plans';
import {
  alertChipText,
  alertSummary,
  startPlanMessage,
  doseMain,
  formatDose,
  morningCheckDue,
  newLogKey,
  painAboveLimitText,
  runningPlan,
  seconds,
} from './plan-words';

const entry = (id: number, date: string, morningPain: number | null = null): LogEntry => ({
  id,
  planId: 1,
  stageId: 1,
  stageName: 'Holds',
  key: `key-${id}`,
  date,
  painDuring: 2,
  morningPain,
  morningAt: null,
  reviewNote: null,
  sets: [],
  note: null,
  createdAt: '',
});

describe('plan words', () => {
  it('writes doses the way a coach says them', () => {
    expect(seconds(45)).toBe('45 s');
    expect(seconds(90)).toBe('1 min 30 s');
    expect(seconds(120)).toBe('2 min');
    expect(doseMain({ sets: 3, reps: 8, holdSeconds: null })).toBe('3 sets × 8 reps');
    expect(doseMain({ sets: 4, reps: null, holdSeconds: 30 })).toBe('4 sets × 30 s hold');
    expect(doseMain({ sets: 3, reps: 6, holdSeconds: 5 })).toBe('3 sets × 6 reps with 5 s hold');
    expect(doseMain({ sets: 1, reps: 1, holdSeconds: null })).toBe('1 set × 1 rep');
    expect(
      formatDose({ sets: 3, reps: 6, holdSeconds: null, tempo: '4 s out', load: 'Body weight', restSeconds: 90, daysPerWeek: 1 }),
    ).toBe('3 sets × 6 reps · tempo 4 s out · Body weight · rest 1 min 30 s · 1 day a week');
    expect(formatDose({ sets: 3, reps: 10, holdSeconds: null, tempo: 'Steady', load: null, restSeconds: null, daysPerWeek: 3 })).toBe(
      '3 sets × 10 reps · tempo steady · 3 days a week',
    );
    expect(formatDose({ sets: 3, reps: 10, holdSeconds: null, tempo: 'RPE 6', load: null, restSeconds: null, daysPerWeek: 3 })).toBe(
      '3 sets × 10 reps · tempo RPE 6 · 3 days a week',
    );
  });

  it('finds the running plan (active or paused) of a list', () => {
    expect(runningPlan([{ status: 'finished' }, { status: 'paused' }])).toEqual({ status: 'paused' });
    expect(runningPlan([{ status: 'draft' }, { status: 'finished' }])).toBeNull();
  });

  it('summarises alerts for a chip, naming the rule that fired and its figures', () => {
    expect(alertSummary([])).toBe('');
    const a = { message: '', date: '' };
    expect(
      alertSummary([
        { ...a, kind: 'during_above_max', value: 6, limit: 5 },
        { ...a, kind: 'weekly_rise_during', value: 4, limit: 2 },
      ]),
    ).toBe('Pain 6/10 during, above the limit of 5/10 +1');
    expect(alertSummary([{ ...a, kind: 'during_above_max', value: 6, limit: 5 }], true)).toBe('Pain 6/10 > limit 5');
    expect(alertChipText({ ...a, kind: 'not_settled', value: 4, limit: 2 })).toBe('Morning pain 4/10, not settled (≤ 2/10)');
    expect(alertChipText({ ...a, kind: 'weekly_rise_during', value: 4, limit: 2 })).toBe('Weekly pain rising: 2/10 → 4/10');
    expect(alertChipText({ ...a, kind: 'weekly_rise_during', value: 3.3, limit: 2 }, true)).toBe('Weekly pain 2 → 3.3/10');
    expect(alertChipText({ ...a, kind: 'weekly_rise_morning', value: 3.5, limit: 1 }, true)).toBe('Weekly morning 1 → 3.5/10');
  });

  it('asks the morning check about the newest unchecked session of the last two days only', () => {
    const today = '2026-12-10';
    expect(morningCheckDue([entry(1, '2026-12-09')], today)?.id).toBe(1);
    expect(morningCheckDue([entry(1, '2026-12-08'), entry(2, '2026-12-09', 1)], today)?.id).toBe(1);
    expect(morningCheckDue([entry(1, '2026-12-07')], today)).toBeNull();
    expect(morningCheckDue([entry(1, '2026-12-10')], today)).toBeNull();
    expect(morningCheckDue([entry(1, '2026-12-09'), entry(3, '2026-12-09')], today)?.id).toBe(3);
  });

  it('makes idempotency keys with randomUUID, or from random bytes without it', () => {
    expect(newLogKey({ randomUUID: () => 'abc-uuid', getRandomValues: (a) => a })).toBe('abc-uuid');
    const key = newLogKey({
      getRandomValues: <T extends ArrayBufferView | null>(a: T) => {
        (a as unknown as Uint8Array).fill(171);
        return a;
      },
    });
    expect(key).toBe('ab'.repeat(16));
    expect(newLogKey()).toMatch(/^[A-Za-z0-9-]{8,64}$/);
  });

  it('says on Start plan that an athlete without an account cannot log yet, instead of pointing at a portal they cannot enter', () => {
    expect(startPlanMessage('Calf plan', { firstName: 'Ada', hasAccount: true, invitationPending: false })).toBe(
      "Calf plan becomes the athlete's current plan, at stage 1. They can log sessions from their portal.",
    );
    expect(startPlanMessage('Calf plan', { firstName: 'Ada', hasAccount: false, invitationPending: false })).toBe(
      "Calf plan becomes the athlete's current plan, at stage 1. Ada has no Trailframe account yet, so they cannot log sessions until they are invited (Invite to Trailframe, on this page).",
    );
    expect(startPlanMessage('Calf plan', { firstName: 'Ada', hasAccount: false, invitationPending: true })).toContain(
      'until they accept the invitation already sent',
    );
  });
});

describe('painAboveLimitText', () => {
  it('tells the athlete to stop and contact the clinician only when the pain during the session is above the plan limit', () => {
    expect(painAboveLimitText(5, 5)).toBeNull();
    expect(painAboveLimitText(0, 5)).toBeNull();
    const text = painAboveLimitText(7, 5);
    expect(text).toContain('Pain 7/10 is more than the 5/10 your plan allows');
    expect(text).toContain('contact your clinician');
  });
});
