import type { Knex } from 'knex';
import type { SessionUser } from '../../src/contracts/api';
import { DEMO_LIMITS, type DemoClip, type DemoClipUpdate } from '../../src/contracts/demonstrations';
import { audit } from '../audit/audit-log';
import { AppError, ConflictError, NotFoundError } from '../errors';
import { checkVideoUpload } from '../media/check-video-upload';
import type { Processing } from '../processing/processing';
import { demoClipKeys } from '../storage/media-keys';
import type { MediaStore } from '../storage/media-store';
import { removeUpload } from '../storage/upload-temps';
import { reachableExercise, reachableItem } from './demo-access';
import { demoClipsRepository as repo, type DemoClipRow } from './demo-clips-repository';
import { MAKE_DEMO_CLIP, makeDemoClipKind } from './make-demo-clip-kind';

/** A received upload's temp file. */
export interface DemoClipUpload {
  path: string;
  size: number;
}

/** The one demonstration clip of an exercise: staff add, caption, place and remove it; athletes see it once ready. */
export interface DemoClipsService {
  /** The exercise's clip as this user may see it (an athlete: ready only), or null. No access check: callers check. */
  ofExercise(user: SessionUser, exerciseId: number): Promise<DemoClip | null>;
  /** Before a clip is received: 404 for an exercise out of reach, 409 when it has its clip already. */
  beforeAdd(user: SessionUser, exerciseId: number): Promise<void>;
  /**
   * Accepts an uploaded temp file: a video by its content (magic bytes, ffprobe) of at most
   * {@link DEMO_LIMITS.clipSeconds} s; the row and its `make_demo_clip` item are made in one
   * transaction inside which the file moves to its key. Whatever is refused leaves nothing.
   */
  add(user: SessionUser, exerciseId: number, file: DemoClipUpload, caption: string): Promise<DemoClip>;
  update(user: SessionUser, clipId: number, change: DemoClipUpdate): Promise<DemoClip>;
  remove(user: SessionUser, clipId: number): Promise<void>;
  /** The stored key of a ready clip's MP4 or poster. */
  mediaKey(user: SessionUser, clipId: number, what: 'video' | 'poster'): Promise<string>;
}

export interface DemoClipsDeps {
  db: Knex;
  store: MediaStore;
  processing: Processing;
  clock: () => Date;
}

/** 422 for a clip over the limit, with its length in words. */
export function clipTooLong(durationS: number): AppError {
  return new AppError(
    422,
    'clip_too_long',
    `This clip is ${Math.round(durationS)} s long; a demonstration clip is at most ${DEMO_LIMITS.clipSeconds} s. Trim it and upload it again.`,
  );
}

/** Containers state durations to the millisecond and round a little: a 30 s recording may read 30.03 s. */
const DURATION_SLACK_S = 0.1;

export function demoClipsService({ db, store, processing, clock }: DemoClipsDeps): DemoClipsService {
  processing.register(makeDemoClipKind({ db, store }));

  const reachableClip = async (user: SessionUser, clipId: number, action: Parameters<typeof reachableExercise>[3]) =>
    reachableItem(db, user, await repo.find(db, user.clinicId, clipId), action, 'Clip');

  const exists = () => new ConflictError('An exercise has one demonstration clip. Remove it first to upload another.', 'demo_clip_exists');

  return {
    async ofExercise(user, exerciseId) {
      const row = await repo.ofExercise(db, user.clinicId, exerciseId);
      if (!row || (user.role === 'athlete' && row.status !== 'ready')) return null;
      return repo.toApi(row);
    },

    async beforeAdd(user, exerciseId) {
      await reachableExercise(db, user, exerciseId, 'demo:create');
      if (await repo.ofExercise(db, user.clinicId, exerciseId)) throw exists();
    },

    async add(user, exerciseId, file, caption) {
      try {
        await this.beforeAdd(user, exerciseId);
        const { container, probe } = await checkVideoUpload(file);
        if (probe.durationS > DEMO_LIMITS.clipSeconds + DURATION_SLACK_S) throw clipTooLong(probe.durationS);
        const storedName = `original.${container}`;
        const at = clock().toISOString();
        let clipId = 0;
        try {
          await db.transaction(async (trx) => {
            if (await repo.ofExercise(trx, user.clinicId, exerciseId)) throw exists();
            const pictures = await trx('demo_pictures').where({ clinic_id: user.clinicId, exercise_id: exerciseId }).count({ n: '*' });
            clipId = await repo.insert(trx, {
              clinic_id: user.clinicId,
              exercise_id: exerciseId,
              position: Number(pictures[0]?.n ?? 0),
              caption,
              stored_name: storedName,
              status: 'processing',
              error: null,
              version: 1,
              duration_s: probe.durationS,
              width: null,
              height: null,
              created_by: user.id,
              created_at: at,
              updated_at: at,
            });
            await processing.enqueue(trx, MAKE_DEMO_CLIP, clipId, { clinicId: user.clinicId, athleteId: null });
            await audit(
              trx,
              { clinicId: user.clinicId, actorId: user.id, action: 'demo.clip_added', detail: { exerciseId, clipId, bytes: file.size } },
              at,
            );
            // Last inside the transaction: if storing fails, no row is committed.
            await store.putFile(demoClipKeys(exerciseId, clipId).original(storedName), file.path);
          });
        } catch (err) {
          if (clipId) await store.removePrefix(demoClipKeys(exerciseId, clipId).prefix);
          throw err;
        }
        return repo.toApi((await repo.find(db, user.clinicId, clipId))!);
      } finally {
        await removeUpload(file.path);
      }
    },

    async update(user, clipId, change) {
      const row = await reachableClip(user, clipId, 'demo:update');
      const patch: Partial<DemoClipRow> = { updated_at: clock().toISOString() };
      if (change.caption !== undefined) patch.caption = change.caption;
      if (change.position !== undefined) patch.position = change.position;
      await repo.update(db, row.id, patch);
      return repo.toApi((await repo.find(db, user.clinicId, clipId))!);
    },

    async remove(user, clipId) {
      const row = await reachableClip(user, clipId, 'demo:delete');
      await processing.cancel('demo_clip', row.id);
      await db.transaction(async (trx) => {
        await repo.remove(trx, row.id);
        await audit(
          trx,
          { clinicId: user.clinicId, actorId: user.id, action: 'demo.clip_removed', detail: { clipId } },
          clock().toISOString(),
        );
      });
      await store.removePrefix(demoClipKeys(row.exercise_id, row.id).prefix);
    },

    async mediaKey(user, clipId, what) {
      const row = await reachableClip(user, clipId, 'demo:read');
      if (row.status !== 'ready') throw new NotFoundError('Clip');
      const keys = demoClipKeys(row.exercise_id, row.id);
      return what === 'video' ? keys.video(row.version) : keys.poster(row.version);
    },
  };
}
