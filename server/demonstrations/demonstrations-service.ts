import type { Readable } from 'node:stream';
import type { Knex } from 'knex';
import type { SessionUser } from '../../src/contracts/api';
import { DEMO_LIMITS, type DemoPicture, type DemoPictureUpdate, type ExerciseDemonstrations } from '../../src/contracts/demonstrations';
import { audit } from '../audit/audit-log';
import { ConflictError } from '../errors';
import type { Action } from '../policy/access-table';
import type { PictureProcessor } from '../pictures/picture-pool';
import type { MediaStore } from '../storage/media-store';
import { demoPictureKey } from '../storage/media-keys';
import { reachableExercise, reachableItem } from './demo-access';
import type { DemoClipsService } from './demo-clips-service';
import { demoPicturesRepository as repo, type DemoPictureRow } from './demo-pictures-repository';

/** Demonstration pictures of the clinic's exercises (and, in the list, the clip): staff add, caption, order and remove them; athletes see those of their plans. */
export interface DemonstrationsService {
  list(user: SessionUser, exerciseId: number): Promise<ExerciseDemonstrations>;
  /** Before a picture is received: 404 for an exercise out of reach, 409 when it has its pictures already. */
  beforeAdd(user: SessionUser, exerciseId: number): Promise<void>;
  /** Processes and stores a picture (at most {@link DEMO_LIMITS.pictures} per exercise); nothing stays when anything fails. */
  addPicture(user: SessionUser, exerciseId: number, bytes: Buffer, caption: string): Promise<DemoPicture>;
  update(user: SessionUser, pictureId: number, change: DemoPictureUpdate): Promise<DemoPicture>;
  remove(user: SessionUser, pictureId: number): Promise<void>;
  /** The stored JPEG of a picture or its thumbnail. */
  image(user: SessionUser, pictureId: number, size: 'full' | 'thumb'): Promise<Readable>;
}

export interface DemonstrationsDeps {
  db: Knex;
  store: MediaStore;
  pictures: PictureProcessor;
  /** The exercise's demonstration clip (listed with the pictures). */
  clips: DemoClipsService;
  clock: () => Date;
}

export function demonstrationsService({ db, store, pictures, clips, clock }: DemonstrationsDeps): DemonstrationsService {
  const reachablePicture = async (user: SessionUser, pictureId: number, action: Action) =>
    reachableItem(db, user, await repo.find(db, user.clinicId, pictureId), action, 'Picture');

  /** Puts the exercise's pictures in order 0…n−1, `moved` (when given) at `to`. */
  async function renumber(trx: Knex, clinicId: number, exerciseId: number, moved?: { id: number; to: number }): Promise<void> {
    const rows = (await repo.ofExercise(trx, clinicId, exerciseId)).filter((r) => r.id !== moved?.id);
    if (moved) rows.splice(Math.min(moved.to, rows.length), 0, { id: moved.id } as DemoPictureRow);
    for (const [i, r] of rows.entries()) await repo.setPosition(trx, r.id, i);
  }

  const full = () => new ConflictError(`An exercise has at most ${DEMO_LIMITS.pictures} pictures. Remove one first.`, 'demo_pictures_full');

  return {
    async list(user, exerciseId) {
      await reachableExercise(db, user, exerciseId, 'demo:list');
      const rows = await repo.ofExercise(db, user.clinicId, exerciseId);
      return { exerciseId, pictures: rows.map(repo.toApi), clip: await clips.ofExercise(user, exerciseId) };
    },

    async beforeAdd(user, exerciseId) {
      await reachableExercise(db, user, exerciseId, 'demo:create');
      if ((await repo.ofExercise(db, user.clinicId, exerciseId)).length >= DEMO_LIMITS.pictures) throw full();
    },

    async addPicture(user, exerciseId, bytes, caption) {
      await this.beforeAdd(user, exerciseId);
      const processed = await pictures.picture(bytes);
      const at = clock().toISOString();
      const written: string[] = [];
      try {
        const id = await db.transaction(async (trx) => {
          const count = (await repo.ofExercise(trx, user.clinicId, exerciseId)).length;
          if (count >= DEMO_LIMITS.pictures) throw full();
          const newId = await repo.insert(trx, {
            clinic_id: user.clinicId,
            exercise_id: exerciseId,
            position: count,
            caption,
            width: processed.full.width,
            height: processed.full.height,
            thumb_width: processed.thumb.width,
            thumb_height: processed.thumb.height,
            created_by: user.id,
            created_at: at,
          });
          for (const [size, image] of [
            ['full', processed.full],
            ['thumb', processed.thumb],
          ] as const) {
            const key = demoPictureKey(exerciseId, newId, size);
            written.push(key);
            await store.put(key, image.bytes);
          }
          await audit(
            trx,
            { clinicId: user.clinicId, actorId: user.id, action: 'demo.picture_added', detail: { exerciseId, pictureId: newId } },
            at,
          );
          return newId;
        });
        return repo.toApi((await repo.find(db, user.clinicId, id))!);
      } catch (err) {
        await Promise.all(written.map((key) => store.remove(key)));
        throw err;
      }
    },

    async update(user, pictureId, change) {
      const row = await reachablePicture(user, pictureId, 'demo:update');
      await db.transaction(async (trx) => {
        if (change.caption !== undefined) await repo.setCaption(trx, row.id, change.caption);
        if (change.position !== undefined) await renumber(trx, user.clinicId, row.exercise_id, { id: row.id, to: change.position });
      });
      return repo.toApi((await repo.find(db, user.clinicId, pictureId))!);
    },

    async remove(user, pictureId) {
      const row = await reachablePicture(user, pictureId, 'demo:delete');
      await db.transaction(async (trx) => {
        await repo.remove(trx, row.id);
        await renumber(trx, user.clinicId, row.exercise_id);
        await audit(
          trx,
          { clinicId: user.clinicId, actorId: user.id, action: 'demo.picture_removed', detail: { pictureId } },
          clock().toISOString(),
        );
      });
      await store.remove(demoPictureKey(row.exercise_id, row.id, 'full'));
      await store.remove(demoPictureKey(row.exercise_id, row.id, 'thumb'));
    },

    async image(user, pictureId, size) {
      const row = await reachablePicture(user, pictureId, 'demo:read');
      return store.get(demoPictureKey(row.exercise_id, row.id, size));
    },
  };
}
