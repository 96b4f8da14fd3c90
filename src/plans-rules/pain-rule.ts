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

const oneDecimal = (n: number) => Math.round(n * 10) / 10;
const fmt = (n: number) => oneDecimal(n).toFixed(1);

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

/** Mean of `score` over the sessions dated in the week starting `monday` (null when none). */
export function weeklyMean(logs: readonly PainLog[], monday: string, score: (l: PainLog) => number | null): number | null {
  const values = logs
    .filter((l) => weekStart(l.date) === monday)
    .map(score)
    .filter((v): v is number => v !== null);
  return mean(values);
}

/**
 * Alerts of a plan's log under its pain rule, as of `today`:
 *
 * - `during_above_max`: a session of the last 7 days had pain during above `rule.maxDuring`;
 * - `not_settled`: a next-morning check of the last 7 days was above `rule.settledMorningMax`
 *   (when `rule.morningMustSettle`);
 * - `weekly_rise_during` / `weekly_rise_morning`: the mean pain (during, or next morning) of the
 *   week of the latest session is higher than the mean of the week before (when
 *   `rule.noWeeklyRise`; only while the latest session is at most 14 days old, and only when
 *   both weeks have scores).
 *
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
      message: `Pain during reached ${high.painDuring}/10 on ${dayText(high.date)}; the plan allows up to ${rule.maxDuring}/10.`,
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
        message: `Pain the morning after ${dayText(unsettled.date)} was ${unsettled.morningPain}/10; settled means at most ${rule.settledMorningMax}/10.`,
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
      const thisWeek = weekStart(latest);
      const lastWeek = addDays(thisWeek, -7);
      const series = [
        { kind: 'weekly_rise_during' as const, what: 'Pain during', score: (l: PainLog) => l.painDuring },
        { kind: 'weekly_rise_morning' as const, what: 'Next-morning pain', score: (l: PainLog) => l.morningPain },
      ];
      for (const s of series) {
        const now = weeklyMean(dated, thisWeek, s.score);
        const before = weeklyMean(dated, lastWeek, s.score);
        if (now !== null && before !== null && now > before) {
          alerts.push({
            kind: s.kind,
            message: `${s.what} rose week over week: mean ${fmt(before)}/10 in the week of ${dayText(lastWeek)}, ${fmt(now)}/10 in the week of ${dayText(thisWeek)}.`,
            date: thisWeek,
            value: oneDecimal(now),
            limit: oneDecimal(before),
          });
        }
      }
    }
  }
  return alerts;
}
