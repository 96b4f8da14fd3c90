import crypto from 'node:crypto';
import { createRequire } from 'node:module';
import type pg from 'pg';
import type { Logger } from 'pino';
import type { Db } from '../db/knex';
import { inProcessProgressChannel, type ProgressChannel, type ProgressNotice } from './progress-channel';

/** The PostgreSQL notification channel progress travels on (per database). */
export const PROGRESS_CHANNEL = 'trailframe_progress';
/** Delay before listening again after the listening connection was lost, ms. */
const RECONNECT_MS = 1_000;

/** A progress channel that crosses processes; `ready` resolves once this process listens. */
export interface SharedProgressChannel extends ProgressChannel {
  readonly ready: Promise<void>;
  close(): Promise<void>;
}

/**
 * {@link ProgressChannel} across processes on PostgreSQL: `publish` hands the notice to this
 * process's subscribers at once and sends it with NOTIFY; one listening connection per process
 * (LISTEN) hands every other process's notices to its subscribers. A notice sent while a process
 * was not listening (it restarted, or lost its connection) is not replayed: a stream that connects
 * starts from the rows (`Processing.unfinishedFor`), and the next progress write carries the state.
 */
export function postgresProgressChannel(o: { db: Db; url: string; logger: Logger }): SharedProgressChannel {
  const local = inProcessProgressChannel();
  const origin = crypto.randomUUID();
  let client: pg.Client | null = null;
  let closed = false;
  let retry: NodeJS.Timeout | null = null;

  async function listen(): Promise<void> {
    const { Client } = createRequire(import.meta.url)('pg') as typeof pg;
    const c = new Client({ connectionString: o.url, application_name: 'trailframe-progress' });
    c.on('notification', (msg) => {
      if (msg.channel !== PROGRESS_CHANNEL || !msg.payload) return;
      try {
        const { from, notice } = JSON.parse(msg.payload) as { from: string; notice: ProgressNotice };
        if (from !== origin) local.publish(notice);
      } catch (err) {
        o.logger.warn({ err: (err as Error).message }, 'unreadable progress notification');
      }
    });
    const lost = (err?: Error) => {
      if (client !== c) return;
      client = null;
      c.end().catch(() => undefined);
      listenLater(err);
    };
    c.on('error', lost);
    c.on('end', () => lost());
    client = c;
    try {
      await c.connect();
      await c.query(`LISTEN ${PROGRESS_CHANNEL}`);
    } catch (err) {
      lost(err as Error);
      throw err;
    }
  }

  function listenLater(err?: Error): void {
    if (closed) return;
    o.logger.warn({ err: err?.message }, 'progress channel lost its connection; listening again');
    retry = setTimeout(() => void listen().catch(() => undefined), RECONNECT_MS);
    retry.unref();
  }

  const ready = listen().catch((err: Error) => {
    o.logger.error({ err: err.message }, 'progress channel could not listen');
  });

  return {
    ready,
    publish(notice) {
      local.publish(notice);
      const payload = JSON.stringify({ from: origin, notice });
      o.db
        .raw('select pg_notify(?, ?)', [PROGRESS_CHANNEL, payload])
        .catch((err: Error) => o.logger.warn({ err: err.message }, 'progress not sent to other processes'));
    },
    subscribe: (athleteId, listener) => local.subscribe(athleteId, listener),
    subscribeClinic: (clinicId, listener) => local.subscribeClinic(clinicId, listener),
    async close() {
      closed = true;
      if (retry) clearTimeout(retry);
      const c = client;
      client = null;
      await c?.end().catch(() => undefined);
    },
  };
}
