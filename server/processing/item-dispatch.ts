import { createRequire } from 'node:module';
import type PgBossModule from 'pg-boss';
import type { Logger } from 'pino';

/** The pg-boss queue that carries processed items to workers. */
export const ITEMS_QUEUE = 'processed-items';
/** The schema pg-boss keeps its tables in (in the app's database). */
export const BOSS_SCHEMA = 'pgboss';

/** One offered item a worker took: `done` once it is claimed in the table (or found no longer due). */
export interface TakenItem {
  itemId: number;
  done(): Promise<void>;
}

/**
 * How processed items reach workers in other processes and on other machines, beside the
 * `processed_items` table (which stays the state users see and the lease of a running item).
 * On SQLite there is none: workers claim from the table. On PostgreSQL {@link pgBossDispatch}.
 */
export interface ItemDispatch {
  /** Offers an item to every worker, now or after `delayMs` (a retry's back-off). */
  offer(itemId: number, delayMs?: number): Promise<void>;
  /** The next offered item, or null when none is due. */
  take(): Promise<TakenItem | null>;
  close(): Promise<void>;
}

export interface PgBossDispatchOptions {
  url: string;
  logger: Logger;
  /** A job a worker fetched and never finished (the process died) is offered again after this. */
  expireInSeconds: number;
  /** How often pg-boss's maintenance runs (expires stalled jobs, archives done ones). */
  maintenanceSeconds?: number;
}

/**
 * Items offered through pg-boss 10: jobs in its queue (fetched with SKIP LOCKED, so any number of
 * workers on any number of machines share them; a retry's back-off is the job's start time; a
 * job whose worker died is expired and retried by pg-boss's maintenance). The job only carries the
 * item's id: the worker then claims the row (one conditional UPDATE), and its lease and heartbeat
 * stay in the table, so a SIGKILLed worker's item is taken over when its lease runs out.
 */
export function pgBossDispatch(o: PgBossDispatchOptions): ItemDispatch {
  // Loaded only on PostgreSQL: a one-machine (SQLite) server never holds pg-boss.
  const PgBoss = createRequire(import.meta.url)('pg-boss') as typeof PgBossModule;
  const boss = new PgBoss({
    connectionString: o.url,
    schema: BOSS_SCHEMA,
    application_name: 'trailframe-queue',
    max: 3,
    schedule: false,
    supervise: true,
    maintenanceIntervalSeconds: o.maintenanceSeconds ?? 60,
  });
  boss.on('error', (err: Error) => o.logger.warn({ err: err.message }, 'queue engine (pg-boss) reported an error'));
  let started: Promise<void> | null = null;
  const ready = () =>
    (started ??= boss
      .start()
      .then(() =>
        boss.createQueue(ITEMS_QUEUE, { name: ITEMS_QUEUE, policy: 'standard', retryLimit: 3, expireInSeconds: o.expireInSeconds }),
      ));

  return {
    async offer(itemId, delayMs = 0) {
      await ready();
      await boss.send(ITEMS_QUEUE, { itemId }, delayMs > 0 ? { startAfter: Math.ceil(delayMs / 1000) } : {});
    },
    async take() {
      await ready();
      const [job] = await boss.fetch<{ itemId: number }>(ITEMS_QUEUE, { batchSize: 1 });
      if (!job) return null;
      return { itemId: job.data.itemId, done: () => boss.complete(ITEMS_QUEUE, job.id) };
    },
    async close() {
      if (!started) return;
      await started.catch(() => undefined);
      await boss.stop({ graceful: false, wait: true, timeout: 1000 });
    },
  };
}
