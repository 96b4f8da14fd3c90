import type { Knex } from 'knex';
import { skipLocked } from '../db/dialect';
import type { ItemScope, ItemState, ProcessedItem } from './processed-item';

/** A `processed_items` row. */
export interface ProcessedItemRow {
  id: number;
  kind: string;
  subject_type: string;
  subject_id: number;
  clinic_id: number | null;
  athlete_id: number | null;
  payload: string;
  state: ItemState;
  attempts: number;
  max_attempts: number;
  lease_until: string | null;
  run_after: string;
  /** The process holding the lease while running. */
  claimed_by: string | null;
  /** The process that last changed the row (the relay passes on other processes' changes). */
  touched_by: string | null;
  progress_done: number | null;
  progress_total: number | null;
  error: string | null;
  created_at: string;
  updated_at: string;
}

const TABLE = 'processed_items';

/** Which kinds a worker takes: only these, or every kind but these (none: every kind). */
export type KindFilter = { only: readonly string[] } | { except: readonly string[] };

/** Narrows a query to the kinds `filter` lets through. */
function ofKinds(q: Knex.QueryBuilder, filter: KindFilter | undefined): Knex.QueryBuilder {
  if (!filter) return q;
  return 'only' in filter ? q.whereIn('kind', [...filter.only]) : filter.except.length ? q.whereNotIn('kind', [...filter.except]) : q;
}

/** Columns to change (a value, or SQL such as `progress_total`). */
export type ItemPatch = { [K in keyof ProcessedItemRow]?: ProcessedItemRow[K] | Knex.Raw };

export function toItem(row: ProcessedItemRow): ProcessedItem {
  return {
    id: row.id,
    kind: row.kind,
    subjectType: row.subject_type,
    subjectId: row.subject_id,
    scope: { clinicId: row.clinic_id ?? 0, athleteId: row.athlete_id },
    payload: JSON.parse(row.payload || '{}') as Record<string, unknown>,
    state: row.state,
    attempts: row.attempts,
    maxAttempts: row.max_attempts,
    progress: row.progress_total !== null ? { done: row.progress_done ?? 0, total: row.progress_total } : null,
    error: row.error,
  };
}

/**
 * Knex of `processed_items`. Every change is one UPDATE that says which state it expects (and,
 * while running, which process holds the lease), so workers in several processes never take or
 * finish the same item twice; the affected-row count tells whether the change applied.
 */
export const processedItemsRepository = {
  async insert(
    trx: Knex,
    row: { kind: string; subjectType: string; subjectId: number; scope: ItemScope; payload: Record<string, unknown> },
    opts: { maxAttempts: number; at: string; by: string },
  ): Promise<number> {
    const [r] = await trx(TABLE)
      .insert({
        kind: row.kind,
        subject_type: row.subjectType,
        subject_id: row.subjectId,
        clinic_id: row.scope.clinicId,
        athlete_id: row.scope.athleteId,
        payload: JSON.stringify(row.payload),
        state: 'queued',
        attempts: 0,
        max_attempts: opts.maxAttempts,
        run_after: opts.at,
        touched_by: opts.by,
        created_at: opts.at,
        updated_at: opts.at,
      })
      .returning('id');
    return (r as { id: number }).id;
  },

  find(db: Knex, id: number): Promise<ProcessedItemRow | undefined> {
    return db<ProcessedItemRow>(TABLE).where({ id }).first();
  },

  /**
   * Takes the next due item in one statement: the oldest queued one whose time has come, or a
   * running one whose lease ran out (its worker died). Running, one more attempt, leased to `by`.
   * `dueBefore` (default `at`) holds queued items back that another way offers on time (pg-boss);
   * `kinds` leaves the other kinds' items, queued or stalled, to the workers that take them.
   */
  async claimNext(
    db: Knex,
    opts: { at: string; leaseUntil: string; by: string; dueBefore?: string; kinds?: KindFilter },
  ): Promise<ProcessedItemRow | null> {
    const next = skipLocked(
      db,
      ofKinds(
        db(TABLE)
          .select('id')
          .where((w) =>
            w
              .where((q) => q.where({ state: 'queued' }).andWhere('run_after', '<=', opts.dueBefore ?? opts.at))
              .orWhere((q) => q.where({ state: 'running' }).andWhere('lease_until', '<', opts.at)),
          ),
        opts.kinds,
      )
        .orderBy('id')
        .limit(1),
    );
    return this.claimWhere(db, (q) => q.whereIn('id', next), opts);
  },

  /** Takes one item by id, as {@link claimNext} does, when it is queued or its lease ran out; else null. */
  claimById(db: Knex, id: number, opts: { at: string; leaseUntil: string; by: string }): Promise<ProcessedItemRow | null> {
    return this.claimWhere(
      db,
      (q) =>
        q
          .where({ id })
          .andWhere((w) =>
            w.where({ state: 'queued' }).orWhere((r) => r.where({ state: 'running' }).andWhere('lease_until', '<', opts.at)),
          ),
      opts,
    );
  },

  async claimWhere(
    db: Knex,
    which: (q: Knex.QueryBuilder) => Knex.QueryBuilder,
    opts: { at: string; leaseUntil: string; by: string },
  ): Promise<ProcessedItemRow | null> {
    const rows = (await which(db(TABLE))
      .update({
        state: 'running',
        attempts: db.raw('attempts + 1'),
        lease_until: opts.leaseUntil,
        claimed_by: opts.by,
        touched_by: opts.by,
        updated_at: opts.at,
      })
      .returning('*')) as ProcessedItemRow[];
    return rows[0] ?? null;
  },

  /**
   * Changes a running item held by `by` in attempt `attempt`; false when it is no longer (cancelled,
   * or taken over after its lease ran out — also by another worker of the same process, which
   * claims it under the next attempt, so a stalled run's late progress or result never lands).
   */
  async updateHeld(db: Knex, id: number, holder: { by: string; attempt: number }, patch: ItemPatch): Promise<boolean> {
    const n = await db(TABLE)
      .where({ id, state: 'running', claimed_by: holder.by, attempts: holder.attempt })
      .update({ ...patch, touched_by: holder.by });
    return n > 0;
  },

  /** Cancels the queued and running items of a subject (of one kind when `opts.kind` is given); answers those it cancelled. */
  async cancelSubject(
    db: Knex,
    subjectType: string,
    subjectId: number,
    opts: { at: string; by: string; kind?: string },
  ): Promise<ProcessedItemRow[]> {
    const rows = (await db(TABLE)
      .where({ subject_type: subjectType, subject_id: subjectId, ...(opts.kind ? { kind: opts.kind } : {}) })
      .whereIn('state', ['queued', 'running'])
      .update({ state: 'cancelled', error: null, lease_until: null, touched_by: opts.by, updated_at: opts.at })
      .returning('*')) as ProcessedItemRow[];
    return rows;
  },

  /** The newest item about a subject, or undefined. */
  latest(db: Knex, subjectType: string, subjectId: number): Promise<ProcessedItemRow | undefined> {
    return db<ProcessedItemRow>(TABLE).where({ subject_type: subjectType, subject_id: subjectId }).orderBy('id', 'desc').first();
  },

  /** Queued and running items of the clinic's own subjects (no athlete): what the clinic stream sends on connecting. */
  unfinishedForClinic(db: Knex, clinicId: number): Promise<ProcessedItemRow[]> {
    return db<ProcessedItemRow>(TABLE)
      .where({ clinic_id: clinicId })
      .whereNull('athlete_id')
      .whereIn('state', ['queued', 'running'])
      .orderBy('id');
  },
  /** Queued and running items of an athlete (what a stream sends on connecting). */
  unfinishedFor(db: Knex, athleteId: number): Promise<ProcessedItemRow[]> {
    return db<ProcessedItemRow>(TABLE).where({ athlete_id: athleteId }).whereIn('state', ['queued', 'running']).orderBy('id');
  },

  /** Rows changed at or after `since` by any process but `notBy`, oldest change first (the relay). */
  changedSince(db: Knex, since: string, notBy: string): Promise<ProcessedItemRow[]> {
    return db<ProcessedItemRow>(TABLE)
      .where('updated_at', '>=', since)
      .andWhere((q) => q.whereNull('touched_by').orWhereNot({ touched_by: notBy }))
      .orderBy('updated_at')
      .orderBy('id')
      .limit(500);
  },
};

/**
 * SQL of the newest item about each subject row `alias` of type `subjectType`, for views that
 * show progress beside the subject (`left join` it as `pi`).
 */
export function joinLatestItem(query: Knex.QueryBuilder, db: Knex, subjectType: string, alias: string): Knex.QueryBuilder {
  return query.leftJoin(`${TABLE} as pi`, function () {
    this.on(
      'pi.id',
      '=',
      db.raw(`(select max(x.id) from ${TABLE} x where x.subject_type = ? and x.subject_id = ${alias}.id)`, [subjectType]),
    );
  });
}
