import type { AdherenceWeek, Dose } from '../contracts/plans';
import { addDays, daysBetween, weekStart } from './dates';

/** A stretch of days during which one stage was current. */
export interface StagePeriod {
  /** First day, `YYYY-MM-DD`. */
  start: string;
  /** Last day (inclusive), or null while the stage is still current. */
  end: string | null;
  sessionsPerWeek: number;
}

/** Sessions a week a stage asks for: the most days-per-week of its exercises (0 when none). */
export function sessionsPerWeek(doses: readonly Pick<Dose, 'daysPerWeek'>[]): number {
  return doses.reduce((m, d) => Math.max(m, d.daysPerWeek), 0);
}

/**
 * Sessions done against sessions prescribed, per week (Monday to Sunday), from the week of the
 * first stage start (or of an earlier backdated session) to the week of `until`. A week in which
 * a stage was current for only some days is prescribed pro rata (rounded to a whole session);
 * the current week counts in full. Pure.
 */
export function weeklyAdherence(periods: readonly StagePeriod[], sessionDates: readonly string[], until: string): AdherenceWeek[] {
  const starts = [...periods.map((p) => p.start), ...sessionDates].sort();
  if (starts.length === 0) return [];
  const first = weekStart(starts[0]!);
  const last = weekStart(until);
  const weeks: AdherenceWeek[] = [];
  for (let monday = first; monday <= last; monday = addDays(monday, 7)) {
    const sunday = addDays(monday, 6);
    let prescribed = 0;
    for (const p of periods) {
      const from = p.start > monday ? p.start : monday;
      const to = p.end !== null && p.end < sunday ? p.end : sunday;
      const days = daysBetween(from, to) + 1;
      if (days > 0) prescribed += (p.sessionsPerWeek * days) / 7;
    }
    const done = sessionDates.filter((d) => d >= monday && d <= sunday).length;
    weeks.push({ weekStart: monday, done, prescribed: Math.round(prescribed) });
  }
  return weeks;
}
