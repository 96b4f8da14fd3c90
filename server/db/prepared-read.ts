import type { Knex } from 'knex';
import { SqliteClient, preparedStatement } from './sqlite-client';

/** A read that runs on (nearly) every request, answering its rows. */
export type PreparedRead<Row> = (params: readonly Knex.RawBinding[]) => Promise<Row[]>;

/**
 * One SQL text for a read on the hot path (the session row, the signed-in user), kept as a
 * prepared statement. On SQLite it runs on the reader connection without the query builder or
 * the pool (a few microseconds instead of tens); elsewhere, and for an in-memory database, it
 * goes through `knex.raw`. Reads committed data only; never use it inside a transaction. Write
 * portable SQL with `?` placeholders.
 */
export function preparedRead<Row>(db: Knex, sql: string): PreparedRead<Row> {
  const client = db.client as unknown;
  return (params) => {
    const reader = client instanceof SqliteClient ? client.reader : null;
    if (reader?.open) {
      try {
        return Promise.resolve(preparedStatement(reader, sql).all(...params) as Row[]);
      } catch (err) {
        return Promise.reject(err as Error);
      }
    }
    return db.raw(sql, params).then((r: unknown) => (Array.isArray(r) ? r : (r as { rows: Row[] }).rows) as Row[]);
  };
}
