/**
 * HEAD on the progress streams (`/api/athletes/:id/processing-events`, `/api/clinic/processing-events`):
 * Express answers HEAD with the GET route, and Node holds a HEAD answer's headers until it ends, so
 * a stream that never ends left the caller waiting with no answer (and subscribed). It must answer
 * the stream's headers at once and end, after the same access checks as GET.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, OTHER, signedIn, type TestApp } from '../../support/test-app';
import { DEMO_SIGN_INS } from '../../../seeds/demo-scenario';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let server: http.Server;
let base: string;

beforeAll(async () => {
  // About the stream's answer, not mail: the in-memory mailer is enough.
  t = await makeTestApp({}, { fakeSmtp: false });
  server = http.createServer(t.app).listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  server?.closeAllConnections();
  server?.close();
  await t?.close();
});

/** A HEAD request's status and content type, or 'no answer' when none comes within 3 s. */
async function head(path: string, cookie: string): Promise<{ status: number; type: string | null } | 'no answer'> {
  try {
    const res = await fetch(`${base}${path}`, { method: 'HEAD', headers: { cookie }, signal: AbortSignal.timeout(3000) });
    return { status: res.status, type: res.headers.get('content-type') };
  } catch {
    return 'no answer';
  }
}

describe('HEAD on the progress streams', () => {
  it('answers the stream headers at once for whoever may follow it, and 404 / 403 / 401 as GET does for others', async () => {
    const staff = (await signedIn(t.app, coach.email, coach.password)).cookieHeader();
    const self = (await signedIn(t.app, athlete.email, athlete.password)).cookieHeader();
    const foreign = (await signedIn(t.app, OTHER.coach.email, OTHER.coach.password)).cookieHeader();
    const ada = (await t.db('athletes').where({ email: athlete.email }).first()).id;
    const stream = { status: 200, type: 'text/event-stream; charset=utf-8' };
    expect(await head(`/api/athletes/${ada}/processing-events`, staff)).toEqual(stream);
    expect(await head(`/api/athletes/${ada}/processing-events`, self)).toEqual(stream);
    expect(await head('/api/clinic/processing-events', staff)).toEqual(stream);
    expect(await head(`/api/athletes/${ada}/processing-events`, foreign)).toMatchObject({ status: 404 });
    expect(await head('/api/clinic/processing-events', self)).toMatchObject({ status: 403 });
    expect(await head(`/api/athletes/${ada}/processing-events`, '')).toMatchObject({ status: 401 });
  });
});
