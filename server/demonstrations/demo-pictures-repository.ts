import type { Knex } from 'knex';
import type { DemoPicture } from '../../src/contracts/demonstrations';

/** A `demo_pictures` row. */
export interface DemoPictureRow {
  id: number;
  clinic_id: number;
  exercise_id: number;
  position: number;
  caption: string;
  width: number;
  height: number;
  thumb_width: number;
  thumb_height: number;
  created_by: number | null;
  created_at: string;
}

/** Knex access to demonstration pictures; every query is scoped by clinic. */
export const demoPicturesRepository = {
  async ofExercise(db: Knex, clinicId: number, exerciseId: number): Promise<DemoPictureRow[]> {
    return db<DemoPictureRow>('demo_pictures').where({ clinic_id: clinicId, exercise_id: exerciseId }).orderBy('position').orderBy('id');
  },
  async find(db: Knex, clinicId: number, id: number): Promise<DemoPictureRow | undefined> {
    return db<DemoPictureRow>('demo_pictures').where({ clinic_id: clinicId, id }).first();
  },
  async insert(db: Knex, row: Omit<DemoPictureRow, 'id'>): Promise<number> {
    const [r] = await db('demo_pictures').insert(row).returning('id');
    return (r as { id: number }).id;
  },
  async setPosition(db: Knex, id: number, position: number): Promise<void> {
    await db('demo_pictures').where({ id }).update({ position });
  },
  async setCaption(db: Knex, id: number, caption: string): Promise<void> {
    await db('demo_pictures').where({ id }).update({ caption });
  },
  async remove(db: Knex, id: number): Promise<void> {
    await db('demo_pictures').where({ id }).delete();
  },
  /**
   * Whether the exercise is on a stage of a plan of the athlete linked to `userId` that is not a
   * draft (and not removed from that stage): what lets an athlete see its demonstrations.
   */
  async inPlanOfAthleteUser(db: Knex, clinicId: number, exerciseId: number, userId: number): Promise<boolean> {
    const row = await db('stage_exercises as se')
      .join('plan_stages as ps', 'ps.id', 'se.stage_id')
      .join('plans as p', 'p.id', 'ps.plan_id')
      .join('athletes as a', 'a.id', 'p.athlete_id')
      .where({ 'se.clinic_id': clinicId, 'se.exercise_id': exerciseId, 'a.user_id': userId })
      .whereNull('se.removed_at')
      .whereNot('p.status', 'draft')
      .first('se.id');
    return row !== undefined;
  },
  toApi(r: DemoPictureRow): DemoPicture {
    const base = `/api/demo-pictures/${r.id}`;
    return {
      id: r.id,
      exerciseId: r.exercise_id,
      position: r.position,
      caption: r.caption,
      url: `${base}/picture.jpg`,
      thumbUrl: `${base}/thumb.jpg`,
      width: r.width,
      height: r.height,
      createdAt: r.created_at,
    };
  },
};
