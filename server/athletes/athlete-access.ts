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
  if (!row || (!isStaff(user) && row.user_id !== user.id)) throw new NotFoundError('Athlete');
  return row;
}
