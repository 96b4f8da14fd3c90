/**
 * Loads who owns a resource of one athlete (the clinic and the athlete's account) and checks it
 * against the policy: the one place services reach an athlete's records through.
 */
import type { Knex } from 'knex';
import type { SessionUser } from '../../src/contracts/api';
import type { AthleteRow } from '../db/rows';
import { NotFoundError } from '../errors';
import type { Action, Grant } from './access-table';
import type { Owner, ResourceState } from './decide';
import { assertAllowed, assertRole, assertScope } from './enforce';

/** The athlete record this user may reach for `action`; another clinic's or athlete's, or an erased one, is 404. */
export async function accessibleAthlete(db: Knex, user: SessionUser, athleteId: number, action: Action): Promise<AthleteRow> {
  assertRole(user, action);
  const row = await db<AthleteRow>('athletes').where({ id: athleteId, clinic_id: user.clinicId }).whereNull('erased_at').first();
  if (!row) throw new NotFoundError('Athlete');
  assertScope(user, action, { clinicId: row.clinic_id, athleteUserId: row.user_id }, 'Athlete');
  return row;
}

/** The owner of an athlete's resource as the policy reads it, or null when the athlete is not of this clinic. */
export async function athleteOwner(db: Knex, clinicId: number, athleteId: number): Promise<Owner | null> {
  const row = await db<AthleteRow>('athletes')
    .where({ id: athleteId, clinic_id: clinicId })
    .whereNull('erased_at')
    .first('clinic_id', 'user_id');
  return row ? { clinicId: row.clinic_id, athleteUserId: row.user_id } : null;
}

/**
 * Checks one resource of an athlete (a row with `clinic_id` and `athlete_id`) for `action`: role,
 * scope and, when `state` is given, the grant's conditions. 404 names `what` ("Clip not found.").
 */
export async function assertAthleteResource(
  db: Knex,
  user: SessionUser,
  action: Action,
  row: { clinic_id: number; athlete_id: number },
  what: string,
  state?: ResourceState,
): Promise<Grant> {
  assertRole(user, action);
  const owner = await athleteOwner(db, user.clinicId, row.athlete_id);
  if (!owner || row.clinic_id !== user.clinicId) throw new NotFoundError(what);
  return state ? assertAllowed(user, action, { ...owner, ...state }, what) : assertScope(user, action, owner, what);
}
