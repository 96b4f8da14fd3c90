import type { Db } from '../db/knex';
import { NotReadyError, PermanentError, type ProcessingKind } from '../processing/processed-item';
import { renderStill, type StillRenderOutput } from '../render/still-render';
import { clipKeys } from '../storage/media-keys';
import { MissingMediaError, type MediaStore } from '../storage/media-store';
import { readSmall } from '../storage/stored-objects';
import { STILL_CLIP_DELETED, stillsRepository as repo, type StillRow } from './stills-repository';

/** The kind that draws a still's frames with their frozen overlay into a PNG and a phone JPEG. */
export const RENDER_STILL = 'render_still';

/** What a render leaves for `onReady`: the picture's layout, for the version it drew. */
interface Rendered {
  version: number;
  out: Pick<StillRenderOutput, 'width' | 'height' | 'layout' | 'labels'>;
}

/** Removes a still's images of one render version. */
export async function removeStillImages(store: MediaStore, row: Pick<StillRow, 'id' | 'clip_id'>, version: number): Promise<void> {
  if (row.clip_id === null) return;
  const keys = clipKeys(row.clip_id);
  await store.remove(keys.still(row.id, version, 'png'));
  await store.remove(keys.still(row.id, version, 'jpeg'));
}

/**
 * Still rendering as a processed item about a still: waits (by retrying) for its clips' frames,
 * renders with the review's overlay, stores both images under the render version; the still is
 * ready with its layout in the same transaction as its item, and the previous version's images go.
 */
export function renderStillKind(d: { db: Db; store: MediaStore }): ProcessingKind<Rendered | null> {
  const { db, store } = d;
  return {
    name: RENDER_STILL,
    subject: 'still',
    athleteSees: false,

    async run(item, ctx) {
      const id = item.subjectId;
      const row = await repo.findById(db, id);
      if (!row) return null; // deleted meanwhile
      if (row.clip_id === null) throw new PermanentError(STILL_CLIP_DELETED);
      const panels = repo.panels(row);
      // A still queued with its clip (the demo) waits for the frames, back in the queue without using an attempt.
      const statuses = await db('clips')
        .whereIn(
          'id',
          panels.map((p) => p.clipId),
        )
        .pluck('status');
      if (statuses.includes('failed')) throw new PermanentError('The clip’s frames could not be extracted.');
      if (statuses.some((st: string) => st !== 'ready')) throw new NotReadyError('The clip’s frames are not extracted yet.');
      const inputs = [];
      for (const p of panels) {
        const image = await readSmall(store, clipKeys(p.clipId).frame(p.frameIndex)).catch((err: unknown) => {
          if (err instanceof MissingMediaError)
            throw new PermanentError('A frame of this still is gone (its clip was deleted or re-processed). Save the still again.');
          throw err;
        });
        const { clipId: _clip, assessmentId: _assessment, frameIndex: _frame, timeS: _time, label: _label, ...overlay } = p;
        inputs.push({ ...overlay, image });
      }
      const version = row.render_version;
      const out = await renderStill({
        panels: inputs,
        caption: row.caption,
        showAngles: Boolean(row.show_angles),
        onProgress: (f) => ctx.progress(Math.round(Math.min(0.95, f) * 100), 100),
      });
      const keys = clipKeys(row.clip_id);
      await store.put(keys.still(id, version, 'png'), out.png);
      await store.put(keys.still(id, version, 'jpeg'), out.jpeg);
      const current = await repo.findById(db, id);
      if (!current || current.render_version !== version || current.clip_id !== row.clip_id || current.status === 'failed') {
        // Deleted, re-captioned or its clip removed meanwhile (the removal failed it): these images belong to nobody.
        await removeStillImages(store, row, version);
        return null;
      }
      return { version, out: { width: out.width, height: out.height, layout: out.layout, labels: out.labels } };
    },

    async onReady(trx, item, rendered) {
      if (!rendered) return;
      const n = await trx('stills')
        .where({ id: item.subjectId, render_version: rendered.version })
        .update({
          status: 'ready',
          error: null,
          width: rendered.out.width,
          height: rendered.out.height,
          layout: JSON.stringify(rendered.out.layout),
          labels: JSON.stringify(rendered.out.labels),
          updated_at: new Date().toISOString(),
        });
      const row = n > 0 ? await repo.findById(trx, item.subjectId) : undefined;
      if (row && rendered.version > 1) await removeStillImages(store, row, rendered.version - 1);
    },

    async onChange(trx, item, change) {
      const at = new Date().toISOString();
      const still = trx('stills').where({ id: item.subjectId }).whereNot({ status: 'ready' });
      if (change.state === 'failed') {
        await still.update({ status: 'failed', error: `The still could not be rendered: ${change.reason}`, updated_at: at });
      } else if (change.state === 'queued' && !change.retry) {
        await trx('stills').where({ id: item.subjectId }).update({ status: 'rendering', error: null, updated_at: at });
      }
    },
  };
}
