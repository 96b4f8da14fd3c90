import path from 'node:path';
import type { Knex } from 'knex';
import { makePhoneMp4 } from '../media/phone-mp4';
import { probeVideo } from '../media/probe';
import { PermanentError, type ProcessingKind } from '../processing/processed-item';
import { demoClipKeys } from '../storage/media-keys';
import { MissingMediaError, type MediaStore } from '../storage/media-store';
import { demoClipsRepository as repo } from './demo-clips-repository';

/** The kind that makes a demonstration clip's phone MP4 and poster. */
export const MAKE_DEMO_CLIP = 'make_demo_clip';

/** What a run leaves for `onReady`: the version it made and the video's size. */
interface Made {
  version: number;
  width: number;
  height: number;
}

/**
 * A demonstration clip made phone-friendly as a processed item about `demo_clip` (the clinic's own
 * subject: progress on the clinic's staff stream): ffmpeg reads the upload through the store's one
 * local path, writes the MP4 and poster in the store's local folder and publishes them under the
 * clip's keys by version. Ready with the video's size in the transaction that makes its item ready.
 */
export function makeDemoClipKind(d: { db: Knex; store: MediaStore }): ProcessingKind<Made | null> {
  const { db, store } = d;
  return {
    name: MAKE_DEMO_CLIP,
    subject: 'demo_clip',
    athleteSees: false,

    async run(item, ctx) {
      const row = await repo.findById(db, item.subjectId);
      if (!row) return null; // removed meanwhile
      const keys = demoClipKeys(row.exercise_id, row.id);
      const version = row.version;
      const made = await store
        .withLocalFile(keys.original(row.stored_name), (input) =>
          store.withLocalFolder(keys.prefix, async (folder) => {
            const video = keys.videoFile(version);
            const poster = keys.posterFile(version);
            await makePhoneMp4({
              input,
              outFile: path.join(folder.path, video),
              posterFile: path.join(folder.path, poster),
              durationS: row.duration_s,
              threads: ctx.threads,
              signal: ctx.signal,
              onProgress: (f) => ctx.progress(Math.round(Math.min(0.99, f) * 100), 100),
            });
            const probe = await probeVideo(path.join(folder.path, video));
            await folder.publish([video, poster]);
            return { version, width: probe.displayWidth, height: probe.displayHeight };
          }),
        )
        .catch((err: unknown) => {
          if (err instanceof MissingMediaError) throw new PermanentError('The uploaded clip is gone. Upload it again.');
          throw err;
        });
      const current = await repo.findById(db, row.id);
      if (!current || current.version !== version) {
        // Removed meanwhile: these files belong to nobody.
        await store.remove(keys.video(version));
        await store.remove(keys.poster(version));
        return null;
      }
      return made;
    },

    async onReady(trx, item, made) {
      if (!made) return;
      await trx('demo_clips').where({ id: item.subjectId, version: made.version }).update({
        status: 'ready',
        error: null,
        width: made.width,
        height: made.height,
        updated_at: new Date().toISOString(),
      });
    },

    async onChange(trx, item, change) {
      const at = new Date().toISOString();
      if (change.state === 'failed') {
        await trx('demo_clips')
          .where({ id: item.subjectId })
          .update({ status: 'failed', error: `The clip could not be made ready for phones: ${change.reason}`, updated_at: at });
      } else if (change.state === 'queued' && !change.retry) {
        await trx('demo_clips').where({ id: item.subjectId }).update({ status: 'processing', error: null, updated_at: at });
      }
    },
  };
}
