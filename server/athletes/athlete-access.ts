import type { Knex } from 'knex';
import type { SessionUser } from '../../src/contracts/api';
import type { AthleteRow } from '../db/rows';
import { NotFoundError } from '../errors';
import { isStaff } from '../http/access';

/**
 * The athlete record this user may see: staff see their clinic's athletes, an athlete only their
 * own. Anything else is "not found" (404), so ids of other clinics and athletes do not leak.
 */
export async function accessibleAthlete(db: Knex, user: SessionUser, athleteId: number): Promise<AthleteRow> {
  const row = await db<AthleteRow>('athletes').where({ id: athleteId, clinic_id: user.clinicId }).first();
  if (!row || !mayAccessAthlete(user, row.user_id)) throw new NotFoundError('Athlete');
  return row;
}

/** Whether this user may see an athlete of their clinic whose account is `athleteUserId` (staff: all; an athlete: self). */
export function mayAccessAthlete(user: SessionUser, athleteUserId: number | null): boolean {
  return isStaff(user) || athleteUserId === user.id;
}
