import type { Knex } from 'knex';
import type { Logger } from 'pino';

/**
 * Processed items: anything the server produces in the background (a clip's frames, a still, a
 * visit summary; later followed markers, an annotated clip, a data export). Each item is one row
 * of `processed_items` about one subject, and goes
 *
 *     queued → running (with progress) → ready
 *                      ↘ queued again (an attempt failed, attempts left)
 *                      ↘ failed (with a reason: last attempt, permanent error, every attempt interrupted)
 *     queued / running → cancelled (its subject is being deleted)
 *
 * The module in this folder owns these moves; a kind only says what to run and what the moves
 * mean for its subject ({@link ProcessingKind}).
 */
export type ItemState = 'queued' | 'running' | 'ready' | 'failed' | 'cancelled';

/** Work done of total while running (frames for a clip; hundredths for a render). */
export interface ItemProgress {
  done: number;
  total: number;
}

/**
 * Who an item's subject belongs to: progress goes to that athlete's stream, or, for the clinic's
 * own subjects (`athleteId` null: an exercise's demonstration clip), to the clinic's staff stream.
 */
export interface ItemScope {
  clinicId: number;
  athleteId: number | null;
}

/** One processed item as the module hands it to its kind. */
export interface ProcessedItem {
  id: number;
  /** The registered kind's name, e.g. `extract_frames`. */
  kind: string;
  /** The subject's type (the kind's `subject`) and id: `clip` 12. */
  subjectType: string;
  subjectId: number;
  scope: ItemScope;
  payload: Record<string, unknown>;
  state: ItemState;
  /** Attempts started so far (this one included while running). */
  attempts: number;
  maxAttempts: number;
  progress: ItemProgress | null;
  error: string | null;
}

/** What the subject of a kind is told inside the transaction that moves its item. */
export type SubjectChange =
  /** Queued: new, retried by a user, or again after attempt `retry.attempt` failed with `retry.reason`. */
  | { state: 'queued'; retry?: { attempt: number; reason: string } }
  /** A worker started an attempt. */
  | { state: 'running' }
  /** Over for good: the last attempt failed, a permanent error, or every attempt was interrupted. */
  | { state: 'failed'; reason: string };

/** What a running kind gets besides its item. */
export interface RunContext {
  /** Aborted when the subject is cancelled (deleted) or the worker stops. */
  signal: AbortSignal;
  /**
   * Reports progress on the one progress channel (and the item's row). Cheap to call often:
   * the module writes and publishes at most a few times a second, and at once when work first
   * becomes usable (`done` goes above 0).
   */
  progress(done: number, total: number): void;
  /** Decoder threads this item may use: the machine's cores shared among the items running here. */
  threads: number;
  logger: Logger;
}

/**
 * A kind of processed item. Registered once with the module (`Processing.register`), in every
 * process that enqueues or runs it; the module never names a kind itself.
 */
export interface ProcessingKind<R = unknown> {
  /** Stored with each item, e.g. `extract_frames` (keep it stable: rows outlive deployments). */
  readonly name: string;
  /** The subject's type, e.g. `clip`: items are found and cancelled by subject. */
  readonly subject: string;
  /** Whether an athlete following their own progress stream sees items of this kind (their clips: yes). */
  readonly athleteSees: boolean;
  /** Does the work. Throw to fail the attempt; throw a {@link PermanentError} when retrying cannot help. */
  run(item: ProcessedItem, ctx: RunContext): Promise<R>;
  /** Records the result on the subject, in the transaction that marks the item ready. */
  onReady(trx: Knex, item: ProcessedItem, result: R): Promise<void>;
  /** Tells the subject about every other move of its item, in the transaction that makes the move. */
  onChange(trx: Knex, item: ProcessedItem, change: SubjectChange): Promise<void>;
}

/** A failure another attempt cannot fix (e.g. a damaged clip): the item fails at once. */
export class PermanentError extends Error {}

/**
 * What the item needs is not there yet (e.g. a still queued with its clip, whose frames are still being
 * extracted): the item goes back to the queue for `retryInMs` without using an attempt, and frees the
 * worker for the work it waits on.
 */
export class NotReadyError extends Error {
  constructor(
    message: string,
    readonly retryInMs = 1_000,
  ) {
    super(message);
  }
}

/** The reason given when the worker stopped during every attempt (killed, power lost). */
export function interruptedReason(attempts: number): string {
  return `Processing was interrupted ${attempts === 1 ? 'once' : `${attempts} times`} (the server stopped while working on it). Retry to try again.`;
}
