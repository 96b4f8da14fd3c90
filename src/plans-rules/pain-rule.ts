import type { PainAlert, PainRule } from '../contracts/plans';
import { addDays, dayText, weekStart } from './dates';

/** What the pain rules read of a log entry. */
export interface PainLog {
  date: string;
  painDuring: number;
  morningPain: number | null;
}

/** Days (today included) whose sessions count as "recent" for the limit alerts. */
export const RECENT_DAYS = 7;
/** The latest session must be this recent for a week-over-week comparison to alert. */
export const WEEKLY_RISE_RECENT_DAYS = 14;
/**
 * Scored sessions each of the two weeks needs before their means are compared: one session is a
 * day, not a week's trend (common practice [trade]).
 */
export const WEEKLY_RISE_MIN_SESSIONS = 2;
/**
 * Smallest rise of the weekly mean, in points of the 0–10 scale, that alerts: one step of the
 * scale; a smaller difference of two means is within its resolution (common practice [trade]).
 */
export const WEEKLY_RISE_MIN_POINTS = 1;

const oneDecimal = (n: number) => Math.round(n * 10) / 10;
/** A score as people write it: "4", "2.5" (one decimal at most, no trailing ".0"). */
const fmt = (n: number) => String(oneDecimal(n));

function mean(values: number[]): number | null {
  return values.length ? values.reduce((a, b) => a + b, 0) / values.length : null;
}

/** Whether a next-morning pain score counts as settled under `rule`. */
export function isSettled(morningPain: number, rule: PainRule): boolean {
  return morningPain <= rule.settledMorningMax;
}

/** The worst (highest, then latest) of the logs by `score`, or null when none. */
function worst<T extends PainLog>(logs: T[], score: (l: T) => number): T | null {
  let best: T | null = null;
  for (const l of logs) {
    if (!best || score(l) > score(best) || (score(l) === score(best) && l.date > best.date)) best = l;
  }
  return best;
}

/** Scores of the sessions dated in the week starting `monday` (sessions without one left out). */
function weekScores(logs: readonly PainLog[], monday: string, score: (l: PainLog) => number | null): number[] {
  return logs
    .filter((l) => weekStart(l.date) === monday)
    .map(score)
    .filter((v): v is number => v !== null);
}

/** Mean of `score` over the sessions dated in the week starting `monday` (null when none). */
export function weeklyMean(logs: readonly PainLog[], monday: string, score: (l: PainLog) => number | null): number | null {
  return mean(weekScores(logs, monday, score));
}

/**
 * Alerts of a plan's log under its pain rule, as of `today`. Each alert's message names the rule
 * that fired and the figures that made it fire:
 *
 * - `during_above_max`: a session of the last 7 days had pain during above `rule.maxDuring`
 *   ("Pain 6/10 during on 9 Dec — above this plan's limit of 5/10");
 * - `not_settled`: a next-morning check of the last 7 days was above `rule.settledMorningMax`
 *   (when `rule.morningMustSettle`; "Morning pain did not settle (≤ 2/10): 4/10 after 9 Dec");
 * - `weekly_rise_during` / `weekly_rise_morning`: the mean pain (during, or next morning) of the
 *   week of the latest session is at least `WEEKLY_RISE_MIN_POINTS` above the mean of the week
 *   before (when `rule.noWeeklyRise`; only while the latest session is at most 14 days old, and
 *   only when both weeks have at least `WEEKLY_RISE_MIN_SESSIONS` scores — one session is not a
 *   trend; while the latest week has fewer, the two weeks before it are compared)
 *   ("Weekly pain rising: 2 → 4 …").
 *
 * A session inside the limit alerts only through the weekly rule, never on its own.
 * The default rule is the pain-monitoring rule of REFERENCES.md (Silbernagel et al. 2007, [mem]).
 * Pure: the same logs, rule and day always give the same alerts.
 */
export function painAlerts(logs: readonly PainLog[], rule: PainRule, today: string): PainAlert[] {
  const alerts: PainAlert[] = [];
  const since = addDays(today, -(RECENT_DAYS - 1));
  const recent = logs.filter((l) => l.date >= since && l.date <= today);

  const high = worst(
    recent.filter((l) => l.painDuring > rule.maxDuring),
    (l) => l.painDuring,
  );
  if (high) {
    alerts.push({
      kind: 'during_above_max',
      message: `Pain ${high.painDuring}/10 during on ${dayText(high.date)} — above this plan's limit of ${rule.maxDuring}/10.`,
      date: high.date,
      value: high.painDuring,
      limit: rule.maxDuring,
    });
  }

  if (rule.morningMustSettle) {
    const unsettled = worst(
      recent.filter((l) => l.morningPain !== null && !isSettled(l.morningPain, rule)),
      (l) => l.morningPain ?? 0,
    );
    if (unsettled && unsettled.morningPain !== null) {
      alerts.push({
        kind: 'not_settled',
        message: `Morning pain did not settle (≤ ${rule.settledMorningMax}/10): ${unsettled.morningPain}/10 the morning after ${dayText(unsettled.date)}.`,
        date: unsettled.date,
        value: unsettled.morningPain,
        limit: rule.settledMorningMax,
      });
    }
  }

  if (rule.noWeeklyRise) {
    const dated = logs.filter((l) => l.date <= today);
    const latest = dated.reduce<string | null>((m, l) => (m === null || l.date > m ? l.date : m), null);
    if (latest && latest >= addDays(today, -(WEEKLY_RISE_RECENT_DAYS - 1))) {
      const latestWeek = weekStart(latest);
      const series = [
        { kind: 'weekly_rise_during' as const, what: 'pain during', score: (l: PainLog) => l.painDuring },
        { kind: 'weekly_rise_morning' as const, what: 'next-morning pain', score: (l: PainLog) => l.morningPain },
      ];
      for (const s of series) {
        // A week just begun (too few scores yet) leaves the comparison to the two weeks before it.
        const thisWeek = weekScores(dated, latestWeek, s.score).length >= WEEKLY_RISE_MIN_SESSIONS ? latestWeek : addDays(latestWeek, -7);
        const lastWeek = addDays(thisWeek, -7);
        const now = weekScores(dated, thisWeek, s.score);
        const before = weekScores(dated, lastWeek, s.score);
        if (now.length < WEEKLY_RISE_MIN_SESSIONS || before.length < WEEKLY_RISE_MIN_SESSIONS) continue;
        const meanNow = oneDecimal(mean(now)!);
        const meanBefore = oneDecimal(mean(before)!);
        if (meanNow - meanBefore >= WEEKLY_RISE_MIN_POINTS) {
          alerts.push({
            kind: s.kind,
            message: `Weekly pain rising: ${fmt(meanBefore)} → ${fmt(meanNow)} (mean ${s.what}, week of ${dayText(lastWeek)} → week of ${dayText(thisWeek)}).`,
            date: thisWeek,
            value: meanNow,
            limit: meanBefore,
          });
        }
      }
    }
  }
  return alerts;
}
