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
  return calendarDate(Number(match[1]), Number(match[2]), Number(match[3]));
}

/** Local midnight of year-month-day; null when that day does not exist (30 February). */
function calendarDate(year: number, month: number, day: number): Date | null {
  const date = new Date(year, month - 1, day);
  return date.getFullYear() === year && date.getMonth() === month - 1 && date.getDate() === day ? date : null;
}

const MONTH_NAMES = [
  'january',
  'february',
  'march',
  'april',
  'may',
  'june',
  'july',
  'august',
  'september',
  'october',
  'november',
  'december',
];

/** A month written in words ("Mar", "March", "Sept", "sep.") → 1–12; null otherwise. */
function monthFromName(word: string): number | null {
  const w = word.toLowerCase().replace(/\.$/, '');
  if (w.length < 3) return null;
  const i = MONTH_NAMES.findIndex((name) => name.startsWith(w) || (w === 'sept' && name === 'september'));
  return i < 0 ? null : i + 1;
}

/** {@link calendarDate} for a typed date: a four-digit year only. */
function realDate(year: number, month: number, day: number): Date | null {
  return year < 1000 || year > 9999 ? null : calendarDate(year, month, day);
}

/**
 * A date as people type it in the app's locale (en-GB) → local midnight `Date`; null when the text
 * is not one of these shapes or names a day that does not exist. Accepted: `2024-03-14` (ISO),
 * `14/03/2024` or `14.3.2024` (day, month, year: the en-GB order; a four-digit year), and
 * `14 Mar 2024` / `14 March 2024` (how the app shows dates). The picker shows the date back in
 * words at once, so the order taken is never hidden.
 */
export function parseDateText(text: string | null | undefined): Date | null {
  const t = (text ?? '').trim();
  if (!t) return null;
  const iso = parseIsoDate(t);
  if (iso) return iso;
  let m = /^(\d{1,2})[/.](\d{1,2})[/.](\d{4})$/.exec(t);
  if (m) return realDate(Number(m[3]), Number(m[2]), Number(m[1]));
  m = /^(\d{1,2})\s+([A-Za-z]+\.?),?\s+(\d{4})$/.exec(t);
  if (m) {
    const month = monthFromName(m[2]!);
    return month === null ? null : realDate(Number(m[3]), month, Number(m[1]));
  }
  return null;
}

/**
 * A month as people type it (when the browser has no month picker) → `YYYY-MM`; null for any
 * other text. Accepted: `2024-03`, `03/2024` or `3.2024` (month, year), `Mar 2024` / `March 2024`.
 */
export function parseMonthText(text: string | null | undefined): string | null {
  const t = (text ?? '').trim();
  let m = /^(\d{4})-(\d{2})$/.exec(t);
  let year: number;
  let month: number | null;
  if (m) [year, month] = [Number(m[1]), Number(m[2])];
  else if ((m = /^(\d{1,2})[/.](\d{4})$/.exec(t))) [year, month] = [Number(m[2]), Number(m[1])];
  else if ((m = /^([A-Za-z]+\.?),?\s+(\d{4})$/.exec(t))) [year, month] = [Number(m[2]), monthFromName(m[1]!)];
  else return null;
  if (month === null || month < 1 || month > 12 || year < 1000) return null;
  return `${pad(year, 4)}-${pad(month)}`;
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
