import type { Config } from '../config';
import type { Db } from '../db/knex';
import type { PasswordResetRow } from '../db/rows';
import { GoneError, NotFoundError } from '../errors';
import type { Mailer } from '../mail/mailer';
import type { Logger } from 'pino';
import { audit } from '../audit/audit-log';
import { hashPassword } from './passwords';
import { hashToken, newToken } from './tokens';
import { usersRepository } from './users-repository';
import { revokeUserSessions, type UserRevocations } from '../http/sessions';

export interface PasswordResetsDeps {
  db: Db;
  mailer: Mailer;
  config: Config;
  clock: () => Date;
  logger: Logger;
  /** Ends the account's open live-status streams with its sessions. */
  revocations: UserRevocations;
  /** Told after a password was set through a reset link (ends any sign-in wait of the account). */
  onPasswordSet?: (email: string) => void;
}

/** "Forgot password": a single-use, short-lived e-mailed link to choose a new password. */
export function passwordResetsService({ db, mailer, config, clock, logger, revocations, onPasswordSet }: PasswordResetsDeps) {
  async function usableReset(token: string): Promise<PasswordResetRow> {
    const row = await db<PasswordResetRow>('password_resets')
      .where({ token_hash: hashToken(token) })
      .first();
    if (!row) throw new NotFoundError('Reset link');
    if (row.used_at) throw new GoneError('This reset link has already been used. Ask for a new one.', 'token_used');
    if (row.expires_at <= clock().toISOString()) {
      throw new GoneError('This reset link has expired. Ask for a new one.', 'token_expired');
    }
    return row;
  }

  return {
    /**
     * Sends a reset link when an active account has this e-mail. Answers the same either way,
     * so the form cannot be used to learn who has an account.
     */
    async request(email: string): Promise<void> {
      const user = await usersRepository.findByEmail(db, email);
      if (!user || !user.active || !user.password_hash) return;
      const now = clock();
      const { token, hash } = newToken();
      await db.transaction(async (trx) => {
        await trx('password_resets').where({ user_id: user.id }).whereNull('used_at').update({ used_at: now.toISOString() });
        await trx('password_resets').insert({
          user_id: user.id,
          token_hash: hash,
          expires_at: new Date(now.getTime() + config.resetTtlMinutes * 60_000).toISOString(),
          created_at: now.toISOString(),
        });
      });
      try {
        await mailer.send({
          to: user.email,
          subject: 'Reset your Trailframe password',
          text: [
            `Hello ${user.name},`,
            '',
            `Someone asked to reset the password of your Trailframe account. Open this link within ${config.resetTtlMinutes} minutes to choose a new one (it works once):`,
            '',
            `${config.publicUrl}/reset-password/${token}`,
            '',
            'If it was not you, ignore this message: your password stays as it is.',
          ].join('\n'),
        });
      } catch (err) {
        // The answer must not differ for unknown e-mails, so a mail failure is logged, not shown.
        logger.error({ err: (err as Error).message, userId: user.id }, 'password reset e-mail failed');
      }
    },

    async preview(token: string): Promise<{ email: string }> {
      const row = await usableReset(token);
      const user = await usersRepository.findById(db, row.user_id);
      if (!user) throw new NotFoundError('Reset link');
      return { email: user.email };
    },

    async complete(token: string, password: string): Promise<void> {
      const { user_id: userId } = await usableReset(token);
      const passwordHash = await hashPassword(password);
      const email = await db.transaction(async (trx) => {
        const row = await trx<PasswordResetRow>('password_resets')
          .where({ token_hash: hashToken(token) })
          .first();
        if (!row || row.used_at) throw new GoneError('This reset link has already been used.', 'token_used');
        const at = clock().toISOString();
        // Claimed only while still unused: on PostgreSQL a second use of the link at the same moment
        // waits for this one and then finds it used.
        const claimed = await trx('password_resets').where({ id: row.id }).whereNull('used_at').update({ used_at: at });
        if (!claimed) throw new GoneError('This reset link has already been used.', 'token_used');
        await usersRepository.setPassword(trx, row.user_id, passwordHash, at);
        const user = await usersRepository.findById(trx, row.user_id);
        // Sign out every existing session of this user.
        await revokeUserSessions(trx, row.user_id);
        if (user) await audit(trx, { clinicId: user.clinic_id, actorId: user.id, action: 'user.password_reset' }, at);
        return user?.email ?? null;
      });
      revocations.revoke(userId);
      if (email) onPasswordSet?.(email);
    },
  };
}

export type PasswordResetsService = ReturnType<typeof passwordResetsService>;
