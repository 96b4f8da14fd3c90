/**
 * Bands stored before the API required the measure's own unit were never applied. The migration
 * converts those in a known form of the unit and removes the others (the default applies again),
 * drops the clinic's stored measures, and `down` puts every changed row back as it was.
 * Conversion factors are the SI prefixes (1 s = 1000 ms, 1 m = 100 cm = 1000 mm) [calc].
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '../../server/db/knex';
import { clinicBands } from '../../server/measures/reference-bands';
import { DEFAULT_REFERENCE_BANDS } from '../../src/kinematics';
import { openTestDb, type TestDb } from '../support/test-db';
import { seed } from '../../seeds/demo-scenario';

const FIX = '20261206140000_fix_reference_band_units.ts';

let db: Db;
let testDb: TestDb;
let clinicId: number;
beforeAll(async () => {
  testDb = await openTestDb();
  db = testDb.db;
  await seed(db);
  clinicId = (await db('clinics').orderBy('id').first()).id;
});
afterAll(async () => {
  await testDb.close();
});

const band = (key: string, unit: string, low: number | null, high: number | null) => ({
  clinic_id: clinicId,
  key,
  low,
  high,
  unit,
  context: `Our ${key} band`,
  source: 'Clinic notes',
  evidence: 'trade',
  updated_by: null,
  updated_at: '2026-11-30T10:00:00.000Z',
});

const legacy = () => [
  band('contact_time', 'ms', 200, 260), // 0.2–0.26 s
  band('step_length', ' CM ', 70, null), // 0.7 m and above
  band('vertical_oscillation', 'm', 0.06, 0.1), // 6–10 cm
  band('cadence', 'spm', 170, 185),
  band('trunk_lean', 'degrees', 2, 8),
  band('flight_time', 'frames', 10, 20), // no conversion: removed
  band('duty_factor', 'fraction', 0.3, 0.4), // no conversion: removed
  band('stride_time', 's', 0.6, 0.8), // already in the measure's unit: left as it is
];

const stored = async () =>
  (await db('reference_bands').where({ clinic_id: clinicId }).orderBy('key').select('key', 'low', 'high', 'unit', 'context')) as {
    key: string;
    low: number | null;
    high: number | null;
    unit: string;
    context: string;
  }[];

describe('reference bands in another unit than their measure (migration)', () => {
  it('converts known units, removes the rest so the default applies, and puts every row back on the way down', async () => {
    await db.migrate.down({ name: FIX });
    await db('reference_bands').where({ clinic_id: clinicId }).delete();
    await db('reference_bands').insert(legacy());
    const before = await stored();
    const visit = await db('assessments').where({ clinic_id: clinicId }).first('id', 'athlete_id');
    const [inserted] = await db('clips')
      .insert({
        clinic_id: clinicId,
        athlete_id: visit.athlete_id,
        assessment_id: visit.id,
        original_name: 'side.mp4',
        stored_name: 'original.mp4',
        size_bytes: 1,
        container: 'mp4',
        status: 'ready',
        created_at: '2026-11-30T10:00:00.000Z',
        updated_at: '2026-11-30T10:00:00.000Z',
      })
      .returning('id');
    const clip = { id: (inserted as { id: number }).id, assessment_id: visit.id };
    await db('measure_snapshots').insert({
      clip_id: clip.id,
      assessment_id: clip.assessment_id,
      annotation_revision: 1,
      kinematics_version: 'x',
      measures: '{}',
      computed_at: '2026-11-30T10:00:00.000Z',
    });

    await db.migrate.up({ name: FIX });
    const after = await stored();
    expect(after.map((b) => [b.key, b.unit, b.low, b.high])).toEqual([
      ['cadence', 'steps/min', 170, 185],
      ['contact_time', 's', 0.2, 0.26],
      ['step_length', 'm', 0.7, null],
      ['stride_time', 's', 0.6, 0.8],
      ['trunk_lean', '°', 2, 8],
      ['vertical_oscillation', 'cm', 6, 10],
    ]);
    expect(after.find((b) => b.key === 'contact_time')?.context).toBe('Our contact_time band');
    const inForce = await clinicBands(db, clinicId);
    for (const key of ['flight_time', 'duty_factor'])
      expect(inForce.filter((b) => b.key === key)).toEqual(DEFAULT_REFERENCE_BANDS.filter((b) => b.key === key));
    expect(await db('measure_snapshots').where({ clip_id: clip.id }).first()).toBeUndefined();

    await db.migrate.down({ name: FIX });
    expect(await stored()).toEqual(before);
    expect(await db.schema.hasTable('reference_bands_unit_fixes')).toBe(false);

    await db.migrate.up({ name: FIX });
    expect(await stored()).toEqual(after);
  });

  it('leaves a database whose bands are all in their measure units as it is', async () => {
    await db.migrate.down({ name: FIX });
    await db('reference_bands').where({ clinic_id: clinicId }).delete();
    await db('reference_bands').insert([band('cadence', 'steps/min', 168, 182), band('hip_extension_toe_off', '°', 10, null)]);
    const before = await stored();
    await db.migrate.up({ name: FIX });
    expect(await stored()).toEqual(before);
    expect(await db('reference_bands_unit_fixes').count({ n: '*' })).toEqual([{ n: 0 }]);
  });
});
