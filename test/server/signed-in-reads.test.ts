/**
 * Signed-in reads as a real server makes them (database on disk: the session and the user come
 * from the read-only connection by prepared statements, kept in memory until the app writes to the
 * identity tables — see identity-cache.test.ts): access still ends at the very next request when a coach is deactivated, a password is reset or a role
 * changes; the CSRF cookie check remembers only (cookie, session) pairs; API answers carry the CSP
 * without a nonce and pages with a fresh one; one access-log line per API request.
 */
import fs from 'node:fs';
import path from 'node:path';
import { Writable } from 'node:stream';
import pino from 'pino';
import request from 'supertest';
import { afterEach, describe, expect, it } from 'vitest';
import { Client, makeTestApp, OTHER, signedIn, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { SqliteClient } from '../../server/db/sqlite-client';
import { onPostgres, titleSkippedWhen } from '../support/test-db';

const [owner, tobin, ilse, ada] = DEMO_SIGN_INS;
let t: TestApp | null = null;

afterEach(async () => {
  await t?.close();
  t = null;
});

const idOf = async (app: TestApp, email: string) => (await app.db('users').where({ email }).first<{ id: number }>('id'))!.id;

describe('access ends at once (database on disk)', () => {
  it.skipIf(onPostgres)(
    titleSkippedWhen(onPostgres, 'runs on the reader connection', 'SQLite reader connection; PostgreSQL reads through its pool'),
    async () => {
      t = await makeTestApp({}, { onDisk: true });
      await signedIn(t.app, tobin.email, tobin.password);
      expect((t.db.client as unknown as SqliteClient).reader?.open).toBe(true);
    },
  );

  it('a deactivated coach: the next read answers 401, and other coaches read on', async () => {
    t = await makeTestApp({}, { onDisk: true });
    const o = await signedIn(t.app, owner.email, owner.password);
    const c = await signedIn(t.app, tobin.email, tobin.password);
    const other = await signedIn(t.app, ilse.email, ilse.password);
    for (let i = 0; i < 5; i++) expect((await c.get('/api/athletes')).status).toBe(200);
    expect((await o.post(`/api/staff/${await idOf(t, tobin.email)}/deactivate`, {})).status).toBe(200);
    expect((await c.get('/api/athletes')).status).toBe(401);
    expect((await c.get('/api/auth/me')).body).toEqual({ user: null });
    expect((await other.get('/api/athletes')).status).toBe(200);
  });

  it('a password reset signs out the sessions that were open', async () => {
    t = await makeTestApp({}, { onDisk: true });
    const c = await signedIn(t.app, tobin.email, tobin.password);
    expect((await c.get('/api/athletes')).status).toBe(200);
    await new Client(t.app).post('/api/password-resets', { email: tobin.email });
    const token = t.mailer.lastLinkTo(tobin.email).split('/').pop()!;
    expect((await new Client(t.app).post(`/api/password-resets/${token}`, { password: 'a-brand-new-password' })).status).toBe(204);
    expect((await c.get('/api/athletes')).status).toBe(401);
    const again = await signedIn(t.app, tobin.email, 'a-brand-new-password');
    expect((await again.get('/api/athletes')).status).toBe(200);
  });

  it('a changed role applies to the next request (no endpoint changes roles yet: the row is changed directly)', async () => {
    t = await makeTestApp({}, { onDisk: true });
    const c = await signedIn(t.app, tobin.email, tobin.password);
    expect((await c.get('/api/staff')).status).toBe(403);
    await t.db('users').where({ email: tobin.email }).update({ role: 'owner' });
    expect((await c.get('/api/staff')).status).toBe(200);
    expect((await c.get('/api/auth/me')).body.user.role).toBe('owner');
    await t.db('users').where({ email: tobin.email }).update({ role: 'coach' });
    expect((await c.get('/api/staff')).status).toBe(403);
  });
});

describe('CSRF cookie check', () => {
  it('a cookie found valid for a session is not taken once that session ended: the next read sets a new one, which works', async () => {
    t = await makeTestApp({}, { onDisk: true });
    const c = await signedIn(t.app, tobin.email, tobin.password);
    const first = await c.xsrf();
    expect((await c.get('/api/athletes')).status).toBe(200);
    expect((await c.get('/api/athletes')).headers['set-cookie']).toBeUndefined();
    // The session ends elsewhere (a password reset); this browser still holds the old cookie.
    await new Client(t.app).post('/api/password-resets', { email: tobin.email });
    const token = t.mailer.lastLinkTo(tobin.email).split('/').pop()!;
    expect((await new Client(t.app).post(`/api/password-resets/${token}`, { password: 'a-brand-new-password' })).status).toBe(204);
    const me = await c.get('/api/auth/me');
    expect(me.body).toEqual({ user: null });
    const fresh = ([] as string[]).concat(me.headers['set-cookie'] ?? []).find((k) => k.startsWith('XSRF-TOKEN='));
    expect(fresh).toBeDefined();
    expect(decodeURIComponent(fresh!.split(';')[0]!.slice('XSRF-TOKEN='.length))).not.toBe(first);
    await c.refreshToken();
    await c.signIn(tobin.email, 'a-brand-new-password');
    expect((await c.post('/api/athletes', { firstName: 'Fresh', lastName: 'Token' })).status).toBe(201);
  });
});

describe('headers and the access log', () => {
  it('API answers carry the CSP without a nonce; pages get a fresh nonce each time', async () => {
    const clientDir = fs.mkdtempSync(path.join(process.env['TMPDIR'] ?? '/tmp', 'tf-client-'));
    fs.writeFileSync(path.join(clientDir, 'index.html'), '<html><body><app-root></app-root></body></html>');
    t = await makeTestApp({ clientDir });
    const api = await request(t.app).get('/api/config');
    const apiCsp = api.headers['content-security-policy'] as string;
    expect(apiCsp).toContain("default-src 'self'");
    expect(apiCsp).toContain("style-src 'self';");
    expect(apiCsp).not.toContain('nonce-');
    const pages = await Promise.all([request(t.app).get('/athletes'), request(t.app).get('/athletes')]);
    const nonces = pages.map((p) => /'nonce-([^']+)'/.exec(p.headers['content-security-policy'] as string)?.[1]);
    expect(nonces[0]).toBeTruthy();
    expect(nonces[0]).not.toBe(nonces[1]);
    expect(pages[0]!.text).toContain(`ngCspNonce="${nonces[0]}"`);
    fs.rmSync(clientDir, { recursive: true, force: true });
  });

  it('one line per API request: method, URL with e-mailed tokens masked, status and time; no cookie; none for pages', async () => {
    const lines: Record<string, unknown>[] = [];
    const sink = new Writable({
      write(chunk: Buffer, _enc, done) {
        for (const l of chunk.toString().split('\n').filter(Boolean)) lines.push(JSON.parse(l) as Record<string, unknown>);
        done();
      },
    });
    t = await makeTestApp({}, { logger: pino({ level: 'info' }, sink) });
    const c = await signedIn(t.app, tobin.email, tobin.password);
    lines.length = 0;
    await c.get('/api/athletes');
    await request(t.app).get(`/api/password-resets/${'a'.repeat(43)}`);
    await request(t.app).get('/some/page');
    await new Promise((r) => setImmediate(r));
    const requests = lines.filter((l) => l['msg'] === 'request completed');
    expect(requests).toHaveLength(2);
    expect(requests[0]).toMatchObject({
      req: { method: 'GET', url: '/api/athletes' },
      res: { statusCode: 200 },
      responseTime: expect.any(Number),
    });
    expect(requests[1]).toMatchObject({ req: { url: '/api/password-resets/[token]' }, res: { statusCode: 404 } });
    expect(JSON.stringify(lines)).not.toMatch(/tf\.sid|XSRF-TOKEN|a{43}/);
  });
});

describe('the assessment page read (database on disk: prepared reads)', () => {
  it('answers what the rows hold, to the athlete only their own, 404 to another clinic', async () => {
    t = await makeTestApp({}, { onDisk: true });
    const db = t.db;
    const { id: adaId, clinic_id: clinicId } = (await db('athletes')
      .where({ email: ada.email })
      .first<{ id: number; clinic_id: number }>('id', 'clinic_id'))!;
    const visit = (await db('assessments').where({ athlete_id: adaId }).orderBy('id').first<{ id: number; date: string }>('id', 'date'))!;
    const other = (await db('assessments').where({ clinic_id: clinicId }).whereNot({ athlete_id: adaId }).first<{ id: number }>('id'))!;
    // Expected values read from the rows directly (not through the service).
    const consent = await db('consents')
      .where({ athlete_id: adaId, kind: 'video_recording' })
      .orderBy('id', 'desc')
      .first<{ granted: number }>('granted');
    const clipIds = await db('clips').where({ assessment_id: visit.id }).orderBy('id').pluck('id');

    const coach = await signedIn(t.app, tobin.email, tobin.password);
    const page = await coach.get(`/api/assessments/${visit.id}`);
    expect(page.status).toBe(200);
    expect(page.body).toMatchObject({ id: visit.id, athleteId: adaId, date: visit.date, videoConsent: Boolean(consent?.granted) });
    expect(page.body.clips.map((c: { id: number }) => c.id)).toEqual(clipIds);

    await db('consents').insert({
      clinic_id: clinicId,
      athlete_id: adaId,
      kind: 'video_recording',
      granted: false,
      recorded_at: new Date().toISOString(),
    });
    expect((await coach.get(`/api/assessments/${visit.id}`)).body.videoConsent).toBe(false);

    const athlete = await signedIn(t.app, ada.email, ada.password);
    expect((await athlete.get(`/api/assessments/${visit.id}`)).status).toBe(200);
    expect((await athlete.get(`/api/assessments/${other.id}`)).status).toBe(404);
    const elsewhere = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    expect((await elsewhere.get(`/api/assessments/${visit.id}`)).status).toBe(404);
  });
});
