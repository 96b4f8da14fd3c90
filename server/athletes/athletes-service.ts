import type { AthleteDetail, AthleteSummary, PendingInvitation, SessionUser } from '../../src/contracts/api';
import { toKilometres } from '../../src/contracts/intake';
import type { Db } from '../db/knex';
import { lockedForUpdate } from '../db/dialect';
import { createOnce } from '../db/create-once';
import type { AthleteRow } from '../db/rows';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { unpublishAll } from '../sharing/consent-withdrawal';
import { sendVideoConsentWithdrawnNotice, type VideoConsentNoticeDeps } from '../mail/video-consent-notice';
import { audit } from '../audit/audit-log';
import type { InvitationsService } from '../auth/invitations-service';
import type { Action } from '../policy/access-table';
import { accessibleAthlete } from '../policy/athlete-resources';
import { assertState, may } from '../policy/enforce';
import { athletesRepository as repo } from './athletes-repository';
import { type AthleteCreateInput, type AthleteUpdateInput, type IntakeInput } from './athletes-schemas';

export interface AthletesDeps {
  db: Db;
  clock: () => Date;
  invitations: InvitationsService;
  /** How owners are told that an athlete withdrew consent to video (mailer, logger, the app's public address). */
  notices: Omit<VideoConsentNoticeDeps, 'db'>;
}

/** Athlete roster, profile and intake, scoped to the signed-in user's clinic (and self for athletes). */
export function athletesService({ db, clock, invitations, notices }: AthletesDeps) {
  const now = () => clock().toISOString();
  const roster = repo.rosterReader(db);

  const accessible = (user: SessionUser, id: number, action: Action): Promise<AthleteRow> => accessibleAthlete(db, user, id, action);

  async function detailFor(user: SessionUser, id: number): Promise<AthleteDetail> {
    const detail = await repo.detail(db, user.clinicId, id, now(), may(user, 'athlete:read-notes'));
    if (!detail) throw new NotFoundError('Athlete');
    return detail;
  }

  /**
   * Inside the transaction that writes the athlete: the coach's row is held (PostgreSQL; SQLite has
   * one writer) while it is checked to be an active coach of the clinic. A deactivation holds the
   * same row (staff-service `holdUsers`), so one sent at the same moment either comes first and this
   * check refuses the coach, or waits and then finds this athlete among the coach's to reassign.
   * Checked outside, the athlete could be given to a coach whose deactivation had just read their
   * athletes (the row lock no longer holds back the insert's foreign-key check).
   */
  async function checkCoach(trx: Db, clinicId: number, coachId: number | null | undefined): Promise<void> {
    if (coachId === null || coachId === undefined) return;
    await lockedForUpdate(trx, trx('users').where({ id: coachId, clinic_id: clinicId }).select('id'));
    const coach = await trx('users').where({ id: coachId, clinic_id: clinicId, active: true }).whereIn('role', ['owner', 'coach']).first();
    if (!coach)
      throw new ValidationError('Coach: choose a coach of this clinic.', [
        { path: ['coachId'], message: 'Choose a coach of this clinic.' },
      ]);
  }

  /**
   * Inside the transaction that writes the address: the clinic's row is held first (PostgreSQL;
   * SQLite has one writer), so two athletes sent at the same moment with one address cannot both pass.
   */
  async function checkEmailFree(trx: Db, clinicId: number, email: string | null | undefined, exceptId?: number): Promise<void> {
    if (!email) return;
    await lockedForUpdate(trx, trx('clinics').where({ id: clinicId }).select('id'));
    const other = await repo.findByEmail(trx, clinicId, email);
    if (other && other.id !== exceptId) {
      throw new ConflictError('Another athlete in this clinic already uses this e-mail address.', 'email_in_use');
    }
  }

  return {
    list(user: SessionUser): Promise<AthleteSummary[]> {
      return roster(user.clinicId, now());
    },

    async get(user: SessionUser, id: number): Promise<AthleteDetail> {
      await accessible(user, id, 'athlete:read');
      return detailFor(user, id);
    },

    async create(user: SessionUser, input: AthleteCreateInput, key?: string): Promise<AthleteDetail> {
      const at = now();
      const id = await createOnce(db, {
        clinicId: user.clinicId,
        kind: 'athlete',
        key,
        request: input,
        at,
        create: async (trx) => {
          await checkEmailFree(trx, user.clinicId, input.email);
          const coachId = input.coachId ?? (user.role === 'coach' ? user.id : null);
          await checkCoach(trx, user.clinicId, coachId);
          const newId = await repo.insert(trx, {
            clinic_id: user.clinicId,
            user_id: null,
            coach_id: coachId,
            first_name: input.firstName,
            last_name: input.lastName,
            email: input.email ?? null,
            date_of_birth: input.dateOfBirth ?? null,
            height_cm: null,
            distance_unit: 'km',
            weekly_km: null,
            longest_run_km: null,
            goal_event: null,
            goal_date: null,
            surfaces: '[]',
            notes: input.notes ?? null,
            created_at: at,
            updated_at: at,
          });
          await audit(trx, { clinicId: user.clinicId, actorId: user.id, athleteId: newId, action: 'athlete.created' }, at);
          return newId;
        },
      });
      return detailFor(user, id);
    },

    async update(user: SessionUser, id: number, input: AthleteUpdateInput): Promise<AthleteDetail> {
      const row = await accessible(user, id, 'athlete:update');
      // An athlete changes only their name (`name-fields-only`); 403 names the other fields.
      assertState(user, 'athlete:update', { fields: Object.keys(input) }, 'Athlete');
      if (input.email !== undefined && row.user_id !== null && input.email !== row.email) {
        throw new ConflictError('This athlete signs in with their e-mail address; it cannot be changed here.', 'email_locked');
      }
      const patch: Partial<AthleteRow> = { updated_at: now() };
      if (input.firstName !== undefined) patch.first_name = input.firstName;
      if (input.lastName !== undefined) patch.last_name = input.lastName;
      if (input.email !== undefined) patch.email = input.email;
      if (input.dateOfBirth !== undefined) patch.date_of_birth = input.dateOfBirth;
      if (input.coachId !== undefined) patch.coach_id = input.coachId;
      if (input.notes !== undefined) patch.notes = input.notes;
      await db.transaction(async (trx) => {
        await checkEmailFree(trx, user.clinicId, input.email, id);
        await checkCoach(trx, user.clinicId, input.coachId);
        await repo.update(trx, user.clinicId, id, patch);
        await audit(trx, {
          clinicId: user.clinicId,
          actorId: user.id,
          athleteId: id,
          action: 'athlete.updated',
          detail: { fields: Object.keys(input) },
        });
      });
      return detailFor(user, id);
    },

    /** Replaces the whole intake (profile figures, injuries, current pain, consents) at once. */
    async putIntake(user: SessionUser, id: number, input: IntakeInput): Promise<AthleteDetail> {
      await accessible(user, id, 'athlete:update-intake');
      const at = now();
      let videoWithdrawn = false;
      await db.transaction(async (trx) => {
        await repo.update(trx, user.clinicId, id, {
          date_of_birth: input.dateOfBirth,
          height_cm: input.heightCm,
          distance_unit: input.distanceUnit,
          weekly_km: input.weeklyDistance === null ? null : toKilometres(input.weeklyDistance, input.distanceUnit),
          longest_run_km: input.longestRecentRun === null ? null : toKilometres(input.longestRecentRun, input.distanceUnit),
          goal_event: input.goalEvent,
          goal_date: input.goalDate,
          surfaces: JSON.stringify(input.surfaces),
          updated_at: at,
        });
        await repo.replaceInjuries(trx, user.clinicId, id, input.injuries);
        await repo.replaceCurrentPain(trx, user.clinicId, id, input.pain, user.id, at);
        const changed: string[] = [];
        if (await repo.recordConsent(trx, user.clinicId, id, 'video_recording', input.consents.videoRecording, user.id, at))
          changed.push('video_recording');
        videoWithdrawn = changed.includes('video_recording') && !input.consents.videoRecording;
        if (await repo.recordConsent(trx, user.clinicId, id, 'share_stills', input.consents.shareStills, user.id, at))
          changed.push('share_stills');
        // Consent to sharing withdrawn: nothing stays shared with the athlete.
        const unpublished = changed.includes('share_stills') && !input.consents.shareStills ? await unpublishAll(trx, id, at) : undefined;
        await audit(
          trx,
          {
            clinicId: user.clinicId,
            actorId: user.id,
            athleteId: id,
            action: 'athlete.intake_updated',
            detail: unpublished === undefined ? { consentsChanged: changed } : { consentsChanged: changed, unpublished },
          },
          at,
        );
      });
      // Consent to video withdrawn: uploads are refused from now on; the owners decide about the clips held.
      if (videoWithdrawn) await sendVideoConsentWithdrawnNotice({ db, ...notices }, id);
      return detailFor(user, id);
    },

    async invite(user: SessionUser, id: number): Promise<PendingInvitation> {
      const row = await accessible(user, id, 'athlete:invite');
      if (row.user_id !== null) throw new ConflictError('This athlete already has an account.', 'athlete_has_account');
      if (!row.email) {
        throw new ValidationError('Add an e-mail address to the athlete before inviting them.', [
          { path: ['email'], message: 'E-mail is required to invite.' },
        ]);
      }
      return invitations.invite({
        clinicId: user.clinicId,
        email: row.email,
        name: `${row.first_name} ${row.last_name}`,
        role: 'athlete',
        athleteId: id,
        invitedBy: user.id,
      });
    },
  };
}

export type AthletesService = ReturnType<typeof athletesService>;
