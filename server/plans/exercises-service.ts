import type { SessionUser } from '../../src/contracts/api';
import type { Exercise } from '../../src/contracts/plans';
import type { Db } from '../db/knex';
import type { Knex } from 'knex';
import { createOnce } from '../db/create-once';
import { ConflictError, NotFoundError } from '../errors';
import { audit } from '../audit/audit-log';
import { doseColumns, exercisesRepository as repo, type ExerciseRow } from './exercises-repository';
import type { ExerciseInput, ExercisePatch, ExerciseQueryInput } from './plans-schemas';

/** The clinic's exercise library (staff only; routes check the role). */
export function exercisesService({ db, clock }: { db: Db; clock: () => Date }) {
  const now = () => clock().toISOString();

  async function accessible(user: SessionUser, id: number): Promise<ExerciseRow> {
    const row = await repo.find(db, user.clinicId, id);
    if (!row) throw new NotFoundError('Exercise');
    return row;
  }

  async function checkNameFree(user: SessionUser, name: string, exceptId?: number, conn: Knex = db): Promise<void> {
    const other = await repo.findByName(conn, user.clinicId, name);
    if (other && other.id !== exceptId)
      throw new ConflictError(`The library already has an exercise called “${other.name}”.`, 'exercise_name_taken');
  }

  return {
    async list(user: SessionUser, query: ExerciseQueryInput): Promise<Exercise[]> {
      return (await repo.search(db, user.clinicId, query)).map(repo.toApi);
    },

    async get(user: SessionUser, id: number): Promise<Exercise> {
      return repo.toApi(await accessible(user, id));
    },

    async create(user: SessionUser, input: ExerciseInput, key?: string): Promise<Exercise> {
      const at = now();
      // With a key, a resend of the exercise it made answers that one (not 409 `exercise_name_taken`).
      const id = await createOnce(db, {
        clinicId: user.clinicId,
        kind: 'exercise',
        key,
        request: input,
        at,
        create: async (trx) => {
          await checkNameFree(user, input.name, undefined, trx);
          const newId = await repo.insert(trx, {
            clinic_id: user.clinicId,
            name: input.name,
            purpose: input.purpose,
            region: input.region,
            kind: input.kind,
            ...doseColumns(input.dose),
            instructions: JSON.stringify(input.instructions),
            cautions: input.cautions,
            source: input.source ?? '',
            archived: false,
            created_by: user.id,
            created_at: at,
            updated_at: at,
          });
          await audit(trx, { clinicId: user.clinicId, actorId: user.id, action: 'exercise.created', detail: { exerciseId: newId } }, at);
          return newId;
        },
      });
      return this.get(user, id);
    },

    async update(user: SessionUser, id: number, patch: ExercisePatch): Promise<Exercise> {
      await accessible(user, id);
      if (patch.name !== undefined) await checkNameFree(user, patch.name, id);
      const at = now();
      const changes: Partial<ExerciseRow> = { updated_at: at };
      if (patch.name !== undefined) changes.name = patch.name;
      if (patch.purpose !== undefined) changes.purpose = patch.purpose;
      if (patch.region !== undefined) changes.region = patch.region;
      if (patch.kind !== undefined) changes.kind = patch.kind;
      if (patch.dose !== undefined) Object.assign(changes, doseColumns(patch.dose));
      if (patch.instructions !== undefined) changes.instructions = JSON.stringify(patch.instructions);
      if (patch.cautions !== undefined) changes.cautions = patch.cautions;
      if (patch.source !== undefined) changes.source = patch.source;
      await db.transaction(async (trx) => {
        await repo.update(trx, user.clinicId, id, changes);
        await audit(
          trx,
          { clinicId: user.clinicId, actorId: user.id, action: 'exercise.updated', detail: { exerciseId: id, fields: Object.keys(patch) } },
          at,
        );
      });
      return this.get(user, id);
    },

    /** Takes an exercise out of the library; plans that use it keep it. */
    async archive(user: SessionUser, id: number): Promise<void> {
      await accessible(user, id);
      const at = now();
      await db.transaction(async (trx) => {
        await repo.update(trx, user.clinicId, id, { archived: true, updated_at: at });
        await audit(trx, { clinicId: user.clinicId, actorId: user.id, action: 'exercise.archived', detail: { exerciseId: id } }, at);
      });
    },
  };
}

export type ExercisesService = ReturnType<typeof exercisesService>;
