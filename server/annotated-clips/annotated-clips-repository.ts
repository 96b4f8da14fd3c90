import type { Knex } from 'knex';
import type { AngleGauge, FrameLandmarks, GaitEventMark } from '../../src/contracts/annotations';
import type { AnnotatedClip, AnnotatedClipPanel, AnnotatedClipStatus, SlowMotionFactor } from '../../src/contracts/annotated-clips';
import type { Direction, Side } from '../../src/contracts/assessment';
import { joinLatestItem } from '../processing/processed-items-repository';
import { renderProgress } from '../sharing/shared-items';

/** A panel as stored: what the API shows plus the marks frozen when the clip was made. */
export interface StoredClipPanel extends AnnotatedClipPanel {
  heading: string;
  fps: number;
  frameSize: { width: number; height: number };
  nearSide: Side;
  direction: Direction;
  /** Landmarks, events and gauges of the frames shown (and the marked frames either side, for interpolation). */
  landmarks: FrameLandmarks[];
  events: GaitEventMark[];
  gauges: AngleGauge[];
}

/** What a row stores in `panels`: the panels and the source frames per step (one per panel). */
export interface StoredClipPlan {
  panels: StoredClipPanel[];
  steps: number[][];
}

export interface AnnotatedClipRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  assessment_id: number;
  clip_id: number;
  other_clip_id: number | null;
  kind: 'single' | 'side_by_side';
  panels: string;
  factor: number;
  caption: string;
  show_angles: number | boolean;
  status: AnnotatedClipStatus;
  error: string | null;
  width: number | null;
  height: number | null;
  frame_count: number | null;
  fps: number | null;
  duration_s: number | null;
  repeat: number | null;
  note: string | null;
  render_version: number;
  published_at: string | null;
  published_by: number | null;
  created_by: number | null;
  created_at: string;
  updated_at: string;
}

/** A row joined with the names the API shows and its newest processed item's progress. */
type ClipView = AnnotatedClipRow & {
  created_by_name: string | null;
  published_by_name: string | null;
  item_done: number | null;
  item_total: number | null;
};

export const annotatedClipsRepository = {
  plan(row: Pick<AnnotatedClipRow, 'panels'>): StoredClipPlan {
    return JSON.parse(row.panels) as StoredClipPlan;
  },

  async insert(trx: Knex, row: Omit<AnnotatedClipRow, 'id'>): Promise<number> {
    const [r] = await trx('annotated_clips').insert(row).returning('id');
    return (r as { id: number }).id;
  },

  findById(db: Knex, id: number): Promise<AnnotatedClipRow | undefined> {
    return db<AnnotatedClipRow>('annotated_clips').where({ id }).first();
  },

  async update(db: Knex, id: number, patch: Partial<AnnotatedClipRow>): Promise<void> {
    await db('annotated_clips').where({ id }).update(patch);
  },

  async view(db: Knex, where: Record<string, unknown>, opts: { publishedOnly: boolean }): Promise<AnnotatedClip[]> {
    const q = joinLatestItem(db('annotated_clips as a'), db, 'annotated_clip', 'a')
      .leftJoin('users as cu', 'cu.id', 'a.created_by')
      .leftJoin('users as pu', 'pu.id', 'a.published_by')
      .where(Object.fromEntries(Object.entries(where).map(([k, v]) => [`a.${k}`, v])))
      .orderBy('a.created_at', 'desc')
      .orderBy('a.id', 'desc')
      .select<ClipView[]>(
        'a.*',
        'cu.name as created_by_name',
        'pu.name as published_by_name',
        'pi.progress_done as item_done',
        'pi.progress_total as item_total',
      );
    if (opts.publishedOnly)
      q.whereNotNull('a.published_at')
        .where('a.status', 'ready')
        .where((w) => w.where('a.kind', 'single').orWhereNotNull('a.other_clip_id'));
    return (await q).map(toApi);
  },
};

/** Why a side-by-side clip whose Baseline clip was deleted cannot be played or published. */
export const BASELINE_CLIP_DELETED = 'The Baseline clip of this side-by-side clip was deleted. Delete this one and make it again.';

/** Whether a side-by-side clip lost its Baseline clip. */
export const lostBaseline = (r: Pick<AnnotatedClipRow, 'kind' | 'other_clip_id'>) => r.kind === 'side_by_side' && r.other_clip_id === null;

function toApi(r: ClipView): AnnotatedClip {
  const gone = lostBaseline(r);
  return {
    id: r.id,
    athleteId: r.athlete_id,
    assessmentId: r.assessment_id,
    kind: r.kind,
    panels: annotatedClipsRepository
      .plan(r)
      .panels.map((p) => ({ clipId: p.clipId, assessmentId: p.assessmentId, label: p.label, fromFrame: p.fromFrame, toFrame: p.toFrame })),
    factor: r.factor as SlowMotionFactor,
    caption: r.caption,
    showAngles: Boolean(r.show_angles),
    status: gone ? 'failed' : r.status,
    progress: gone ? 0 : renderProgress(r),
    error: gone ? BASELINE_CLIP_DELETED : r.error,
    width: r.width,
    height: r.height,
    frameCount: r.frame_count,
    fps: r.fps,
    durationS: r.duration_s,
    repeat: r.repeat,
    note: r.note,
    publishedAt: r.published_at,
    publishedBy: r.published_by_name,
    createdAt: r.created_at,
    createdBy: r.created_by_name ?? 'Former staff member',
    // The render version in the URL changes with each render, so caches never go stale.
    videoUrl: `/api/annotated-clips/${r.id}/video.mp4?v=${r.render_version}`,
  };
}
