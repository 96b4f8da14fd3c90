import crypto from 'node:crypto';
import { createRequire } from 'node:module';
import type { Request, RequestHandler, Response } from 'express';
import type { SessionData } from 'express-session';
import { EXTEND_EVERY_MS, SESSION_COOKIE, type Sessions } from './sessions';

/** Signed session cookies found valid, remembered (raw cookie → session id); the oldest goes first. */
const VERIFIED_COOKIES_MAX = 10_000;
const COOKIE = new RegExp(`(?:^|;\\s*)${SESSION_COOKIE.replace('.', '\\.')}=([^;]*)`);

/** passport's request helpers (`req.logIn`/`login`, `req.logOut`/`logout`, `req.isAuthenticated`…), as `passport.session()` sets them. */
type PassportHelpers = Record<'login' | 'logIn' | 'logout' | 'logOut' | 'isAuthenticated' | 'isUnauthenticated', unknown>;
const passportRequest = createRequire(import.meta.url)('passport/lib/http/request') as PassportHelpers;

/**
 * The session id in a signed express-session cookie value (`s:<id>.<HMAC-SHA256 of id, base64>`,
 * URL-encoded as the browser sends it), or null when the signature does not verify.
 */
export function verifiedSessionId(raw: string, secret: string): string | null {
  let value: string;
  try {
    value = decodeURIComponent(raw);
  } catch {
    return null;
  }
  if (!value.startsWith('s:')) return null;
  const dot = value.lastIndexOf('.');
  if (dot < 3) return null;
  const id = value.slice(2, dot);
  const expected = Buffer.from(crypto.createHmac('sha256', secret).update(id).digest('base64').replace(/=+$/, ''));
  const given = Buffer.from(value.slice(dot + 1));
  return given.length === expected.length && crypto.timingSafeEqual(given, expected) ? id : null;
}

/** A session's data without its cookie, as text: what a request changed in it shows here. */
const contentOf = (session: object | undefined): string =>
  JSON.stringify(session ?? null, (key, value) => (key === 'cookie' ? undefined : value));

/**
 * The session and sign-in of every API request as one middleware: express-session, then
 * `passport.session()`, then the session's extension ({@link Sessions.extend}). A signed-in read
 * (GET or HEAD) whose cookie verified before, whose session row is unexpired and needs no
 * extension, and whose user is still active takes a short way to the same state — `req.session`
 * (express-session's own Session object on the same store), `req.sessionID`, `req.user`,
 * passport's request helpers — without re-signing the cookie, hashing the session three times and
 * wrapping the response as express-session does for every request. The rows come from the same
 * in-memory identity cache as the long way, so a sign-out, password reset, role change or
 * deactivation is seen by the very next request (the long way then answers it). Should a read
 * change its session, the change is saved before the answer goes out, as express-session would;
 * anything else (no cookie, a cookie not seen before, every write, every sign-in and sign-out)
 * takes the long way.
 */
export function signedInSessions(d: {
  sessions: Sessions;
  /** `passport.session()` of the app's passport. */
  passportSession: RequestHandler;
  /** The app's passport (its session manager goes on requests that take the short way). */
  passport: unknown;
  /** The signed-in user of an id, as passport's deserializeUser answers it (null: gone or deactivated). */
  sessionUser: (id: number) => Promise<Express.User | null>;
  logger: { warn(o: object, m: string): void };
}): RequestHandler {
  const { store, secret, clock } = d.sessions;
  const verified = new Map<string, string | null>();
  const sessionManager = (d.passport as { _sm: unknown })._sm;
  /** The app's request prototypes given passport's helpers (once each: cheaper than on every request). */
  const equipped = new WeakSet<object>();

  const longWay: RequestHandler = (req, res, next) => {
    d.sessions.middleware(req, res, (err?: unknown) => {
      if (err) return next(err);
      d.passportSession(req, res, (err2?: unknown) => (err2 ? next(err2) : d.sessions.extend(req, res, next)));
    });
  };

  /** The session id of a signed cookie, verified once per distinct cookie. */
  const sessionIdOf = (raw: string): string | null => {
    let id = verified.get(raw);
    if (id === undefined) {
      id = verifiedSessionId(raw, secret);
      verified.set(raw, id);
      if (verified.size > VERIFIED_COOKIES_MAX) verified.delete(verified.keys().next().value!);
    }
    return id;
  };

  /** A session row's data as {@link contentOf} writes it, by session id, while the row's text is unchanged. */
  const contents = new Map<string, { sess: string; content: string }>();
  const contentOfRow = (id: string, sess: string, data: SessionData): string => {
    const known = contents.get(id);
    if (known?.sess === sess) return known.content;
    const content = contentOf(data);
    contents.delete(id);
    contents.set(id, { sess, content });
    if (contents.size > VERIFIED_COOKIES_MAX) contents.delete(contents.keys().next().value!);
    return content;
  };

  /** The signed-in state of a read, or null when it must take the long way. */
  const shortWay = async (req: Request): Promise<{ id: string; data: SessionData; user: Express.User; content: string } | null> => {
    const raw = COOKIE.exec(req.headers.cookie ?? '')?.[1];
    const id = raw ? sessionIdOf(raw) : null;
    if (!id) return null;
    const row = await store.readSession(id);
    if (!row || row.expired < new Date().toISOString()) return null;
    const data = JSON.parse(row.sess) as SessionData & { passport?: { user?: number } };
    const userId = data.passport?.user;
    if (typeof userId !== 'number' || clock().getTime() - (data.seenAt ?? 0) >= EXTEND_EVERY_MS) return null;
    const user = await d.sessionUser(userId);
    // What the session holds before the handler runs (its cookie aside), to tell whether it changed it.
    return user ? { id, data, user, content: contentOfRow(id, row.sess, data) } : null;
  };

  /** Holds the answer back until a session the handler changed is saved, as express-session does. */
  const saveChangesBeforeAnswer = (req: Request, res: Response, before: string) => {
    const end = res.end;
    res.end = function (this: Response, ...args: unknown[]) {
      res.end = end;
      if (!req.session || contentOf(req.session) === before) return (end as (...a: unknown[]) => Response).apply(this, args);
      req.session.save((err) => {
        if (err) d.logger.warn({ err: (err as Error).message }, 'saving a changed session failed');
        (end as (...a: unknown[]) => Response).apply(this, args);
      });
      return this;
    } as Response['end'];
  };

  return (req, res, next) => {
    if ((req.method !== 'GET' && req.method !== 'HEAD') || req.session) return void longWay(req, res, next);
    shortWay(req).then(
      (found) => {
        if (!found) return void longWay(req, res, next);
        req.sessionID = found.id;
        req.sessionStore = store as unknown as Request['sessionStore'];
        store.createSession(req, found.data);
        req.user = found.user;
        const proto = Object.getPrototypeOf(req) as object;
        if (!equipped.has(proto)) {
          Object.assign(proto, passportRequest, { _sessionManager: sessionManager });
          equipped.add(proto);
        }
        saveChangesBeforeAnswer(req, res, found.content);
        next();
      },
      (err: unknown) => next(err),
    );
  };
}
