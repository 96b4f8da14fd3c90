import type { Logger } from 'pino';
import type { Config } from '../config';
import { isPostgres } from '../db/dialect';
import type { Db } from '../db/knex';
import { pgBossDispatch, type ItemDispatch } from './item-dispatch';
import type { Processing } from './processing';
import { inProcessProgressChannel, type ProgressChannel } from './progress-channel';
import { postgresProgressChannel } from './progress-channel-pg';
import { startProgressRelay, type ProgressRelay } from './progress-relay';

/**
 * How processed items and their progress travel between processes: the one place that chooses.
 *
 * - SQLite (one machine): workers claim from `processed_items`; progress is published in-process,
 *   and the relay reads what workers in other processes wrote to the table.
 * - PostgreSQL (`DATABASE_URL`): items are offered through pg-boss, so any number of workers on any
 *   number of machines share them; progress crosses processes with LISTEN/NOTIFY, so no relay.
 */
export interface ProcessingEngine {
  /** Whether progress and items cross processes by themselves (PostgreSQL). */
  readonly shared: boolean;
  /** The progress channel to build the processing layer with. */
  readonly channel: ProgressChannel;
  /** What offers items to workers besides the table (null: workers claim from the table). */
  readonly dispatch: ItemDispatch | null;
  /** Resolves once this process receives other processes' progress (at once on SQLite). */
  readonly ready: Promise<void>;
  /** Brings other processes' progress onto this process's channel while a stream follows it. */
  startRelay(processing: Processing, everyMs: number): ProgressRelay;
  close(): Promise<void>;
}

/** A relay with nothing to do: the channel itself crosses processes. */
const NO_RELAY: ProgressRelay = { follow: () => () => undefined, stop: () => undefined };

/** The engine for the configured database. */
export function processingEngine(d: { db: Db; config: Pick<Config, 'databaseUrl' | 'jobs'>; logger: Logger }): ProcessingEngine {
  const url = d.config.databaseUrl;
  if (!isPostgres(d.db) || !url) {
    return {
      shared: false,
      channel: inProcessProgressChannel(),
      dispatch: null,
      ready: Promise.resolve(),
      startRelay: (processing, everyMs) => startProgressRelay({ db: d.db, processing, logger: d.logger, everyMs }),
      close: async () => undefined,
    };
  }
  const channel = postgresProgressChannel({ db: d.db, url, logger: d.logger });
  // A fetched job whose worker died is offered again after twice the lease (the row's lease has run out by then).
  const dispatch = pgBossDispatch({ url, logger: d.logger, expireInSeconds: Math.max(2, Math.ceil((2 * d.config.jobs.leaseMs) / 1000)) });
  return {
    shared: true,
    channel,
    dispatch,
    ready: channel.ready,
    startRelay: () => NO_RELAY,
    async close() {
      await dispatch.close();
      await channel.close();
    },
  };
}
