/**
 * Departed staff: the owner deactivates a coach (sessions revoked at once, sign-in refused with a
 * clear message, their athletes reassigned to a coach the owner picks or to the owner) and can
 * reactivate them. Every change goes to the audit log.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { Client, makeTestApp, OTHER, signedIn, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { jsonTextEquals } from '../../server/db/dialect';

const [owner, tobin, ilse] = DEMO_SIGN_INS;
let t: TestApp;
let o: Client;
const ids: Record<string, number> = {};

beforeEach(async () => {
  t = await makeTestApp();
  o = await signedIn(t.app, owner.email, owner.password);
  for (const u of [owner, tobin, ilse]) ids[u.email] = (await t.db('users').where({ email: u.email }).first()).id;
});
afterEach(async () => {
  await t.close();
});

const athletesOf = async (userId: number) =>
  (await t.db('athletes').where({ coach_id: userId }).orderBy('id')).map((a: { id: number }) => a.id);

describe('deactivating a coach', () => {
  it('revokes their sessions at once, refuses sign-in with a clear message, and moves their athletes to the coach the owner picks', async () => {
    const tobinsAthletes = await athletesOf(ids[tobin.email]!);
    expect(tobinsAthletes.length).toBeGreaterThan(0);
    const ilsesBefore = await athletesOf(ids[ilse.email]!);
    const c = await signedIn(t.app, tobin.email, tobin.password);
    expect((await c.get('/api/athletes')).status).toBe(200);

    const res = await o.post(`/api/staff/${ids[tobin.email]}/deactivate`, { reassignTo: ids[ilse.email] });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body).toMatchObject({ id: ids[tobin.email], active: false, athleteCount: 0, deactivatedAt: expect.any(String) });

    // Signed out at once: no session row is left, the open browser is signed out.
    expect(await t.db('sessions').where(jsonTextEquals(t.db, 'sess', ['passport', 'user'], ids[tobin.email]!))).toHaveLength(0);
    expect((await c.get('/api/athletes')).status).toBe(401);
    // The right password gets a clear answer; a wrong one the usual one (nothing leaks without the password).
    const refused = await new Client(t.app).post('/api/auth/sign-in', { email: tobin.email, password: tobin.password });
    expect(refused.status).toBe(403);
    expect(refused.body.error).toMatchObject({ code: 'account_deactivated', message: expect.stringMatching(/deactivated.*owner/i) });
    expect((await new Client(t.app).post('/api/auth/sign-in', { email: tobin.email, password: 'not-the-password' })).status).toBe(401);

    expect(await athletesOf(ids[tobin.email]!)).toEqual([]);
    expect(await athletesOf(ids[ilse.email]!)).toEqual([...ilsesBefore, ...tobinsAthletes].sort((a, b) => a - b));
    const audit = await t.db('audit_log').where({ action: 'staff.deactivated' }).first();
    expect(audit).toMatchObject({ actor_id: ids[owner.email] });
    expect(JSON.parse(audit.detail)).toMatchObject({ userId: ids[tobin.email], reassignedTo: ids[ilse.email], athleteIds: tobinsAthletes });

    // Gone from the coach pickers; the Team list shows the state.
    expect((await o.get('/api/coaches')).body.coaches.map((x: { id: number }) => x.id)).not.toContain(ids[tobin.email]);
    const staff = (await o.get('/api/staff')).body.staff as { id: number; active: boolean; athleteCount: number }[];
    expect(staff.find((s) => s.id === ids[tobin.email])).toMatchObject({ active: false, athleteCount: 0 });
    expect(staff.find((s) => s.id === ids[ilse.email])!.athleteCount).toBe(ilsesBefore.length + tobinsAthletes.length);
  });

  it('without a choice, the athletes go to the owner', async () => {
    const tobinsAthletes = await athletesOf(ids[tobin.email]!);
    expect((await o.post(`/api/staff/${ids[tobin.email]}/deactivate`, {})).status).toBe(200);
    expect(await athletesOf(ids[owner.email]!)).toEqual(tobinsAthletes);
  });

  it('ends their open live-status streams at once', async () => {
    const server = http.createServer(t.app).listen(0, '127.0.0.1');
    try {
      const c = await signedIn(t.app, tobin.email, tobin.password);
      const athlete = await t.db('athletes').where({ coach_id: ids[tobin.email] }).first();
      const res = await fetch(`http://127.0.0.1:${(server.address() as AddressInfo).port}/api/athletes/${athlete.id}/processing-events`, {
        headers: { cookie: c.cookieHeader() },
      });
      expect(res.status).toBe(200);
      const body = res.text();
      expect((await o.post(`/api/staff/${ids[tobin.email]}/deactivate`, {})).status).toBe(200);
      await expect(Promise.race([body.then(() => 'ended'), new Promise((r) => setTimeout(() => r('still open'), 3000))])).resolves.toBe(
        'ended',
      );
    } finally {
      server.closeAllConnections();
      server.close();
    }
  });

  it("refuses the owner themselves, unknown or other clinics' people, bad reassignments, and non-owners", async () => {
    const self = await o.post(`/api/staff/${ids[owner.email]}/deactivate`, { reassignTo: ids[ilse.email] });
    expect(self.status).toBe(409);
    expect(self.body.error.code).toBe('cannot_deactivate_self');
    const otherCoach = (await t.db('users').where({ email: OTHER.coach.email }).first()).id;
    const athleteUser = (await t.db('users').where({ email: DEMO_SIGN_INS[3].email }).first()).id;
    for (const id of [otherCoach, athleteUser, 999_999]) expect((await o.post(`/api/staff/${id}/deactivate`, {})).status).toBe(404);
    expect((await o.post('/api/staff/abc/deactivate', {})).status).toBe(404);
    for (const reassignTo of [ids[tobin.email], otherCoach, athleteUser, 999_999]) {
      const bad = await o.post(`/api/staff/${ids[tobin.email]}/deactivate`, { reassignTo });
      expect(bad.status).toBe(422);
      expect(bad.body.error.details[0].path).toEqual(['reassignTo']);
    }
    expect((await o.post(`/api/staff/${ids[tobin.email]}/deactivate`, { reassignTo: 'x' })).status).toBe(422);
    const c = await signedIn(t.app, ilse.email, ilse.password);
    expect((await c.post(`/api/staff/${ids[tobin.email]}/deactivate`, {})).status).toBe(403);
    const otherOwner = await signedIn(t.app, OTHER.owner.email, OTHER.owner.password);
    expect((await otherOwner.post(`/api/staff/${ids[tobin.email]}/deactivate`, {})).status).toBe(404);
    // Nothing changed.
    expect((await t.db('users').where({ id: ids[tobin.email] }).first()).active).toBeTruthy();
    // A deactivated coach cannot take athletes either.
    expect((await o.post(`/api/staff/${ids[ilse.email]}/deactivate`, {})).status).toBe(200);
    expect((await o.post(`/api/staff/${ids[tobin.email]}/deactivate`, { reassignTo: ids[ilse.email] })).status).toBe(422);
    expect((await o.post(`/api/staff/${ids[ilse.email]}/deactivate`, {})).status).toBe(409);
  });
});

describe('reactivating a coach', () => {
  it('lets them sign in again; their former athletes stay with whoever took them', async () => {
    const tobinsAthletes = await athletesOf(ids[tobin.email]!);
    await o.post(`/api/staff/${ids[tobin.email]}/deactivate`, { reassignTo: ids[ilse.email] });
    const res = await o.post(`/api/staff/${ids[tobin.email]}/reactivate`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ id: ids[tobin.email], active: true, deactivatedAt: null, athleteCount: 0 });
    expect((await new Client(t.app).post('/api/auth/sign-in', { email: tobin.email, password: tobin.password })).status).toBe(200);
    expect(await athletesOf(ids[ilse.email]!)).toEqual(expect.arrayContaining(tobinsAthletes));
    expect(await t.db('audit_log').where({ action: 'staff.reactivated' })).toHaveLength(1);
    expect((await o.post(`/api/staff/${ids[tobin.email]}/reactivate`)).status).toBe(409);
    expect((await o.post(`/api/staff/${ids[owner.email]}/reactivate`)).status).toBe(409);
    const c = await signedIn(t.app, ilse.email, ilse.password);
    expect((await c.post(`/api/staff/${ids[tobin.email]}/reactivate`)).status).toBe(403);
  });
});
