import type { Knex } from 'knex';
import { SqliteClient } from './sqlite-client';

/** Entries an identity cache keeps at most; the least recently stored goes first. */
export const IDENTITY_CACHE_MAX = 10_000;

/** Values read from the identity tables, kept while those tables are unchanged. */
export interface IdentityCache<K, V> {
  /** The value kept for `key` when the identity tables have not changed since it was read, else `load()`'s (then kept). */
  read(key: K, load: () => Promise<V>): Promise<V>;
}

/**
 * A cache of values read from the tables that say who is signed in and what they may do (sessions,
 * users, clinics, athletes). Every signed-in request reads its session row and its user; those rows
 * change rarely, so they are kept in memory and used for as long as this process has not written to
 * any of those tables since they were read ({@link SqliteClient.identityGeneration}): a sign-out,
 * password change, role change, deactivation or erasure is seen by the very next request. Other
 * knex clients have no generation: nothing is kept and every read loads.
 */
export function identityCache<K, V>(db: Knex, max = IDENTITY_CACHE_MAX): IdentityCache<K, V> {
  const client = db.client as unknown;
  const generation = client instanceof SqliteClient ? () => client.identityGeneration() : () => null;
  const kept = new Map<K, { generation: number; value: V }>();
  return {
    async read(key, load) {
      const before = generation();
      if (before !== null) {
        const hit = kept.get(key);
        if (hit?.generation === before) return hit.value;
      }
      const value = await load();
      // Kept only when nothing changed while it loaded (a load can wait on the pool).
      if (before !== null && generation() === before) {
        kept.delete(key);
        kept.set(key, { generation: before, value });
        if (kept.size > max) kept.delete(kept.keys().next().value!);
      }
      return value;
    },
  };
}
