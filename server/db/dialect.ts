/**
 * Every difference between the two databases the app runs on, in one place: SQLite (the default,
 * one file, see `sqlite-client.ts`) and PostgreSQL (when `DATABASE_URL` is set). Code elsewhere
 * writes portable knex and asks this module where the dialects part:
 *
 * - Connection: SQLite has one writer and a read-only reader; PostgreSQL a pool of connections, so
 *   two requests may write at once (use transactions and unique keys, not "nobody else writes").
 * - Values: PostgreSQL returns 64-bit integers (`count(*)`, `sum`) and numerics as strings and
 *   `json` columns parsed; {@link PG_TYPES} makes them numbers and text, as SQLite returns them.
 *   Booleans come back as true/false (SQLite: 1/0): compare with `Boolean(x)`, write `true/false`.
 * - SQL: JSON access ({@link jsonTextEquals}), check constraints (SQLite's are triggers in the
 *   first migrations, {@link addCheck}), `LIKE` (case-insensitive on SQLite for ASCII, sensitive on
 *   PostgreSQL: compare `lower(col)`), `INSERT OR IGNORE` (use knex `onConflict().ignore()`).
 */
import { createRequire } from 'node:module';
import type { Knex } from 'knex';
import type pg from 'pg';

let pgModule: typeof pg | undefined;
/**
 * `pg`, loaded when a PostgreSQL connection first asks for a type parser (never on SQLite), then
 * kept: the parsers are asked for on every column of every result, and resolving the module anew
 * each time cost a few milliseconds of CPU per signed-in read.
 */
const loadPg = () => (pgModule ??= createRequire(import.meta.url)('pg') as typeof pg);

/** The database engine behind a knex instance. */
export type Dialect = 'sqlite' | 'postgres';

/** Whether `target` (DATABASE_URL or a file name) names a PostgreSQL server. */
export function isPostgresUrl(target: string): boolean {
  return /^postgres(ql)?:\/\//.test(target);
}

/** Which engine `db` runs on. */
export function dialectOf(db: Knex): Dialect {
  const name = (db.client as { dialect?: string }).dialect;
  return name === 'postgresql' ? 'postgres' : 'sqlite';
}

/** Whether `db` runs on PostgreSQL. */
export function isPostgres(db: Knex): boolean {
  return dialectOf(db) === 'postgres';
}

/** The rows of a raw SELECT on either engine (SQLite's client answers the rows, PostgreSQL's a result holding them). */
export async function selectRows<T>(db: Knex, sql: string, bindings: readonly Knex.RawBinding[] = []): Promise<T[]> {
  const result = (await db.raw(sql, bindings)) as T[] | { rows: T[] };
  return Array.isArray(result) ? result : result.rows;
}

const INT8 = 20;
const NUMERIC = 1700;
const JSON_OID = 114;
const JSONB = 3802;

/**
 * Type parsers for the app's PostgreSQL connections (not global: pg-boss keeps its own). int8 and
 * numeric as numbers (the app's counts and sums stay far below 2^53), json as text (the app parses
 * its JSON columns itself, as it does on SQLite).
 */
export const PG_TYPES = {
  getTypeParser(oid: number, format?: 'text' | 'binary') {
    if (oid === INT8 || oid === NUMERIC) return (v: string) => Number(v);
    if (oid === JSON_OID || oid === JSONB) return (v: string) => v;
    return loadPg().types.getTypeParser(oid, format);
  },
} as unknown as pg.CustomTypesConfig;

/**
 * `where <column's JSON at path> = value` for a text column holding JSON (the session row's
 * `sess`). `path` lists the keys, e.g. `['passport', 'user']`; `value` compares as text.
 */
export function jsonTextEquals(db: Knex, column: string, path: readonly string[], value: string | number): Knex.Raw {
  if (isPostgres(db)) return db.raw(`(??::jsonb #>> ?) = ?`, [column, `{${path.join(',')}}`, String(value)]);
  return db.raw(`CAST(json_extract(??, ?) AS TEXT) = ?`, [column, `$.${path.join('.')}`, String(value)]);
}

/**
 * A check that `column` holds one of `values`, in a migration: SQLite's first migrations used a
 * trigger (kept there as it is, so existing SQLite files match); PostgreSQL gets a CHECK constraint.
 */
export async function addCheck(knex: Knex, table: string, name: string, column: string, values: readonly string[]): Promise<void> {
  const list = values.map((v) => `'${v.replace(/'/g, "''")}'`).join(',');
  if (isPostgres(knex)) {
    await knex.raw(`ALTER TABLE ?? ADD CONSTRAINT ?? CHECK (?? IN (${list}))`, [table, name, column]);
    return;
  }
  await knex.raw(`CREATE TRIGGER ${name} BEFORE INSERT ON ${table}
    WHEN NEW.${column} NOT IN (${list})
    BEGIN SELECT RAISE(ABORT, 'invalid ${column}'); END`);
}

/**
 * Adds `FOR UPDATE SKIP LOCKED` on PostgreSQL, so concurrent claimers each take a different row;
 * SQLite has one writer at a time and needs none.
 */
export function skipLocked(db: Knex, query: Knex.QueryBuilder): Knex.QueryBuilder {
  return isPostgres(db) ? query.forUpdate().skipLocked() : query;
}

/**
 * Adds `FOR NO KEY UPDATE` on PostgreSQL, so a transaction that reads a row this way waits for
 * another one holding it (e.g. a clinic's row while an invoice number is given); SQLite has one
 * writer at a time and needs none.
 *
 * Not `FOR UPDATE`: that lock also holds back every insert whose foreign key points at the row
 * (PostgreSQL checks a reference with `FOR KEY SHARE`), so a transaction holding one person's row
 * and inserting an audit entry that names another could deadlock with one doing the reverse (two
 * deactivations sent at once did). These locks guard the row's state, never its key, and
 * `FOR NO KEY UPDATE` still excludes every other holder, an update and a delete of the row.
 */
export function lockedForUpdate(db: Knex, query: Knex.QueryBuilder): Knex.QueryBuilder {
  return isPostgres(db) ? query.forNoKeyUpdate() : query;
}

/**
 * Whether `err` is PostgreSQL refusing a value for its column (SQLSTATE class 22: a number out of
 * range, text longer than its `varchar(n)`, a malformed number). SQLite stores such values as they
 * come; the API answers 400 for them on PostgreSQL instead of failing.
 */
export function isValueRefused(err: unknown): boolean {
  const e = err as { code?: unknown; severity?: unknown };
  return typeof e?.code === 'string' && typeof e.severity === 'string' && /^22[0-9A-Z]{3}$/.test(e.code);
}
