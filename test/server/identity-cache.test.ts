/**
 * The signed-in cache (server/db/identity-cache.ts): a session row and its user are read once and
 * kept while the process writes nothing to sessions, users, clinics or athletes; every change made
 * through the app — sign-out, password reset, role change, deactivation, erasure, a changed clinic
 * or athlete link — is seen by the very next request. Database on disk, as a real server runs.
 */
import request from 'supertest';
import { afterEach, describe, expect, it } from 'vitest';
import { Client, makeTestApp, signedIn, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import type { SqliteClient, SqliteConnection } from '../../server/db/sqlite-client';
import { onPostgres, titleSkippedWhen } from '../support/test-db';

const [owner, tobin, , ada] = DEMO_SIGN_INS;
let t: TestApp | null = null;

afterEach(async () => {
  await t?.close();
  t = null;
});

const generation = (app: TestApp) => (app.db.client as unknown as SqliteClient).identityGeneration();
/** A request with exactly this Cookie header (a browser that kept an old cookie). */
const withCookie = (app: TestApp, cookie: string, path: string) => request(app.app).get(path).set('Cookie', cookie);
/** A second connection to an on-disk test app's database file, which the app knows nothing of. */
function otherConnection(app: TestApp): SqliteConnection {
  const client = app.db.client as unknown as { driver: new (file: string) => SqliteConnection; connectionSettings: { filename: string } };
  return new client.driver(client.connectionSettings.filename);
}

describe.skipIf(onPostgres)(
  titleSkippedWhen(
    onPostgres,
    'what is kept, and for how long',
    'the signed-in cache counts writes on the SQLite client only; on PostgreSQL, with several web servers, nothing is kept',
  ),
  () => {
    it('a user changed behind the app (another connection) is still read from memory; the next write through the app to those tables ends that', async () => {
      t = await makeTestApp({}, { onDisk: true });
      const c = await signedIn(t.app, tobin.email, tobin.password);
      expect((await c.get('/api/auth/me')).body.user.name).not.toBe('Renamed Elsewhere');
      // Written by a connection the app does not know of: the kept row is what the app serves.
      const other = otherConnection(t);
      other.prepare('UPDATE users SET name = ? WHERE email = ?').run('Renamed Elsewhere', tobin.email);
      other.close();
      expect((await c.get('/api/auth/me')).body.user.name).not.toBe('Renamed Elsewhere');
      // A write to another table keeps the cache…
      await t.db('audit_log').insert({ clinic_id: 1, action: 'test.noted', detail: '{}', at: new Date().toISOString() });
      expect((await c.get('/api/auth/me')).body.user.name).not.toBe('Renamed Elsewhere');
      // …one to users (any row) drops it.
      await t.db('users').where({ email: owner.email }).update({ updated_at: new Date().toISOString() });
      expect((await c.get('/api/auth/me')).body.user.name).toBe('Renamed Elsewhere');
    });

    it('reads do not move the generation; a write naming an identity table does; inside a transaction there is none until it ends', async () => {
      t = await makeTestApp({}, { onDisk: true });
      // The start-up sweep of expired sessions (a delete) has run once this one has.
      await t.clearExpiredSessions();
      const g0 = generation(t)!;
      await t.db('users').select('id');
      await t.db('clips').update({ updated_at: '2026-01-01T00:00:00.000Z' }).where({ id: -1 });
      expect(generation(t)).toBe(g0);
      await t.db('clinics').update({ name: 'Larchwood Clinic' }).where({ id: -1 });
      expect(generation(t)).toBeGreaterThan(g0);
      const g1 = generation(t)!;
      let inside: number | null | undefined;
      await t.db.transaction(async (trx) => {
        await trx('users').update({ role: 'owner' }).where({ email: tobin.email });
        inside = generation(t!);
      });
      expect(inside).toBeNull();
      expect(generation(t)).toBeGreaterThan(g1);
    });

    it('a rolled-back change to users: nothing kept during it, the old role read after it', async () => {
      t = await makeTestApp({}, { onDisk: true });
      const c = await signedIn(t.app, tobin.email, tobin.password);
      expect((await c.get('/api/staff')).status).toBe(403);
      await expect(
        t.db.transaction(async (trx) => {
          await trx('users').update({ role: 'owner' }).where({ email: tobin.email });
          // Uncommitted: the reader still sees a coach, and nothing read now is kept.
          expect((await c.get('/api/staff')).status).toBe(403);
          throw new Error('rolled back');
        }),
      ).rejects.toThrow('rolled back');
      expect((await c.get('/api/staff')).status).toBe(403);
      expect((await c.get('/api/auth/me')).body.user.role).toBe('coach');
    });
  },
);

describe('the next request sees every change made through the app', () => {
  it('sign-out: the old cookie, replayed after many cached reads, is signed out', async () => {
    t = await makeTestApp({}, { onDisk: true });
    const c = await signedIn(t.app, tobin.email, tobin.password);
    const cookie = c.cookieHeader();
    for (let i = 0; i < 5; i++) expect((await withCookie(t, cookie, '/api/athletes')).status).toBe(200);
    expect((await c.post('/api/auth/sign-out')).status).toBe(204);
    expect((await withCookie(t, cookie, '/api/athletes')).status).toBe(401);
    expect((await withCookie(t, cookie, '/api/auth/me')).body).toEqual({ user: null });
  });

  it('password reset: every session open before it is signed out', async () => {
    t = await makeTestApp({}, { onDisk: true });
    const c = await signedIn(t.app, tobin.email, tobin.password);
    for (let i = 0; i < 3; i++) expect((await c.get('/api/athletes')).status).toBe(200);
    await new Client(t.app).post('/api/password-resets', { email: tobin.email });
    const token = t.mailer.lastLinkTo(tobin.email).split('/').pop()!;
    expect((await new Client(t.app).post(`/api/password-resets/${token}`, { password: 'another-new-password' })).status).toBe(204);
    expect((await c.get('/api/athletes')).status).toBe(401);
  });

  it('role change: a coach made owner reads the staff list at once, and loses it at once', async () => {
    t = await makeTestApp({}, { onDisk: true });
    const c = await signedIn(t.app, tobin.email, tobin.password);
    for (let i = 0; i < 3; i++) expect((await c.get('/api/staff')).status).toBe(403);
    await t.db('users').where({ email: tobin.email }).update({ role: 'owner' });
    expect((await c.get('/api/staff')).status).toBe(200);
    await t.db('users').where({ email: tobin.email }).update({ role: 'coach' });
    expect((await c.get('/api/staff')).status).toBe(403);
  });

  it('deactivation by the owner: the coach is signed out at the next request', async () => {
    t = await makeTestApp({}, { onDisk: true });
    const o = await signedIn(t.app, owner.email, owner.password);
    const c = await signedIn(t.app, tobin.email, tobin.password);
    for (let i = 0; i < 3; i++) expect((await c.get('/api/athletes')).status).toBe(200);
    const id = (await t.db('users').where({ email: tobin.email }).first<{ id: number }>('id'))!.id;
    expect((await o.post(`/api/staff/${id}/deactivate`, {})).status).toBe(200);
    expect((await c.get('/api/athletes')).status).toBe(401);
  });

  it('erasure: an athlete whose account row is deleted is signed out at the next request', async () => {
    t = await makeTestApp({}, { onDisk: true });
    const a = await signedIn(t.app, ada.email, ada.password);
    for (let i = 0; i < 3; i++) expect((await a.get('/api/auth/me')).body.user.email).toBe(ada.email);
    await t.db('users').where({ email: ada.email }).delete();
    expect((await a.get('/api/auth/me')).body).toEqual({ user: null });
  });

  it('a renamed clinic and an athlete link that ends are in the next answer', async () => {
    t = await makeTestApp({}, { onDisk: true });
    const a = await signedIn(t.app, ada.email, ada.password);
    const me = (await a.get('/api/auth/me')).body.user;
    expect(me.athleteId).not.toBeNull();
    await t.db('clinics').where({ id: me.clinicId }).update({ name: 'Renamed Clinic' });
    expect((await a.get('/api/auth/me')).body.user.clinicName).toBe('Renamed Clinic');
    await t.db('athletes').where({ id: me.athleteId }).update({ user_id: null });
    expect((await a.get('/api/auth/me')).body.user.athleteId).toBeNull();
  });
});
