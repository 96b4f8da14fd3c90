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

/** The queue seam: SQLite rows here; a Redis-backed queue later, by configuration. */
export interface JobQueue {
  /** Adds a job inside the caller's transaction, so it exists exactly when the caller's rows do. */
  enqueue(trx: Knex, type: string, subject: string, payload: Record<string, unknown>): Promise<number>;
  /** Claims the next due job (or one whose worker's lease ran out), or null. */
  claim(): Promise<Job | null>;
  /** Extends the lease of a running job; false when the job is no longer ours. */
  heartbeat(job: Job): Promise<boolean>;
  complete(job: Job): Promise<void>;
  /** Records a failure: back to the queue after `retryInMs`, or `failed` for good. Returns whether it is final. */
  fail(job: Job, error: string, opts: { final: boolean; retryInMs: number }): Promise<boolean>;
  /** Drops queued jobs of a subject (its rows are being deleted). */
  cancelSubject(subject: string): Promise<void>;
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

  return {
    async enqueue(trx, type, subject, payload) {
      const at = now();
      const [row] = await trx('jobs')
        .insert({ type, subject, payload: JSON.stringify(payload), status: 'queued', attempts: 0, max_attempts: opts.maxAttempts, run_after: at, created_at: at, updated_at: at })
        .returning('id');
      return (row as { id: number }).id;
    },

    async claim() {
      return db.transaction(async (trx) => {
        const at = now();
        const row = await trx<JobRow>('jobs')
          .where((q) => q.where({ status: 'queued' }).andWhere('run_after', '<=', at))
          .orWhere((q) => q.where({ status: 'running' }).andWhere('lease_until', '<', at))
          .orderBy('id')
          .first();
        if (!row) return null;
        if (row.attempts >= row.max_attempts) {
          // A worker died on the last attempt: the job is over.
          await trx('jobs').where({ id: row.id }).update({ status: 'failed', error: row.error ?? 'The worker stopped during the last attempt.', lease_until: null, updated_at: at });
          return null;
        }
        await trx('jobs').where({ id: row.id }).update({ status: 'running', attempts: row.attempts + 1, lease_until: leaseEnd(), updated_at: at });
        held.add(row.id);
        return {
          id: row.id,
          type: row.type,
          subject: row.subject,
          payload: JSON.parse(row.payload) as Record<string, unknown>,
          attempts: row.attempts + 1,
          maxAttempts: row.max_attempts,
        };
      });
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
      await db('jobs')
        .where({ id: job.id })
        .update({
          status: last ? 'failed' : 'queued',
          error: error.slice(0, 1000),
          lease_until: null,
          run_after: new Date(clock().getTime() + retryInMs).toISOString(),
          updated_at: now(),
        });
      return last;
    },

    async cancelSubject(subject) {
      await db('jobs').where({ subject }).whereIn('status', ['queued', 'running']).update({ status: 'failed', error: 'cancelled', lease_until: null, updated_at: now() });
    },
  };
}
