import type { Request, RequestHandler, Response } from 'express';
import { csrfSync } from 'csrf-sync';

/** Readable cookie Angular's HttpClient copies into the `X-XSRF-TOKEN` header. */
export const XSRF_COOKIE = 'XSRF-TOKEN';
export const XSRF_HEADER = 'x-xsrf-token';

/**
 * Synchroniser-token CSRF protection (csrf-sync): the token lives in the server session; the
 * browser gets a copy in a readable cookie and must echo it in a header on every POST, PUT,
 * PATCH and DELETE. A cross-site page can neither read the cookie nor set the header.
 */
export function createCsrf(secureCookies: boolean) {
  const { csrfSynchronisedProtection, generateToken } = csrfSync({
    getTokenFromRequest: (req) => {
      const v = req.headers[XSRF_HEADER];
      return Array.isArray(v) ? v[0] : v;
    },
    errorConfig: { statusCode: 403, code: 'EBADCSRFTOKEN', message: 'invalid csrf token' },
  });

  function issue(req: Request, res: Response, overwrite = false): string {
    const token = generateToken(req, overwrite);
    res.cookie(XSRF_COOKIE, token, { httpOnly: false, sameSite: 'lax', secure: secureCookies, path: '/' });
    return token;
  }

  /** Makes sure the session has a token and the browser holds the same one in its cookie. */
  const ensureCookie: RequestHandler = (req, res, next) => {
    const token = req.session.csrfToken;
    const cookie = /(?:^|;\s*)XSRF-TOKEN=([^;]+)/.exec(req.headers.cookie ?? '')?.[1];
    if (!token || cookie !== token) issue(req, res);
    next();
  };

  return { protect: csrfSynchronisedProtection, ensureCookie, issue };
}

export type Csrf = ReturnType<typeof createCsrf>;
