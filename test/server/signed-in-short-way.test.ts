/**
 * The short way of signed-in reads (server/http/signed-in.ts): the cookie's signature is checked as
 * express-session signs it (the cookie a real sign-in set is the reference, and express-session's
 * own cookie-signature package signs the forged ones), a read skips express-session's store read
 * only when everything checks out, a session a read changes is saved before the answer, and a
 * forged, signed-out or expired session never gets through.
 */
import { createRequire } from 'node:module';
import express from 'express';
import request from 'supertest';
import pino from 'pino';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { Client, makeTestApp, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { SessionStore, createSessions } from '../../server/http/sessions';
import { signedInSessions, verifiedSessionId } from '../../server/http/signed-in';
import { createPassport } from '../../server/auth/passport-setup';
import { usersRepository } from '../../server/auth/users-repository';

const [, coach] = DEMO_SIGN_INS;
/** express-session's own signer (the package it depends on), to forge and check cookies independently. */
const signature = createRequire(createRequire(import.meta.url).resolve('express-session'))('cookie-signature') as {
  sign(value: string, secret: string): string;
};

let t: TestApp | null = null;
afterEach(async () => {
  vi.restoreAllMocks();
  await t?.close();
  t = null;
});

/** The raw `tf.sid` value of a signed-in client. */
const rawSid = (c: Client) => c.cookieHeader().slice('tf.sid='.length);

describe('verifiedSessionId', () => {
  it('reads the id of the cookie a real sign-in set, and of one signed by express-session’s signer', async () => {
    t = await makeTestApp();
    const c = new Client(t.app);
    await c.signIn(coach.email, coach.password);
    const row = await t.db('sessions').first<{ sid: string }>('sid');
    expect(verifiedSessionId(rawSid(c), t.config.sessionSecret)).toBe(row!.sid);
    const forged = encodeURIComponent(`s:${signature.sign('abc+/=', 'secret-1')}`);
    expect(verifiedSessionId(forged, 'secret-1')).toBe('abc+/=');
  });

  it('refuses another secret, a changed id or signature, an unsigned value and bad encoding', () => {
    const good = `s:${signature.sign('session-id', 'secret-1')}`;
    expect(verifiedSessionId(encodeURIComponent(good), 'secret-2')).toBeNull();
    expect(verifiedSessionId(encodeURIComponent(good.replace('session-id', 'session-ie')), 'secret-1')).toBeNull();
    expect(verifiedSessionId(encodeURIComponent(`${good.slice(0, -1)}${good.endsWith('A') ? 'B' : 'A'}`), 'secret-1')).toBeNull();
    expect(verifiedSessionId(encodeURIComponent(`${good}x`), 'secret-1')).toBeNull();
    expect(verifiedSessionId('session-id', 'secret-1')).toBeNull();
    expect(verifiedSessionId('s%3Aabc.%E0%A4%A', 'secret-1')).toBeNull();
  });
});

describe('signed-in reads in the app', () => {
  it('a read after sign-in skips express-session’s store read; a write and a read needing an extension take the long way', async () => {
    t = await makeTestApp();
    const c = new Client(t.app);
    await c.signIn(coach.email, coach.password);
    const get = vi.spyOn(SessionStore.prototype, 'get');
    expect((await c.get('/api/athletes')).status).toBe(200);
    expect((await c.get('/api/auth/me')).body.user.email).toBe(coach.email);
    expect(get).not.toHaveBeenCalled();
    expect((await c.post('/api/athletes', { firstName: 'Short', lastName: 'Way' })).status).toBe(201);
    expect(get).toHaveBeenCalledTimes(1);
    t.advance(6 * 60_000);
    expect((await c.get('/api/athletes')).status).toBe(200);
    expect(get).toHaveBeenCalledTimes(2);
    // Extended: the next read takes the short way again.
    expect((await c.get('/api/athletes')).status).toBe(200);
    expect(get).toHaveBeenCalledTimes(2);
  });

  it('a forged signature, a signed-out session and an expired one answer 401 on reads', async () => {
    t = await makeTestApp();
    const c = new Client(t.app);
    await c.signIn(coach.email, coach.password);
    const raw = rawSid(c);
    const read = (cookie: string) => request(t!.app).get('/api/athletes').set('Cookie', `tf.sid=${cookie}`);
    expect((await read(raw)).status).toBe(200);
    const sid = (await t.db('sessions').first<{ sid: string }>('sid'))!.sid;
    expect((await read(encodeURIComponent(`s:${signature.sign(sid, 'not-the-secret')}`))).status).toBe(401);
    await t.db('sessions').update({ expired: new Date(Date.now() - 1000).toISOString() });
    expect((await read(raw)).status).toBe(401);
    await t.db('sessions').update({ expired: new Date(Date.now() + 3_600_000).toISOString() });
    expect((await read(raw)).status).toBe(200);
    expect((await c.post('/api/auth/sign-out')).status).toBe(204);
    expect((await read(raw)).status).toBe(401);
  });
});

describe('a read that changes its session', () => {
  it('is saved before the answer, as express-session saves it; an unchanged one writes nothing', async () => {
    t = await makeTestApp();
    const clock = () => new Date();
    const sessions = createSessions({ db: t.db, secret: 'test-secret', secureCookies: false, clock, logger: pino({ level: 'silent' }) });
    const passport = createPassport(t.db);
    const app = express();
    app.use(
      signedInSessions({
        sessions,
        passportSession: passport.session(),
        passport,
        sessionUser: usersRepository.sessionUserReader(t.db),
        logger: pino({ level: 'silent' }),
      }),
    );
    const userId = (await t.db('users').where({ email: coach.email }).first<{ id: number }>('id'))!.id;
    app.post('/in', (req, res, next) => req.logIn({ id: userId } as Express.User, (err) => (err ? next(err) : res.json({ ok: true }))));
    app.get('/note', (req, res) => {
      (req.session as unknown as { note?: string }).note = String(req.query['n']);
      res.json({ user: req.user?.id ?? null });
    });
    app.get('/read', (req, res) =>
      res.json({ user: req.user?.id ?? null, note: (req.session as unknown as { note?: string }).note ?? null }),
    );
    const agent = request.agent(app);
    expect((await agent.post('/in')).status).toBe(200);
    // Marked seen at sign-in elsewhere; here mark it so reads take the short way.
    const row = await t.db('sessions').first<{ sid: string; sess: string }>();
    await t
      .db('sessions')
      .where({ sid: row!.sid })
      .update({ sess: JSON.stringify({ ...JSON.parse(row!.sess), seenAt: Date.now() }) });
    const get = vi.spyOn(SessionStore.prototype, 'get');
    expect((await agent.get('/note?n=first')).body).toEqual({ user: userId });
    expect(JSON.parse((await t.db('sessions').where({ sid: row!.sid }).first<{ sess: string }>())!.sess).note).toBe('first');
    const written = await t.db('sessions').where({ sid: row!.sid }).first();
    expect((await agent.get('/read')).body).toEqual({ user: userId, note: 'first' });
    expect(await t.db('sessions').where({ sid: row!.sid }).first()).toEqual(written);
    expect(get).not.toHaveBeenCalled();
    await sessions.close();
  });
});
