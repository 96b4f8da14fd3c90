import type { Knex } from 'knex';
import type { Dose, Exercise, ExerciseRegion, LoadingKind } from '../../src/contracts/plans';
import type { ExerciseQueryInput } from './plans-schemas';
import { byName } from '../db/name-order';

export interface ExerciseRow {
  id: number;
  clinic_id: number;
  name: string;
  purpose: string;
  region: ExerciseRegion;
  kind: LoadingKind;
  sets: number;
  reps: number | null;
  hold_seconds: number | null;
  tempo: string | null;
  load: string | null;
  rest_seconds: number | null;
  days_per_week: number;
  instructions: string;
  cautions: string;
  source: string;
  archived: number | boolean;
  created_by: number | null;
  created_at: string;
  updated_at: string;
}

/** Dose columns shared by `exercises` (default dose) and `stage_exercises` (prescription). */
export type DoseColumns = Pick<ExerciseRow, 'sets' | 'reps' | 'hold_seconds' | 'tempo' | 'load' | 'rest_seconds' | 'days_per_week'>;

export function doseColumns(d: Dose): DoseColumns {
  return {
    sets: d.sets,
    reps: d.reps,
    hold_seconds: d.holdSeconds,
    tempo: d.tempo,
    load: d.load,
    rest_seconds: d.restSeconds,
    days_per_week: d.daysPerWeek,
  };
}

export function doseFromRow(r: DoseColumns): Dose {
  return {
    sets: r.sets,
    reps: r.reps,
    holdSeconds: r.hold_seconds,
    tempo: r.tempo,
    load: r.load,
    restSeconds: r.rest_seconds,
    daysPerWeek: r.days_per_week,
  };
}

/** Escapes `%`, `_` and `\` for a LIKE pattern (with `ESCAPE '\'`). */

/** The clinic's exercise library. Every query is scoped by clinic. */
export const exercisesRepository = {
  find(db: Knex, clinicId: number, id: number): Promise<ExerciseRow | undefined> {
    return db<ExerciseRow>('exercises').where({ id, clinic_id: clinicId }).first();
  },

  findByName(db: Knex, clinicId: number, name: string): Promise<ExerciseRow | undefined> {
    return db<ExerciseRow>('exercises').where({ clinic_id: clinicId }).whereRaw('lower(name) = ?', [name.toLowerCase()]).first();
  },

  byIds(db: Knex, clinicId: number, ids: number[]): Promise<ExerciseRow[]> {
    if (ids.length === 0) return Promise.resolve([]);
    return db<ExerciseRow>('exercises')
      .where({ clinic_id: clinicId })
      .whereIn('id', [...new Set(ids)]);
  },

  /**
   * A clinic's library by region, kind and words (each in the name, purpose or source, any case),
   * in alphabetical order ({@link byName}). Words are matched here rather than in SQL: SQLite's
   * `lower` knows only ASCII ("élan" would miss "Élan"); a library is small.
   */
  async search(db: Knex, clinicId: number, q: ExerciseQueryInput): Promise<ExerciseRow[]> {
    const query = db<ExerciseRow>('exercises').where({ clinic_id: clinicId, archived: q.archived === 'true' });
    if (q.region) query.andWhere({ region: q.region });
    if (q.kind) query.andWhere({ kind: q.kind });
    const words = (q.q ?? '').toLowerCase().split(/\s+/).filter(Boolean);
    const rows = (await query).filter((r) => {
      const text = `${r.name}\n${r.purpose}\n${r.source}`.toLowerCase();
      return words.every((w) => text.includes(w));
    });
    return rows.sort((a, b) => byName(a.name, b.name) || a.id - b.id);
  },

  async insert(db: Knex, row: Omit<ExerciseRow, 'id'>): Promise<number> {
    const [r] = await db('exercises').insert(row).returning('id');
    return (r as { id: number }).id;
  },

  async update(db: Knex, clinicId: number, id: number, patch: Partial<ExerciseRow>): Promise<void> {
    await db('exercises').where({ id, clinic_id: clinicId }).update(patch);
  },

  toApi(r: ExerciseRow): Exercise {
    return {
      id: r.id,
      name: r.name,
      purpose: r.purpose,
      region: r.region,
      kind: r.kind,
      dose: doseFromRow(r),
      instructions: JSON.parse(r.instructions) as string[],
      cautions: r.cautions,
      source: r.source ?? '',
      archived: Boolean(r.archived),
      createdAt: r.created_at,
      updatedAt: r.updated_at,
    };
  },
};
