import type { Knex } from 'knex';
import type { Clip } from '../../src/contracts/api';
import type { ClipStatus, Direction, Side } from '../../src/contracts/assessment';
import { preparedRead } from '../db/prepared-read';
import { joinLatestItem } from '../processing/processed-items-repository';

export interface ClipRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  assessment_id: number;
  uploaded_by: number | null;
  original_name: string;
  stored_name: string;
  size_bytes: number;
  container: string;
  status: ClipStatus;
  error: string | null;
  near_side: Side;
  direction: Direction;
  capture_fps: number | null;
  fps: number | null;
  width: number | null;
  height: number | null;
  frame_count: number | null;
  duration_s: number | null;
  rotation: number | null;
  codec: string | null;
  thumb_count: number;
  thumb_every: number | null;
  created_at: string;
  updated_at: string;
}

/** A row with the uploader's name, whether it is marked, and its newest processed item's progress. */
type ClipWithName = ClipRow & {
  uploaded_by_name: string | null;
  marked: number | boolean;
  item_done: number | null;
  item_total: number | null;
};

/** SQL: whether the clip `c` has any landmark or gait event. */
const MARKED =
  '(EXISTS (SELECT 1 FROM clip_landmarks l WHERE l.clip_id = c.id) OR EXISTS (SELECT 1 FROM gait_events g WHERE g.clip_id = c.id)) AS marked';

function withUploader(db: Knex) {
  const q = db('clips as c').leftJoin('users as u', 'u.id', 'c.uploaded_by');
  return joinLatestItem(q, db, 'clip', 'c').select(
    'c.*',
    'u.name as uploaded_by_name',
    'pi.progress_done as item_done',
    'pi.progress_total as item_total',
    db.raw(MARKED),
  );
}

/** `clips` rows and their API shape. */
export const clipsRepository = {
  find(db: Knex, clinicId: number, id: number): Promise<ClipRow | undefined> {
    return db<ClipRow>('clips').where({ id, clinic_id: clinicId }).first();
  },

  findById(db: Knex, id: number): Promise<ClipRow | undefined> {
    return db<ClipRow>('clips').where({ id }).first();
  },

  async view(db: Knex, id: number): Promise<Clip | null> {
    const row = (await withUploader(db).where('c.id', id).first()) as ClipWithName | undefined;
    return row ? toApi(row) : null;
  },

  async listForAssessment(db: Knex, assessmentId: number): Promise<Clip[]> {
    const rows = (await withUploader(db).where('c.assessment_id', assessmentId).orderBy('c.id')) as ClipWithName[];
    return rows.map(toApi);
  },

  /** {@link clipsRepository.listForAssessment} as a prepared read (outside transactions only), for the assessment page. */
  listForAssessmentReader(db: Knex): (assessmentId: number) => Promise<Clip[]> {
    const query = withUploader(db).where('c.assessment_id', 0).orderBy('c.id').toSQL();
    const read = preparedRead<ClipWithName>(db, query.sql);
    // The join's own bindings come first; the assessment id is the last one.
    const fixed = query.bindings.slice(0, -1);
    return async (assessmentId) => (await read([...fixed, assessmentId])).map(toApi);
  },

  idsForAssessment(db: Knex, assessmentId: number): Promise<number[]> {
    return db('clips').where({ assessment_id: assessmentId }).pluck('id');
  },

  async insert(db: Knex, row: Omit<ClipRow, 'id'>): Promise<number> {
    const [r] = await db('clips').insert(row).returning('id');
    return (r as { id: number }).id;
  },

  /** Whether the clip has any landmark or gait event (its settings then shape the measures). */
  async isMarked(db: Knex, id: number): Promise<boolean> {
    const [landmark, event] = await Promise.all([
      db('clip_landmarks').where({ clip_id: id }).first('clip_id'),
      db('gait_events').where({ clip_id: id }).first('clip_id'),
    ]);
    return Boolean(landmark || event);
  },

  async update(db: Knex, id: number, patch: Partial<ClipRow>): Promise<void> {
    await db('clips')
      .where({ id })
      .update({ ...patch, updated_at: new Date().toISOString() });
  },
};

function toApi(r: ClipWithName): Clip {
  // Frames extracted so far (0 … done − 1 can be shown), from the clip's processed item.
  const extracting = r.status === 'extracting' && r.item_total;
  return {
    id: r.id,
    assessmentId: r.assessment_id,
    athleteId: r.athlete_id,
    originalName: r.original_name,
    sizeBytes: Number(r.size_bytes),
    status: r.status,
    progress: extracting ? { done: r.item_done ?? 0, total: r.item_total ?? 0 } : null,
    error: r.error,
    nearSide: r.near_side,
    direction: r.direction,
    captureFps: r.capture_fps,
    fps: r.fps,
    effectiveFps: r.capture_fps ?? r.fps,
    width: r.width,
    height: r.height,
    frameCount: r.frame_count,
    durationS: r.duration_s,
    rotation: r.rotation,
    codec: r.codec,
    thumbCount: r.thumb_count,
    thumbEvery: r.thumb_every,
    uploadedByName: r.uploaded_by_name ?? '',
    uploadedById: r.uploaded_by,
    marked: Boolean(r.marked),
    createdAt: r.created_at,
  };
}
