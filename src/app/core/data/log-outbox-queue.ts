/**
 * The athlete's unsent log submissions as a small queue of pure functions over an immutable list:
 * a session (POST with its idempotency key) or a morning check (PUT by the session's key). Items
 * leave the queue only when the server has answered with success; a connection problem or a
 * server error schedules another try with growing back-off; a refusal the athlete must see
 * (e.g. the stage moved on) keeps the item, marked, until the athlete fixes it (sends it again,
 * e.g. for today's stage) or discards it. Nothing is dropped silently, and a retry can never make
 * a second entry (same key).
 */
import type { LogWrite } from '../../../contracts/plans';

export type OutboxItem =
  (OutboxBase & { kind: 'log'; body: LogWrite }) | (OutboxBase & { kind: 'morning'; pain: number; sessionDate: string });

interface OutboxBase {
  /** Unique per item: the session key, or `<key>:morning`. */
  id: string;
  planId: number;
  /** The session's idempotency key. */
  key: string;
  attempts: number;
  /** Epoch ms of the next try. */
  nextAt: number;
  /** Last problem, in words. */
  lastError: string | null;
  /** The server refused it for a reason a retry cannot fix; kept for the athlete to see. */
  refused: boolean;
  createdAt: number;
}

export const BACKOFF = { firstMs: 1_000, maxMs: 60_000, jitter: 0.2 } as const;

/** Wait before try number `attempts + 1`: 1 s, 2 s, 4 s … up to 60 s, ± 20 % jitter. */
export function backoffMs(attempts: number, random: () => number = Math.random): number {
  const base = Math.min(BACKOFF.maxMs, BACKOFF.firstMs * 2 ** Math.max(0, attempts - 1));
  const spread = base * BACKOFF.jitter;
  return Math.round(base - spread + random() * 2 * spread);
}

/**
 * Whether a failed try is worth repeating: no answer at all (status 0, offline), the sign-in ended
 * (401: sent again once the athlete signs in), a timeout, rate limiting, or a server error. Other
 * 4xx answers are final for this submission.
 */
export function isRetryable(status: number): boolean {
  return status === 0 || status === 401 || status === 408 || status === 429 || status >= 500;
}

export function logItem(planId: number, body: LogWrite, now: number): OutboxItem {
  return {
    kind: 'log',
    id: body.key,
    planId,
    key: body.key,
    body,
    attempts: 0,
    nextAt: now,
    lastError: null,
    refused: false,
    createdAt: now,
  };
}

export function morningItem(planId: number, key: string, pain: number, sessionDate: string, now: number): OutboxItem {
  return {
    kind: 'morning',
    id: `${key}:morning`,
    planId,
    key,
    pain,
    sessionDate,
    attempts: 0,
    nextAt: now,
    lastError: null,
    refused: false,
    createdAt: now,
  };
}

/** Adds an item; an item with the same id is replaced (a changed morning answer), keeping order. */
export function enqueue(items: readonly OutboxItem[], item: OutboxItem): OutboxItem[] {
  const at = items.findIndex((i) => i.id === item.id);
  if (at === -1) return [...items, item];
  return items.map((i, n) => (n === at ? item : i));
}

/**
 * Whether a morning check still waits for its session: queued before it, or refused and not yet
 * fixed or discarded by the athlete (the check belongs to that session and goes with it).
 */
function blocked(items: readonly OutboxItem[], item: OutboxItem): boolean {
  return item.kind === 'morning' && items.some((i) => i.kind === 'log' && i.key === item.key);
}

/**
 * The item to send now: the first one not refused whose time has come — but never a morning
 * check whose session is still unsent (it goes after that session).
 */
export function nextDue(items: readonly OutboxItem[], now: number): OutboxItem | null {
  return items.find((i) => !i.refused && !blocked(items, i) && i.nextAt <= now) ?? null;
}

/** Epoch ms of the earliest try that could go out, or null when nothing is pending. */
export function nextWake(items: readonly OutboxItem[]): number | null {
  const pending = items.filter((i) => !i.refused && !blocked(items, i)).map((i) => i.nextAt);
  return pending.length ? Math.min(...pending) : null;
}

export const remove = (items: readonly OutboxItem[], id: string): OutboxItem[] => items.filter((i) => i.id !== id);

export function retryLater(items: readonly OutboxItem[], id: string, message: string, now: number, random?: () => number): OutboxItem[] {
  return items.map((i) =>
    i.id === id ? { ...i, attempts: i.attempts + 1, nextAt: now + backoffMs(i.attempts + 1, random), lastError: message } : i,
  );
}

export function refuse(items: readonly OutboxItem[], id: string, message: string): OutboxItem[] {
  return items.map((i) => (i.id === id ? { ...i, attempts: i.attempts + 1, refused: true, lastError: message } : i));
}

/**
 * A refused session, fixed by the athlete, goes out again now with `body` (same key: the server
 * never stored it); its morning check follows it again.
 */
export function resend(items: readonly OutboxItem[], id: string, body: LogWrite, now: number): OutboxItem[] {
  const item = items.find((i) => i.id === id);
  if (!item || item.kind !== 'log') return [...items];
  return items.map((i) => {
    if (i.id === id) return { ...i, body: { ...body, key: i.key }, refused: false, attempts: 0, lastError: null, nextAt: now };
    if (i.kind === 'morning' && i.key === item.key) return { ...i, refused: false, attempts: 0, lastError: null, nextAt: now };
    return i;
  });
}

/** A stage as far as a session needs it: its id and its exercises (stage-exercise and library ids). */
export interface StageTarget {
  id: number;
  exercises: readonly { id: number; exerciseId: number }[];
}

/**
 * The session re-aimed at `stage` (e.g. today's stage after the coach moved the plan on): each of
 * the stage's exercises gets the sets done that the session had for it, matched by stage-exercise
 * id or library exercise; the stage's other exercises get 0. Pure.
 */
export function retargetLog(body: LogWrite, stage: StageTarget): LogWrite {
  const done = (e: { id: number; exerciseId: number }) =>
    body.sets.find((s) => s.stageExerciseId === e.id)?.setsDone ?? body.sets.find((s) => s.exerciseId === e.exerciseId)?.setsDone ?? 0;
  return {
    ...body,
    stageId: stage.id,
    sets: stage.exercises.map((e) => ({ stageExerciseId: e.id, exerciseId: e.exerciseId, setsDone: done(e) })),
  };
}

/** Everything pending becomes due now (back online, or "Send now"). */
export function dueNow(items: readonly OutboxItem[], now: number): OutboxItem[] {
  return items.map((i) => (i.refused ? i : { ...i, nextAt: Math.min(i.nextAt, now) }));
}

/** Reads a stored queue; anything unreadable yields what can be recovered (never throws). */
export function parseStored(text: string | null): OutboxItem[] {
  if (!text) return [];
  try {
    const data = JSON.parse(text) as unknown;
    if (!Array.isArray(data)) return [];
    return data.filter(
      (i): i is OutboxItem =>
        !!i &&
        typeof i === 'object' &&
        typeof (i as OutboxItem).id === 'string' &&
        typeof (i as OutboxItem).key === 'string' &&
        typeof (i as OutboxItem).planId === 'number' &&
        ((i as OutboxItem).kind === 'log' || (i as OutboxItem).kind === 'morning'),
    );
  } catch {
    return [];
  }
}
