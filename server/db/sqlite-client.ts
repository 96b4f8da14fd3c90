/**
 * The SQLite dialect of the app: knex's better-sqlite3 client with the connection settings, a
 * cache of prepared statements, and a second, read-only connection that plain reads use.
 *
 * - One writing connection (the knex pool holds exactly one): SQLite allows one writer, and
 *   better-sqlite3 is synchronous, so a second writer would block the event loop on the lock.
 *   Transactions and every insert, update, delete and raw query run on it.
 * - Reads outside a transaction (`select`, `first`, `pluck` builders) run on a separate reader
 *   connection of the same file. In WAL mode a reader sees every committed transaction and never
 *   a half-written one, and it does not wait for a write transaction that holds the pool while it
 *   awaits (an annotation save, an upload). Reads inside a transaction stay on the writer, so a
 *   transaction reads its own writes. An in-memory database (tests) has no second connection.
 * - Statements are prepared once per connection and kept (least recently used go past
 *   {@link STATEMENT_CACHE_SIZE}); knex would prepare each query again.
 */
import { createRequire } from 'node:module';
import type { Knex } from 'knex';

const require = createRequire(import.meta.url);

/** The part of a better-sqlite3 `Database` this module uses. */
export interface SqliteConnection {
  prepare(sql: string): SqliteStatement;
  pragma(source: string, options?: { simple?: boolean }): unknown;
  close(): void;
  readonly open: boolean;
  /** Whether a transaction is open on this connection. */
  readonly inTransaction: boolean;
}

export interface SqliteStatement {
  readonly reader: boolean;
  all(...params: unknown[]): unknown[];
  run(...params: unknown[]): { changes: number; lastInsertRowid: number | bigint };
}

/**
 * Connection settings, applied to both connections: WAL (readers beside the writer), NORMAL
 * sync (durable at each checkpoint, safe against corruption; WAL's recommended pairing), a busy
 * wait for the rare lock held by another process, foreign keys, a 32 MiB page cache, memory-mapped
 * reads up to 256 MiB and temp tables in memory.
 */
export const SQLITE_PRAGMAS: readonly string[] = [
  'journal_mode = WAL',
  'synchronous = NORMAL',
  'busy_timeout = 5000',
  'foreign_keys = ON',
  'cache_size = -32000',
  'mmap_size = 268435456',
  'temp_store = MEMORY',
];

/** Prepared statements kept per connection. */
export const STATEMENT_CACHE_SIZE = 500;

const statementCaches = new WeakMap<SqliteConnection, Map<string, SqliteStatement>>();

/** The connection's prepared statement for `sql`, prepared on first use and kept. */
export function preparedStatement(connection: SqliteConnection, sql: string): SqliteStatement {
  let cache = statementCaches.get(connection);
  if (!cache) statementCaches.set(connection, (cache = new Map()));
  const hit = cache.get(sql);
  if (hit) {
    // Most recently used last, so the oldest is first when one must go.
    cache.delete(sql);
    cache.set(sql, hit);
    return hit;
  }
  const statement = connection.prepare(sql);
  cache.set(sql, statement);
  if (cache.size > STATEMENT_CACHE_SIZE) cache.delete(cache.keys().next().value!);
  return statement;
}

/** Whether `filename` names a database that only this connection can see. */
function inMemory(filename: string): boolean {
  return filename === ':memory:' || filename === '' || /mode=memory/.test(filename);
}

type KnexClientClass = new (config: Knex.Config) => KnexSqliteClient;

interface KnexSqliteClient {
  connectionSettings: { filename: string; options?: Record<string, unknown> };
  config: object;
  transacting?: boolean;
  driver: new (filename: string, options?: object) => SqliteConnection;
  acquireRawConnection(): Promise<SqliteConnection>;
  destroyRawConnection(connection: SqliteConnection): Promise<void>;
  runner(builder: QueryBuilderInternals): { connection?: unknown; run(): Promise<unknown> };
  processResponse(obj: object, runner: unknown): unknown;
  postProcessResponse(response: unknown, queryContext: unknown): unknown;
  destroy(callback?: unknown): Promise<void>;
  _formatBindings(bindings: unknown[] | undefined): unknown[];
}

interface QueryBuilderInternals {
  _method?: string;
  _statements?: unknown[];
  _connection?: unknown;
  toSQL(): { sql: string; bindings?: unknown[]; method?: string };
  queryContext(): unknown;
}

// knex ships the dialect as CommonJS without types.
const Client_BetterSQLite3 = require('knex/lib/dialects/better-sqlite3/index.js') as KnexClientClass;

type KnexTransactionClass = new (client: unknown, ...args: unknown[]) => { query(connection: unknown, sql: string): Promise<unknown> };
const Transaction_Sqlite = require('knex/lib/dialects/sqlite3/execution/sqlite-transaction.js') as KnexTransactionClass;

/**
 * A transaction that takes the database's write lock when it begins (`BEGIN IMMEDIATE`), waiting
 * for it under the busy timeout. knex's `BEGIN` defers the lock to the first write: a transaction
 * that reads first (checks, then inserts) and meets another process's commit in between is then
 * refused at once (SQLITE_BUSY, no wait), which a server beside separate workers or other servers
 * on one database file would answer as a 500. In one process nothing changes: the pool has one
 * writing connection, so its transactions already run one at a time.
 */
class ImmediateTransaction extends Transaction_Sqlite {
  begin(connection: unknown): Promise<unknown> {
    return this.query(connection, 'BEGIN IMMEDIATE;');
  }
}

/** Builder methods that only read. */
const READS = new Set(['select', 'first', 'pluck']);

/** Statements that cannot change a row. */
const SELECT_SQL = /^\s*select\b/i;
/**
 * The tables that say who is signed in and what they may do (a session, its user, the user's
 * clinic and athlete): a statement naming one of them moves {@link SqliteClient.identityGeneration}.
 * Rows of other tables never change them (no foreign key cascades into them from elsewhere).
 */
const IDENTITY_TABLES = /\b(?:sessions|users|clinics|athletes)\b/i;

/** See {@link SqliteClient.identityGeneration}. */
interface IdentityWrites {
  writes: number;
  pending: boolean;
  writer: SqliteConnection | null;
}
const identityWrites = new WeakMap<object, IdentityWrites>();

/**
 * knex client for SQLite through better-sqlite3 (pass as `client` in the knex config). Keeps the
 * reader connection beside the pool's writer and closes it with the pool.
 */
export class SqliteClient extends Client_BetterSQLite3 {
  /** The read-only connection for reads outside transactions; null for in-memory databases. */
  reader: SqliteConnection | null = null;
  /**
   * Writes to the identity tables, shared with this client's transaction clients (knex makes those
   * with `Object.create` of the class and copies `config`, so the state hangs off that).
   */
  private get identity(): IdentityWrites {
    let state = identityWrites.get(this.config);
    if (!state) identityWrites.set(this.config, (state = { writes: 0, pending: false, writer: null }));
    return state;
  }

  /**
   * A number that changes whenever this process changes the tables saying who is signed in and what
   * they may do (sessions, users, clinics, athletes: any statement naming one, and again when its
   * transaction ends), or null while such a change is uncommitted. Values read from those tables
   * may be kept in memory as long as it answers the same number; workers in other processes never
   * write these tables.
   */
  identityGeneration(): number | null {
    const identity = this.identity;
    if (identity.pending) {
      if (identity.writer?.open && identity.writer.inTransaction) return null;
      // The transaction ended (committed or rolled back): what it wrote is now what readers see.
      identity.pending = false;
      identity.writes++;
    }
    return identity.writes;
  }

  /** knex's transactions of this client begin with `BEGIN IMMEDIATE` ({@link ImmediateTransaction}). */
  transaction(...args: unknown[]): object {
    return new ImmediateTransaction(this, ...args);
  }

  override async acquireRawConnection(): Promise<SqliteConnection> {
    const connection = await super.acquireRawConnection();
    this.identity.writer = connection;
    applyPragmas(connection);
    const filename = this.connectionSettings.filename;
    if (!inMemory(filename) && !this.reader) {
      const reader = new this.driver(filename);
      applyPragmas(reader);
      reader.pragma('query_only = ON');
      this.reader = reader;
    }
    return connection;
  }

  override async destroyRawConnection(connection: SqliteConnection): Promise<void> {
    this.closeReader();
    await super.destroyRawConnection(connection);
  }

  override async destroy(callback?: unknown): Promise<void> {
    await super.destroy(callback);
    this.closeReader();
  }

  /**
   * Plain reads outside a transaction go to the reader connection, and run in one step: compile,
   * cached statement, knex's own response shaping (no pool, no per-query events).
   */
  override runner(builder: QueryBuilderInternals) {
    const runner = super.runner(builder);
    const reader = this.reader;
    if (reader?.open && !this.transacting && !builder._connection && builder._statements && READS.has(builder._method ?? '')) {
      // knex's Runner uses a preset connection as it is (streams too) and does not give it back to the pool.
      runner.connection = reader;
      runner.run = async () => {
        const query = builder.toSQL();
        let rows: unknown[];
        try {
          rows = preparedStatement(reader, query.sql).all(this._formatBindings(query.bindings));
        } catch (err) {
          // As knex reports a failed query: with its SQL.
          if (err instanceof Error) err.message = `${query.sql} - ${err.message}`;
          throw err;
        }
        return this.postProcessResponse(this.processResponse({ ...query, response: rows }, runner), builder.queryContext());
      };
    }
    return runner;
  }

  /** knex's query step, with the statement from the cache. */
  async _query(connection: SqliteConnection, obj: { sql: string; bindings?: unknown[]; response?: unknown; context?: unknown }) {
    if (!obj.sql) throw new Error('The query is empty');
    if (!connection) throw new Error('No connection provided');
    if (!SELECT_SQL.test(obj.sql) && IDENTITY_TABLES.test(obj.sql)) {
      const identity = this.identity;
      identity.writes++;
      identity.writer ??= connection;
      // Inside a transaction the change is seen only once it ends (see identityGeneration).
      if (connection.inTransaction) identity.pending = true;
    }
    const statement = preparedStatement(connection, obj.sql);
    const bindings = this._formatBindings(obj.bindings);
    if (statement.reader) {
      obj.response = statement.all(bindings);
      return obj;
    }
    const response = statement.run(bindings);
    obj.response = response;
    obj.context = { lastID: response.lastInsertRowid, changes: response.changes };
    return obj;
  }

  private closeReader(): void {
    if (this.reader?.open) this.reader.close();
    this.reader = null;
  }
}

/** Applies {@link SQLITE_PRAGMAS} to a connection. */
export function applyPragmas(connection: SqliteConnection): void {
  for (const p of SQLITE_PRAGMAS) connection.pragma(p);
}
