import type { Knex } from 'knex';

/**
 * Reference bands saved before the API required the measure's own unit: a band in another unit was
 * stored and then never applied (a band applies only in its measure's unit), so the owner believed a
 * band was in force that was not. Such a band is converted when its unit is a known spelling or
 * multiple of the measure's unit (ms → s, cm → m, m → cm, spm → steps/min, deg → °…); otherwise the
 * clinic's override is removed, so the published default applies again and the band editor shows it.
 * Each changed row is kept as it was in `reference_bands_unit_fixes`, which `down` puts back.
 * The clinic's stored measures are dropped, as after any band change, so the next read uses the band in force.
 */

/** Each measure's unit when this migration was written (frozen here: later code may change). */
const MEASURE_UNITS: Readonly<Record<string, string>> = {
  hip_extension_toe_off: '°',
  hip_extension_toe_off_rel_trunk: '°',
  knee_flexion_initial_contact: '°',
  knee_flexion_peak_stance: '°',
  shank_angle_initial_contact: '°',
  foot_angle_initial_contact: '°',
  trunk_lean: '°',
  heel_ahead_of_hip_initial_contact: 'm',
  cadence: 'steps/min',
  step_time: 's',
  stride_time: 's',
  step_length: 'm',
  stride_length: 'm',
  contact_time: 's',
  flight_time: 's',
  duty_factor: '%',
  vertical_oscillation: 'cm',
  symmetry_contact_time: '%',
  symmetry_hip_extension_toe_off: '%',
};

/** Per measure unit: other spellings (lower case, single spaces) and the factor that turns their values into it. */
const CONVERTIBLE: Readonly<Record<string, Readonly<Record<string, number>>>> = {
  '°': { deg: 1, degs: 1, degree: 1, degrees: 1, º: 1 },
  s: { sec: 1, secs: 1, second: 1, seconds: 1, ms: 0.001, msec: 0.001, millisecond: 0.001, milliseconds: 0.001 },
  m: { metre: 1, metres: 1, meter: 1, meters: 1, cm: 0.01, mm: 0.001 },
  cm: { centimetre: 1, centimetres: 1, centimeter: 1, centimeters: 1, mm: 0.1, m: 100 },
  'steps/min': {
    spm: 1,
    'step/min': 1,
    'steps/minute': 1,
    'steps per minute': 1,
    'steps per min': 1,
    'steps·min⁻¹': 1,
    'steps min-1': 1,
    'steps/min.': 1,
  },
  '%': { percent: 1, pct: 1, 'per cent': 1 },
};

const FIXES = 'reference_bands_unit_fixes';

interface BandRow {
  clinic_id: number;
  key: string;
  low: number | null;
  high: number | null;
  unit: string;
  context: string;
  source: string;
  evidence: string;
  updated_by: number | null;
  updated_at: string;
}

/** `value × factor` without the binary noise of the multiplication (0.07 × 100 = 7, not 7.000000000000001). */
function scaled(value: number | null, factor: number): number | null {
  return value === null ? null : Number((value * factor).toPrecision(12));
}

/** The factor turning a value in `unit` into `target`, or null when `unit` is not a known form of it. */
function unitFactor(unit: string, target: string): number | null {
  const spelled = unit.trim().toLowerCase().replace(/\s+/g, ' ');
  if (spelled === target.toLowerCase()) return 1;
  return CONVERTIBLE[target]?.[spelled] ?? null;
}

async function dropSnapshots(trx: Knex, clinicIds: readonly number[]): Promise<void> {
  if (clinicIds.length === 0) return;
  await trx('measure_snapshots').whereIn('clip_id', trx('clips').whereIn('clinic_id', clinicIds).select('id')).delete();
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable(FIXES, (t) => {
    t.integer('clinic_id').notNullable().references('clinics.id').onDelete('CASCADE');
    t.string('key', 40).notNullable();
    t.double('low');
    t.double('high');
    t.string('unit', 20).notNullable();
    t.string('context', 200).notNullable();
    t.string('source', 300).notNullable();
    t.string('evidence', 6).notNullable();
    t.integer('updated_by').references('users.id').onDelete('SET NULL');
    t.string('updated_at').notNullable();
    // `converted` (the row now holds the band in the measure's unit) or `removed` (the default applies).
    t.string('fix', 10).notNullable();
    t.primary(['clinic_id', 'key']);
  });
  await knex.transaction(async (trx) => {
    const rows = (await trx('reference_bands').select('*')) as BandRow[];
    const touched = new Set<number>();
    for (const row of rows) {
      const target = MEASURE_UNITS[row.key];
      if (target === undefined || row.unit === target) continue;
      const factor = unitFactor(row.unit, target);
      await trx(FIXES).insert({ ...row, fix: factor === null ? 'removed' : 'converted' });
      const where = { clinic_id: row.clinic_id, key: row.key };
      if (factor === null) await trx('reference_bands').where(where).delete();
      else
        await trx('reference_bands')
          .where(where)
          .update({ unit: target, low: scaled(row.low, factor), high: scaled(row.high, factor) });
      touched.add(row.clinic_id);
    }
    await dropSnapshots(trx, [...touched]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.transaction(async (trx) => {
    const rows = (await trx(FIXES).select('*')) as (BandRow & { fix: string })[];
    for (const { fix: _fix, ...row } of rows) await trx('reference_bands').insert(row).onConflict(['clinic_id', 'key']).merge();
    await dropSnapshots(trx, [...new Set(rows.map((r) => r.clinic_id))]);
  });
  await knex.schema.dropTable(FIXES);
}
