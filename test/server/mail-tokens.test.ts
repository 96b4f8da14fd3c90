/**
 * No signed-in account can read a message or token meant for another account. Every e-mail goes
 * through the demo's fake SMTP receiver here (as in `npm start`), then a signed-in user calls
 * every GET route of the API with every small id and looks for the other account's token.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { Client, makeTestApp, OTHER, signedIn, type TestApp } from '../support/test-app';
import { listRoutes } from '../support/routes';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';

const [owner, coach] = DEMO_SIGN_INS;
let t: TestApp;

beforeEach(async () => {
  t = await makeTestApp();
});
afterEach(async () => {
  await t.close();
});

/** Asks for a reset link for `email` as an anonymous visitor; answers the token caught by the fake receiver. */
async function resetTokenFor(email: string): Promise<string> {
  expect((await new Client(t.app).post('/api/password-resets', { email })).status).toBe(202);
  const row = await t.db('mailbox_messages').where('to_address', 'like', `%${email}%`).orderBy('id', 'desc').first();
  const token = (row?.text as string | undefined)?.match(/\/reset-password\/([A-Za-z0-9_-]+)/)?.[1];
  if (!token) throw new Error(`no reset mail caught for ${email}`);
  return token;
}

/**
 * Calls every mounted GET route (server-sent events aside) with each id from 1 to `maxId` in every
 * path parameter, and answers the paths whose answer contains `secret`.
 */
async function routesRevealing(c: Client, secret: string, maxId: number): Promise<string[]> {
  const found: string[] = [];
  const gets = listRoutes(t.app).filter((r) => r.startsWith('GET ') && !r.endsWith('-events'));
  expect(gets.length).toBeGreaterThan(20);
  for (const route of gets) {
    const pattern = route.slice(4);
    const ids = pattern.includes(':') ? Array.from({ length: maxId }, (_, i) => i + 1) : [0];
    for (const id of ids) {
      const path = pattern.replace(/:[A-Za-z]+/g, String(id));
      const res = await c.get(path).buffer(true);
      const text = `${res.text ?? ''}${Buffer.isBuffer(res.body) ? res.body.toString('latin1') : JSON.stringify(res.body ?? '')}`;
      if (text.includes(secret)) found.push(path);
    }
  }
  return found;
}

describe('e-mailed tokens stay with their account', () => {
  it("the owner of another clinic cannot obtain clinic A's owner's reset token by any route", async () => {
    const token = await resetTokenFor(owner.email);
    const messages = await t.db('mailbox_messages').count({ n: '*' }).first();
    const other = await signedIn(t.app, OTHER.owner.email, OTHER.owner.password);
    expect(await routesRevealing(other, token, Number(messages?.n ?? 0) + 2)).toEqual([]);
    // The token still works for its owner: it was never used by anyone else.
    expect((await new Client(t.app).get(`/api/password-resets/${token}`)).body).toEqual({ email: owner.email });
  });

  it("inside one clinic the owner cannot read a coach's reset link", async () => {
    const token = await resetTokenFor(coach.email);
    const messages = await t.db('mailbox_messages').count({ n: '*' }).first();
    const o = await signedIn(t.app, owner.email, owner.password);
    expect(await routesRevealing(o, token, Number(messages?.n ?? 0) + 2)).toEqual([]);
  });

  it("a coach's invitation link is not readable by the clinic's coaches or by another clinic's owner", async () => {
    const o = await signedIn(t.app, owner.email, owner.password);
    expect((await o.post('/api/staff/invitations', { email: 'new.coach@larchwood-clinic.test', name: 'New Coach' })).status).toBe(201);
    const row = await t.db('mailbox_messages').where('to_address', 'like', '%new.coach@%').first();
    const token = (row.text as string).match(/\/invitation\/([A-Za-z0-9_-]+)/)![1]!;
    for (const c of [await signedIn(t.app, coach.email, coach.password), await signedIn(t.app, OTHER.owner.email, OTHER.owner.password)]) {
      expect(await routesRevealing(c, token, 4)).toEqual([]);
    }
  });
});
