/**
 * The SQLite dialect (server/db/sqlite-client.ts): connection settings on both connections, plain
 * reads on the read-only connection (committed data only, never waiting for a transaction), reads
 * inside a transaction on the writer, the prepared-statement cache, and prepared reads' rows (fetched
 * as arrays, made into the objects better-sqlite3 itself would answer).
 */
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createDb, migrate, type Db } from '../../server/db/knex';
import fc from 'fast-check';
import { preparedRead, rowBuilder } from '../../server/db/prepared-read';
import { preparedStatement, SqliteClient, STATEMENT_CACHE_SIZE, type SqliteConnection } from '../../server/db/sqlite-client';
import { tempDir } from './media/fixtures';

let dir: { dir: string; cleanup: () => Promise<void> };
let db: Db;

beforeEach(async () => {
  dir = await tempDir('sqlite-client');
  db = createDb(path.join(dir.dir, 'db.sqlite'));
  await migrate(db);
});
afterEach(async () => {
  await db.destroy();
  await dir.cleanup();
});

const client = () => db.client as unknown as SqliteClient;
const reader = () => client().reader!;
const at = '2026-12-04T10:00:00.000Z';

describe('connection settings', () => {
  it('the writer and the reader run with WAL, NORMAL sync, a busy wait, foreign keys, a 32 MiB cache, mmap and memory temp store', async () => {
    const writer = (await db.client.acquireConnection()) as SqliteConnection;
    try {
      for (const conn of [writer, reader()]) {
        const pragma = (name: string) => conn.pragma(name, { simple: true });
        expect(pragma('journal_mode')).toBe('wal');
        expect(pragma('synchronous')).toBe(1); // NORMAL (SQLite documentation: 0 OFF, 1 NORMAL, 2 FULL)
        expect(pragma('busy_timeout')).toBe(5000);
        expect(pragma('foreign_keys')).toBe(1);
        expect(pragma('cache_size')).toBe(-32000); // negative = KiB
        expect(pragma('mmap_size')).toBe(268435456);
        expect(pragma('temp_store')).toBe(2); // MEMORY
      }
      expect(writer.pragma('query_only', { simple: true })).toBe(0);
      expect(reader().pragma('query_only', { simple: true })).toBe(1);
    } finally {
      db.client.releaseConnection(writer);
    }
  });

  it('an in-memory database has no reader and reads through the pool', async () => {
    const mem = createDb(':memory:');
    await migrate(mem);
    expect((mem.client as unknown as SqliteClient).reader).toBeNull();
    expect(await mem('clinics').count({ n: '*' })).toEqual([{ n: 0 }]);
    await mem.destroy();
  });
});

describe('reads beside a transaction', () => {
  it('a plain read sees committed rows only and does not wait for an open transaction; the transaction reads its own writes', async () => {
    let release!: () => void;
    const held = new Promise<void>((r) => (release = r));
    let inside: unknown[] = [];
    const trx = db.transaction(async (t) => {
      await t('clinics').insert({ name: 'Uncommitted', created_at: at });
      inside = await t('clinics').where({ name: 'Uncommitted' });
      await held;
    });
    // Give the transaction time to write; the writer is now held.
    await new Promise((r) => setTimeout(r, 50));
    expect(inside).toHaveLength(1);
    const outside = await db('clinics').where({ name: 'Uncommitted' });
    expect(outside).toHaveLength(0);
    expect(await preparedRead(db, 'SELECT id FROM clinics WHERE name = ?')(['Uncommitted'])).toHaveLength(0);
    release();
    await trx;
    expect(await db('clinics').where({ name: 'Uncommitted' })).toHaveLength(1);
    expect(await preparedRead(db, 'SELECT id FROM clinics WHERE name = ?')(['Uncommitted'])).toHaveLength(1);
  });

  it('a rolled-back transaction leaves nothing for the reader', async () => {
    await expect(
      db.transaction(async (t) => {
        await t('clinics').insert({ name: 'Rolled back', created_at: at });
        throw new Error('stop');
      }),
    ).rejects.toThrow('stop');
    expect(await db('clinics').where({ name: 'Rolled back' })).toHaveLength(0);
  });

  it('first(), pluck() and count() answer as knex does, and a failing read names its SQL', async () => {
    await db('clinics').insert([
      { name: 'A', created_at: at },
      { name: 'B', created_at: at },
    ]);
    expect((await db('clinics').orderBy('name').first('name'))?.name).toBe('A');
    expect(await db('clinics').orderBy('name').pluck('name')).toEqual(['A', 'B']);
    expect(await db('clinics').count({ n: '*' })).toEqual([{ n: 2 }]);
    await expect(db('no_such_table').select('*')).rejects.toThrow(/select \* from `no_such_table`.*no such table/);
  });
});

describe('transactions beside another process', () => {
  // Another process on the same file (a worker, a second web server) stands in as a second
  // better-sqlite3 connection that does not wait for locks.
  it('a transaction that reads before it writes holds the write lock from its start, so a commit elsewhere in between cannot refuse its write', async () => {
    const Driver = client().driver;
    const other = new Driver(path.join(dir.dir, 'db.sqlite'));
    other.pragma('busy_timeout = 0');
    let othersWrite: unknown = null;
    try {
      await db.transaction(async (trx) => {
        await trx('clinics').select('id');
        try {
          other.prepare("insert into clinics (name, created_at) values ('Elsewhere', ?)").run(at);
        } catch (err) {
          othersWrite = (err as { code?: string }).code;
        }
        // With knex's deferred BEGIN the other commit lands first and this insert fails at once (SQLITE_BUSY_SNAPSHOT).
        await trx('clinics').insert({ name: 'Here', created_at: at });
      });
    } finally {
      other.close();
    }
    expect(othersWrite).toBe('SQLITE_BUSY');
    expect(await db('clinics').pluck('name')).toEqual(['Here']);
  });
});

describe('prepared statements', () => {
  it('one statement per SQL text, kept until the cache is full (least recently used go first)', () => {
    const conn = reader();
    const sql = 'SELECT 1 AS one';
    const first = preparedStatement(conn, sql);
    expect(preparedStatement(conn, sql)).toBe(first);
    for (let i = 0; i < STATEMENT_CACHE_SIZE; i++) preparedStatement(conn, `SELECT ${i + 2} AS n`);
    expect(preparedStatement(conn, sql)).not.toBe(first);
  });

  it('a kept statement follows a schema change (a new column shows in select *)', async () => {
    await db('clinics').insert({ name: 'Before', created_at: at });
    const before = await db('clinics').select('*');
    expect(before[0]).not.toHaveProperty('motto');
    await db.schema.alterTable('clinics', (t) => t.string('motto'));
    const after = await db('clinics').select('*');
    expect(after[0]).toHaveProperty('motto', null);
  });
});

describe('prepared reads', () => {
  /** An SQL identifier in double quotes (SQLite's quoting: a quote inside is doubled). */
  const quoted = (name: string) => `"${name.replace(/"/g, '""')}"`;

  it('answer the objects better-sqlite3 answers: every column, a later column of a name winning, odd names as they are', async () => {
    await db('clinics').insert({ name: 'Ridge "Lab"', created_at: at });
    for (const extra of ['', ', NULL AS "__proto__"']) {
      const sql = `SELECT c.*, c.name AS ${quoted('naïve "name"')}, 1 AS id, 'x' AS "constructor"${extra} FROM clinics c WHERE c.name = ?`;
      const rows = await preparedRead<Record<string, unknown>>(db, sql)(['Ridge "Lab"']);
      const expected = reader().prepare(sql).all('Ridge "Lab"') as Record<string, unknown>[];
      expect(rows).toEqual(expected);
      expect(rows[0]!['id']).toBe(1);
      expect(Object.keys(rows[0]!)).toEqual(Object.keys(expected[0]!));
    }
  });

  it('follow a schema change that adds a column under a kept read (select *)', async () => {
    await db('clinics').insert({ name: 'Before', created_at: at });
    const read = preparedRead<Record<string, unknown>>(db, 'SELECT * FROM clinics');
    expect((await read([]))[0]).not.toHaveProperty('motto');
    await db.schema.alterTable('clinics', (t) => t.string('motto'));
    expect((await read([]))[0]).toHaveProperty('motto', null);
  });

  it('rowBuilder makes, for any column names, the object a column-by-column assignment makes (property check)', () => {
    fc.assert(
      fc.property(fc.array(fc.string({ maxLength: 12 }), { minLength: 1, maxLength: 12 }), (names) => {
        fc.pre(!names.includes('__proto__'));
        const built = rowBuilder(names)!(names.map((_, i) => i));
        const byHand: Record<string, unknown> = {};
        names.forEach((name, i) => Object.defineProperty(byHand, name, { value: i, enumerable: true, writable: true, configurable: true }));
        expect(Object.getPrototypeOf(built)).toBe(Object.prototype);
        expect(Object.entries(built)).toEqual(Object.entries(byHand));
      }),
    );
  });

  it('make the objects better-sqlite3 makes for SQL with any column names (property check)', () => {
    const conn = reader();
    type Raw = { raw(on: boolean): Raw; all(): unknown[][]; columns(): { name: string }[] };
    fc.assert(
      fc.property(
        fc.array(
          fc.string({ minLength: 1, maxLength: 8 }).filter((n) => !n.includes('\0')),
          { minLength: 1, maxLength: 6 },
        ),
        (names) => {
          const sql = `SELECT ${names.map((n, i) => `${i} AS ${quoted(n)}`).join(', ')}`;
          const expected = conn.prepare(sql).all();
          const raw = (conn.prepare(sql) as unknown as Raw).raw(true);
          const build = rowBuilder(raw.columns().map((c) => c.name));
          if (build) expect(raw.all().map(build)).toEqual(expected);
          else expect(names).toContain('__proto__');
        },
      ),
      { numRuns: 200 },
    );
  });
});
