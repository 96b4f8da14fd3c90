/**
 * Pure rules of clip retention: when an athlete's clips become due for removal. An athlete is
 * inactive when their last activity (a visit, a clip, a logged session, a plan or profile change)
 * is older than the clinic's retention period in calendar months.
 */

/** The moment `months` calendar months before `now` (UTC; the 31st of a month into a shorter month clamps to its end). */
export function retentionCutoff(now: Date, months: number): Date {
  const y = now.getUTCFullYear();
  const m = now.getUTCMonth() - months;
  const target = new Date(Date.UTC(y, m, 1, now.getUTCHours(), now.getUTCMinutes(), now.getUTCSeconds(), now.getUTCMilliseconds()));
  const lastDay = new Date(Date.UTC(target.getUTCFullYear(), target.getUTCMonth() + 1, 0)).getUTCDate();
  target.setUTCDate(Math.min(now.getUTCDate(), lastDay));
  return target;
}

/** Milliseconds of an ISO date or time; a date without a time counts as the end of that day (NaN when unreadable). */
function endOf(value: string): number {
  return (/^\d{4}-\d{2}-\d{2}$/.test(value) ? new Date(`${value}T23:59:59.999Z`) : new Date(value)).getTime();
}

/** Whether an athlete whose last activity was at `lastActivity` (ISO date or time) is past the retention period at `now`. */
export function pastRetention(lastActivity: string, months: number, now: Date): boolean {
  const at = endOf(lastActivity);
  return !Number.isNaN(at) && at < retentionCutoff(now, months).getTime();
}

/** The latest of several ISO dates or times (nulls and unreadable ones ignored), or null. */
export function latestOf(values: readonly (string | null | undefined)[]): string | null {
  let best: string | null = null;
  for (const v of values) if (v && !Number.isNaN(endOf(v)) && (best === null || endOf(v) > endOf(best))) best = v;
  return best;
}
