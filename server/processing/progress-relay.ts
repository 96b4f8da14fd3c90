import type { Logger } from 'pino';
import type { Db } from '../db/knex';
import type { Processing } from './processing';
import { processedItemsRepository as repo } from './processed-items-repository';

/**
 * Brings what workers in OTHER processes do (`npm run worker`, same database) onto this process's
 * progress channel: while anyone follows a stream here, it reads the rows of `processed_items`
 * that another process changed since the last look, every `everyMs` (one indexed query, in this
 * one place), and publishes their notices. Changes made in this process are published directly
 * and skipped here (`touched_by`).
 *
 * This is the SQLite way across processes; with PostgreSQL the channel itself can cross them
 * (LISTEN/NOTIFY) and the relay is not needed.
 */
export interface ProgressRelay {
  /** Someone follows a stream: read other processes' changes until the returned function is called. */
  follow(): () => void;
  /** Stops reading (shutdown). */
  stop(): void;
}

/** Rows are read again this far back, so a change committed late (behind a busy writer) is not missed. */
const OVERLAP_MS = 3_000;

export function startProgressRelay(o: {
  db: Db;
  processing: Processing;
  logger: Logger;
  everyMs: number;
  clock?: () => Date;
}): ProgressRelay {
  const clock = o.clock ?? (() => new Date());
  let followers = 0;
  let timer: NodeJS.Timeout | null = null;
  let cursor = clock().toISOString();
  /** What was last published per item (its `updated_at`), within the overlap window. */
  const seen = new Map<number, string>();
  let reading = false;

  async function look(): Promise<void> {
    if (reading) return;
    reading = true;
    try {
      const since = new Date(Date.parse(cursor) - OVERLAP_MS).toISOString();
      const rows = await repo.changedSince(o.db, since, o.processing.processTag);
      for (const row of rows) {
        if (seen.get(row.id) === row.updated_at) continue;
        seen.set(row.id, row.updated_at);
        if (row.updated_at > cursor) cursor = row.updated_at;
        const notice = o.processing.noticeOf(row);
        if (notice) o.processing.channel.publish(notice);
      }
      for (const [id, at] of seen) if (at < since) seen.delete(id);
    } catch (err) {
      o.logger.warn({ err: (err as Error).message }, 'progress relay could not read processed items');
    } finally {
      reading = false;
    }
  }

  const stopTimer = () => {
    if (timer) clearInterval(timer);
    timer = null;
  };

  return {
    follow() {
      followers += 1;
      if (!timer) {
        cursor = clock().toISOString();
        timer = setInterval(() => void look(), o.everyMs);
        timer.unref();
      }
      let left = false;
      return () => {
        if (left) return;
        left = true;
        followers -= 1;
        if (followers === 0) stopTimer();
      };
    },
    stop: stopTimer,
  };
}
