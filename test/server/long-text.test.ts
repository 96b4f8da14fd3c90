/**
 * Text fields at their limit and one past it, on SQLite and PostgreSQL alike: exactly the limit in
 * Cyrillic letters (two UTF-8 bytes each) or in emoji (two UTF-16 units each: the limit counts
 * what a browser's `maxlength` counts) is stored and answered unchanged; one character more is a
 * 422 naming the limit, never a 500 or a cut store. Limits are the shared ones of src/contracts,
 * which the forms show too.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { LIMITS } from '../../src/contracts/intake';
import { PLAN_LIMITS } from '../../src/contracts/plans';
import { LEGAL_LIMITS } from '../../src/contracts/billing';
import { ASSESSMENT_TEXT_LIMITS } from '../../src/contracts/assessment';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { baselineVisit } from '../support/bodies';
import { exerciseBody } from '../support/plans';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let o: Client;
let c: Client;
let athleteId: number;
let assessmentId: number;

beforeAll(async () => {
  t = await makeTestApp();
  o = await signedIn(t.app, owner.email, owner.password);
  c = await signedIn(t.app, coach.email, coach.password);
  athleteId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  assessmentId = (await c.post(`/api/athletes/${athleteId}/assessments`, baselineVisit())).body.id;
});
afterAll(async () => {
  await t?.close();
});

/** An exercise of its own name each time (names are unique in a library). */
const exercise = (over: Record<string, unknown>) => exerciseBody(`Long text ${Math.random().toString(36).slice(2, 8)}`, over);

/** One text field: how to send a value, and where the answer carries it back. */
interface Field {
  what: string;
  limit: number;
  send: (value: string) => Promise<{ status: number; body: Record<string, unknown> }>;
  read: (body: Record<string, unknown>) => unknown;
}
const FIELDS: Field[] = [
  {
    what: 'athlete first name',
    limit: LIMITS.name,
    send: (v) => c.patch(`/api/athletes/${athleteId}`, { firstName: v }),
    read: (b) => b['firstName'],
  },
  {
    what: 'athlete last name',
    limit: LIMITS.name,
    send: (v) => c.patch(`/api/athletes/${athleteId}`, { lastName: v }),
    read: (b) => b['lastName'],
  },
  {
    what: 'assessment shoes',
    limit: ASSESSMENT_TEXT_LIMITS.shoes,
    send: (v) => c.patch(`/api/assessments/${assessmentId}`, { shoes: v }),
    read: (b) => b['shoes'],
  },
  {
    what: 'assessment camera notes',
    limit: ASSESSMENT_TEXT_LIMITS.cameraNotes,
    send: (v) => c.patch(`/api/assessments/${assessmentId}`, { cameraNotes: v }),
    read: (b) => b['cameraNotes'],
  },
  {
    what: 'assessment notes',
    limit: ASSESSMENT_TEXT_LIMITS.notes,
    send: (v) => c.patch(`/api/assessments/${assessmentId}`, { notes: v }),
    read: (b) => b['notes'],
  },
  {
    what: 'exercise name',
    limit: PLAN_LIMITS.text.name,
    send: (v) => c.post('/api/exercises', exercise({ name: v })),
    read: (b) => b['name'],
  },
  {
    what: 'exercise purpose',
    limit: PLAN_LIMITS.text.purpose,
    send: (v) => c.post('/api/exercises', exercise({ purpose: v })),
    read: (b) => b['purpose'],
  },
  {
    what: 'exercise instruction step',
    limit: PLAN_LIMITS.text.instructionStep,
    send: (v) => c.post('/api/exercises', exercise({ instructions: [v] })),
    read: (b) => (b['instructions'] as string[])[0],
  },
  {
    what: 'exercise cautions',
    limit: PLAN_LIMITS.text.cautions,
    send: (v) => c.post('/api/exercises', exercise({ cautions: v })),
    read: (b) => b['cautions'],
  },
  {
    what: 'exercise source',
    limit: PLAN_LIMITS.text.source,
    send: (v) => c.post('/api/exercises', exercise({ source: v })),
    read: (b) => b['source'],
  },
  {
    what: 'price item',
    limit: 80,
    send: (v) => o.post('/api/prices', { item: v, amountMinor: 1000 }),
    read: (b) => b['item'],
  },
  {
    what: 'price description',
    limit: 300,
    send: (v) => o.post('/api/prices', { item: 'Long description', description: v, amountMinor: 1000 }),
    read: (b) => b['description'],
  },
  {
    what: 'clinic legal name',
    limit: LEGAL_LIMITS.legalName,
    send: (v) => o.put('/api/clinic/legal-details', { legalName: v, address: 'Invented Street 1', taxNumber: '', contactLine: '' }),
    read: (b) => b['legalName'],
  },
  {
    what: 'clinic contact line',
    limit: LEGAL_LIMITS.contactLine,
    send: (v) =>
      o.put('/api/clinic/legal-details', { legalName: 'Invented Ltd', address: 'Invented Street 1', taxNumber: '', contactLine: v }),
    read: (b) => b['contactLine'],
  },
];

describe('text at its limit and one past it', () => {
  for (const f of FIELDS) {
    it(`${f.what}: ${f.limit} characters are stored unchanged, ${f.limit + 1} answer 422 naming ${f.limit}`, async () => {
      // Odd limits leave one letter beside the emoji so the length is exactly the limit.
      for (const value of ['ж'.repeat(f.limit), '🏃'.repeat(Math.floor(f.limit / 2)) + 'ж'.repeat(f.limit % 2)]) {
        expect(value.length).toBe(f.limit);
        const res = await f.send(value);
        expect(res.status, `${JSON.stringify(res.body).slice(0, 300)}`).toBeLessThan(300);
        expect(f.read(res.body)).toBe(value);
      }
      const over = await f.send('ж'.repeat(f.limit + 1));
      expect(over.status, JSON.stringify(over.body).slice(0, 300)).toBe(422);
      expect((over.body['error'] as { message: string }).message).toContain(String(f.limit));
    });
  }
});
