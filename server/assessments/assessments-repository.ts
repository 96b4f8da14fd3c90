import type { Knex } from 'knex';
import type { Assessment } from '../../src/contracts/api';
import type { AssessmentKind, FilmSurface, SpeedUnit } from '../../src/contracts/assessment';

export interface AssessmentRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  date: string;
  kind: AssessmentKind;
  surface: FilmSurface;
  speed_mps: number | null;
  speed_unit: SpeedUnit;
  incline_percent: number | null;
  shoes: string | null;
  camera_notes: string | null;
  notes: string | null;
  created_by: number | null;
  created_at: string;
  updated_at: string;
}

/** `assessments` rows and their API shape. */
export const assessmentsRepository = {
  find(db: Knex, clinicId: number, id: number): Promise<AssessmentRow | undefined> {
    return db<AssessmentRow>('assessments').where({ id, clinic_id: clinicId }).first();
  },

  async listForAthlete(db: Knex, athleteId: number): Promise<(AssessmentRow & { clip_count: number })[]> {
    return db('assessments as s')
      .where('s.athlete_id', athleteId)
      .select('s.*', db.raw('(SELECT COUNT(*) FROM clips c WHERE c.assessment_id = s.id) AS clip_count'))
      .orderBy([
        { column: 's.date', order: 'desc' },
        { column: 's.id', order: 'desc' },
      ]);
  },

  async clipCount(db: Knex, id: number): Promise<number> {
    const row = await db('clips').where({ assessment_id: id }).count<{ n: number }[]>({ n: '*' });
    return Number(row[0]?.n ?? 0);
  },

  async insert(db: Knex, row: Omit<AssessmentRow, 'id'>): Promise<number> {
    const [r] = await db('assessments').insert(row).returning('id');
    return (r as { id: number }).id;
  },

  async update(db: Knex, id: number, patch: Partial<AssessmentRow>): Promise<void> {
    await db('assessments').where({ id }).update(patch);
  },

  toApi(r: AssessmentRow, clipCount: number, includeNotes: boolean): Assessment {
    return {
      id: r.id,
      athleteId: r.athlete_id,
      date: r.date,
      kind: r.kind,
      surface: r.surface,
      speedMps: r.speed_mps,
      speedUnit: r.speed_unit,
      inclinePercent: r.incline_percent,
      shoes: r.shoes,
      cameraNotes: r.camera_notes,
      // Coach notes are for staff; athletes get null.
      notes: includeNotes ? r.notes : null,
      clipCount,
      createdAt: r.created_at,
      updatedAt: r.updated_at,
    };
  },
};
