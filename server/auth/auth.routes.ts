import { Router, type RequestHandler } from 'express';
import type { Passport } from 'passport';
import { ForbiddenError, UnauthorizedError } from '../errors';
import { DEACTIVATED } from './passport-setup';
import type { Csrf } from '../http/csrf';
import { markSessionSeen, SESSION_COOKIE } from '../http/sessions';
import { parse, tokenParam } from '../http/validate';
import type { Db } from '../db/knex';
import { AcceptInvitationBody, ChangePasswordBody, ResetCompleteBody, ResetRequestBody, SignInBody } from './auth-schemas';
import type { InvitationsService } from './invitations-service';
import type { PasswordResetsService } from './password-resets-service';
import { WrongCurrentPasswordError, type PasswordChangeService } from './password-change-service';
import { currentUser } from '../http/access';
import { accountWaitError, type SignInGuard } from './sign-in-guard';
import { usersRepository } from './users-repository';

export interface AuthRoutesDeps {
  db: Db;
  passport: InstanceType<typeof Passport>;
  csrf: Csrf;
  invitations: InvitationsService;
  resets: PasswordResetsService;
  passwordChange: PasswordChangeService;
  signInLimiter: RequestHandler;
  /** Per-account limits and known browsers. */
  signInGuard: SignInGuard;
  resetLimiter: RequestHandler;
  clock: () => Date;
}

/** Sign-in and out, the current user, changing one's password, invitation links and password resets. */
export function authRoutes(d: AuthRoutesDeps): Router {
  const router = Router();

  router.get('/auth/csrf', (req, res) => {
    res.json({ token: d.csrf.issue(req, res) });
  });

  router.post('/auth/sign-in', d.signInLimiter, (req, res, next) => {
    const { email } = parse(SignInBody, req.body);
    const wait = d.signInGuard.waitSeconds(req, email);
    if (wait > 0) {
      res.setHeader('Retry-After', String(wait));
      throw accountWaitError(wait);
    }
    d.passport.authenticate('local', { session: true }, (err: unknown, user: Express.User | false, info?: { message?: string }) => {
      if (err) return next(err);
      if (!user && info?.message === DEACTIVATED) {
        return next(
          new ForbiddenError(
            "Your account has been deactivated by your clinic's owner. Ask them if you need access again.",
            'account_deactivated',
          ),
        );
      }
      if (!user) {
        d.signInGuard.failed(req, email);
        return next(new UnauthorizedError('E-mail or password is incorrect.', 'invalid_credentials'));
      }
      // passport regenerates the session id here (session fixation defence).
      req.logIn(user, (loginErr) => {
        if (loginErr) return next(loginErr);
        markSessionSeen(req, d.clock);
        d.signInGuard.succeeded(req, res, email);
        d.csrf.issue(req, res, true);
        usersRepository
          .touchSignIn(d.db, user.id, d.clock().toISOString())
          .then(() => res.json({ user }))
          .catch(next);
      });
    })(req, res, next);
  });

  router.post('/auth/sign-out', (req, res, next) => {
    req.logOut((err) => {
      if (err) return next(err);
      // passport leaves a fresh empty session behind; drop it, so signed-out browsers have no row.
      req.session.destroy((destroyErr) => {
        if (destroyErr) return next(destroyErr);
        res.clearCookie(SESSION_COOKIE, { path: '/' });
        d.csrf.issue(req, res, true);
        res.status(204).end();
      });
    });
  });

  // A wrong current password counts as a failed sign-in (per address and per account), so this
  // cannot be used to guess passwords; 401 comes first, so signed-out calls count nothing.
  const signedIn: RequestHandler = (req, _res, next) => {
    currentUser(req);
    next();
  };
  router.post('/auth/password', signedIn, d.signInLimiter, async (req, res, next) => {
    const user = currentUser(req);
    const body = parse(ChangePasswordBody, req.body);
    const wait = d.signInGuard.accountWaitSeconds(user.email);
    if (wait > 0) {
      res.setHeader('Retry-After', String(wait));
      throw accountWaitError(wait);
    }
    try {
      await d.passwordChange.change(user.id, body.currentPassword, body.newPassword);
    } catch (err) {
      if (err instanceof WrongCurrentPasswordError) d.signInGuard.failedForAccount(user.email);
      throw err;
    }
    d.signInGuard.clear(user.email);
    const fresh = await usersRepository.sessionUser(d.db, user.id);
    if (!fresh) throw new UnauthorizedError();
    // Every session of the account was ended; this browser stays signed in under a new session id.
    req.logIn(fresh, (err) => {
      if (err) return next(err);
      markSessionSeen(req, d.clock);
      d.csrf.issue(req, res, true);
      res.json({ user: fresh });
    });
  });

  // Signed out is an answer, not an error: the app asks this once at start-up.
  router.get('/auth/me', (req, res) => {
    res.json({ user: req.user ?? null });
  });

  router.get('/invitations/:token', async (req, res) => {
    const token = tokenParam(req.params, 'Invitation');
    res.json(await d.invitations.preview(token));
  });

  router.post('/invitations/:token/accept', async (req, res, next) => {
    const token = tokenParam(req.params, 'Invitation');
    const body = parse(AcceptInvitationBody, req.body);
    const userId = await d.invitations.accept(token, body.name, body.password);
    const user = await usersRepository.sessionUser(d.db, userId);
    if (!user) throw new UnauthorizedError();
    req.logIn(user, (err) => {
      if (err) return next(err);
      markSessionSeen(req, d.clock);
      d.csrf.issue(req, res, true);
      res.status(201).json({ user });
    });
  });

  router.post('/password-resets', d.resetLimiter, async (req, res) => {
    const { email } = parse(ResetRequestBody, req.body);
    await d.resets.request(email);
    res.status(202).json({ message: 'If an account uses this e-mail, a reset link is on its way.' });
  });

  router.get('/password-resets/:token', async (req, res) => {
    const token = tokenParam(req.params, 'Reset link');
    res.json(await d.resets.preview(token));
  });

  router.post('/password-resets/:token', d.resetLimiter, async (req, res) => {
    const token = tokenParam(req.params, 'Reset link');
    const { password } = parse(ResetCompleteBody, req.body);
    await d.resets.complete(token, password);
    res.status(204).end();
  });

  return router;
}
