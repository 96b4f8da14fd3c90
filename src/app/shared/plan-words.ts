/**
 * Words and small pure helpers of the Plans screens: doses, statuses, alerts, the running plan
 * of a list, and the session the athlete still owes a morning check for.
 */
import type { AthleteSummary } from '../../contracts/api';
import type { Dose, LogEntry, PainAlert, PlanStatus, PlanSummary } from '../../contracts/plans';
import { addDays } from '../../plans-rules';

/** "30 s" / "1 min 30 s". */
export function seconds(s: number): string {
  if (s < 60) return `${s} s`;
  const m = Math.floor(s / 60);
  const rest = s % 60;
  return rest ? `${m} min ${rest} s` : `${m} min`;
}

/**
 * The main line of a dose, with its units so an athlete need not guess: "3 sets × 8 reps",
 * "4 sets × 30 s hold", "3 sets × 6 reps with 5 s hold".
 */
export function doseMain(d: Pick<Dose, 'sets' | 'reps' | 'holdSeconds'>): string {
  const sets = `${d.sets} set${d.sets === 1 ? '' : 's'}`;
  const reps = d.reps === null ? '' : `${d.reps} rep${d.reps === 1 ? '' : 's'}`;
  if (d.reps !== null && d.holdSeconds !== null) return `${sets} × ${reps} with ${seconds(d.holdSeconds)} hold`;
  if (d.reps !== null) return `${sets} × ${reps}`;
  return `${sets} × ${seconds(d.holdSeconds ?? 0)} hold`;
}

/** Free text placed after a word: "Steady" → "steady" (an acronym such as "RPE 6" stays). */
function inSentence(text: string): string {
  return /^[A-Z][a-z]/.test(text) ? text[0]!.toLowerCase() + text.slice(1) : text;
}

/** Every part of a dose in a list, for a line of chips or a sentence. */
export function doseParts(d: Dose): string[] {
  const parts = [doseMain(d)];
  if (d.tempo) parts.push(`tempo ${inSentence(d.tempo)}`);
  if (d.load) parts.push(d.load);
  if (d.restSeconds !== null) parts.push(`rest ${seconds(d.restSeconds)}`);
  parts.push(`${d.daysPerWeek} day${d.daysPerWeek === 1 ? '' : 's'} a week`);
  return parts;
}

export const formatDose = (d: Dose): string => doseParts(d).join(' · ');

/** The plan an athlete follows now (active or paused), else the newest one, else null. */
export function runningPlan<T extends Pick<PlanSummary, 'status'>>(plans: readonly T[]): T | null {
  return plans.find((p) => p.status === 'active' || p.status === 'paused') ?? null;
}

/** A score as people write it: "4", "2.5". */
const score = (n: number) => String(Math.round(n * 10) / 10);

/**
 * Chip words of one alert that name the rule that fired and its figures: "Pain 6/10 > limit 5"
 * (compact, the roster) or "Pain 6/10 during, above the limit of 5/10".
 */
export function alertChipText(alert: PainAlert, compact = false): string {
  const v = score(alert.value);
  const l = score(alert.limit);
  switch (alert.kind) {
    case 'during_above_max':
      return compact ? `Pain ${v}/10 > limit ${l}` : `Pain ${v}/10 during, above the limit of ${l}/10`;
    case 'not_settled':
      return compact ? `Morning ${v}/10 > ${l}` : `Morning pain ${v}/10, not settled (≤ ${l}/10)`;
    case 'weekly_rise_during':
      return compact ? `Weekly pain ${l} → ${v}/10` : `Weekly pain rising: ${l}/10 → ${v}/10`;
    case 'weekly_rise_morning':
      return compact ? `Weekly morning ${l} → ${v}/10` : `Weekly morning pain rising: ${l}/10 → ${v}/10`;
  }
}

/** Chip text of a list of alerts: the first one's words and "+n" for the rest. */
export function alertSummary(alerts: readonly PainAlert[], compact = false): string {
  if (alerts.length === 0) return '';
  const first = alertChipText(alerts[0]!, compact);
  return alerts.length > 1 ? `${first} +${alerts.length - 1}` : first;
}

export function statusClass(status: PlanStatus): string {
  return `status-${status}`;
}

/**
 * The newest session of yesterday or the day before (the athlete's calendar) still without a
 * morning check — the one the one-tap morning check asks about — or null.
 */
export function morningCheckDue(logs: readonly LogEntry[], today: string): LogEntry | null {
  const earliest = addDays(today, -2);
  const candidates = logs.filter((l) => l.morningPain === null && l.date < today && l.date >= earliest);
  candidates.sort((a, b) => (a.date === b.date ? b.id - a.id : a.date < b.date ? 1 : -1));
  return candidates[0] ?? null;
}

/** A fresh idempotency key for a log submission (UUID when the browser offers it). */
export function newLogKey(cryptoObj: Pick<Crypto, 'getRandomValues'> & { randomUUID?: () => string } = crypto): string {
  if (typeof cryptoObj.randomUUID === 'function') return cryptoObj.randomUUID();
  const bytes = cryptoObj.getRandomValues(new Uint8Array(16));
  return Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
}

/** What "Start plan" asks; it says the athlete can log only when they have an account. */
export function startPlanMessage(
  title: string,
  athlete: Pick<AthleteSummary, 'firstName' | 'hasAccount' | 'invitationPending'> | null,
): string {
  const head = `${title} becomes the athlete's current plan, at stage 1.`;
  if (!athlete || athlete.hasAccount) return `${head} They can log sessions from their portal.`;
  const invite = athlete.invitationPending ? 'accept the invitation already sent' : 'are invited (Invite to Trailframe, on this page)';
  return `${head} ${athlete.firstName} has no Trailframe account yet, so they cannot log sessions until they ${invite}.`;
}

/**
 * What the athlete reads after logging a session whose pain during it was above their plan's
 * limit: stop, do not push through, contact the clinician. Null when the score is within the plan.
 */
export function painAboveLimitText(painDuring: number, maxDuring: number): string | null {
  if (painDuring <= maxDuring) return null;
  return `Pain ${painDuring}/10 is more than the ${maxDuring}/10 your plan allows. Stop the exercise that hurt, do not push through it next time, and contact your clinician before your next session.`;
}
