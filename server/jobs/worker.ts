import type { Logger } from 'pino';
import type { Job, JobQueue } from './job-queue';

/** Runs one job type. Throw to fail the attempt; a {@link PermanentJobError} ends the job at once. */
export type JobHandler = (job: Job, ctx: { signal: AbortSignal }) => Promise<void>;

/** A failure that another attempt cannot fix (e.g. a corrupt clip). */
export class PermanentJobError extends Error {}

export interface Worker {
  /** Looks for work now instead of at the next poll. */
  wake(): void;
  /** Aborts the running job of a subject, if any (its rows are being deleted). */
  cancel(subject: string): void;
  /** Stops claiming; waits for running jobs to settle (they are aborted). */
  stop(): Promise<void>;
  /** Resolves when nothing is running and nothing is due (tests). */
  idle(): Promise<void>;
}

export interface WorkerOptions {
  queue: JobQueue;
  handlers: Record<string, JobHandler>;
  logger: Logger;
  concurrency: number;
  pollMs: number;
  leaseMs: number;
}

/** In-process worker loop over a {@link JobQueue}, with lease heartbeats and retry back-off. */
export function startWorker(o: WorkerOptions): Worker {
  const running = new Map<number, { subject: string; controller: AbortController; done: Promise<void> }>();
  let stopped = false;
  let timer: NodeJS.Timeout | undefined;
  let pumping = false;
  let idleWaiters: (() => void)[] = [];

  const schedule = (ms: number) => {
    if (stopped) return;
    clearTimeout(timer);
    timer = setTimeout(() => void pump(), ms);
  };

  async function runJob(job: Job, controller: AbortController): Promise<void> {
    const beat = setInterval(
      () => {
        o.queue.heartbeat(job).catch((err: Error) => o.logger.warn({ err: err.message, jobId: job.id }, 'job heartbeat failed'));
      },
      Math.max(250, o.leaseMs / 3),
    );
    const handler = o.handlers[job.type];
    try {
      if (!handler) throw new PermanentJobError(`No handler for job type ${job.type}`);
      await handler(job, { signal: controller.signal });
      await o.queue.complete(job);
    } catch (err) {
      const message = (err as Error).message || String(err);
      if (controller.signal.aborted) {
        // Stopping: the job goes back to the queue with its attempt unused. Cancelled: the queue
        // row was ended when its subject was deleted, and fail() leaves it so.
        if (stopped) await o.queue.release(job);
        else await o.queue.fail(job, 'cancelled', { final: true, retryInMs: 0 });
        o.logger.info({ jobId: job.id, type: job.type, stopping: stopped }, 'job interrupted');
        return;
      }
      // A final failure fails the job's subject too (the queue applies it in one transaction).
      const final = await o.queue.fail(job, message, {
        final: err instanceof PermanentJobError,
        retryInMs: 2_000 * 2 ** (job.attempts - 1),
      });
      o.logger.warn({ jobId: job.id, type: job.type, attempt: job.attempts, final, err: message }, 'job failed');
    } finally {
      clearInterval(beat);
    }
  }

  async function pump(): Promise<void> {
    if (pumping || stopped) return;
    pumping = true;
    try {
      while (!stopped && running.size < o.concurrency) {
        const job = await o.queue.claim();
        if (!job) break;
        const controller = new AbortController();
        const entry = { subject: job.subject, controller, done: Promise.resolve() };
        entry.done = runJob(job, controller)
          .catch((err: Error) => o.logger.error({ err: err.message, jobId: job.id }, 'could not record the end of a job'))
          .finally(() => {
            running.delete(job.id);
            void pump();
          });
        running.set(job.id, entry);
      }
    } catch (err) {
      o.logger.error({ err: (err as Error).message }, 'worker could not claim a job');
    } finally {
      pumping = false;
    }
    if (running.size === 0) {
      const waiters = idleWaiters;
      idleWaiters = [];
      waiters.forEach((w) => w());
    }
    schedule(o.pollMs);
  }

  schedule(0);
  return {
    wake: () => schedule(0),
    cancel(subject) {
      for (const r of running.values()) if (r.subject === subject) r.controller.abort();
    },
    async stop() {
      stopped = true;
      clearTimeout(timer);
      for (const r of running.values()) r.controller.abort();
      await Promise.all([...running.values()].map((r) => r.done));
    },
    idle() {
      return new Promise((resolve) => {
        idleWaiters.push(resolve);
        schedule(0);
      });
    },
  };
}
