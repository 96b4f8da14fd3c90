/**
 * The SQLite dialect (server/db/sqlite-client.ts): connection settings on both connections, plain
 * reads on the read-only connection (committed data only, never waiting for a transaction), reads
 * inside a transaction on the writer, and the prepared-statement cache.
 */
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createDb, migrate, type Db } from '../../server/db/knex';
import { preparedRead } from '../../server/db/prepared-read';
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
