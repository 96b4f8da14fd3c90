/**
 * The landmark origin migration, down and up on a database with rows from before it: every
 * point stored as 'manual' comes back as placed, 'tracked' as followed, with no confidence; down
 * again gives the old words back.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '../../server/db/knex';
import { onPostgres, openTestDb, type TestDb } from '../support/test-db';

const ORIGIN = '20261204130000_add_origin_and_confidence_to_clip_landmarks.ts';

let db: Db;
let testDb: TestDb;
beforeAll(async () => {
  testDb = await openTestDb();
  db = testDb.db;
  // Rows of a clip that does not exist are fine here: this test is about the column only.
  if (onPostgres) await db.schema.alterTable('clip_landmarks', (t) => t.dropForeign(['clip_id']));
  else await db.raw('PRAGMA foreign_keys = OFF');
});
afterAll(async () => {
  await testDb.close();
});

describe('clip_landmarks origin and confidence (migration)', () => {
  it('existing rows become placed (manual) or followed (tracked), and down restores the old words', async () => {
    await db.migrate.down({ name: ORIGIN });
    await db('clip_landmarks').insert([
      { clip_id: 1, frame: 0, side: 'right', landmark: 'hip', x: 0.5, y: 0.4, source: 'manual' },
      { clip_id: 1, frame: 1, side: 'right', landmark: 'hip', x: 0.5, y: 0.41, source: 'tracked' },
    ]);
    await db('clip_landmarks').insert({ clip_id: 1, frame: 2, side: 'right', landmark: 'hip', x: 0.5, y: 0.42 });
    await db.migrate.up({ name: ORIGIN });
    const rows = await db('clip_landmarks').orderBy('frame').select('frame', 'origin', 'confidence');
    expect(rows).toEqual([
      { frame: 0, origin: 'placed', confidence: null },
      { frame: 1, origin: 'followed', confidence: null },
      { frame: 2, origin: 'placed', confidence: null },
    ]);
    expect(Object.keys(await db('clip_landmarks').columnInfo())).not.toContain('source');
    await db('clip_landmarks').insert({ clip_id: 1, frame: 3, side: 'right', landmark: 'hip', x: 0.5, y: 0.43 });
    expect((await db('clip_landmarks').where({ frame: 3 }).first()).origin).toBe('placed');

    await db.migrate.down({ name: ORIGIN });
    const old = await db('clip_landmarks').orderBy('frame').select('frame', 'source');
    expect(old.map((r: { source: string }) => r.source)).toEqual(['manual', 'tracked', 'manual', 'manual']);
    await db.migrate.up({ name: ORIGIN });
  });
});
