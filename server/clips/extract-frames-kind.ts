import type { Logger } from 'pino';
import type { Db } from '../db/knex';
import { plannedManifest } from '../media/extract-plan';
import { extractFrames } from '../media/extract';
import { FRAMES_DIR, MANIFEST_FILE, THUMBS_DIR, frameFileName, type ClipManifest } from '../media/manifest';
import { MediaError } from '../media/media-error';
import { probeVideo } from '../media/probe';
import { PermanentError, type ProcessingKind } from '../processing/processed-item';
import { clipKeys } from '../storage/media-keys';
import type { LocalFolder, MediaStore } from '../storage/media-store';
import { putJson, readJson } from '../storage/stored-objects';
import { clipFacts } from './clip-facts';
import { clipsRepository as repo } from './clips-repository';

/** The kind that turns an accepted clip into frames, thumbnails and its complete manifest. */
export const EXTRACT_FRAMES = 'extract_frames';

/**
 * Publishes frames in order as ffmpeg reports them, and only then reports them as progress, so a
 * frame counted as ready can always be read by key (at once for the local store). `finish` publishes
 * the frames no report named and waits for every publication (an object store uploads them: the
 * local folder must outlive them).
 */
function framePublisher(folder: LocalFolder, report: (done: number, total: number) => void) {
  let publishedUpTo = 0;
  let chain: Promise<void> = Promise.resolve();
  const publishTo = (done: number, after: () => void) => {
    if (done < publishedUpTo) publishedUpTo = done; // the extraction restarted (fallback scaler)
    const names: string[] = [];
    for (let i = publishedUpTo; i < done; i++) names.push(`${FRAMES_DIR}/${frameFileName(i)}`);
    publishedUpTo = done;
    chain = chain.then(() => folder.publish(names)).then(after);
    return chain;
  };
  return {
    onProgress: (done: number, total: number) => void publishTo(done, () => report(done, total)).catch(() => undefined),
    finish: (frameCount: number) => publishTo(Math.max(frameCount, publishedUpTo), () => undefined),
  };
}

/**
 * Frame extraction as a processed item about a clip: reads the probe from the clip's manifest (or
 * probes a clip that has none, e.g. seeded), writes the planned manifest, then frames in order
 * with progress, thumbnails and the complete manifest; the clip row's facts are derived from it
 * when the item is ready. Damaged clips fail at once; anything else is retried.
 */
export function extractFramesKind(d: { db: Db; store: MediaStore; logger: Logger }): ProcessingKind<ClipManifest | null> {
  const { db, store } = d;
  return {
    name: EXTRACT_FRAMES,
    subject: 'clip',
    athleteSees: true,

    async run(item, ctx) {
      const clipId = item.subjectId;
      const row = await repo.findById(db, clipId);
      if (!row) return null; // deleted meanwhile
      const keys = clipKeys(clipId);
      const stored = await readJson<ClipManifest>(store, keys.manifest);
      try {
        const manifest = await store.withLocalFile(keys.original(row.stored_name), async (input) => {
          const probe = stored?.source ?? (await probeVideo(input));
          // The plan first: the review can open on it as soon as the first frames exist.
          await putJson(store, keys.manifest, { ...plannedManifest(probe), source: probe } satisfies ClipManifest);
          return store.withLocalFolder(keys.prefix, async (folder) => {
            const frames = framePublisher(folder, ctx.progress);
            const made = await extractFrames(input, folder.path, {
              probe,
              signal: ctx.signal,
              threads: ctx.threads,
              onProgress: frames.onProgress,
            });
            await frames.finish(made.frameCount);
            const thumbs = Array.from({ length: made.thumbCount }, (_, i) => `${THUMBS_DIR}/${frameFileName(i)}`);
            await folder.publish([...thumbs, MANIFEST_FILE]);
            const complete: ClipManifest = { ...made, source: probe };
            await putJson(store, keys.manifest, complete);
            return complete;
          });
        });
        if (!(await repo.findById(db, clipId))) {
          await store.removePrefix(keys.prefix); // deleted while its frames were made
          return null;
        }
        return manifest;
      } catch (err) {
        // Nothing half-made stays: extractFrames removed its local frames, and those already
        // published (an object store holds them apart from the local folder) go here; a later
        // attempt plans again.
        await store.removePrefix(`${keys.prefix}${FRAMES_DIR}/`);
        await store.removePrefix(`${keys.prefix}${THUMBS_DIR}/`);
        await store.remove(keys.manifest);
        if (!(await repo.findById(db, clipId))) await store.removePrefix(keys.prefix);
        if (err instanceof MediaError && err.code !== 'tool_missing' && err.code !== 'aborted') {
          d.logger.warn({ clipId, reason: err.reason }, 'clip processing failed');
          throw new PermanentError(err.message);
        }
        throw err;
      }
    },

    async onReady(trx, item, manifest) {
      if (!manifest) return;
      await repo.update(trx, item.subjectId, { status: 'ready', error: null, ...clipFacts(manifest) });
    },

    async onChange(trx, item, change) {
      const clipId = item.subjectId;
      if (change.state === 'queued') {
        const error = change.retry ? `Attempt ${change.retry.attempt} failed; trying again shortly.` : null;
        await trx('clips').where({ id: clipId }).whereNot({ status: 'ready' }).update({ status: 'queued', error, updated_at: now() });
      } else if (change.state === 'running') {
        await trx('clips')
          .where({ id: clipId })
          .whereNot({ status: 'ready' })
          .update({ status: 'extracting', error: null, updated_at: now() });
      } else {
        // The clip is failed with the reason (unless it got ready meanwhile).
        await trx('clips')
          .where({ id: clipId })
          .whereNot({ status: 'ready' })
          .update({ status: 'failed', error: change.reason.slice(0, 500), updated_at: now() });
      }
    },
  };
}

const now = () => new Date().toISOString();
