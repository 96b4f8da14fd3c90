import fs from 'node:fs';
import path from 'node:path';
import type { Db } from '../db/knex';
import type { Job, SubjectFailure } from '../jobs/job-queue';
import { PermanentJobError, type JobHandler } from '../jobs/worker';
import { FRAMES_DIR, frameFileName } from '../media/manifest';
import type { MediaStore } from '../storage/media-store';
import { renderAnnotatedClip } from '../render/annotated-clip-render';
import type { SlowMotionFactor } from '../../src/contracts/annotated-clips';
import { BASELINE_CLIP_DELETED, annotatedClipFile, annotatedClipsRepository as repo, lostBaseline } from './annotated-clips-repository';

export const RENDER_ANNOTATED_CLIP_JOB = 'render_annotated_clip';
/** Folder of annotated-clip videos inside the clip's folder. */
export const ANNOTATED_DIR = 'annotated';
export const subjectOf = (id: number) => `annotated_clip:${id}`;

const FRAME_GONE = 'A frame of this clip is gone (its clip was deleted or re-processed). Make the annotated clip again.';

/**
 * The render job of an annotated clip: reads the frozen plan, draws every step's frames with the
 * overlay into an MP4 (progress on the row as it goes), and makes the clip ready with the video's
 * facts. The video is written under a temporary name and renamed, so a reader never sees half a file.
 */
export function annotatedClipJob(d: { db: Db; store: MediaStore; clock: () => Date }): { run: JobHandler; failure: SubjectFailure } {
  const { db } = d;
  const now = () => d.clock().toISOString();
  return {
    run: async (job: Job, { signal }) => {
      const id = Number(job.payload['annotatedClipId']);
      const row = await repo.findById(db, id);
      if (!row) return; // deleted meanwhile
      if (lostBaseline(row)) throw new PermanentJobError(BASELINE_CLIP_DELETED);
      const plan = repo.plan(row);
      const statuses = await db('clips')
        .whereIn(
          'id',
          plan.panels.map((p) => p.clipId),
        )
        .pluck('status');
      if (statuses.length < plan.panels.length) throw new PermanentJobError('A clip of this annotated clip was deleted.');
      if (statuses.some((st: string) => st !== 'ready')) throw new Error('The clip’s frames are not extracted yet.');
      const dir = path.join(d.store.clipDir(row.clip_id), ANNOTATED_DIR);
      await fs.promises.mkdir(dir, { recursive: true });
      const name = annotatedClipFile(id, row.render_version);
      const tmp = path.join(dir, `.${name}.tmp`);
      const out = await renderAnnotatedClip({
        panels: plan.panels.map((p) => ({
          ...p,
          readFrame: (i: number) =>
            fs.promises.readFile(path.join(d.store.clipDir(p.clipId), FRAMES_DIR, frameFileName(i))).catch(() => {
              throw new PermanentJobError(FRAME_GONE);
            }),
        })),
        steps: plan.steps,
        factor: row.factor as SlowMotionFactor,
        caption: row.caption,
        showAngles: Boolean(row.show_angles),
        outFile: tmp,
        signal,
        onProgress: (f) => repo.update(db, id, { progress: Math.min(0.99, f) }),
      });
      if (!(await repo.findById(db, id))) {
        await fs.promises.rm(tmp, { force: true }); // deleted while rendering
        return;
      }
      await fs.promises.rename(tmp, path.join(dir, name));
      await repo.update(db, id, {
        status: 'ready',
        progress: 1,
        error: null,
        width: out.width,
        height: out.height,
        frame_count: out.frameCount,
        fps: out.outputFps,
        duration_s: out.durationS,
        repeat: out.repeat,
        note: out.note,
        updated_at: now(),
      });
    },
    failure: {
      async fail(trx, job, reason) {
        await trx('annotated_clips')
          .where({ id: Number(job.payload['annotatedClipId']) })
          .whereNot({ status: 'ready' })
          .update({ status: 'failed', error: `The clip could not be rendered: ${reason}`, updated_at: now() });
      },
    },
  };
}
