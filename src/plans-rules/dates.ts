/**
 * Calendar-day arithmetic on `YYYY-MM-DD` strings (UTC, so no time zone or daylight-saving
 * surprises). Weeks start on Monday (ISO 8601).
 */

const DAY_MS = 86_400_000;

function toUtc(date: string): number {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  return Date.UTC(y, m - 1, d);
}

function fromUtc(ms: number): string {
  return new Date(ms).toISOString().slice(0, 10);
}

/** Whether `date` is a real calendar day written `YYYY-MM-DD`. */
export function isIsoDate(date: string): boolean {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(date)) return false;
  const ms = toUtc(date);
  return !Number.isNaN(ms) && fromUtc(ms) === date;
}

/** The UTC calendar day of an instant (a `Date` or an ISO timestamp). */
export function dayOf(instant: Date | string): string {
  return (typeof instant === 'string' ? new Date(instant) : instant).toISOString().slice(0, 10);
}

export function addDays(date: string, days: number): string {
  return fromUtc(toUtc(date) + days * DAY_MS);
}

/** Whole days from `from` to `to` (negative when `to` is earlier). */
export function daysBetween(from: string, to: string): number {
  return Math.round((toUtc(to) - toUtc(from)) / DAY_MS);
}

/** Monday of the ISO week that holds `date`. */
export function weekStart(date: string): string {
  const weekday = new Date(toUtc(date)).getUTCDay(); // 0 = Sunday
  return addDays(date, -((weekday + 6) % 7));
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** A day as people read it in a sentence, "23 Nov" (the year is left out: alerts are recent). */
export function dayText(date: string): string {
  const [, m, d] = date.split('-').map(Number) as [number, number, number];
  return `${d} ${MONTHS[m - 1]}`;
}
