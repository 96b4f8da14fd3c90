import { rm } from 'node:fs/promises';
import path from 'node:path';
import type { SlowMotionFactor } from '../../src/contracts/annotated-clips';
import type { Db } from '../db/knex';
import { NotReadyError, PermanentError, type ProcessingKind } from '../processing/processed-item';
import { partialFileOf, renderAnnotatedClip, type AnnotatedClipRenderOutput } from '../render/annotated-clip-render';
import { annotatedClipFile, clipKeys } from '../storage/media-keys';
import { MissingMediaError, type MediaStore } from '../storage/media-store';
import { readSmall } from '../storage/stored-objects';
import { BASELINE_CLIP_DELETED, annotatedClipsRepository as repo, lostBaseline, type AnnotatedClipRow } from './annotated-clips-repository';

/** The kind that draws an annotated clip's frames with their frozen marks into an MP4. */
export const RENDER_ANNOTATED_CLIP = 'render_annotated_clip';

const FRAME_GONE = 'A frame of this clip is gone (its clip was deleted or re-processed). Make the annotated clip again.';

/** What a render leaves for `onReady`: the video's facts, for the version it drew. */
interface Rendered {
  version: number;
  out: Pick<AnnotatedClipRenderOutput, 'width' | 'height' | 'frameCount' | 'outputFps' | 'durationS' | 'repeat' | 'note'>;
}

/** Removes an annotated clip's video of one render version. */
export async function removeAnnotatedVideo(
  store: MediaStore,
  row: Pick<AnnotatedClipRow, 'id' | 'clip_id'>,
  version: number,
): Promise<void> {
  await store.remove(clipKeys(row.clip_id).annotated(row.id, version));
  await removePartialVideo(store, row, version);
}

/**
 * Removes what a render of one version left half written: a process killed mid-render (SIGKILL,
 * power loss) cannot remove its own. The next attempt and deleting the clip call this.
 */
export async function removePartialVideo(store: MediaStore, row: Pick<AnnotatedClipRow, 'id' | 'clip_id'>, version: number): Promise<void> {
  await store.withLocalFolder(clipKeys(row.clip_id).annotatedPrefix, (folder) =>
    rm(partialFileOf(path.join(folder.path, annotatedClipFile(row.id, version))), { force: true }),
  );
}

/**
 * Annotated-clip rendering as a processed item about an annotated clip: waits (by retrying) for
 * its clips' frames, draws every step's frames with the overlay into an MP4 that ffmpeg writes in
 * the store's local folder (under a hidden name until complete) and publishes it under its key. The clip is ready with the video's facts in the transaction that
 * makes its item ready.
 */
export function renderAnnotatedClipKind(d: { db: Db; store: MediaStore }): ProcessingKind<Rendered | null> {
  const { db, store } = d;
  return {
    name: RENDER_ANNOTATED_CLIP,
    subject: 'annotated_clip',
    athleteSees: false,

    async run(item, ctx) {
      const id = item.subjectId;
      const row = await repo.findById(db, id);
      if (!row) return null; // deleted meanwhile
      // What an earlier attempt killed mid-render left half written goes before anything else can fail.
      await removePartialVideo(store, row, row.render_version);
      if (lostBaseline(row)) throw new PermanentError(BASELINE_CLIP_DELETED);
      const plan = repo.plan(row);
      const statuses = await db('clips')
        .whereIn(
          'id',
          plan.panels.map((p) => p.clipId),
        )
        .pluck('status');
      if (statuses.length < new Set(plan.panels.map((p) => p.clipId)).size)
        throw new PermanentError('A clip of this annotated clip was deleted.');
      if (statuses.includes('failed')) throw new PermanentError('The clip’s frames could not be extracted.');
      if (statuses.some((st: string) => st !== 'ready')) throw new NotReadyError('The clip’s frames are not extracted yet.');
      const version = row.render_version;
      const name = annotatedClipFile(id, version);
      const out = await store.withLocalFolder(clipKeys(row.clip_id).annotatedPrefix, async (folder) => {
        const rendered = await renderAnnotatedClip({
          panels: plan.panels.map((p) => ({
            ...p,
            readFrame: (i: number) =>
              readSmall(store, clipKeys(p.clipId).frame(i)).catch((err: unknown) => {
                if (err instanceof MissingMediaError) throw new PermanentError(FRAME_GONE);
                throw err;
              }),
          })),
          steps: plan.steps,
          factor: row.factor as SlowMotionFactor,
          caption: row.caption,
          showAngles: Boolean(row.show_angles),
          outFile: path.join(folder.path, name),
          signal: ctx.signal,
          onProgress: (f) => ctx.progress(Math.round(Math.min(0.99, f) * 100), 100),
        });
        await folder.publish([name]);
        return rendered;
      });
      const current = await repo.findById(db, id);
      if (!current || current.render_version !== version || current.status === 'failed' || lostBaseline(current)) {
        // Deleted or a clip of it removed meanwhile (the removal failed it): this video belongs to nobody.
        await removeAnnotatedVideo(store, row, version);
        return null;
      }
      const { width, height, frameCount, outputFps, durationS, repeat, note } = out;
      return { version, out: { width, height, frameCount, outputFps, durationS, repeat, note } };
    },

    async onReady(trx, item, rendered) {
      if (!rendered) return;
      const o = rendered.out;
      await trx('annotated_clips').where({ id: item.subjectId, render_version: rendered.version }).update({
        status: 'ready',
        error: null,
        width: o.width,
        height: o.height,
        frame_count: o.frameCount,
        fps: o.outputFps,
        duration_s: o.durationS,
        repeat: o.repeat,
        note: o.note,
        updated_at: new Date().toISOString(),
      });
    },

    async onChange(trx, item, change) {
      const at = new Date().toISOString();
      if (change.state === 'failed') {
        await trx('annotated_clips')
          .where({ id: item.subjectId })
          .whereNot({ status: 'ready' })
          .update({ status: 'failed', error: `The clip could not be rendered: ${change.reason}`, updated_at: at });
      } else if (change.state === 'queued' && !change.retry) {
        await trx('annotated_clips').where({ id: item.subjectId }).update({ status: 'rendering', error: null, updated_at: at });
      }
    },
  };
}
