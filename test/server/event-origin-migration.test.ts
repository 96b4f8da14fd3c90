/**
 * The gait-event origin migration, down and up on a seeded database: events stored before it
 * existed read as placed; going down drops the column and keeps the events.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '../../server/db/knex';
import { openTestDb, type TestDb } from '../support/test-db';
import { seed } from '../../seeds/demo-scenario';

const ORIGIN = '20261204145000_add_origin_to_gait_events.ts';

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

describe('gait_events.origin (migration)', () => {
  it('down drops the column and keeps the events; up reads them as placed', async () => {
    const a = await db('assessments').first('id', 'clinic_id', 'athlete_id');
    const at = '2026-12-04T10:00:00.000Z';
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
    await db('gait_events').insert({ clip_id: clip.id, frame: 9001, side: 'left', kind: 'toe_off', origin: 'proposed' });
    const count = async () => Number((await db('gait_events').count({ n: '*' }))[0]!.n);
    const before = await count();
    await db.migrate.down({ name: ORIGIN });
    expect(Object.keys(await db('gait_events').columnInfo())).not.toContain('origin');
    expect(await count()).toBe(before);
    await db.migrate.up({ name: ORIGIN });
    const row = await db('gait_events').where({ clip_id: clip.id, frame: 9001 }).first();
    expect(row.origin).toBe('placed');
  });
});
