import type { InvitationPreview, PendingInvitation, Role } from '../../src/contracts/api';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { lockedForUpdate } from '../db/dialect';
import type { InvitationRow } from '../db/rows';
import { ConflictError, GoneError, NotFoundError, AppError } from '../errors';
import type { Mailer, MailMessage } from '../mail/mailer';
import { audit } from '../audit/audit-log';
import { hashPassword } from './passwords';
import { hashToken, newToken } from './tokens';
import { usersRepository } from './users-repository';

export interface InviteInput {
  clinicId: number;
  email: string;
  name: string;
  role: Role;
  athleteId: number | null;
  invitedBy: number;
}

/**
 * The same invitation (address, name, role, athlete) asked for again within this time answers the
 * one just made and sends no second e-mail: a double click or a retry, not a Resend.
 */
export const REPEATED_INVITATION_MS = 10_000;

export interface InvitationsDeps {
  db: Db;
  mailer: Mailer;
  config: Config;
  clock: () => Date;
}

/** Invitations: a single-use, expiring e-mailed link that lets a new user set a password. */
export function invitationsService({ db, mailer, config, clock }: InvitationsDeps) {
  async function usableInvitation(token: string): Promise<InvitationRow> {
    const row = await db<InvitationRow>('invitations')
      .where({ token_hash: hashToken(token) })
      .first();
    if (!row) throw new NotFoundError('Invitation');
    if (row.used_at) throw new GoneError('This invitation has already been used. Sign in instead, or ask for a new one.', 'token_used');
    if (row.revoked_at || row.expires_at <= clock().toISOString()) {
      throw new GoneError('This invitation has expired. Ask your clinic to send a new one.', 'token_expired');
    }
    return row;
  }

  return {
    /**
     * Creates an invitation (replacing any pending one for the same e-mail) and e-mails the link.
     * An address with an account in ANOTHER clinic is answered exactly as a new one (so no owner
     * learns that it is registered somewhere); its owner gets a notice instead of a link, and the
     * invitation's token is never sent anywhere, so it can only expire or be revoked. The same
     * invitation asked for again within {@link REPEATED_INVITATION_MS} (a double click, a retry)
     * answers the pending one and sends nothing.
     */
    async invite(input: InviteInput): Promise<PendingInvitation> {
      const now = clock();
      const { token, hash } = newToken();
      const expiresAt = new Date(now.getTime() + config.invitationTtlHours * 3_600_000).toISOString();
      let elsewhere = false;
      let repeated: InvitationRow | undefined;
      const id = await db.transaction(async (trx) => {
        // One invitation of a clinic at a time (PostgreSQL; SQLite has one writer): the next one sees
        // the pending invitation this one made.
        await lockedForUpdate(trx, trx('clinics').where({ id: input.clinicId }).select('id'));
        const existing = await usersRepository.findByEmail(trx, input.email);
        if (existing && existing.clinic_id === input.clinicId) {
          throw new ConflictError('Someone in your clinic already has an account with this e-mail address.', 'email_in_use');
        }
        elsewhere = Boolean(existing);
        repeated = await trx<InvitationRow>('invitations')
          .where({ clinic_id: input.clinicId, email: input.email, name: input.name, role: input.role, athlete_id: input.athleteId })
          .whereNull('used_at')
          .whereNull('revoked_at')
          .where('created_at', '>', new Date(now.getTime() - REPEATED_INVITATION_MS).toISOString())
          .first();
        if (repeated) return repeated.id;
        await trx('invitations')
          .where({ clinic_id: input.clinicId, email: input.email })
          .whereNull('used_at')
          .whereNull('revoked_at')
          .update({ revoked_at: now.toISOString() });
        const [row] = await trx('invitations')
          .insert({
            clinic_id: input.clinicId,
            email: input.email,
            name: input.name,
            role: input.role,
            athlete_id: input.athleteId,
            token_hash: hash,
            invited_by: input.invitedBy,
            expires_at: expiresAt,
            created_at: now.toISOString(),
          })
          .returning('id');
        const newId = (row as { id: number }).id;
        await audit(trx, {
          clinicId: input.clinicId,
          actorId: input.invitedBy,
          athleteId: input.athleteId,
          action: `invitation.sent`,
          detail: { role: input.role, invitationId: newId },
        });
        return newId;
      });
      if (repeated) return pendingInvitation(repeated);
      const clinic = await db('clinics').where({ id: input.clinicId }).first<{ name: string }>('name');
      try {
        await mailer.send(
          elsewhere
            ? alreadyRegisteredNotice(input, clinic?.name ?? 'A clinic')
            : {
                to: input.email,
                subject: `You're invited to ${clinic?.name ?? 'your clinic'} on Trailframe`,
                text: [
                  `Hello ${input.name},`,
                  '',
                  `${clinic?.name ?? 'Your clinic'} has invited you to Trailframe as ${input.role === 'athlete' ? 'an athlete' : 'a coach'}.`,
                  'Open this link to choose your password (it works once and expires in 7 days):',
                  '',
                  `${config.publicUrl}/invitation/${token}`,
                  '',
                  'If you did not expect this, you can ignore this message.',
                ].join('\n'),
              },
        );
      } catch (err) {
        await db('invitations').where({ id }).delete();
        throw new AppError(
          502,
          'mail_failed',
          `The invitation e-mail could not be sent (${(err as Error).message}). Nothing was saved; try again.`,
        );
      }
      return {
        id,
        email: input.email,
        name: input.name,
        role: input.role,
        athleteId: input.athleteId,
        expiresAt,
        createdAt: now.toISOString(),
      };
    },

    async preview(token: string): Promise<InvitationPreview> {
      const row = await usableInvitation(token);
      const clinic = await db('clinics').where({ id: row.clinic_id }).first<{ name: string }>('name');
      return { email: row.email, name: row.name, role: row.role, clinicName: clinic?.name ?? '' };
    },

    /** Uses the invitation: creates the account (linking an athlete record) and returns the user id. */
    async accept(token: string, name: string, password: string): Promise<number> {
      await usableInvitation(token);
      const passwordHash = await hashPassword(password);
      return db.transaction(async (trx) => {
        // Re-read inside the transaction so two accepts of one link cannot both succeed.
        const row = await trx<InvitationRow>('invitations')
          .where({ token_hash: hashToken(token) })
          .first();
        if (!row || row.used_at) throw new GoneError('This invitation has already been used.', 'token_used');
        const at = clock().toISOString();
        // Claimed only while still unused, and before the e-mail is checked: on PostgreSQL a second
        // accept at the same moment waits here for this one and then finds the invitation used (410),
        // rather than finding the account this one made (it answered 409 email_in_use).
        const claimed = await trx('invitations').where({ id: row.id }).whereNull('used_at').update({ used_at: at });
        if (!claimed) throw new GoneError('This invitation has already been used.', 'token_used');
        if (await usersRepository.findByEmail(trx, row.email)) {
          throw new ConflictError('Someone already has an account with this e-mail address.', 'email_in_use');
        }
        const userId = await usersRepository.insert(trx, {
          clinic_id: row.clinic_id,
          email: row.email,
          name,
          role: row.role,
          password_hash: passwordHash,
          active: true,
          last_sign_in_at: null,
          created_at: at,
          updated_at: at,
        });
        if (row.athlete_id) {
          const linked = await trx('athletes')
            .where({ id: row.athlete_id, clinic_id: row.clinic_id })
            .whereNull('user_id')
            .update({ user_id: userId, updated_at: at });
          if (!linked) throw new ConflictError('This athlete already has an account.', 'athlete_has_account');
        }
        await audit(trx, { clinicId: row.clinic_id, actorId: userId, athleteId: row.athlete_id, action: 'invitation.accepted' }, at);
        return userId;
      });
    },

    async listPending(clinicId: number): Promise<PendingInvitation[]> {
      const rows = await db<InvitationRow>('invitations')
        .where({ clinic_id: clinicId })
        .whereNull('used_at')
        .whereNull('revoked_at')
        .where('expires_at', '>', clock().toISOString())
        .orderBy('created_at', 'desc');
      return rows.map(pendingInvitation);
    },

    async revoke(clinicId: number, id: number, actorId: number): Promise<void> {
      const n = await db('invitations')
        .where({ id, clinic_id: clinicId })
        .whereNull('used_at')
        .whereNull('revoked_at')
        .update({ revoked_at: clock().toISOString() });
      if (!n) throw new NotFoundError('Invitation');
      await audit(db, { clinicId, actorId, action: 'invitation.revoked', detail: { invitationId: id } });
    },
  };
}

function pendingInvitation(r: InvitationRow): PendingInvitation {
  return {
    id: r.id,
    email: r.email,
    name: r.name,
    role: r.role,
    athleteId: r.athlete_id,
    expiresAt: r.expires_at,
    createdAt: r.created_at,
  };
}

/**
 * The e-mail to someone whose address already has an account (in another clinic) instead of an
 * invitation: it says what happened and carries no link or token.
 */
function alreadyRegisteredNotice(input: InviteInput, clinicName: string): MailMessage {
  return {
    to: input.email,
    subject: `${clinicName} tried to invite you to Trailframe`,
    text: [
      `Hello ${input.name},`,
      '',
      `${clinicName} tried to invite you to Trailframe as ${input.role === 'athlete' ? 'an athlete' : 'a coach'}.`,
      'This e-mail address already has a Trailframe account, and one address can belong to only one account,',
      'so nothing was created and your account was not changed.',
      '',
      `If you want to join ${clinicName} too, ask them to invite another e-mail address of yours.`,
      'If you did not expect this, you can ignore this message.',
    ].join('\n'),
  };
}

export type InvitationsService = ReturnType<typeof invitationsService>;
