/**
 * Session rows: none until someone signs in (anonymous calls, the CSRF cookie and failed sign-ins
 * store nothing), expired rows stop working and are cleared, and reads do not rewrite the row on
 * every request (it is extended at most every few minutes).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import request from 'supertest';
import { Client, makeTestApp, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [owner, coach] = DEMO_SIGN_INS;
let t: TestApp;

beforeEach(async () => {
  t = await makeTestApp();
});
afterEach(async () => {
  await t.close();
});

const sessionRows = async () => Number((await t.db('sessions').count({ n: '*' }).first())?.n ?? 0);

describe('no session row for anonymous requests', () => {
  it('100 calls to /api/health, and the public reads, store no session', async () => {
    for (let i = 0; i < 100; i++) expect((await request(t.app).get('/api/health')).status).toBe(200);
    for (const path of ['/api/config', '/api/auth/csrf', '/api/auth/me', '/api/athletes', `/api/invitations/${'x'.repeat(43)}`]) {
      await request(t.app).get(path);
    }
    expect(await sessionRows()).toBe(0);
  });

  it('signing in still needs the CSRF header; a failed sign-in stores nothing, a good one one row', async () => {
    expect((await request(t.app).post('/api/auth/sign-in').send({ email: coach.email, password: coach.password })).status).toBe(403);
    const c = new Client(t.app);
    expect((await c.post('/api/auth/sign-in', { email: coach.email, password: 'wrong-password' })).status).toBe(401);
    expect((await c.post('/api/password-resets', { email: 'nobody@nowhere.test' })).status).toBe(202);
    expect(await sessionRows()).toBe(0);
    await c.signIn(coach.email, coach.password);
    expect(await sessionRows()).toBe(1);
    expect((await c.get('/api/athletes')).status).toBe(200);
    expect((await c.post('/api/athletes', { firstName: 'Csrf', lastName: 'Check' })).status).toBe(201);
    expect((await c.post('/api/auth/sign-out')).status).toBe(204);
    expect(await sessionRows()).toBe(0);
  });

  it("one signed-in session's CSRF token does not work for another session", async () => {
    const a = new Client(t.app);
    await a.signIn(coach.email, coach.password);
    const b = new Client(t.app);
    await b.signIn(owner.email, owner.password);
    const tokenOfA = await a.xsrf();
    // b's cookies, a's token in both the header and the XSRF cookie.
    const forged = await b.agent
      .post('/api/athletes')
      .set('X-XSRF-TOKEN', tokenOfA)
      .set('Cookie', `XSRF-TOKEN=${tokenOfA}; ${b.cookieHeader()}`)
      .send({ firstName: 'Cross', lastName: 'Session' });
    expect(forged.status).toBe(403);
    expect(forged.body.error.code).toBe('csrf_invalid');
  });
});

describe('expired sessions', () => {
  it('an expired row no longer signs anyone in, and the cleanup removes it (live rows stay)', async () => {
    const c = new Client(t.app);
    await c.signIn(coach.email, coach.password);
    const live = new Client(t.app);
    await live.signIn(owner.email, owner.password);
    const sid = decodeURIComponent(c.cookieHeader().split('=')[1]!).slice(2).split('.')[0]!;
    await t
      .db('sessions')
      .where({ sid })
      .update({ expired: new Date(Date.now() - 60_000).toISOString() });
    expect((await c.get('/api/auth/me')).body).toEqual({ user: null });
    expect(await t.clearExpiredSessions()).toBe(1);
    expect(await t.db('sessions').where({ sid })).toHaveLength(0);
    expect(await sessionRows()).toBe(1);
    expect((await live.get('/api/auth/me')).body.user.email).toBe(owner.email);
  });
});

describe('reads do not rewrite the session row every time', () => {
  it('ten reads leave the row as it was; after five minutes the next one extends it', async () => {
    const c = new Client(t.app);
    await c.signIn(coach.email, coach.password);
    const before = await t.db('sessions').first();
    await new Promise((r) => setTimeout(r, 20));
    for (let i = 0; i < 10; i++) expect((await c.get('/api/athletes')).status).toBe(200);
    expect(await t.db('sessions').first()).toEqual(before);
    t.advance(6 * 60_000);
    await new Promise((r) => setTimeout(r, 20));
    const res = await c.get('/api/auth/me');
    expect(res.body.user.email).toBe(coach.email);
    // The cookie is sent again with the new expiry, and the row's expiry moved on.
    expect(([] as string[]).concat(res.headers['set-cookie'] ?? []).some((x) => x.startsWith('tf.sid='))).toBe(true);
    const after = await t.db('sessions').first();
    expect(after.expired > before.expired).toBe(true);
  });
});
