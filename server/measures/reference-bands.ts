import { z } from 'zod';
import type { Knex } from 'knex';
import type { MeasureKey, ReferenceBand } from '../../src/contracts/measures';
import { DEFAULT_REFERENCE_BANDS, MEASURE_DEFINITIONS, MEASURE_KEYS } from '../../src/kinematics';
import { ValidationError } from '../errors';

export const BandBody = z
  .strictObject({
    low: z.number('Lower limit must be a number.').nullable(),
    high: z.number('Upper limit must be a number.').nullable(),
    unit: z.string().trim().min(1, 'Unit is required.').max(20),
    context: z.string().trim().min(1, 'Say what population or condition the band describes.').max(200),
    source: z.string().trim().min(3, 'Name the source (publication, or "common practice").').max(300),
    evidence: z.enum(['pub', 'mem', 'trade', 'calc'], 'Evidence is pub, mem, trade or calc.'),
  })
  .refine((b) => b.low !== null || b.high !== null, { message: 'Give at least one limit.', path: ['low'] })
  .refine((b) => b.low === null || b.high === null || b.low <= b.high, {
    message: 'The lower limit must not exceed the upper limit.',
    path: ['high'],
  });
export type BandInput = z.output<typeof BandBody>;

/** Whether `key` names a measure. */
export function isMeasureKey(key: string): key is MeasureKey {
  return (MEASURE_KEYS as string[]).includes(key);
}

interface BandRow {
  key: MeasureKey;
  low: number | null;
  high: number | null;
  unit: string;
  context: string;
  source: string;
  evidence: ReferenceBand['evidence'];
}

/** A clinic's bands: its own edits first, then the defaults for keys it has not edited. */
export async function clinicBands(db: Knex, clinicId: number): Promise<ReferenceBand[]> {
  const own = await db('reference_bands')
    .where({ clinic_id: clinicId })
    .select<BandRow[]>('key', 'low', 'high', 'unit', 'context', 'source', 'evidence');
  const edited = new Set(own.map((b) => b.key));
  return [...own.map((b) => ({ ...b })), ...DEFAULT_REFERENCE_BANDS.filter((b) => !edited.has(b.key))];
}

export async function saveBand(db: Knex, clinicId: number, key: string, input: BandInput, userId: number): Promise<ReferenceBand> {
  if (!isMeasureKey(key)) throw new ValidationError(`Unknown measure "${key}".`, [{ path: ['key'], message: 'Unknown measure.' }]);
  // A band applies to the measure only in the measure's own unit (`findBand`): any other would be
  // saved and then silently never shown, so it is refused.
  const unit = MEASURE_DEFINITIONS[key].unit;
  if (input.unit !== unit)
    throw new ValidationError(`The unit of this measure is "${unit}".`, [
      { path: ['unit'], message: `Use the measure's unit, "${unit}".` },
    ]);
  const row = { clinic_id: clinicId, key, ...input, updated_by: userId, updated_at: new Date().toISOString() };
  await db.transaction(async (trx) => {
    await trx('reference_bands').insert(row).onConflict(['clinic_id', 'key']).merge();
    await dropClinicSnapshots(trx, clinicId);
  });
  return { key, ...input };
}

export async function resetBand(db: Knex, clinicId: number, key: string): Promise<void> {
  if (!isMeasureKey(key)) throw new ValidationError(`Unknown measure "${key}".`, [{ path: ['key'], message: 'Unknown measure.' }]);
  await db.transaction(async (trx) => {
    await trx('reference_bands').where({ clinic_id: clinicId, key }).delete();
    await dropClinicSnapshots(trx, clinicId);
  });
}

/**
 * A measures snapshot holds each mean's place against the bands in force when it was computed, so a
 * band change drops the clinic's snapshots: the next read computes them against the band now in force.
 */
async function dropClinicSnapshots(trx: Knex, clinicId: number): Promise<void> {
  await trx('measure_snapshots')
    .whereIn('clip_id', trx('clips').where({ clinic_id: clinicId }).select('id'))
    .delete();
}
