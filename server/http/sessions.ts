import { EventEmitter } from 'node:events';
import type { Knex } from 'knex';
import type { Request, RequestHandler } from 'express';
import session, { type SessionData } from 'express-session';
import { ConnectSessionKnexStore } from 'connect-session-knex';
import { preparedRead } from '../db/prepared-read';
import { identityCache } from '../db/identity-cache';
import { isPostgres, jsonTextEquals } from '../db/dialect';

declare module 'express-session' {
  interface SessionData {
    /** When the session's expiry was last moved on (ms, app clock); see {@link EXTEND_EVERY_MS}. */
    seenAt?: number;
  }
}

/** Name of the session cookie. */
export const SESSION_COOKIE = 'tf.sid';
/** A signed-in session lasts this long after its last extension. */
export const SESSION_MAX_AGE_MS = 12 * 3_600_000;
/** Reads extend a session (one write of its row) at most this often. */
export const EXTEND_EVERY_MS = 5 * 60_000;
const CLEANUP_EVERY_MS = 15 * 60_000;

/** A session row as kept: its data (JSON) and when it expires (ISO time), or none. */
export type SessionRow = { sess: string; expired: string } | undefined;

/**
 * The session store in `sessions`: has no touch (see {@link createSessions}), and
 * reads a session (every signed-in request does) with one prepared statement, its row kept in
 * memory until the identity tables change ({@link identityCache}).
 */
export class SessionStore extends ConnectSessionKnexStore {
  /** The session row of `sid` (kept in memory until the identity tables change), or undefined. */
  readonly readSession: (sid: string) => Promise<SessionRow>;
  private readonly db: Knex;

  constructor(options: ConstructorParameters<typeof ConnectSessionKnexStore>[0] & { knex: Knex }) {
    super(options);
    this.db = options.knex;
    const read = preparedRead<NonNullable<SessionRow>>(options.knex, 'SELECT sess, expired FROM sessions WHERE sid = ?');
    const rows = identityCache<string, SessionRow>(options.knex);
    this.readSession = (sid) => rows.read(sid, async () => (await read([sid]))[0]);
  }

  override async get(sid: string, callback?: (err: unknown, session?: SessionData | null) => void): Promise<SessionData | null> {
    try {
      const row = await this.readSession(sid);
      // `expired` holds ISO times (connect-session-knex writes them), so text order is time order.
      const session = row && row.expired >= new Date().toISOString() ? (JSON.parse(row.sess) as SessionData) : null;
      callback?.(null, session);
      return session;
    } catch (err) {
      callback?.(err);
      throw err;
    }
  }

  /**
   * On PostgreSQL a portable upsert: the library's own query casts `expired` to a timestamp, which
   * would store it in PostgreSQL's text form instead of the ISO text the reads compare with.
   */
  override async set(sid: string, session: SessionData, callback?: (err?: unknown) => void): Promise<void> {
    if (!isPostgres(this.db)) return super.set(sid, session, callback);
    try {
      const maxAge = session.cookie.maxAge;
      const expired = new Date(Date.now() + (maxAge ?? 86_400_000)).toISOString();
      await this.db('sessions')
        .insert({ sid, expired, sess: JSON.stringify(session) })
        .onConflict('sid')
        .merge(['expired', 'sess']);
      callback?.();
    } catch (err) {
      callback?.(err);
      throw err;
    }
  }
}
/**
 * No `touch` at all (the library's would rewrite the row): express-session then ends the response
 * of a request that left its session unchanged directly, instead of holding the body back for a
 * touch (one extra write of all but its last byte, one more hash of the session).
 */
Object.defineProperty(SessionStore.prototype, 'touch', { value: undefined });

/** Sessions of the app: middleware, extension of signed-in sessions, cleanup of expired rows. */
export interface Sessions {
  /** express-session with the quiet store. */
  middleware: RequestHandler;
  /** The store express-session reads and writes through. */
  store: SessionStore;
  /** The secret session cookies are signed with. */
  secret: string;
  /** The app clock. */
  clock: () => Date;
  /** Moves a signed-in session's expiry on when it was last moved over {@link EXTEND_EVERY_MS} ago (mount after passport.session()). */
  extend: RequestHandler;
  /** Deletes expired rows; answers how many. Also runs at start and every 15 minutes. */
  clearExpired(): Promise<number>;
  /** Stops the periodic cleanup and waits for one in flight. */
  close(): Promise<void>;
}

/**
 * Server sessions in the `sessions` table. A row exists only once someone signs in
 * (`saveUninitialized: false`, and nothing else writes to anonymous sessions). Reads do not
 * rewrite it: the store ignores touches, and a signed-in session is saved with a new expiry (and
 * its cookie sent again) only when it was last extended over five minutes ago.
 */
export function createSessions(d: {
  db: Knex;
  secret: string;
  secureCookies: boolean;
  clock: () => Date;
  logger: { warn(o: object, m: string): void };
}): Sessions {
  const store = new SessionStore({ knex: d.db, tableName: 'sessions', createTable: false, cleanupInterval: 0 });
  const middleware = session({
    name: SESSION_COOKIE,
    secret: d.secret,
    store,
    resave: false,
    saveUninitialized: false,
    rolling: false,
    cookie: { httpOnly: true, sameSite: 'lax', secure: d.secureCookies, maxAge: SESSION_MAX_AGE_MS },
  });
  // Rows carry the real time of their expiry (the store writes them), so compare with the real time.
  const clearExpired = async () => d.db('sessions').where('expired', '<', new Date().toISOString()).delete();
  let sweeping: Promise<unknown> = Promise.resolve();
  const sweep = () => {
    sweeping = clearExpired().catch((err: Error) => d.logger.warn({ err: err.message }, 'clearing expired sessions failed'));
  };
  sweep();
  const timer = setInterval(sweep, CLEANUP_EVERY_MS);
  timer.unref();
  return {
    middleware,
    store,
    secret: d.secret,
    clock: d.clock,
    extend: (req, _res, next) => {
      if (req.user && req.session) {
        const now = d.clock().getTime();
        if (now - (req.session.seenAt ?? 0) >= EXTEND_EVERY_MS) markSessionSeen(req, d.clock);
      }
      next();
    },
    clearExpired,
    async close() {
      clearInterval(timer);
      await sweeping;
    },
  };
}

/** Notes that the session was just extended (sign-in calls it too, so the first reads write nothing). */
export function markSessionSeen(req: Request, clock: () => Date): void {
  req.session.seenAt = clock().getTime();
  req.session.touch();
}

/** Signs a user out everywhere at once: deletes every session row that carries their id. */
export async function revokeUserSessions(db: Knex, userId: number): Promise<number> {
  return db('sessions')
    .where(jsonTextEquals(db, 'sess', ['passport', 'user'], userId))
    .delete();
}

/** "This user was just signed out everywhere": long-lived responses (live-status streams) end on it. */
export interface UserRevocations {
  revoke(userId: number): void;
  /** Calls `listener` when `userId` is revoked; answers the unsubscribe. */
  onRevoke(userId: number, listener: () => void): () => void;
}

/** In-process revocation notices (one process; a shared bus later, like clip events). */
export function inProcessRevocations(): UserRevocations {
  const bus = new EventEmitter();
  bus.setMaxListeners(0);
  return {
    revoke: (userId) => void bus.emit(`u${userId}`),
    onRevoke(userId, listener) {
      bus.on(`u${userId}`, listener);
      return () => bus.off(`u${userId}`, listener);
    },
  };
}
