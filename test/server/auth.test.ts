import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { Client, makeTestApp, signedIn, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [owner, coach] = DEMO_SIGN_INS;
let t: TestApp;

beforeEach(async () => {
  t = await makeTestApp();
});
afterEach(async () => {
  await t.close();
});

describe('sign-in and sessions', () => {
  it('signs in with e-mail (any case) and password, then /me answers the user', async () => {
    const c = new Client(t.app);
    const res = await c.post('/api/auth/sign-in', { email: coach.email.toUpperCase(), password: coach.password });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email: coach.email, role: 'coach', clinicName: 'Larchwood Running Clinic', athleteId: null });
    const me = await c.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe(coach.email);
  });

  it('gives the same answer for an unknown e-mail and a wrong password', async () => {
    const c = new Client(t.app);
    const wrong = await c.post('/api/auth/sign-in', { email: coach.email, password: 'not-the-password' });
    const unknown = await c.post('/api/auth/sign-in', { email: 'nobody@nowhere.test', password: 'not-the-password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error.code).toBe('invalid_credentials');
  });

  it('issues a new session id at sign-in, with httpOnly SameSite=Lax cookies', async () => {
    const c = new Client(t.app);
    await c.refreshToken();
    const before = (await c.get('/api/auth/csrf')).headers['set-cookie'];
    const res = await c.post('/api/auth/sign-in', { email: coach.email, password: coach.password });
    const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
    const sid = cookies.find((x) => x.startsWith('tf.sid='));
    expect(sid).toBeDefined();
    expect(sid).toMatch(/HttpOnly/);
    expect(sid).toMatch(/SameSite=Lax/);
    expect(sid?.split(';')[0]).not.toBe(
      ([] as string[])
        .concat(before ?? [])
        .find((x) => x.startsWith('tf.sid='))
        ?.split(';')[0],
    );
  });

  it('signs out: /me answers 401 afterwards', async () => {
    const c = new Client(t.app);
    await c.signIn(coach.email, coach.password);
    expect((await c.post('/api/auth/sign-out')).status).toBe(204);
    const me = await c.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body).toEqual({ user: null });
  });

  it('refuses state-changing requests without the CSRF header (403)', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').send({ email: coach.email, password: coach.password });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('csrf_invalid');
  });

  it('answers malformed JSON with 400 and a message, never 500', async () => {
    const c = new Client(t.app);
    await c.refreshToken();
    const token = (await c.get('/api/auth/csrf')).body.token as string;
    const res = await c.agent
      .post('/api/auth/sign-in')
      .set('X-XSRF-TOKEN', token)
      .set('Content-Type', 'application/json')
      .send('{"email": ');
    expect(res.status).toBe(400);
    expect(res.body.error).toMatchObject({ code: 'malformed_json' });
  });

  it('rejects missing, extra and wrongly typed fields with 422 and field details', async () => {
    const c = new Client(t.app);
    const missing = await c.post('/api/auth/sign-in', { email: coach.email });
    expect(missing.status).toBe(422);
    expect(missing.body.error.details[0].path).toEqual(['password']);
    const extra = await c.post('/api/auth/sign-in', { email: coach.email, password: 'x', admin: true });
    expect(extra.status).toBe(422);
    const typed = await c.post('/api/auth/sign-in', { email: 42, password: ['x'] });
    expect(typed.status).toBe(422);
    const long = await c.post('/api/auth/sign-in', { email: coach.email, password: 'x'.repeat(5000) });
    expect(long.status).toBe(422);
  });

  it('rate-limits repeated failed sign-ins with 429', async () => {
    await t.close();
    t = await makeTestApp({ rateLimit: { signInAttempts: 3, accountAttempts: 5, resetRequests: 5, windowMs: 60_000 } });
    const c = new Client(t.app);
    for (let i = 0; i < 3; i++)
      expect((await c.post('/api/auth/sign-in', { email: coach.email, password: 'wrong-password' })).status).toBe(401);
    const limited = await c.post('/api/auth/sign-in', { email: coach.email, password: coach.password });
    expect(limited.status).toBe(429);
    expect(limited.body.error.code).toBe('too_many_attempts');
  });

  it('a deactivated user cannot sign in and loses their session', async () => {
    const c = new Client(t.app);
    await c.signIn(coach.email, coach.password);
    await t.db('users').where({ email: coach.email }).update({ active: false });
    expect((await c.get('/api/auth/me')).body).toEqual({ user: null });
    // The right password learns why (403 account_deactivated, see staff.test.ts); a wrong one gets the usual 401.
    expect((await new Client(t.app).post('/api/auth/sign-in', { email: coach.email, password: coach.password })).status).toBe(403);
    expect((await new Client(t.app).post('/api/auth/sign-in', { email: coach.email, password: 'not-the-password' })).status).toBe(401);
  });

  it('stores password hashes as argon2id, never the password', async () => {
    const row = await t.db('users').where({ email: coach.email }).first();
    expect(row.password_hash).toMatch(/^\$argon2id\$/);
    expect(row.password_hash).not.toContain(coach.password);
  });
});

describe('sign-in limits: per account as well as per address', () => {
  /** A client at a given address (the app trusts X-Forwarded-For here, as behind one proxy). */
  const at = (ip: string) => {
    const c = new Client(t.app);
    c.agent.set('X-Forwarded-For', ip);
    return c;
  };
  const attempt = (ip: string, email: string, password: string) => at(ip).post('/api/auth/sign-in', { email, password });

  beforeEach(async () => {
    await t.close();
    t = await makeTestApp({ trustProxy: 1 });
  });

  it('failures against one account from many addresses slow that account down, and only that account', async () => {
    for (let i = 1; i <= 5; i++) expect((await attempt(`198.51.100.${i}`, coach.email, 'wrong-password')).status).toBe(401);
    const slowed = await attempt('198.51.100.6', coach.email, coach.password);
    expect(slowed.status).toBe(429);
    expect(slowed.body.error.message).toMatch(/this account/);
    expect(Number(slowed.headers['retry-after'])).toBeGreaterThan(0);
    // Same for an address nobody has: the answer never tells whether an account exists.
    for (let i = 1; i <= 5; i++) await attempt(`198.51.100.${i}`, 'nobody@nowhere.test', 'wrong-password');
    expect((await attempt('198.51.100.7', 'nobody@nowhere.test', 'wrong-password')).body).toEqual({
      error: { ...slowed.body.error, message: expect.stringMatching(/this account/) },
    });
    // Other accounts, from the very same addresses, are not held up.
    expect((await attempt('198.51.100.1', owner.email, owner.password)).status).toBe(200);
  });

  it('the wait ends: after it, the right password signs in and clears the count', async () => {
    for (let i = 1; i <= 5; i++) await attempt(`203.0.113.${i}`, coach.email, 'wrong-password');
    expect((await attempt('203.0.113.9', coach.email, coach.password)).status).toBe(429);
    t.advance(31_000);
    expect((await attempt('203.0.113.9', coach.email, coach.password)).status).toBe(200);
    expect((await attempt('203.0.113.9', coach.email, 'wrong-password')).status).toBe(401);
  });

  it('ten failed sign-ins from one address do not lock out the other people at that address', async () => {
    for (let i = 0; i < 10; i++) expect((await attempt('192.0.2.10', `typo${i}@larchwood-clinic.test`, 'wrong-password')).status).toBe(401);
    expect((await attempt('192.0.2.10', coach.email, coach.password)).status).toBe(200);
  });

  it('a browser that signed in before is not held up by an attack on its account or on its address', async () => {
    const office = at('192.0.2.20');
    const first = await office.signIn(coach.email, coach.password);
    const device = ([] as string[]).concat(first.headers['set-cookie'] ?? []).find((x) => x.startsWith('tf.device='));
    expect(device).toMatch(/HttpOnly/);
    expect(device).not.toContain(coach.email);
    expect((await office.post('/api/auth/sign-out')).status).toBe(204);
    // An attacker fails against the account from many addresses, and many times from the office's address.
    for (let i = 1; i <= 8; i++) await attempt(`198.51.100.${i}`, coach.email, 'wrong-password');
    for (let i = 0; i < 60; i++) await attempt('192.0.2.20', `spray${i}@larchwood-clinic.test`, 'wrong-password');
    expect((await attempt('192.0.2.20', owner.email, owner.password)).status).toBe(429);
    expect((await attempt('198.51.100.50', coach.email, coach.password)).status).toBe(429);
    // The coach's own browser still signs in.
    expect((await office.post('/api/auth/sign-in', { email: coach.email, password: coach.password })).status).toBe(200);
  });

  it('a password reset ends the wait for that account', async () => {
    for (let i = 1; i <= 6; i++) await attempt(`198.51.100.${i}`, coach.email, 'wrong-password');
    expect((await attempt('198.51.100.7', coach.email, coach.password)).status).toBe(429);
    await new Client(t.app).post('/api/password-resets', { email: coach.email });
    const token = t.mailer.lastLinkTo(coach.email).split('/').pop()!;
    expect((await new Client(t.app).post(`/api/password-resets/${token}`, { password: 'a-new-long-password' })).status).toBe(204);
    expect((await attempt('198.51.100.7', coach.email, 'a-new-long-password')).status).toBe(200);
  });
});

describe('password reset', () => {
  it('ends the account’s open live-status streams at once, as it ends its sessions', async () => {
    const athlete = DEMO_SIGN_INS[3];
    const server = http.createServer(t.app).listen(0, '127.0.0.1');
    try {
      const c = await signedIn(t.app, athlete.email, athlete.password);
      const me = (await c.get('/api/auth/me')).body.user as { athleteId: number };
      const res = await fetch(`http://127.0.0.1:${(server.address() as AddressInfo).port}/api/athletes/${me.athleteId}/processing-events`, {
        headers: { cookie: c.cookieHeader() },
      });
      expect(res.status).toBe(200);
      const body = res.text();
      await new Client(t.app).post('/api/password-resets', { email: athlete.email });
      const token = t.mailer.lastLinkTo(athlete.email).split('/').pop()!;
      expect((await new Client(t.app).post(`/api/password-resets/${token}`, { password: 'a-new-long-password' })).status).toBe(204);
      expect((await c.get('/api/auth/me')).body).toEqual({ user: null });
      await expect(Promise.race([body.then(() => 'ended'), new Promise((r) => setTimeout(() => r('still open'), 3000))])).resolves.toBe(
        'ended',
      );
    } finally {
      server.closeAllConnections();
      server.close();
    }
  });
});

describe('HTTP hygiene', () => {
  it('sends a CSP that allows only self, and no x-powered-by', async () => {
    const res = await request(t.app).get('/api/config');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ demoMode: true, version: expect.any(String), uploadMaxBytes: 2048 * 1024 * 1024, demoInboxUrl: null });
    const csp = res.headers['content-security-policy'] as string;
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toMatch(/https?:/);
    expect(res.headers['x-powered-by']).toBeUndefined();
    expect(res.headers['cache-control']).toBe('no-store');
  });

  it('marks every API answer not to be stored, errors and the bare /api path included', async () => {
    for (const path of ['/api/nope', '/api', '/api?x=1', '/api/athletes']) {
      const res = await request(t.app).get(path);
      expect(res.headers['cache-control'], path).toBe('no-store');
      expect(res.headers['content-security-policy'], path).toContain("default-src 'self'");
    }
  });

  it('answers unknown API paths with the JSON error shape', async () => {
    const res = await request(t.app).get('/api/nope');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });

  it('refuses a body that is not JSON with 415', async () => {
    const c = new Client(t.app);
    await c.refreshToken();
    const token = (await c.get('/api/auth/csrf')).body.token as string;
    const res = await c.agent.post('/api/auth/sign-in').set('X-XSRF-TOKEN', token).set('Content-Type', 'text/plain').send('email=x');
    expect(res.status).toBe(415);
  });
});
