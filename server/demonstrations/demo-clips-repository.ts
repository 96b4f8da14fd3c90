import type { Knex } from 'knex';
import type { DemoClip, DemoClipStatus } from '../../src/contracts/demonstrations';

/** A `demo_clips` row. */
export interface DemoClipRow {
  id: number;
  clinic_id: number;
  exercise_id: number;
  position: number;
  caption: string;
  /** Our name of the upload as received (`original.mp4`). */
  stored_name: string;
  status: DemoClipStatus;
  error: string | null;
  /** Render version of the phone MP4 and poster. */
  version: number;
  duration_s: number;
  width: number | null;
  height: number | null;
  created_by: number | null;
  created_at: string;
  updated_at: string;
}

/** Knex access to demonstration clips; reads are scoped by clinic. */
export const demoClipsRepository = {
  ofExercise(db: Knex, clinicId: number, exerciseId: number): Promise<DemoClipRow | undefined> {
    return db<DemoClipRow>('demo_clips').where({ clinic_id: clinicId, exercise_id: exerciseId }).first();
  },
  find(db: Knex, clinicId: number, id: number): Promise<DemoClipRow | undefined> {
    return db<DemoClipRow>('demo_clips').where({ clinic_id: clinicId, id }).first();
  },
  findById(db: Knex, id: number): Promise<DemoClipRow | undefined> {
    return db<DemoClipRow>('demo_clips').where({ id }).first();
  },
  async insert(db: Knex, row: Omit<DemoClipRow, 'id'>): Promise<number> {
    const [r] = await db('demo_clips').insert(row).returning('id');
    return (r as { id: number }).id;
  },
  async update(db: Knex, id: number, patch: Partial<DemoClipRow>): Promise<void> {
    await db('demo_clips').where({ id }).update(patch);
  },
  async remove(db: Knex, id: number): Promise<void> {
    await db('demo_clips').where({ id }).delete();
  },
  toApi(r: DemoClipRow): DemoClip {
    const ready = r.status === 'ready';
    const base = `/api/demo-clips/${r.id}`;
    return {
      id: r.id,
      exerciseId: r.exercise_id,
      position: r.position,
      caption: r.caption,
      status: r.status,
      error: r.status === 'failed' ? r.error : null,
      durationS: r.duration_s,
      width: ready ? r.width : null,
      height: ready ? r.height : null,
      videoUrl: ready ? `${base}/video.mp4?v=${r.version}` : null,
      posterUrl: ready ? `${base}/poster.jpg?v=${r.version}` : null,
      createdAt: r.created_at,
    };
  },
};
