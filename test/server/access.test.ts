/**
 * Walks every API route as each kind of caller and checks the status. A new route must be added
 * to ROUTES, or the "every route is listed" check fails.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Express } from 'express';
import { Client, makeTestApp, OTHER, signedIn, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

type Who = 'anonymous' | 'athleteSelf' | 'athleteOther' | 'coach' | 'coachOtherClinic' | 'owner';
const WHO: Who[] = ['anonymous', 'athleteSelf', 'athleteOther', 'coach', 'coachOtherClinic', 'owner'];

interface Ctx {
  /** The demo athlete with an account (the "self" athlete). */
  selfAthleteId: number;
  /** An athlete of the same clinic, not the signed-in athlete. */
  otherAthleteId: number;
  pendingInvitationId: number;
  mailId: number;
}

interface RouteCase {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  /** Express path pattern as mounted, for the completeness check. */
  pattern: string;
  path: (c: Ctx) => string;
  body?: (c: Ctx) => unknown;
  expect: Record<Who, number>;
}

const intake = {
  dateOfBirth: null, heightCm: null, distanceUnit: 'km', weeklyDistance: null, longestRecentRun: null,
  goalEvent: null, goalDate: null, surfaces: [], injuries: [], pain: [], consents: { videoRecording: true, shareStills: true },
};

const all = (status: number): Record<Who, number> => Object.fromEntries(WHO.map((w) => [w, status])) as Record<Who, number>;
const staffOnly = (ok: number, otherClinic = 403): Record<Who, number> => ({ anonymous: 401, athleteSelf: 403, athleteOther: 403, coach: ok, coachOtherClinic: otherClinic, owner: ok });
const ownerOnly = (ok: number): Record<Who, number> => ({ anonymous: 401, athleteSelf: 403, athleteOther: 403, coach: 403, coachOtherClinic: 403, owner: ok });

// "athleteOther" is an athlete of another clinic reading the same ids: always 404 for athlete ids.
const ROUTES: RouteCase[] = [
  { method: 'get', pattern: '/api/health', path: () => '/api/health', expect: all(200) },
  { method: 'get', pattern: '/api/config', path: () => '/api/config', expect: all(200) },
  { method: 'get', pattern: '/api/auth/csrf', path: () => '/api/auth/csrf', expect: all(200) },
  { method: 'get', pattern: '/api/auth/me', path: () => '/api/auth/me', expect: all(200) },
  { method: 'get', pattern: '/api/staff', path: () => '/api/staff', expect: ownerOnly(200) },
  { method: 'post', pattern: '/api/staff/invitations', path: () => '/api/staff/invitations', body: () => ({ email: `walk-${Math.random().toString(36).slice(2)}@x.test`, name: 'Walker' }), expect: ownerOnly(201) },
  { method: 'delete', pattern: '/api/staff/invitations/:id', path: (c) => `/api/staff/invitations/${c.pendingInvitationId}`, expect: ownerOnly(204) },
  { method: 'get', pattern: '/api/coaches', path: () => '/api/coaches', expect: staffOnly(200, 200) },
  { method: 'get', pattern: '/api/athletes', path: () => '/api/athletes', expect: staffOnly(200, 200) },
  { method: 'post', pattern: '/api/athletes', path: () => '/api/athletes', body: () => ({ firstName: 'Walk', lastName: 'Er' }), expect: staffOnly(201, 201) },
  { method: 'get', pattern: '/api/athletes/:id', path: (c) => `/api/athletes/${c.selfAthleteId}`, expect: { anonymous: 401, athleteSelf: 200, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 } },
  { method: 'get', pattern: '/api/athletes/:id', path: (c) => `/api/athletes/${c.otherAthleteId}`, expect: { anonymous: 401, athleteSelf: 404, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 } },
  { method: 'patch', pattern: '/api/athletes/:id', path: (c) => `/api/athletes/${c.selfAthleteId}`, body: () => ({ firstName: 'Ada' }), expect: { anonymous: 401, athleteSelf: 200, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 } },
  { method: 'patch', pattern: '/api/athletes/:id', path: (c) => `/api/athletes/${c.otherAthleteId}`, body: () => ({ firstName: 'Bruno' }), expect: { anonymous: 401, athleteSelf: 404, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 } },
  { method: 'put', pattern: '/api/athletes/:id/intake', path: (c) => `/api/athletes/${c.selfAthleteId}/intake`, body: () => intake, expect: { anonymous: 401, athleteSelf: 200, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 } },
  { method: 'put', pattern: '/api/athletes/:id/intake', path: (c) => `/api/athletes/${c.otherAthleteId}/intake`, body: () => intake, expect: { anonymous: 401, athleteSelf: 404, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 } },
  { method: 'post', pattern: '/api/athletes/:id/invitation', path: (c) => `/api/athletes/${c.otherAthleteId}/invitation`, expect: { ...staffOnly(201), coachOtherClinic: 404 } },
  { method: 'get', pattern: '/api/invitations/:token', path: () => `/api/invitations/${'u'.repeat(43)}`, expect: all(404) },
  { method: 'post', pattern: '/api/invitations/:token/accept', path: () => `/api/invitations/${'u'.repeat(43)}/accept`, body: () => ({ name: 'X', password: 'long-enough-pw' }), expect: all(404) },
  { method: 'post', pattern: '/api/password-resets', path: () => '/api/password-resets', body: () => ({ email: 'nobody@nowhere.test' }), expect: all(202) },
  { method: 'get', pattern: '/api/password-resets/:token', path: () => `/api/password-resets/${'u'.repeat(43)}`, expect: all(404) },
  { method: 'post', pattern: '/api/password-resets/:token', path: () => `/api/password-resets/${'u'.repeat(43)}`, body: () => ({ password: 'long-enough-pw' }), expect: all(404) },
  { method: 'get', pattern: '/api/mailbox', path: () => '/api/mailbox', expect: ownerOnly(200) },
  { method: 'get', pattern: '/api/mailbox/:id', path: (c) => `/api/mailbox/${c.mailId}`, expect: ownerOnly(200) },
  { method: 'post', pattern: '/api/auth/sign-in', path: () => '/api/auth/sign-in', body: () => ({ email: 'nobody@nowhere.test', password: 'x' }), expect: all(401) },
  { method: 'post', pattern: '/api/auth/sign-out', path: () => '/api/auth/sign-out', expect: all(204) },
];

const [owner, coach, , athlete] = DEMO_SIGN_INS;
const CREDENTIALS: Record<Exclude<Who, 'anonymous'>, { email: string; password: string }> = {
  athleteSelf: athlete,
  athleteOther: OTHER.athlete,
  coach,
  coachOtherClinic: OTHER.coach,
  owner,
};

let t: TestApp;
let ctx: Ctx;

async function clientFor(app: Express, who: Who): Promise<Client> {
  if (who === 'anonymous') return new Client(app);
  const cred = CREDENTIALS[who];
  return signedIn(app, cred.email, cred.password);
}

beforeAll(async () => {
  t = await makeTestApp({ rateLimit: { signInAttempts: 1000, resetRequests: 1000, windowMs: 60_000 } });
  const self = await t.db('athletes').where({ email: athlete.email }).first();
  const other = await t.db('athletes').where({ email: 'bruno.feldhaus@runner.test' }).first();
  await t.db('mailbox_messages').insert({ to_address: 'a@x.test', from_address: 'b@x.test', subject: 'hi', text: 'hello', received_at: new Date().toISOString() });
  const mail = await t.db('mailbox_messages').first();
  ctx = { selfAthleteId: self.id, otherAthleteId: other.id, pendingInvitationId: 0, mailId: mail.id };
});
afterAll(async () => {
  await t.close();
});

describe('access walk: every route × every caller', () => {
  for (const route of ROUTES) {
    for (const who of WHO) {
      it(`${route.method.toUpperCase()} ${route.pattern} as ${who} → ${route.expect[who]}`, async () => {
        const c = await clientFor(t.app, who);
        if (route.pattern === '/api/staff/invitations/:id') {
          const o = await clientFor(t.app, 'owner');
          ctx.pendingInvitationId = (await o.post('/api/staff/invitations', { email: `rev-${Math.random().toString(36).slice(2)}@x.test`, name: 'Rev' })).body.id;
        }
        if (route.pattern === '/api/athletes/:id/invitation') {
          await t.db('invitations').where({ athlete_id: ctx.otherAthleteId }).delete();
        }
        const path = route.path(ctx);
        const res = route.method === 'get' ? await c.get(path) : await c.send(route.method, path, route.body?.(ctx));
        expect(res.status, JSON.stringify(res.body)).toBe(route.expect[who]);
        if (res.status >= 400) expect(res.body.error).toMatchObject({ code: expect.any(String), message: expect.any(String) });
      });
    }
  }

  it('every mounted API route is listed in this walk', () => {
    const mounted = listRoutes(t.app);
    const listed = new Set(ROUTES.map((r) => `${r.method.toUpperCase()} ${r.pattern}`));
    expect(mounted.length).toBeGreaterThanOrEqual(20);
    const missing = mounted.filter((r) => !listed.has(r));
    expect(missing).toEqual([]);
  });
});

/** Reads `METHOD /api/path` for every route registered under the API router. */
function listRoutes(app: Express): string[] {
  const out: string[] = [];
  type Layer = { route?: { path: string; methods: Record<string, boolean> }; handle?: { stack?: Layer[] }; name?: string; matchers?: unknown };
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const m of Object.keys(layer.route.methods)) out.push(`${m.toUpperCase()} ${prefix}${layer.route.path}`);
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack, prefix);
      }
    }
  };
  const router = (app as unknown as { router: { stack: Layer[] } }).router;
  // The API router is mounted at /api; the client-app router has no API routes.
  for (const layer of router.stack) {
    if (layer.handle?.stack) walk(layer.handle.stack, '/api');
  }
  return [...new Set(out)].filter((r) => !r.includes('/api/*') && !r.includes('(?!'));
}
