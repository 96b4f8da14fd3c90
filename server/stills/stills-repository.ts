import type { Knex } from 'knex';
import type { RenderStatus, Still, StillLabel, StillPanel, StillRect } from '../../src/contracts/sharing';
import type { StillPanelInput } from '../render/still-render';
import { joinLatestItem } from '../processing/processed-items-repository';
import { renderProgress } from '../sharing/shared-items';

/** A panel as stored: what the API shows plus the overlay frozen at save time (all but the image). */
export interface StoredPanel extends StillPanel, Omit<StillPanelInput, 'image'> {}

export interface StillRow {
  id: number;
  clinic_id: number;
  athlete_id: number;
  assessment_id: number;
  clip_id: number | null;
  kind: 'frame' | 'pair';
  panels: string;
  caption: string;
  show_angles: number | boolean;
  status: RenderStatus;
  error: string | null;
  width: number | null;
  height: number | null;
  layout: string | null;
  labels: string | null;
  render_version: number;
  published_at: string | null;
  published_by: number | null;
  created_by: number | null;
  created_at: string;
  updated_at: string;
}

/** A row joined with the names the API shows and its newest processed item's progress. */
type StillView = StillRow & {
  created_by_name: string | null;
  published_by_name: string | null;
  item_done: number | null;
  item_total: number | null;
};

export const STILL_CLIP_DELETED = 'The clip of this still was deleted, so its image is gone. Save a new still from another clip.';

export const stillsRepository = {
  panels(row: Pick<StillRow, 'panels'>): StoredPanel[] {
    return JSON.parse(row.panels) as StoredPanel[];
  },

  async insert(trx: Knex, row: Omit<StillRow, 'id'>): Promise<number> {
    const [r] = await trx('stills').insert(row).returning('id');
    return (r as { id: number }).id;
  },

  find(db: Knex, clinicId: number, id: number): Promise<StillRow | undefined> {
    return db<StillRow>('stills').where({ id, clinic_id: clinicId }).first();
  },

  findById(db: Knex, id: number): Promise<StillRow | undefined> {
    return db<StillRow>('stills').where({ id }).first();
  },

  async update(db: Knex, id: number, patch: Partial<StillRow>): Promise<void> {
    await db('stills').where({ id }).update(patch);
  },

  async view(db: Knex, where: Record<string, unknown>, opts: { publishedOnly: boolean }): Promise<Still[]> {
    const q = joinLatestItem(db('stills as s'), db, 'still', 's')
      .leftJoin('users as cu', 'cu.id', 's.created_by')
      .leftJoin('users as pu', 'pu.id', 's.published_by')
      .where(Object.fromEntries(Object.entries(where).map(([k, v]) => [`s.${k}`, v])))
      .orderBy('s.created_at', 'desc')
      .orderBy('s.id', 'desc')
      .select<StillView[]>(
        's.*',
        'cu.name as created_by_name',
        'pu.name as published_by_name',
        'pi.progress_done as item_done',
        'pi.progress_total as item_total',
      );
    if (opts.publishedOnly) q.whereNotNull('s.published_at').whereNotNull('s.clip_id').where('s.status', 'ready');
    return (await q).map(toApi);
  },
};

function toApi(r: StillView): Still {
  const clipGone = r.clip_id === null;
  return {
    id: r.id,
    athleteId: r.athlete_id,
    assessmentId: r.assessment_id,
    kind: r.kind,
    panels: stillsRepository
      .panels(r)
      .map((p) => ({ clipId: p.clipId, assessmentId: p.assessmentId, frameIndex: p.frameIndex, timeS: p.timeS, label: p.label })),
    caption: r.caption,
    showAngles: Boolean(r.show_angles),
    status: clipGone ? 'failed' : r.status,
    progress: renderProgress(r),
    error: clipGone ? STILL_CLIP_DELETED : r.error,
    width: r.width,
    height: r.height,
    labels: r.labels ? (JSON.parse(r.labels) as StillLabel[]) : [],
    layout: r.layout ? (JSON.parse(r.layout) as StillRect[]) : null,
    publishedAt: r.published_at,
    publishedBy: r.published_by_name,
    createdAt: r.created_at,
    createdBy: r.created_by_name ?? 'Former staff member',
    // The render version in the URL changes when the caption is edited, so caches never go stale.
    imageUrl: `/api/stills/${r.id}/image.png?v=${r.render_version}`,
    phoneImageUrl: `/api/stills/${r.id}/image.jpg?v=${r.render_version}`,
  };
}
