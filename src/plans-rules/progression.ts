import type { CriterionCheck, PainRule, ProgressionCriterion, ProgressionResult, SetsDone } from '../contracts/plans';
import { daysBetween, dayOf } from './dates';
import { isSettled } from './pain-rule';

/** What progression reads of a log entry of the stage. */
export interface StageLog {
  id: number;
  date: string;
  painDuring: number;
  morningPain: number | null;
  sets: Pick<SetsDone, 'setsPrescribed' | 'setsDone'>[];
}

export interface StageForProgression {
  id: number;
  criteria: readonly ProgressionCriterion[];
  /** When the stage became current (ISO timestamp or date); null when it never was. */
  startedAt: string | null;
}

/** The stage's sessions, most recent first (by session day, then by entry id). */
export function newestFirst<T extends { id: number; date: string }>(logs: readonly T[]): T[] {
  return [...logs].sort((a, b) => (a.date === b.date ? b.id - a.id : a.date < b.date ? 1 : -1));
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** Whether every prescribed set of a session was ticked. */
export function allSetsDone(log: Pick<StageLog, 'sets'>): boolean {
  return log.sets.length > 0 && log.sets.every((s) => s.setsDone >= s.setsPrescribed);
}

/** Checks one criterion against the stage's sessions (most recent first). */
export function checkCriterion(
  criterion: ProgressionCriterion,
  recentFirst: readonly StageLog[],
  rule: PainRule,
  stageStartedAt: string | null,
  today: string,
): CriterionCheck {
  const lastN = (n: number) => recentFirst.slice(0, n);
  const tooFew = (n: number) => `${plural(recentFirst.length, 'session')} logged in this stage; ${n} needed.`;
  switch (criterion.kind) {
    case 'pain_during_at_most': {
      const { max, sessions } = criterion;
      if (recentFirst.length < sessions) return { criterion, met: false, detail: tooFew(sessions) };
      const scores = lastN(sessions).map((l) => l.painDuring);
      const met = scores.every((s) => s <= max);
      return {
        criterion,
        met,
        detail: `Pain during on the last ${plural(sessions, 'session')}: ${scores.join(', ')} (each must be at most ${max}/10).`,
      };
    }
    case 'settled_by_morning': {
      const { sessions } = criterion;
      if (recentFirst.length < sessions) return { criterion, met: false, detail: tooFew(sessions) };
      const last = lastN(sessions);
      const missing = last.filter((l) => l.morningPain === null).length;
      const met = missing === 0 && last.every((l) => l.morningPain !== null && isSettled(l.morningPain, rule));
      const scores = last.map((l) => (l.morningPain === null ? '–' : String(l.morningPain))).join(', ');
      const why = missing ? ` ${plural(missing, 'morning check')} missing.` : '';
      return {
        criterion,
        met,
        detail: `Next-morning pain after the last ${plural(sessions, 'session')}: ${scores} (settled = at most ${rule.settledMorningMax}/10).${why}`,
      };
    }
    case 'all_sets_done': {
      const { sessions } = criterion;
      if (recentFirst.length < sessions) return { criterion, met: false, detail: tooFew(sessions) };
      const done = lastN(sessions).filter(allSetsDone).length;
      return { criterion, met: done === sessions, detail: `All sets done on ${done} of the last ${plural(sessions, 'session')}.` };
    }
    case 'sessions_logged': {
      const n = recentFirst.length;
      return { criterion, met: n >= criterion.sessions, detail: `${plural(n, 'session')} logged of ${criterion.sessions} needed.` };
    }
    case 'weeks_in_stage': {
      if (!stageStartedAt) return { criterion, met: false, detail: 'The stage has not started yet.' };
      const days = daysBetween(dayOf(stageStartedAt.length === 10 ? `${stageStartedAt}T00:00:00Z` : stageStartedAt), today);
      const needed = criterion.weeks * 7;
      return { criterion, met: days >= needed, detail: `${plural(Math.max(0, days), 'day')} in this stage of ${needed} needed.` };
    }
  }
}

/**
 * Evaluates a stage's checkable progression criteria from its own log entries. `ready` is true
 * when there is at least one criterion and all are met: the app then suggests moving to
 * `nextStageId`; the coach decides. Pure.
 */
export function evaluateProgression(
  stage: StageForProgression,
  logs: readonly StageLog[],
  rule: PainRule,
  today: string,
  nextStageId: number | null,
): ProgressionResult {
  const recentFirst = newestFirst(logs);
  const checks = stage.criteria.map((c) => checkCriterion(c, recentFirst, rule, stage.startedAt, today));
  return { stageId: stage.id, ready: checks.length > 0 && checks.every((c) => c.met), checks, nextStageId };
}

/** Plain words for a criterion, e.g. "Pain during at most 3/10 on the last 3 sessions". */
export function describeCriterion(c: ProgressionCriterion, rule?: PainRule): string {
  switch (c.kind) {
    case 'pain_during_at_most':
      return `Pain during at most ${c.max}/10 on the last ${plural(c.sessions, 'session')}`;
    case 'settled_by_morning':
      return `Settled by next morning${rule ? ` (at most ${rule.settledMorningMax}/10)` : ''} after the last ${plural(c.sessions, 'session')}`;
    case 'all_sets_done':
      return `All sets done on the last ${plural(c.sessions, 'session')}`;
    case 'sessions_logged':
      return `At least ${plural(c.sessions, 'session')} logged in this stage`;
    case 'weeks_in_stage':
      return `At least ${plural(c.weeks, 'week')} in this stage`;
  }
}
