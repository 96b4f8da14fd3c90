import crypto from 'node:crypto';
import type { Request, Response } from 'express';
import { AppError } from '../errors';

/** Name of the "this browser signed in to these accounts before" cookie. */
export const DEVICE_COOKIE = 'tf.device';
const DEVICE_MAX_AGE_MS = 180 * 24 * 3_600_000;
/** Accounts remembered per browser. */
const DEVICE_ACCOUNTS = 5;
/** A known-device cookie stops exempting after this many failed attempts within the window. */
const DEVICE_FAILURES = 10;
/** The per-account wait after the free attempts: 30 s, doubling per further failure, at most 15 minutes. */
const FIRST_WAIT_MS = 30_000;
const MAX_WAIT_MS = 15 * 60_000;
/** Entries kept in memory at most (oldest dropped first). */
const MAX_ENTRIES = 50_000;

interface Failures {
  count: number;
  lastAt: number;
}

/** What the sign-in route asks before and after checking a password. */
export interface SignInGuard {
  /** Whether this browser signed in to the account with `email` before (and its cookie is not spent). */
  knownDevice(req: Request, email: string): boolean;
  /** Seconds the account must still wait (for any address), 0 to go on; known devices never wait. */
  waitSeconds(req: Request, email: string): number;
  /** Records a wrong password (for unknown addresses too, so answers never tell whether an account exists). */
  failed(req: Request, email: string): void;
  /** Clears the account's count and remembers this browser for the account. */
  succeeded(req: Request, res: Response, email: string): void;
  /** Clears the account's count (after a password reset). */
  clear(email: string): void;
  /**
   * Seconds the account must still wait, whatever the browser: for a wrong current password given
   * by a signed-in session, which is on a known device by nature.
   */
  accountWaitSeconds(email: string): number;
  /** Records a wrong current password against the account itself (never against the browser's exemption). */
  failedForAccount(email: string): void;
}

/**
 * Sign-in limiting per account, beside the per-address limit (express-rate-limit in app.ts):
 * after `accountAttempts` failed attempts, from whatever addresses, the account must wait before
 * the next one — 30 s, doubling per further failure, at most 15 minutes — and 15 minutes without
 * a failure forgets the count. So that an attacker cannot keep a person locked out, a browser that
 * signed in to the account before (a signed, httpOnly cookie naming no account) is exempt from
 * this wait and from the per-address limit, until it fails 10 times itself; a password reset or a
 * correct password after the wait clears the count. Counts live in memory, like the per-address
 * limit's.
 */
export function signInGuard(d: {
  secret: string;
  accountAttempts: number;
  windowMs: number;
  secureCookies: boolean;
  clock: () => Date;
}): SignInGuard {
  const key = crypto.createHmac('sha256', d.secret).update('trailframe known device').digest();
  const accounts = new Map<string, Failures>();
  const devices = new Map<string, Failures>();
  const norm = (email: string) =>
    String(email ?? '')
      .trim()
      .toLowerCase();
  const mac = (email: string, nonce: string) => crypto.createHmac('sha256', key).update(`${email}\n${nonce}`).digest('base64url');

  const live = (map: Map<string, Failures>, k: string, now: number): Failures | undefined => {
    const f = map.get(k);
    if (f && now - f.lastAt > Math.max(d.windowMs, MAX_WAIT_MS)) {
      map.delete(k);
      return undefined;
    }
    return f;
  };
  const bump = (map: Map<string, Failures>, k: string, now: number) => {
    const f = live(map, k, now) ?? { count: 0, lastAt: now };
    map.delete(k);
    map.set(k, { count: f.count + 1, lastAt: now });
    if (map.size > MAX_ENTRIES) map.delete(map.keys().next().value as string);
  };

  /** The cookie's entries: `nonce.mac` pairs, each valid for one account. */
  const entries = (req: Request): string[] => {
    const raw = /(?:^|;\s*)tf\.device=([A-Za-z0-9_~.-]{1,2000})/.exec(req.headers.cookie ?? '')?.[1];
    return raw ? raw.split('~').filter((e) => /^[A-Za-z0-9_-]{16,64}\.[A-Za-z0-9_-]{43}$/.test(e)) : [];
  };
  /** The nonce of this browser's entry for the account, if it has a valid one. */
  const deviceNonce = (req: Request, email: string): string | null => {
    for (const e of entries(req)) {
      const [nonce, tag] = e.split('.') as [string, string];
      const expected = mac(email, nonce);
      if (tag.length === expected.length && crypto.timingSafeEqual(Buffer.from(tag), Buffer.from(expected))) return nonce;
    }
    return null;
  };
  const waitMs = (f: Failures | undefined): number => {
    if (!f || f.count < d.accountAttempts) return 0;
    return Math.min(MAX_WAIT_MS, FIRST_WAIT_MS * 2 ** (f.count - d.accountAttempts));
  };

  function knownDevice(req: Request, email: string): boolean {
    const nonce = deviceNonce(req, norm(email));
    return nonce !== null && (live(devices, nonce, d.clock().getTime())?.count ?? 0) < DEVICE_FAILURES;
  }

  const accountWait = (e: string): number => {
    const now = d.clock().getTime();
    const f = live(accounts, e, now);
    const left = f ? f.lastAt + waitMs(f) - now : 0;
    return left > 0 ? Math.ceil(left / 1000) : 0;
  };

  return {
    knownDevice,
    waitSeconds(req, email) {
      const e = norm(email);
      return knownDevice(req, e) ? 0 : accountWait(e);
    },
    accountWaitSeconds: (email) => accountWait(norm(email)),
    failedForAccount(email) {
      bump(accounts, norm(email), d.clock().getTime());
    },
    failed(req, email) {
      const e = norm(email);
      const now = d.clock().getTime();
      const nonce = deviceNonce(req, e);
      if (nonce) bump(devices, nonce, now);
      else bump(accounts, e, now);
    },
    succeeded(req, res, email) {
      const e = norm(email);
      accounts.delete(e);
      if (deviceNonce(req, e)) return;
      const nonce = crypto.randomBytes(18).toString('base64url');
      const kept = entries(req).slice(-(DEVICE_ACCOUNTS - 1));
      res.cookie(DEVICE_COOKIE, [...kept, `${nonce}.${mac(e, nonce)}`].join('~'), {
        httpOnly: true,
        sameSite: 'lax',
        secure: d.secureCookies,
        path: '/api/auth',
        maxAge: DEVICE_MAX_AGE_MS,
      });
    },
    clear(email) {
      accounts.delete(norm(email));
    },
  };
}

/** The 429 for an account that must wait (same for addresses without an account). */
export function accountWaitError(seconds: number): AppError {
  const minutes = Math.ceil(seconds / 60);
  return new AppError(
    429,
    'too_many_attempts',
    `Too many failed sign-ins for this account. Try again in ${minutes === 1 ? 'a minute' : `${minutes} minutes`}, or reset your password.`,
  );
}
