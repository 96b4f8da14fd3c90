import crypto from 'node:crypto';
import os from 'node:os';
import type { Knex } from 'knex';
import type { ProcessingSubject } from '../../src/contracts/processing';
import type { Db } from '../db/knex';
import { interruptedReason, type ItemScope, type ProcessedItem, type ProcessingKind } from './processed-item';
import {
  processedItemsRepository as repo,
  toItem,
  type ItemPatch,
  type KindFilter,
  type ProcessedItemRow,
} from './processed-items-repository';
import type { ProgressChannel, ProgressNotice } from './progress-channel';
import type { ItemDispatch } from './item-dispatch';

/**
 * The processed-items module as services use it: kinds register here, subjects' work is enqueued
 * inside the caller's transaction, cancelled with the subject, and followed on the one progress
 * channel. Workers use {@link Processing.queue}.
 */
export interface Processing {
  /** The one progress channel every kind reports through. */
  readonly channel: ProgressChannel;
  /** The worker's side: claim, lease, progress, ready, failed, release. */
  readonly queue: ProcessingQueue;
  /** This process's name in `claimed_by` / `touched_by` (host:pid:random). */
  readonly processTag: string;
  /** Registers a kind (once per process that enqueues or runs it). */
  register<R>(kind: ProcessingKind<R>): void;
  /** The registered kind, or undefined. */
  kind(name: string): ProcessingKind<unknown> | undefined;
  /**
   * Adds an item about `subjectId` inside the caller's transaction (or at once with a plain
   * connection), so it exists exactly when the caller's rows do; tells the subject it is queued.
   * After commit, workers of this process are woken and the change is published.
   */
  enqueue(trx: Knex, kind: string, subjectId: number, scope: ItemScope, payload?: Record<string, unknown>): Promise<number>;
  /**
   * Cancels a subject's queued and running items (it is being deleted), or only those of `kind`
   * (a person stopped that job); a running attempt is aborted. Answers how many were cancelled.
   */
  cancel(subjectType: string, subjectId: number, kind?: string): Promise<number>;
  /** The newest item about a subject, or null. */
  latest(subjectType: string, subjectId: number): Promise<ProcessedItem | null>;
  /** Notices of an athlete's queued and running items (what a new stream starts with). */
  unfinishedFor(athleteId: number): Promise<ProgressNotice[]>;
  /** Notices of the clinic's own queued and running items (no athlete): what the clinic stream starts with. */
  unfinishedForClinic(clinicId: number): Promise<ProgressNotice[]>;
  /** The notice a row's state makes (also for rows other processes changed). */
  noticeOf(row: ProcessedItemRow): ProgressNotice | null;
  /** Calls `listener` after an item was enqueued and committed here. */
  onEnqueued(listener: () => void): () => void;
  /** Calls `listener` with item ids cancelled here (a worker aborts those it runs). */
  onCancelled(listener: (itemIds: number[]) => void): () => void;
}

/** What a worker does with items; every call applies only while the item is still this process's. */
export interface ProcessingQueue {
  /**
   * Claims the next due item (or one whose worker's lease ran out), or null. An item found with
   * no attempt left (its worker died in the last one) fails with its subject, and the search goes on.
   * `filter` limits the claim to some kinds (the others wait queued for the workers that take them);
   * with a dispatch (PostgreSQL) it is not applied: every worker there takes every kind.
   */
  claim(filter?: KindFilter): Promise<ProcessedItem | null>;
  /** Extends the lease; false when the item is no longer ours (cancelled, or taken over). */
  heartbeat(item: ProcessedItem): Promise<boolean>;
  /** Records and publishes progress; false when the item is no longer ours. */
  progress(item: ProcessedItem, done: number, total: number): Promise<boolean>;
  /** Marks the item ready and lets its kind record the result, in one transaction. */
  complete(item: ProcessedItem, result: unknown): Promise<boolean>;
  /**
   * Records a failed attempt: queued again after `retryInMs`, or failed for good with its subject
   * when `permanent` or no attempt is left. Answers what happened (`gone`: no longer ours).
   */
  fail(item: ProcessedItem, error: string, opts: { permanent: boolean; retryInMs: number }): Promise<'retrying' | 'failed' | 'gone'>;
  /** Hands a running item back without using an attempt (the worker is stopping, or the item is not ready: due again after `afterMs`). */
  release(item: ProcessedItem, afterMs?: number): Promise<void>;
}

export interface ProcessingOptions {
  db: Db;
  channel: ProgressChannel;
  leaseMs: number;
  maxAttempts: number;
  clock?: () => Date;
  /**
   * How items reach workers besides the table (pg-boss on PostgreSQL; see `engine.ts`). With one,
   * workers take offered items first and claim from the table only what was not offered within
   * {@link SWEEP_GRACE_MS} (an offer lost with its process) or whose lease ran out.
   */
  dispatch?: ItemDispatch | null;
}

/** A queued item no offer brought to a worker this long after it was due is claimed from the table. */
export const SWEEP_GRACE_MS = 5_000;

/** The processed-items module over the `processed_items` table. */
export function createProcessing(o: ProcessingOptions): Processing {
  const { db, channel } = o;
  const dispatch = o.dispatch ?? null;
  const clock = o.clock ?? (() => new Date());
  const now = () => clock().toISOString();
  const later = (ms: number) => new Date(clock().getTime() + ms).toISOString();
  const processTag = `${os.hostname()}:${process.pid}:${crypto.randomUUID().slice(0, 8)}`;
  const kinds = new Map<string, ProcessingKind<unknown>>();
  const enqueued = new Set<() => void>();
  const cancelled = new Set<(ids: number[]) => void>();

  function kindOf(name: string): ProcessingKind<unknown> {
    const kind = kinds.get(name);
    if (!kind) throw new Error(`No processing kind "${name}" is registered in this process`);
    return kind;
  }

  function noticeOf(row: ProcessedItemRow): ProgressNotice | null {
    if (row.clinic_id === null) return null;
    const item = toItem(row);
    return {
      athleteId: row.athlete_id,
      clinicId: row.clinic_id,
      athleteSees: kinds.get(row.kind)?.athleteSees ?? false,
      event: {
        subject: row.subject_type as ProcessingSubject,
        id: row.subject_id,
        kind: row.kind,
        state: row.state,
        progress: row.state === 'running' ? item.progress : null,
        error: row.state === 'failed' ? row.error : null,
      },
    };
  }

  async function publish(id: number): Promise<void> {
    const row = await repo.find(db, id).catch(() => undefined);
    const notice = row && noticeOf(row);
    if (notice) channel.publish(notice);
  }

  /** Runs `change` in a transaction, then publishes the item's new state when it applied. */
  async function move(id: number, change: (trx: Knex) => Promise<boolean>): Promise<boolean> {
    const applied = await db.transaction(change);
    if (applied) await publish(id);
    return applied;
  }

  /** A lease is this process's in the item's attempt: a later claim (any process) takes it over. */
  const holder = (item: ProcessedItem) => ({ by: processTag, attempt: item.attempts });
  const held = (item: ProcessedItem, patch: ItemPatch) => (trx: Knex) =>
    repo.updateHeld(trx, item.id, holder(item), { ...patch, updated_at: now() });

  /** Offers this process made that are still on their way (a claim here waits for them, so it sees its own). */
  const inFlight = new Set<Promise<void>>();
  const offer = (id: number, delayMs = 0): Promise<void> => {
    if (!dispatch) return Promise.resolve();
    const sent: Promise<void> = dispatch
      .offer(id, delayMs)
      .catch(() => undefined) // the sweep finds it
      .finally(() => inFlight.delete(sent));
    inFlight.add(sent);
    return sent;
  };

  /** The next row to run: an offered one, else one due in the table (see {@link ProcessingOptions.dispatch}). */
  async function nextRow(filter: KindFilter | undefined): Promise<ProcessedItemRow | null> {
    const lease = () => ({ at: now(), leaseUntil: later(o.leaseMs), by: processTag });
    if (!dispatch) return repo.claimNext(db, { ...lease(), ...(filter ? { kinds: filter } : {}) });
    await Promise.all(inFlight);
    for (;;) {
      const taken = await dispatch.take().catch(() => null);
      if (!taken) break;
      const row = await repo.claimById(db, taken.itemId, lease());
      await taken.done().catch(() => undefined);
      if (row) return row;
    }
    return repo.claimNext(db, { ...lease(), dueBefore: later(-SWEEP_GRACE_MS) });
  }

  /** Runs `then` once `trx` committed (at once with a plain connection). */
  function afterCommit(trx: Knex, then: () => void): void {
    const tx = trx as Knex.Transaction;
    if (tx.isTransaction && tx.executionPromise) tx.executionPromise.then(then, () => undefined);
    else then();
  }
  const offerAfterCommit = (trx: Knex, id: number, delayMs: number) => dispatch && afterCommit(trx, () => void offer(id, delayMs));

  const queue: ProcessingQueue = {
    async claim(filter) {
      for (;;) {
        const row = await nextRow(filter);
        if (!row) return null;
        const item = toItem(row);
        if (row.attempts <= row.max_attempts && kinds.has(row.kind)) {
          await move(item.id, async (trx) => {
            await kindOf(item.kind).onChange(trx, item, { state: 'running' });
            return true;
          });
          return item;
        }
        // Its worker stopped during the last attempt (or nobody here knows the kind): over, and so is its subject.
        const used = row.attempts - 1;
        const reason = !kinds.has(row.kind) ? `Nothing here can make "${row.kind}".` : (row.error ?? interruptedReason(used));
        await move(item.id, async (trx) => {
          if (!(await held(item, { state: 'failed', attempts: used, error: reason.slice(0, 1000), lease_until: null })(trx))) return false;
          await kinds.get(item.kind)?.onChange(trx, { ...item, attempts: used }, { state: 'failed', reason });
          return true;
        });
      }
    },

    heartbeat: (item) => repo.updateHeld(db, item.id, holder(item), { lease_until: later(o.leaseMs), updated_at: now() }),

    async progress(item, done, total) {
      const ok = await repo.updateHeld(db, item.id, holder(item), { progress_done: done, progress_total: total, updated_at: now() });
      if (ok) await publish(item.id);
      return ok;
    },

    complete: (item, result) =>
      move(item.id, async (trx) => {
        // Written first (no read before the write), so workers in other processes never deadlock on it.
        const patch = { state: 'ready' as const, error: null, lease_until: null, progress_done: trx.raw('progress_total') };
        if (!(await held(item, patch)(trx))) return false;
        await kindOf(item.kind).onReady(trx, item, result);
        return true;
      }),

    async fail(item, error, { permanent, retryInMs }) {
      const last = permanent || item.attempts >= item.maxAttempts;
      const reason = error.slice(0, 1000);
      const kind = kindOf(item.kind);
      const applied = await move(item.id, async (trx) => {
        if (last) {
          if (!(await held(item, { state: 'failed', error: reason, lease_until: null })(trx))) return false;
          await kind.onChange(trx, item, { state: 'failed', reason });
          return true;
        }
        const requeue = { state: 'queued' as const, error: reason, lease_until: null, claimed_by: null, run_after: later(retryInMs) };
        if (!(await held(item, requeue)(trx))) return false;
        offerAfterCommit(trx, item.id, retryInMs);
        await kind.onChange(trx, item, { state: 'queued', retry: { attempt: item.attempts, reason } });
        return true;
      });
      return !applied ? 'gone' : last ? 'failed' : 'retrying';
    },

    async release(item, afterMs = 0) {
      await move(item.id, async (trx) => {
        const back = {
          state: 'queued' as const,
          attempts: Math.max(0, item.attempts - 1),
          lease_until: null,
          claimed_by: null,
          run_after: later(afterMs),
        };
        if (!(await held(item, back)(trx))) return false;
        offerAfterCommit(trx, item.id, afterMs);
        await kindOf(item.kind).onChange(trx, item, { state: 'queued' });
        return true;
      });
    },
  };

  return {
    channel,
    queue,
    processTag,
    register(kind) {
      if (kinds.has(kind.name)) throw new Error(`Processing kind "${kind.name}" is registered twice`);
      kinds.set(kind.name, kind as ProcessingKind<unknown>);
    },
    kind: (name) => kinds.get(name),

    async enqueue(trx, kindName, subjectId, scope, payload = {}) {
      const kind = kindOf(kindName);
      const at = now();
      const id = await repo.insert(
        trx,
        { kind: kind.name, subjectType: kind.subject, subjectId, scope, payload },
        {
          maxAttempts: o.maxAttempts,
          at,
          by: processTag,
        },
      );
      const item: ProcessedItem = {
        id,
        kind: kind.name,
        subjectType: kind.subject,
        subjectId,
        scope,
        payload,
        state: 'queued',
        attempts: 0,
        maxAttempts: o.maxAttempts,
        progress: null,
        error: null,
      };
      await kind.onChange(trx, item, { state: 'queued' });
      afterCommit(trx, () => {
        void publish(id);
        // Workers here look once the offer is made (at once without one).
        void offer(id).then(() => {
          for (const wake of enqueued) wake();
        });
      });
      return id;
    },

    async cancel(subjectType, subjectId, kind) {
      const rows = await repo.cancelSubject(db, subjectType, subjectId, { at: now(), by: processTag, ...(kind ? { kind } : {}) });
      if (!rows.length) return 0;
      for (const listener of cancelled) listener(rows.map((r) => r.id));
      for (const row of rows) {
        const notice = noticeOf(row);
        if (notice) channel.publish(notice);
      }
      return rows.length;
    },

    async latest(subjectType, subjectId) {
      const row = await repo.latest(db, subjectType, subjectId);
      return row ? toItem(row) : null;
    },

    async unfinishedFor(athleteId) {
      const rows = await repo.unfinishedFor(db, athleteId);
      return rows.map(noticeOf).filter((n): n is ProgressNotice => n !== null);
    },

    async unfinishedForClinic(clinicId) {
      const rows = await repo.unfinishedForClinic(db, clinicId);
      return rows.map(noticeOf).filter((n): n is ProgressNotice => n !== null);
    },

    noticeOf,
    onEnqueued(listener) {
      enqueued.add(listener);
      return () => enqueued.delete(listener);
    },
    onCancelled(listener) {
      cancelled.add(listener);
      return () => cancelled.delete(listener);
    },
  };
}
