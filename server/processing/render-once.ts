import type { Knex } from 'knex';
import { lockedForUpdate } from '../db/dialect';
import type { Db } from '../db/knex';
import type { ItemScope } from './processed-item';
import type { Processing } from './processing';

/** A new subject to render (a still, an annotated clip, a visit summary) and what makes two requests for it the same. */
export interface RenderRequest {
  /** The subject's table; its rows have `status`. */
  table: string;
  /** The row identical requests take turns on (PostgreSQL; SQLite has one writer), e.g. the clip's. */
  lock: (trx: Knex) => Knex.QueryBuilder;
  /** The columns that, all equal, make a request the same render (the content asked for, as stored). */
  same: Record<string, string | number | boolean | null>;
  /** Inserts the subject's row (status `rendering`); answers its id. */
  insert: (trx: Knex) => Promise<number>;
  /** The processing kind that renders it, and the item's scope. */
  kind: string;
  scope: ItemScope;
}

/**
 * Makes the subject and queues its render in one transaction, unless the same one is still
 * rendering: the same request again while it renders (a double click, a retry after a lost answer)
 * answers that one (`made: false`) instead of a second render. Once it is ready or failed, the same
 * request makes another.
 */
export async function renderOnce(db: Db, processing: Processing, r: RenderRequest): Promise<{ id: number; made: boolean }> {
  return db.transaction(async (trx) => {
    await lockedForUpdate(trx, r.lock(trx));
    const rendering = await trx(r.table)
      .where({ ...r.same, status: 'rendering' })
      .first<{ id: number } | undefined>('id');
    if (rendering) return { id: rendering.id, made: false };
    const id = await r.insert(trx);
    await processing.enqueue(trx, r.kind, id, r.scope);
    return { id, made: true };
  });
}
