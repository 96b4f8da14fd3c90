import type { Knex } from 'knex';
import type { SessionUser } from '../../src/contracts/api';
import { NotFoundError } from '../errors';
import type { Action } from '../policy/access-table';
import { assertRole, assertScope } from '../policy/enforce';
import { demoPicturesRepository } from './demo-pictures-repository';

/**
 * The exercise as this user may reach it for `action`: another clinic's is 404; an athlete
 * reaches it (scope `self`) only when it is on one of their own plans that is not a draft.
 */
export async function reachableExercise(db: Knex, user: SessionUser, exerciseId: number, action: Action): Promise<number> {
  const grant = assertRole(user, action);
  const exercise = await db('exercises').where({ id: exerciseId, clinic_id: user.clinicId }).first('id');
  if (!exercise) throw new NotFoundError('Exercise');
  const own = grant.scope === 'self' && (await demoPicturesRepository.inPlanOfAthleteUser(db, user.clinicId, exerciseId, user.id));
  assertScope(user, action, { clinicId: user.clinicId, athleteUserId: own ? user.id : null }, 'Exercise');
  return exerciseId;
}

/** A demonstration item (picture, clip) of an exercise in reach for `action`, or 404 as `what`. */
export async function reachableItem<T extends { exercise_id: number }>(
  db: Knex,
  user: SessionUser,
  row: T | undefined,
  action: Action,
  what: string,
): Promise<T> {
  assertRole(user, action);
  if (!row) throw new NotFoundError(what);
  try {
    await reachableExercise(db, user, row.exercise_id, action);
  } catch (err) {
    if (err instanceof NotFoundError) throw new NotFoundError(what);
    throw err;
  }
  return row;
}
