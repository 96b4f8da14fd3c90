import crypto from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import { doubleCsrf } from 'csrf-csrf';

/** Readable cookie Angular's HttpClient copies into the `X-XSRF-TOKEN` header. */
export const XSRF_COOKIE = 'XSRF-TOKEN';
export const XSRF_HEADER = 'x-xsrf-token';
/** Valid (cookie, session) pairs remembered; the oldest goes first. */
const KNOWN_TOKENS_MAX = 10_000;

/** What a token is bound to: the session once signed in; nothing before (sign-in, reset forms). */
const sessionBinding = (req: Request): string => (req.user ? `session:${req.sessionID}` : '');

/** What the app's CSRF protection offers the routes. */
export interface Csrf {
  /** Refuses POST, PUT, PATCH and DELETE whose header does not carry the cookie's valid token (403). */
  protect: RequestHandler;
  /** Sets a fresh cookie when the browser has none, or one made for another session. */
  ensureCookie: RequestHandler;
  /** Issues a token (a new one with `overwrite`, e.g. after sign-in) and sets the cookie; answers it. */
  issue(req: Request, res: Response, overwrite?: boolean): string;
}

/**
 * Signed double-submit CSRF protection (csrf-csrf): the token is an HMAC, under a key derived
 * from the session secret, of a random value and — once signed in — the session id; the browser
 * holds it in a readable cookie and must echo it in a header on every POST, PUT, PATCH and
 * DELETE. A cross-site page can neither read the cookie nor set the header. Nothing is stored on
 * the server, so anonymous visitors get no session row; a token made for one signed-in session
 * does not work for another.
 */
export function createCsrf(secureCookies: boolean, sessionSecret: string): Csrf {
  const key = crypto.createHmac('sha256', sessionSecret).update('trailframe csrf').digest('hex');
  const { doubleCsrfProtection, generateCsrfToken, validateRequest } = doubleCsrf({
    getSecret: () => key,
    // Bound to the session once signed in; anonymous tokens (sign-in, reset forms) to nothing.
    getSessionIdentifier: sessionBinding,
    cookieName: XSRF_COOKIE,
    cookieOptions: { httpOnly: false, sameSite: 'lax', secure: secureCookies, path: '/' },
    getCsrfTokenFromRequest: (req) => {
      const v = req.headers[XSRF_HEADER];
      return Array.isArray(v) ? v[0] : v;
    },
    errorConfig: { statusCode: 403, code: 'EBADCSRFTOKEN', message: 'invalid csrf token' },
  });

  /** csrf-csrf reads `req.cookies`; we have no cookie parser, so read the one cookie it needs. */
  const withCookie = (req: Request): void => {
    const raw = /(?:^|;\s*)XSRF-TOKEN=([^;]+)/.exec(req.headers.cookie ?? '')?.[1];
    let value: string | undefined;
    try {
      value = raw === undefined ? undefined : decodeURIComponent(raw);
    } catch {
      value = undefined;
    }
    (req as Request & { cookies: Record<string, string> }).cookies = value === undefined ? {} : { [XSRF_COOKIE]: value };
  };

  /**
   * Cookies found valid, by session binding: a token valid for a binding stays valid for it (the
   * HMAC key never changes while the app runs), so each is checked once, not on every read.
   */
  const known = new Map<string, true>();

  /** Whether the browser's cookie holds a token valid for this request's session. */
  const cookieValid = (req: Request): boolean => {
    const cookie = (req as Request & { cookies: Record<string, string> }).cookies[XSRF_COOKIE];
    if (!cookie) return false;
    const key = `${sessionBinding(req)}\n${cookie}`;
    if (known.has(key)) return true;
    const probe = Object.create(req) as Request;
    Object.defineProperty(probe, 'headers', { value: { ...req.headers, [XSRF_HEADER]: cookie } });
    const valid = validateRequest(probe);
    if (valid) {
      known.set(key, true);
      if (known.size > KNOWN_TOKENS_MAX) known.delete(known.keys().next().value!);
    }
    return valid;
  };

  return {
    protect: (req, res, next) => {
      // Reads change nothing and carry no token (csrf-csrf ignores GET, HEAD and OPTIONS too).
      if (req.method === 'GET' || req.method === 'HEAD' || req.method === 'OPTIONS') return next();
      withCookie(req);
      doubleCsrfProtection(req, res, next);
    },
    ensureCookie: (req, res, next) => {
      withCookie(req);
      if (!cookieValid(req)) generateCsrfToken(req, res, { overwrite: true });
      next();
    },
    issue(req, res, overwrite = false) {
      withCookie(req);
      return generateCsrfToken(req, res, { overwrite });
    },
  };
}
