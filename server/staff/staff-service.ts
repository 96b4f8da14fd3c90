import type { SessionUser, StaffMember } from '../../src/contracts/api';
import type { Db } from '../db/knex';
import { lockedForUpdate } from '../db/dialect';
import type { UserRow } from '../db/rows';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { audit } from '../audit/audit-log';
import { usersRepository } from '../auth/users-repository';
import { revokeUserSessions, type UserRevocations } from '../http/sessions';

export interface StaffServiceDeps {
  db: Db;
  clock: () => Date;
  revocations: UserRevocations;
}

/** The clinic's team as the owner manages it: departed coaches are deactivated, and may come back. */
export interface StaffService {
  /**
   * Deactivates a coach of the owner's clinic: signs them out everywhere at once, refuses their
   * sign-in from then on, and moves their athletes to `reassignTo` (an active owner or coach of
   * the clinic; default: the owner acting). 404 for anyone not on the clinic's staff; 409 for the
   * owner themselves, another owner, or a coach already deactivated; 422 for a bad `reassignTo`.
   */
  deactivate(user: SessionUser, id: number, reassignTo: number | undefined): Promise<StaffMember>;
  /** Lets a deactivated coach sign in again; the athletes moved away stay where they went. */
  reactivate(user: SessionUser, id: number): Promise<StaffMember>;
}

export function staffService({ db, clock, revocations }: StaffServiceDeps): StaffService {
  async function staffMember(trx: Db, clinicId: number, id: number): Promise<UserRow> {
    const row = await trx<UserRow>('users').where({ id, clinic_id: clinicId }).whereIn('role', ['owner', 'coach']).first();
    if (!row) throw new NotFoundError('Staff member');
    return row;
  }

  /**
   * Holds the rows of the people a change is about, in id order, until the transaction ends
   * (PostgreSQL; SQLite has one writer): a second deactivation sent at once waits and then finds it
   * done, and a coach being deactivated cannot receive another's athletes meanwhile.
   */
  async function holdUsers(trx: Db, clinicId: number, ids: number[]): Promise<void> {
    await lockedForUpdate(trx, trx('users').where({ clinic_id: clinicId }).whereIn('id', ids).orderBy('id').select('id'));
  }

  async function member(clinicId: number, id: number): Promise<StaffMember> {
    const [m] = await usersRepository.listStaff(db, clinicId, id);
    if (!m) throw new NotFoundError('Staff member');
    return m;
  }

  return {
    async deactivate(user, id, reassignTo) {
      const at = clock().toISOString();
      const to = reassignTo ?? user.id;
      await db.transaction(async (trx) => {
        await holdUsers(trx, user.clinicId, [id, to]);
        const target = await staffMember(trx, user.clinicId, id);
        if (target.id === user.id) throw new ConflictError('You cannot deactivate your own account.', 'cannot_deactivate_self');
        if (target.role === 'owner') throw new ConflictError("An owner's account cannot be deactivated here.", 'cannot_deactivate_owner');
        if (!target.active) throw new ConflictError(`${target.name} is already deactivated.`, 'already_deactivated');
        const heir =
          to === target.id
            ? undefined
            : await trx<UserRow>('users')
                .where({ id: to, clinic_id: user.clinicId, active: true })
                .whereIn('role', ['owner', 'coach'])
                .first();
        if (!heir) {
          throw new ValidationError('reassignTo: choose an active coach of this clinic (not the one leaving), or yourself.', [
            { path: ['reassignTo'], message: 'Choose an active coach of this clinic, or yourself.' },
          ]);
        }
        const athleteIds = (await trx('athletes').where({ clinic_id: user.clinicId, coach_id: target.id }).orderBy('id').select('id')).map(
          (a: { id: number }) => a.id,
        );
        await trx('athletes').whereIn('id', athleteIds).update({ coach_id: heir.id, updated_at: at });
        await trx('users').where({ id: target.id }).update({ active: false, deactivated_at: at, updated_at: at });
        const sessions = await revokeUserSessions(trx, target.id);
        await audit(
          trx,
          {
            clinicId: user.clinicId,
            actorId: user.id,
            action: 'staff.deactivated',
            detail: { userId: target.id, reassignedTo: heir.id, athleteIds, sessionsRevoked: sessions },
          },
          at,
        );
      });
      revocations.revoke(id);
      return member(user.clinicId, id);
    },

    async reactivate(user, id) {
      const at = clock().toISOString();
      await db.transaction(async (trx) => {
        await holdUsers(trx, user.clinicId, [id]);
        const target = await staffMember(trx, user.clinicId, id);
        if (target.active) throw new ConflictError(`${target.name} is active already.`, 'already_active');
        await trx('users').where({ id: target.id }).update({ active: true, deactivated_at: null, updated_at: at });
        await audit(trx, { clinicId: user.clinicId, actorId: user.id, action: 'staff.reactivated', detail: { userId: target.id } }, at);
      });
      return member(user.clinicId, id);
    },
  };
}
