/**
 * An unexpected failure answers 500 with our fixed words and nothing of the error itself: no
 * message (it can carry stored health data or SQL), no stack (it names our files), while the log
 * keeps the whole error for whoever runs the server. Through the app: routes whose query or stored
 * data fails, as a broken database or a corrupt row would make them.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import pino from 'pino';
import { makeTestApp, signedIn, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { onPostgres } from '../support/test-db';

const [owner, coach] = DEMO_SIGN_INS;
const INTERNAL = { error: { code: 'internal', message: 'Something went wrong on our side. Please try again.' } };

let t: TestApp;
let logs: { level: number; msg: string; err?: { message?: string; stack?: string } }[];

beforeEach(async () => {
  logs = [];
  const logger = pino({ level: 'info' }, { write: (line: string) => void logs.push(JSON.parse(line)) });
  // About the error answer, not mail: the in-memory mailer is enough.
  t = await makeTestApp({}, { logger, fakeSmtp: false });
});
afterEach(async () => {
  await t.close();
});

/** Whether the raw answer shows anything of the thrown error. */
function expectNothingOfTheError(text: string, thrownMessage: string): void {
  expect(text).not.toContain(thrownMessage.slice(0, 24));
  expect(text).not.toMatch(/"stack"|\bat \S+ \(|\.ts:\d+|node_modules|server\//);
}

describe('an internal error', () => {
  it('from stored data that will not parse: 500 with our words only, the log keeps message and stack', async () => {
    // A corrupt row: the exercise's instructions are no longer JSON and start with private words.
    await t.db('exercises').update({ instructions: 'Knee pain 7/10 after the hill session {' });
    const c = await signedIn(t.app, coach.email, coach.password);
    const res = await c.get('/api/exercises');
    expect(res.status).toBe(500);
    expect(res.body).toEqual(INTERNAL);
    expect(res.headers['content-type']).toMatch(/^application\/json/);
    expectNothingOfTheError(res.text, 'Knee pain 7/10');
    expect(res.text).not.toContain('JSON');

    const logged = logs.find((l) => l.msg === 'unhandled error');
    expect(logged?.level).toBe(50); // pino's "error"
    expect(logged?.err?.message).toMatch(/JSON/);
    expect(logged?.err?.stack).toMatch(/exercises-repository/);
  });

  it('from a failed query: 500 without the database’s words (no SQL, no table names)', async () => {
    if (onPostgres) await t.db.raw('DROP TABLE prices CASCADE');
    else await t.db.schema.dropTable('prices');
    const c = await signedIn(t.app, owner.email, owner.password);
    const res = await c.get('/api/prices');
    expect(res.status).toBe(500);
    expect(res.body).toEqual(INTERNAL);
    expectNothingOfTheError(res.text, 'no such table: prices');
    expect(res.text).not.toMatch(/sqlite|select|prices/i);
    expect(logs.some((l) => l.msg === 'unhandled error' && /no such table|does not exist/.test(l.err?.message ?? ''))).toBe(true);
  });
});
