import type { Knex } from 'knex';
import { SqliteClient, type SqliteConnection } from './sqlite-client';

/** A read that runs on (nearly) every request, answering its rows. */
export type PreparedRead<Row> = (params: readonly Knex.RawBinding[]) => Promise<Row[]>;

/** The part of a better-sqlite3 statement a raw read uses. */
interface RawStatement {
  raw(toggle: boolean): RawStatement;
  all(...params: unknown[]): unknown[][];
  columns(): { name: string }[];
}

/** A read's statement in raw mode (rows as arrays of values) and the function that makes each row's object. */
interface RawRead {
  statement: RawStatement;
  names: number;
  row: (values: unknown[]) => unknown;
}

/** A read whose rows stay better-sqlite3's own objects (see {@link rowBuilder}). */
interface ObjectRead {
  statement: { all(...params: unknown[]): unknown[] };
  row: null;
}

const rawReads = new WeakMap<SqliteConnection, Map<string, RawRead | ObjectRead>>();

/**
 * A function making a row's object from its values in column order — the object better-sqlite3
 * would answer (a later column of the same name wins) — as one object literal with the columns as
 * its keys, so every row is built in one step with one shape: on the assessment page's clip list,
 * about half the time better-sqlite3's own row objects take. The keys are the statement's column
 * names (SQL written in this code base, never input), each written as a JSON string literal.
 */
export function rowBuilder(names: readonly string[]): ((values: unknown[]) => Record<string, unknown>) | null {
  // A literal's "__proto__" key would set the prototype: such a read keeps better-sqlite3's own objects.
  if (names.includes('__proto__')) return null;
  const literal = names.map((name, i) => `${JSON.stringify(name)}: v[${i}]`).join(', ');
  // The keys are the statement's own column names, quoted by JSON.stringify.
  return new Function('v', `return { ${literal} };`) as (values: unknown[]) => Record<string, unknown>;
}

function rawRead(connection: SqliteConnection, sql: string): RawRead | ObjectRead {
  let reads = rawReads.get(connection);
  if (!reads) rawReads.set(connection, (reads = new Map()));
  let read = reads.get(sql);
  if (!read) {
    const statement = connection.prepare(sql) as unknown as RawStatement;
    const names = statement.columns().map((c) => c.name);
    const row = rowBuilder(names);
    read = row ? { statement: statement.raw(true), names: names.length, row } : { statement, row: null };
    reads.set(sql, read);
  }
  return read;
}

/** The rows of a raw read as objects; should the columns have changed under it (a schema change), the builder follows. */
function rowsOf(read: RawRead | ObjectRead, params: readonly unknown[]): unknown[] {
  if (read.row === null) return read.statement.all(...params);
  const values = read.statement.all(...params);
  if (values.length > 0 && values[0]!.length !== read.names) {
    const names = read.statement.columns().map((c) => c.name);
    read.names = names.length;
    // Should a new column be named "__proto__", its object is still made as a literal would make it.
    read.row = rowBuilder(names) ?? ((v: unknown[]) => Object.fromEntries(names.map((n, i) => [n, v[i]])));
  }
  return values.map(read.row);
}

/**
 * One SQL text for a read on the hot path (the session row, the signed-in user, the roster, the
 * assessment page), kept as a prepared statement. On SQLite it runs on the reader connection
 * without the query builder or the pool (a few microseconds instead of tens), its rows fetched as
 * arrays and made into objects by {@link rowBuilder}; elsewhere, and for an in-memory database, it
 * goes through `knex.raw`. Reads committed data only; never use it inside a transaction. Write
 * portable SQL with `?` placeholders.
 */
export function preparedRead<Row>(db: Knex, sql: string): PreparedRead<Row> {
  const client = db.client as unknown;
  return (params) => {
    const reader = client instanceof SqliteClient ? client.reader : null;
    if (reader?.open) {
      try {
        return Promise.resolve(rowsOf(rawRead(reader, sql), params) as Row[]);
      } catch (err) {
        return Promise.reject(err as Error);
      }
    }
    return db.raw(sql, params).then((r: unknown) => (Array.isArray(r) ? r : (r as { rows: Row[] }).rows) as Row[]);
  };
}
