import http from 'node:http';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { Client, makeTestApp, OTHER, signedIn, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
const NEW = 'a-brand-new-passphrase';
let t: TestApp;

beforeEach(async () => {
  t = await makeTestApp({}, { fakeSmtp: false });
});
afterEach(async () => {
  await t.close();
});

const sid = (res: { headers: Record<string, unknown> }) =>
  ([] as string[])
    .concat((res.headers['set-cookie'] as string[] | undefined) ?? [])
    .find((c) => c.startsWith('tf.sid='))
    ?.split(';')[0];
const signInStatus = async (email: string, password: string) =>
  (await new Client(t.app).post('/api/auth/sign-in', { email, password })).status;

describe('POST /api/auth/password: changing one’s own password while signed in', () => {
  const people = [
    ['owner', owner],
    ['coach', coach],
    ['athlete', athlete],
    ['other clinic’s owner', OTHER.owner],
  ] as const;

  for (const [role, who] of people) {
    it(`as the ${role}: the new password signs in, the old one no longer does, this browser stays signed in under a new session id and every other session ends at once`, async () => {
      const here = new Client(t.app);
      const first = await here.signIn(who.email, who.password);
      const elsewhere = await signedIn(t.app, who.email, who.password);
      expect((await elsewhere.get('/api/auth/me')).body.user.email).toBe(who.email);

      const res = await here.post('/api/auth/password', { currentPassword: who.password, newPassword: NEW });
      expect(res.status).toBe(200);
      expect(res.body.user).toMatchObject({ email: who.email });
      expect(sid(res)).toBeDefined();
      expect(sid(res)).not.toBe(sid(first));

      // This browser: still signed in, and its writes pass CSRF with the token issued for the new session.
      expect((await here.get('/api/auth/me')).body.user.email).toBe(who.email);
      expect((await here.post('/api/auth/sign-out')).status).toBe(204);
      // The other browser: signed out at the very next request, reads and writes alike.
      expect((await elsewhere.get('/api/auth/me')).body).toEqual({ user: null });
      // (its page's token was bound to the ended session: 403 csrf_invalid; with a fresh token, 401, as the app retries)
      expect((await elsewhere.post('/api/auth/password', { currentPassword: NEW, newPassword: 'yet-another-passphrase' })).status).toBe(
        403,
      );
      await elsewhere.refreshToken();
      expect((await elsewhere.post('/api/auth/password', { currentPassword: NEW, newPassword: 'yet-another-passphrase' })).status).toBe(
        401,
      );

      expect(await signInStatus(who.email, who.password)).toBe(401);
      expect(await signInStatus(who.email, NEW)).toBe(200);
      const row = await t.db('users').where({ email: who.email }).first();
      expect(row.password_hash).toMatch(/^\$argon2id\$/);
      const entry = await t.db('audit_log').where({ actor_id: row.id, action: 'user.password_changed' }).first();
      expect(entry).toMatchObject({ clinic_id: row.clinic_id });
      expect(t.mailer.sent.filter((m) => m.to === who.email).at(-1)?.subject).toBe('Your Trailframe password was changed');
    });
  }

  it('a wrong current password is 422 on the field, changes nothing and keeps the session', async () => {
    const c = await signedIn(t.app, coach.email, coach.password);
    const res = await c.post('/api/auth/password', { currentPassword: 'not-my-password', newPassword: NEW });
    expect(res.status).toBe(422);
    expect(res.body.error).toMatchObject({ code: 'wrong_password', details: [{ path: ['currentPassword'] }] });
    expect((await c.get('/api/auth/me')).body.user.email).toBe(coach.email);
    expect(await signInStatus(coach.email, coach.password)).toBe(200);
    expect(await signInStatus(coach.email, NEW)).toBe(401);
  });

  it('a new password outside the policy (as at reset and invitation) or equal to the current one is 422 on the new field', async () => {
    const c = await signedIn(t.app, athlete.email, athlete.password);
    for (const newPassword of ['short', 'x'.repeat(300)]) {
      const res = await c.post('/api/auth/password', { currentPassword: athlete.password, newPassword });
      expect(res.status).toBe(422);
      expect(res.body.error.details[0].path).toEqual(['newPassword']);
    }
    const same = await c.post('/api/auth/password', { currentPassword: athlete.password, newPassword: athlete.password });
    expect(same.status).toBe(422);
    expect(same.body.error).toMatchObject({ code: 'same_password', details: [{ path: ['newPassword'] }] });
    for (const body of [
      {},
      { currentPassword: athlete.password },
      { currentPassword: athlete.password, newPassword: NEW, email: 'x@y.test' },
    ]) {
      expect((await c.post('/api/auth/password', body)).status).toBe(422);
    }
    expect(await signInStatus(athlete.email, athlete.password)).toBe(200);
  });

  it('is refused without the CSRF header (403) and when signed out (401)', async () => {
    const c = await signedIn(t.app, owner.email, owner.password);
    const bare = await c.agent.post('/api/auth/password').send({ currentPassword: owner.password, newPassword: NEW });
    expect(bare.status).toBe(403);
    expect(bare.body.error.code).toBe('csrf_invalid');
    const anonymous = await new Client(t.app).post('/api/auth/password', { currentPassword: owner.password, newPassword: NEW });
    expect(anonymous.status).toBe(401);
    expect((await request(t.app).post('/api/auth/password').send({})).status).toBe(403);
    expect(await signInStatus(owner.email, owner.password)).toBe(200);
  });

  it('wrong current passwords count as failed sign-ins of the account: after five the account waits, here and at the sign-in page', async () => {
    const c = await signedIn(t.app, coach.email, coach.password);
    for (let i = 0; i < 5; i++) {
      expect((await c.post('/api/auth/password', { currentPassword: `guess-${i}`, newPassword: NEW })).status).toBe(422);
    }
    const limited = await c.post('/api/auth/password', { currentPassword: coach.password, newPassword: NEW });
    expect(limited.status).toBe(429);
    expect(Number(limited.headers['retry-after'])).toBeGreaterThan(0);
    // A browser that never signed in to the account waits as well.
    expect(await signInStatus(coach.email, coach.password)).toBe(429);
    t.advance(31_000);
    expect((await c.post('/api/auth/password', { currentPassword: coach.password, newPassword: NEW })).status).toBe(200);
  });

  it('wrong current passwords count toward the per-address sign-in limit', async () => {
    await t.close();
    t = await makeTestApp(
      { rateLimit: { signInAttempts: 3, accountAttempts: 50, resetRequests: 5, windowMs: 60_000 } },
      { fakeSmtp: false },
    );
    const c = await signedIn(t.app, coach.email, coach.password);
    for (let i = 0; i < 3; i++) await c.post('/api/auth/password', { currentPassword: `guess-${i}`, newPassword: NEW });
    expect((await c.post('/api/auth/password', { currentPassword: coach.password, newPassword: NEW })).status).toBe(429);
    expect(await signInStatus(owner.email, 'wrong-password')).toBe(429);
  });

  it('of two changes sent at once with the same current password, one wins and the other is refused (never both answered 200)', async () => {
    const c = await signedIn(t.app, owner.email, owner.password);
    const answers = await Promise.all(
      ['first-new-passphrase', 'second-new-passphrase'].map((newPassword) =>
        c.post('/api/auth/password', { currentPassword: owner.password, newPassword }),
      ),
    );
    const statuses = answers.map((r) => r.status);
    expect(statuses.filter((s) => s === 200)).toHaveLength(1);
    expect([401, 409, 422]).toContain(statuses.find((s) => s !== 200));
    const won = statuses[0] === 200 ? 'first-new-passphrase' : 'second-new-passphrase';
    expect(await signInStatus(owner.email, won)).toBe(200);
  });

  it('voids a reset link asked for before the change', async () => {
    await new Client(t.app).post('/api/password-resets', { email: athlete.email });
    const token = t.mailer.lastLinkTo(athlete.email).split('/').pop()!;
    const c = await signedIn(t.app, athlete.email, athlete.password);
    expect((await c.post('/api/auth/password', { currentPassword: athlete.password, newPassword: NEW })).status).toBe(200);
    const later = await new Client(t.app).post(`/api/password-resets/${token}`, { password: 'someone-elses-choice' });
    expect(later.status).toBe(410);
    expect(later.body.error.code).toBe('token_used');
  });

  it('ends the other sessions’ open live-status streams at once', async () => {
    const server = http.createServer(t.app).listen(0, '127.0.0.1');
    try {
      const elsewhere = await signedIn(t.app, athlete.email, athlete.password);
      const me = (await elsewhere.get('/api/auth/me')).body.user as { athleteId: number };
      const res = await fetch(`http://127.0.0.1:${(server.address() as AddressInfo).port}/api/athletes/${me.athleteId}/processing-events`, {
        headers: { cookie: elsewhere.cookieHeader() },
      });
      expect(res.status).toBe(200);
      const body = res.text();
      const here = await signedIn(t.app, athlete.email, athlete.password);
      expect((await here.post('/api/auth/password', { currentPassword: athlete.password, newPassword: NEW })).status).toBe(200);
      await expect(Promise.race([body.then(() => 'ended'), new Promise((r) => setTimeout(() => r('still open'), 3000))])).resolves.toBe(
        'ended',
      );
    } finally {
      server.closeAllConnections();
      server.close();
    }
  });
});
