import crypto from 'node:crypto';
import type { Knex } from 'knex';
import { AppError } from '../errors';
import { lockedForUpdate } from './dialect';
import type { Db } from './knex';

/** How long a create key answers retries (a day: a lost answer is retried within minutes). */
export const CREATE_KEY_KEPT_MS = 24 * 60 * 60 * 1000;

/**
 * Removes the create keys naming an erased athlete, their visits or their plans (a hash of what
 * was typed must not outlive the erasure).
 */
export async function eraseCreateKeys(
  trx: Knex,
  clinicId: number,
  athleteId: number,
  assessmentIds: number[],
  planIds: number[],
): Promise<void> {
  await trx('create_keys')
    .where({ clinic_id: clinicId })
    .where((q) =>
      q
        .where({ kind: 'athlete', subject_id: athleteId })
        .orWhere((r) => r.where({ kind: 'assessment' }).whereIn('subject_id', assessmentIds))
        .orWhere((r) => r.where({ kind: 'plan' }).whereIn('subject_id', planIds)),
    )
    .delete();
}

/** What a keyed create makes (the `kind` column of `create_keys`). */
export type CreateKind = 'athlete' | 'assessment' | 'plan' | 'price' | 'exercise';

/**
 * Runs `create` in a transaction once per `key` (the client's `Idempotency-Key`) of this clinic and
 * kind: the same key again, at once or after the answer was lost, answers the id it made. The same
 * key with another request (another body or athlete) answers 422 `idempotency_key_reused`. Without
 * a key every call creates. Keyed creates of a clinic take turns (PostgreSQL; SQLite has one writer).
 */
export async function createOnce(
  db: Db,
  o: { clinicId: number; kind: CreateKind; key: string | undefined; request: unknown; at: string; create: (trx: Knex) => Promise<number> },
): Promise<number> {
  return db.transaction(async (trx) => {
    if (!o.key) return o.create(trx);
    const hash = crypto.createHash('sha256').update(JSON.stringify(o.request)).digest('hex');
    await lockedForUpdate(trx, trx('clinics').where({ id: o.clinicId }).select('id'));
    // A key answers retries for a day; older ones go, so the table stays small and keeps no hash for long.
    await trx('create_keys')
      .where({ clinic_id: o.clinicId })
      .where('created_at', '<', new Date(Date.parse(o.at) - CREATE_KEY_KEPT_MS).toISOString())
      .delete();
    const made = await trx('create_keys')
      .where({ clinic_id: o.clinicId, kind: o.kind, key: o.key })
      .first<{ subject_id: number; request_hash: string } | undefined>('subject_id', 'request_hash');
    if (made && made.request_hash !== hash)
      throw new AppError(422, 'idempotency_key_reused', 'This key was used for something else. Reload the page and save again.');
    if (made) return made.subject_id;
    const id = await o.create(trx);
    await trx('create_keys').insert({
      clinic_id: o.clinicId,
      kind: o.kind,
      key: o.key,
      subject_id: id,
      request_hash: hash,
      created_at: o.at,
    });
    return id;
  });
}
