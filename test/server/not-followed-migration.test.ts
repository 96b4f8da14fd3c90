/**
 * The frames-not-followed migration, down and up on a seeded database: the table goes and comes
 * back; one entry per clip, frame, side and landmark; entries go with their clip.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '../../server/db/knex';
import { openTestDb, type TestDb } from '../support/test-db';
import { seed } from '../../seeds/demo-scenario';

const MIGRATION = '20261207180000_create_clip_not_followed.ts';

let db: Db;
let testDb: TestDb;
beforeAll(async () => {
  testDb = await openTestDb();
  db = testDb.db;
  await seed(db);
});
afterAll(async () => {
  await testDb.close();
});

describe('clip_not_followed (migration)', () => {
  it('down drops the table, up makes it again: one entry per frame, side and landmark, gone with the clip', async () => {
    await db.migrate.down({ name: MIGRATION });
    expect(await db.schema.hasTable('clip_not_followed')).toBe(false);
    await db.migrate.up({ name: MIGRATION });
    const a = await db('assessments').first('id', 'clinic_id', 'athlete_id');
    const at = '2026-12-07T10:00:00.000Z';
    const [clip] = await db('clips')
      .insert({
        clinic_id: a.clinic_id,
        athlete_id: a.athlete_id,
        assessment_id: a.id,
        original_name: 'run.mp4',
        stored_name: 'x.mp4',
        size_bytes: 1,
        container: 'mp4',
        status: 'ready',
        created_at: at,
        updated_at: at,
      })
      .returning('id');
    const row = { clip_id: clip.id, frame: 4, side: 'left', landmark: 'ankle', reason: 'not_found' };
    await db('clip_not_followed').insert(row);
    await expect(db('clip_not_followed').insert({ ...row, reason: 'broke_links' })).rejects.toThrow();
    await db('clips').where({ id: clip.id }).delete();
    expect(Number((await db('clip_not_followed').where({ clip_id: clip.id }).count({ n: '*' }))[0]!.n)).toBe(0);
  });
});
