import type { Logger } from 'pino';
import type { Config } from '../config';
import type { Db } from '../db/knex';
import { AppError, ConflictError, UnauthorizedError } from '../errors';
import type { Mailer } from '../mail/mailer';
import { audit } from '../audit/audit-log';
import { revokeUserSessions, type UserRevocations } from '../http/sessions';
import { hashPassword, verifyPassword } from './passwords';
import { usersRepository } from './users-repository';

export interface PasswordChangeDeps {
  db: Db;
  mailer: Mailer;
  config: Config;
  clock: () => Date;
  logger: Logger;
  revocations: UserRevocations;
}

/** The 422 for a current password that is not the account's (counted by the sign-in guard). */
export class WrongCurrentPasswordError extends AppError {
  constructor() {
    const message = 'That is not your current password.';
    super(422, 'wrong_password', message, [{ path: ['currentPassword'], message }]);
  }
}

/** A signed-in person changes their own password, knowing the current one. */
export interface PasswordChangeService {
  /**
   * Checks `currentPassword` (422 `wrong_password`), refuses a new password equal to it (422
   * `same_password`), then stores (409 `password_changed` when another change came first) the new hash, ends every session of the account (the caller
   * signs this browser in again), voids unused reset links, audits `user.password_changed` and
   * e-mails the account a notice. Answers the account's e-mail.
   */
  change(userId: number, currentPassword: string, newPassword: string): Promise<string>;
}

export function passwordChangeService({ db, mailer, config, clock, logger, revocations }: PasswordChangeDeps): PasswordChangeService {
  return {
    async change(userId, currentPassword, newPassword) {
      const row = await usersRepository.findById(db, userId);
      if (!row || !row.active) throw new UnauthorizedError();
      if (!(await verifyPassword(row.password_hash, currentPassword))) throw new WrongCurrentPasswordError();
      if (newPassword === currentPassword) {
        const message = 'Choose a new password that differs from your current one.';
        throw new AppError(422, 'same_password', message, [{ path: ['newPassword'], message }]);
      }
      const passwordHash = await hashPassword(newPassword);
      const at = clock().toISOString();
      await db.transaction(async (trx) => {
        // Only over the password just checked: of two changes at once, the second finds it changed.
        if (!(await usersRepository.replacePassword(trx, userId, row.password_hash, passwordHash, at)))
          throw new ConflictError('Your password was changed a moment ago. Sign in with the new one.', 'password_changed');
        // Every session of the account ends at once, this one too (the route signs this browser in anew).
        await revokeUserSessions(trx, userId);
        // A reset link asked for earlier must not set another password later.
        await trx('password_resets').where({ user_id: userId }).whereNull('used_at').update({ used_at: at });
        await audit(trx, { clinicId: row.clinic_id, actorId: userId, action: 'user.password_changed' }, at);
      });
      // Open live-status streams of the ended sessions close now.
      revocations.revoke(userId);
      try {
        await mailer.send({
          to: row.email,
          subject: 'Your Trailframe password was changed',
          text: [
            `Hello ${row.name},`,
            '',
            'The password of your Trailframe account was just changed, and every other device was signed out.',
            '',
            `If it was not you, choose a new password now: ${config.publicUrl}/forgot-password`,
          ].join('\n'),
        });
      } catch (err) {
        // The password is changed either way; the notice is a courtesy.
        logger.error({ err: (err as Error).message, userId }, 'password change notice failed');
      }
      return row.email;
    },
  };
}
