import type { Knex } from 'knex';
import type { Db } from '../db/knex';

/** One unit of background work. */
export interface Job {
  id: number;
  type: string;
  /** What the job is about, e.g. `clip:12`; lets callers cancel or find a subject's jobs. */
  subject: string;
  payload: Record<string, unknown>;
  attempts: number;
  maxAttempts: number;
}

/** How a job type leaves its subject (clip, still, summary…) when the job is over for good. */
export interface SubjectFailure {
  /** Marks the subject failed with the reason, inside the queue's own transaction. */
  fail(trx: Knex, job: Job, reason: string): Promise<void>;
  /** After commit: tells whoever shows the subject (e.g. the clip's live events). */
  failed?(job: Job): void;
}

/** The reason given when the server stopped during every attempt (killed, power lost). */
export function interruptedReason(attempts: number): string {
  return `Processing was interrupted ${attempts} times (the server stopped while working on it). Retry to try again.`;
}

/** The queue seam: SQLite rows here; a Redis-backed queue later, by configuration. */
export interface JobQueue {
  /**
   * Registers how jobs of `type` fail their subject. The queue applies it wherever a job ends
   * failed: a last attempt that throws, a permanent error, and a job whose every attempt was
   * interrupted (found at claim time after its lease ran out).
   */
  onFinalFailure(type: string, failure: SubjectFailure): void;
  /** Adds a job inside the caller's transaction, so it exists exactly when the caller's rows do. */
  enqueue(trx: Knex, type: string, subject: string, payload: Record<string, unknown>): Promise<number>;
  /**
   * Claims the next due job (or one whose worker's lease ran out), or null. A job found with no
   * attempts left is ended failed, with its subject, and the search goes on.
   */
  claim(): Promise<Job | null>;
  /** Extends the lease of a running job; false when the job is no longer ours. */
  heartbeat(job: Job): Promise<boolean>;
  complete(job: Job): Promise<void>;
  /**
   * Records a failure: back to the queue after `retryInMs`, or `failed` for good (with its subject)
   * when `final` or no attempt is left. Returns whether it is final. A job that is no longer
   * running (cancelled meanwhile) is left as it is.
   */
  fail(job: Job, error: string, opts: { final: boolean; retryInMs: number }): Promise<boolean>;
  /** Hands a running job back without using an attempt (the worker is stopping). */
  release(job: Job): Promise<void>;
  /** Drops queued jobs of a subject (its rows are being deleted). */
  cancelSubject(subject: string): Promise<void>;
}

function toJob(row: JobRow, attempts: number): Job {
  return {
    id: row.id,
    type: row.type,
    subject: row.subject,
    payload: JSON.parse(row.payload) as Record<string, unknown>,
    attempts,
    maxAttempts: row.max_attempts,
  };
}

interface JobRow {
  id: number;
  type: string;
  subject: string;
  payload: string;
  status: 'queued' | 'running' | 'done' | 'failed';
  attempts: number;
  max_attempts: number;
  lease_until: string | null;
  run_after: string;
  error: string | null;
}

/** Durable queue in the `jobs` table (leases make a dead worker's job claimable again). */
export function sqliteJobQueue(db: Db, opts: { leaseMs: number; maxAttempts: number; clock?: () => Date }): JobQueue {
  const clock = opts.clock ?? (() => new Date());
  const now = () => clock().toISOString();
  const leaseEnd = () => new Date(clock().getTime() + opts.leaseMs).toISOString();
  // Jobs this process holds; a heartbeat renews only these.
  const held = new Set<number>();
  const failures = new Map<string, SubjectFailure>();

  /** Ends a job failed and, in the same transaction, its subject. */
  async function endFailed(trx: Knex, job: Job, reason: string): Promise<void> {
    await trx('jobs')
      .where({ id: job.id })
      .update({ status: 'failed', error: reason.slice(0, 1000), lease_until: null, updated_at: now() });
    await failures.get(job.type)?.fail(trx, job, reason);
  }

  function notify(job: Job): void {
    try {
      failures.get(job.type)?.failed?.(job);
    } catch {
      // Telling a live view is best effort; the rows are committed.
    }
  }

  return {
    async enqueue(trx, type, subject, payload) {
      const at = now();
      const [row] = await trx('jobs')
        .insert({
          type,
          subject,
          payload: JSON.stringify(payload),
          status: 'queued',
          attempts: 0,
          max_attempts: opts.maxAttempts,
          run_after: at,
          created_at: at,
          updated_at: at,
        })
        .returning('id');
      return (row as { id: number }).id;
    },

    onFinalFailure(type, failure) {
      failures.set(type, failure);
    },

    async claim() {
      for (;;) {
        const ended: Job[] = [];
        const claimed = await db.transaction(async (trx) => {
          const at = now();
          const row = await trx<JobRow>('jobs')
            .where((q) => q.where({ status: 'queued' }).andWhere('run_after', '<=', at))
            .orWhere((q) => q.where({ status: 'running' }).andWhere('lease_until', '<', at))
            .orderBy('id')
            .first();
          if (!row) return null;
          if (row.attempts >= row.max_attempts) {
            // The worker stopped during the last attempt: the job is over, and so is its subject.
            const job = toJob(row, row.attempts);
            await endFailed(trx, job, row.error ?? interruptedReason(row.attempts));
            ended.push(job);
            return 'ended' as const;
          }
          await trx('jobs')
            .where({ id: row.id })
            .update({ status: 'running', attempts: row.attempts + 1, lease_until: leaseEnd(), updated_at: at });
          held.add(row.id);
          return toJob(row, row.attempts + 1);
        });
        ended.forEach(notify);
        if (claimed !== 'ended') return claimed;
      }
    },

    async heartbeat(job) {
      if (!held.has(job.id)) return false;
      const n = await db('jobs').where({ id: job.id, status: 'running' }).update({ lease_until: leaseEnd(), updated_at: now() });
      return n > 0;
    },

    async complete(job) {
      held.delete(job.id);
      await db('jobs').where({ id: job.id }).update({ status: 'done', lease_until: null, error: null, updated_at: now() });
    },

    async fail(job, error, { final, retryInMs }) {
      held.delete(job.id);
      const last = final || job.attempts >= job.maxAttempts;
      const message = error.slice(0, 1000);
      const applied = await db.transaction(async (trx) => {
        const running = await trx('jobs').where({ id: job.id, status: 'running' }).first('id');
        if (!running) return false; // cancelled meanwhile: its subject is going away
        if (last) {
          await endFailed(trx, job, message);
          return true;
        }
        await trx('jobs')
          .where({ id: job.id })
          .update({
            status: 'queued',
            error: message,
            lease_until: null,
            run_after: new Date(clock().getTime() + retryInMs).toISOString(),
            updated_at: now(),
          });
        return false;
      });
      if (applied) notify(job);
      return last;
    },

    async release(job) {
      held.delete(job.id);
      await db('jobs')
        .where({ id: job.id, status: 'running' })
        .update({ status: 'queued', attempts: Math.max(0, job.attempts - 1), lease_until: null, run_after: now(), updated_at: now() });
    },

    async cancelSubject(subject) {
      await db('jobs')
        .where({ subject })
        .whereIn('status', ['queued', 'running'])
        .update({ status: 'failed', error: 'cancelled', lease_until: null, updated_at: now() });
    },
  };
}
