import { Passport } from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Db } from '../db/knex';
import { usersRepository } from './users-repository';
import { verifyPassword } from './passwords';

/** The `info.message` of a right password for a deactivated account. */
export const DEACTIVATED = 'account_deactivated';

/**
 * A passport instance of this app (not the module singleton, so several apps can live in one
 * process, as in tests): e-mail + password sign-in, user id in the session.
 */
export function createPassport(db: Db): InstanceType<typeof Passport> {
  const passport = new Passport();
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      (async () => {
        const row = await usersRepository.findByEmail(db, email);
        const ok = await verifyPassword(row?.password_hash ?? null, password);
        if (!row || !ok) return done(null, false);
        // Only someone who knows the password learns that the account was deactivated.
        if (!row.active) return done(null, false, { message: DEACTIVATED });
        const user = await usersRepository.sessionUser(db, row.id);
        return done(null, user ?? false);
      })().catch(done);
    }),
  );
  passport.serializeUser((user, done) => done(null, (user as Express.User).id));
  const sessionUser = usersRepository.sessionUserReader(db);
  passport.deserializeUser((id: number, done) => {
    sessionUser(id)
      // A deactivated or deleted user's session simply stops being signed in.
      .then((user) => done(null, user ?? false))
      .catch(done);
  });
  return passport;
}
