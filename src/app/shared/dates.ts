/**
 * Calendar-date helpers. The API exchanges dates as `YYYY-MM-DD` and months as `YYYY-MM`; the
 * date pickers work with local `Date` objects. Conversions use local calendar parts so a date
 * never shifts by a day across time zones.
 */

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;

function pad(n: number, width = 2): string {
  return String(n).padStart(width, '0');
}

/** `Date` → `YYYY-MM-DD` from its local calendar parts; null for null or an invalid date. */
export function toIsoDate(date: Date | null | undefined): string | null {
  if (!date || Number.isNaN(date.getTime())) return null;
  return `${pad(date.getFullYear(), 4)}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}`;
}

/** `YYYY-MM-DD` → local midnight `Date`; null when empty or not a real calendar date. */
export function parseIsoDate(value: string | null | undefined): Date | null {
  const match = value ? ISO_DATE.exec(value) : null;
  if (!match) return null;
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
  const date = new Date(year, month - 1, day);
  return date.getFullYear() === year && date.getMonth() === month - 1 && date.getDate() === day ? date : null;
}

/** The month containing `date` as `YYYY-MM`. */
export function toIsoMonth(date: Date): string {
  return `${pad(date.getFullYear(), 4)}-${pad(date.getMonth() + 1)}`;
}

/**
 * Age in whole years on `today` for someone born on `dateOfBirth` (`YYYY-MM-DD`). A birthday on
 * 29 February counts as reached on 1 March in common years. Null for a missing or invalid date
 * or a birth date after `today`.
 */
export function ageOn(dateOfBirth: string | null | undefined, today: Date): number | null {
  const birth = parseIsoDate(dateOfBirth);
  if (!birth) return null;
  let age = today.getFullYear() - birth.getFullYear();
  const monthDiff = today.getMonth() - birth.getMonth();
  if (monthDiff < 0 || (monthDiff === 0 && today.getDate() < birth.getDate())) age -= 1;
  return age >= 0 ? age : null;
}

/** Local midnight of `date`, for whole-day comparisons. */
export function startOfDay(date: Date): Date {
  return new Date(date.getFullYear(), date.getMonth(), date.getDate());
}
