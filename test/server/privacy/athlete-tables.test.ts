/**
 * Every table that reaches an athlete — one with an `athlete_id`, or with a foreign key to such a
 * table (clip landmarks through clips, stage exercises through plan stages and plans) — must be in
 * `ATHLETE_TABLES` (exported and erased) or, with its reason, in `NOT_ATHLETE_DATA`. The tables and
 * keys are read from a database migrated from migrations/, so a new migration that adds such a table
 * fails here until the export and erasure cover it.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDb, migrate, type Db } from '../../../server/db/knex';
import { ATHLETE_TABLES, ATHLETE_TABLE_NAMES, NOT_ATHLETE_DATA } from '../../../server/privacy/athlete-tables';

/** Tables reaching an athlete, by the schema: the fixed point of "has athlete_id, or a foreign key to one that does". */
async function tablesReachingAthletes(db: Db): Promise<string[]> {
  const tables = (
    (await db.raw(`SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%'`)) as { name: string }[]
  ).map((r) => r.name);
  const reach = new Set<string>(['athletes']);
  const parents = new Map<string, string[]>();
  for (const table of tables) {
    const cols = (await db.raw(`PRAGMA table_info(${table})`)) as { name: string }[];
    if (cols.some((c) => c.name === 'athlete_id')) reach.add(table);
    parents.set(
      table,
      ((await db.raw(`PRAGMA foreign_key_list(${table})`)) as { table: string }[]).map((f) => f.table),
    );
  }
  for (let grew = true; grew;) {
    grew = false;
    for (const [table, ps] of parents)
      if (!reach.has(table) && ps.some((p) => reach.has(p))) {
        reach.add(table);
        grew = true;
      }
  }
  return [...reach].sort();
}

let db: Db;
beforeAll(async () => {
  db = createDb(':memory:');
  await migrate(db);
});
afterAll(async () => {
  await db.destroy();
});

describe('athlete tables', () => {
  it('every table of the migrations that reaches an athlete is exported and erased (or left out with a reason)', async () => {
    const covered = new Set([...ATHLETE_TABLE_NAMES, ...Object.keys(NOT_ATHLETE_DATA)]);
    const reaching = await tablesReachingAthletes(db);
    expect(reaching.length).toBeGreaterThan(20);
    expect(reaching.filter((t) => !covered.has(t))).toEqual([]);
  });

  it('a table added with an athlete_id, or below such a table, is caught', async () => {
    await db.schema.createTable('walk_notes', (t) => {
      t.increments('id');
      t.integer('athlete_id').references('athletes.id');
    });
    await db.schema.createTable('walk_note_tags', (t) => {
      t.increments('id');
      t.integer('note_id').references('walk_notes.id');
    });
    try {
      const covered = new Set([...ATHLETE_TABLE_NAMES, ...Object.keys(NOT_ATHLETE_DATA)]);
      expect((await tablesReachingAthletes(db)).filter((t) => !covered.has(t))).toEqual(['walk_note_tags', 'walk_notes']);
    } finally {
      await db.schema.dropTable('walk_note_tags');
      await db.schema.dropTable('walk_notes');
    }
  });

  it("each listed table exists and its condition selects by the athlete's id", async () => {
    for (const name of ATHLETE_TABLE_NAMES) {
      const rows = await db.raw(`SELECT * FROM ${name} WHERE ${ATHLETE_TABLES[name].where}`, [1]);
      expect(Array.isArray(rows), name).toBe(true);
    }
  });

  it('only invoices and their payment records are kept by erasure; the athlete row is anonymised', () => {
    const kept = ATHLETE_TABLE_NAMES.filter((n) => ATHLETE_TABLES[n].erase === 'keep');
    expect(kept).toEqual(['invoices', 'invoice_lines', 'payment_events']);
    expect(ATHLETE_TABLE_NAMES.filter((n) => ATHLETE_TABLES[n].erase === 'anonymise')).toEqual(['athletes']);
  });
});
