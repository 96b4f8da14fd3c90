import type { Knex } from 'knex';
import type { Processing } from '../processing/processing';
import { stillsRepository, type StillRow } from '../stills/stills-repository';

/** Why a still or annotated clip whose render waited on a removed clip is failed. */
export const RENDER_CLIP_DELETED = 'A clip it shows was deleted before it was rendered. Make it again from another clip.';

/**
 * Ends the renders drawn from a clip that is being removed: the stills and annotated clips kept
 * under it or showing its frames (a pair still, a side-by-side clip's Baseline). Their queued or
 * running items are cancelled (a running attempt is aborted, in whatever process) and those not yet
 * ready are failed with the reason, so a page following them sees an end instead of "rendering" for
 * good, and no worker later spends a slot on frames that are gone. Call it before the clip's files go.
 */
export async function cancelRendersOfClip(db: Knex, processing: Pick<Processing, 'cancel'>, clipId: number): Promise<void> {
  const at = new Date().toISOString();
  const athlete = db('clips').where({ id: clipId }).select('athlete_id');
  const stills = (await db('stills').whereIn('athlete_id', athlete).select('id', 'clip_id', 'panels')) as Pick<
    StillRow,
    'id' | 'clip_id' | 'panels'
  >[];
  for (const s of stills) {
    if (s.clip_id !== clipId && !stillsRepository.panels(s).some((p) => p.clipId === clipId)) continue;
    await processing.cancel('still', s.id);
    await db('stills')
      .where({ id: s.id })
      .whereNot({ status: 'ready' })
      .update({ status: 'failed', error: RENDER_CLIP_DELETED, updated_at: at });
  }
  const videos = (await db('annotated_clips')
    .where((w) => w.where({ clip_id: clipId }).orWhere({ other_clip_id: clipId }))
    .pluck('id')) as number[];
  for (const id of videos) {
    await processing.cancel('annotated_clip', id);
    await db('annotated_clips')
      .where({ id })
      .whereNot({ status: 'ready' })
      .update({ status: 'failed', error: RENDER_CLIP_DELETED, updated_at: at });
  }
}
