/**
 * A new athlete, visit, plan, price or library exercise sent again after its answer was lost, or twice by a double click: with
 * the same `Idempotency-Key` it answers the one it made (201 with the same id); the same key with
 * other content answers 422 `idempotency_key_reused`; another key (or none, an older client) makes
 * another, as a second athlete or plan may be meant.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { baselineVisit } from '../support/bodies';

const [ownerCred, coachCred, , athleteCred] = DEMO_SIGN_INS;
let t: TestApp;
let owner: Client;
let coach: Client;
let adaId: number;
let exerciseId: number;

const keyed = (c: Client, path: string, key: string, body: unknown) => c.send('post', path, body, { 'Idempotency-Key': key });

/** Sends `body` with `key` twice at once and once more after; answers the three responses. */
async function thrice(c: Client, path: string, key: string, body: unknown) {
  const together = await Promise.all([keyed(c, path, key, body), keyed(c, path, key, body)]);
  return [...together, await keyed(c, path, key, body)];
}

beforeAll(async () => {
  t = await makeTestApp({}, { fakeSmtp: false });
  owner = await signedIn(t.app, ownerCred.email, ownerCred.password);
  coach = await signedIn(t.app, coachCred.email, coachCred.password);
  adaId = (await t.db('athletes').where({ email: athleteCred.email }).first()).id;
  exerciseId = (await coach.get('/api/exercises')).body.exercises[0].id;
});
afterAll(async () => {
  await t?.close();
});

describe('a new athlete without an e-mail address sent again', () => {
  const body = { firstName: 'Noor', lastName: 'Plainfield' };
  const count = async () => (await t.db('athletes').where({ first_name: 'Noor', last_name: 'Plainfield' })).length;

  it('the same key twice at once and after success: one athlete, one audit entry, every answer 201 with its id', async () => {
    const answers = await thrice(coach, '/api/athletes', 'athlete-key-0001', body);
    expect(answers.map((r) => r.status)).toEqual([201, 201, 201]);
    expect(new Set(answers.map((r) => r.body.id)).size).toBe(1);
    expect(await count()).toBe(1);
    expect(await t.db('audit_log').where({ action: 'athlete.created', athlete_id: answers[0]!.body.id })).toHaveLength(1);
  });

  it('the same key with another name answers 422 and makes nothing; another key makes a second athlete (a namesake may be meant)', async () => {
    const reused = await keyed(coach, '/api/athletes', 'athlete-key-0001', { ...body, lastName: 'Other' });
    expect(reused.status).toBe(422);
    expect(reused.body.error.code).toBe('idempotency_key_reused');
    expect((await keyed(coach, '/api/athletes', 'athlete-key-0002', body)).status).toBe(201);
    expect(await count()).toBe(2);
    // A malformed key is refused before anything is made.
    expect((await keyed(coach, '/api/athletes', 'bad key!', body)).status).toBe(422);
    expect(await count()).toBe(2);
  });
});

describe('a new athlete sent again after their coach left', () => {
  it("answers the athlete it made (201, same id), not 422 for the departed coach; the athlete stays with the coach's heir", async () => {
    const ilse = await t.db('users').where({ email: DEMO_SIGN_INS[2].email }).first();
    const body = { firstName: 'Perrin', lastName: 'Ashgrove', coachId: ilse.id };
    const first = await keyed(owner, '/api/athletes', 'athlete-key-0300', body);
    expect(first.status).toBe(201);
    const ownerId = (await t.db('users').where({ email: ownerCred.email }).first()).id;
    expect((await owner.post(`/api/staff/${ilse.id}/deactivate`, { reassignTo: ownerId })).status).toBe(200);
    try {
      // The answer was lost; the page sends the same athlete again with its key.
      const again = await keyed(owner, '/api/athletes', 'athlete-key-0300', body);
      expect(again.status, JSON.stringify(again.body)).toBe(201);
      expect(again.body.id).toBe(first.body.id);
      expect((await t.db('athletes').where({ id: first.body.id }).first()).coach_id).toBe(ownerId);
      // A new athlete for the departed coach is still refused.
      const fresh = await keyed(owner, '/api/athletes', 'athlete-key-0301', { ...body, firstName: 'Quill' });
      expect(fresh.status).toBe(422);
    } finally {
      expect((await owner.post(`/api/staff/${ilse.id}/reactivate`)).status).toBe(200);
    }
  });
});

describe('how long a create key is kept', () => {
  it('a key older than a day answers no more and is removed (the table keeps no hash for long)', async () => {
    const body = { firstName: 'Oona', lastName: 'Brookfield' };
    const first = await keyed(coach, '/api/athletes', 'athlete-key-0100', body);
    expect(first.status).toBe(201);
    await t.db('create_keys').where({ key: 'athlete-key-0100' }).update({ created_at: '2000-01-01T00:00:00.000Z' });
    const later = await keyed(coach, '/api/athletes', 'athlete-key-0100', body);
    expect(later.status).toBe(201);
    expect(later.body.id).not.toBe(first.body.id);
    expect(await t.db('create_keys').where({ key: 'athlete-key-0100' }).pluck('subject_id')).toEqual([later.body.id]);
  });

  it("an athlete's erasure removes the keys that made the athlete and their visits", async () => {
    const made = await keyed(coach, '/api/athletes', 'athlete-key-0200', { firstName: 'Pia', lastName: 'Ashgrove' });
    const id = made.body.id as number;
    expect((await keyed(coach, `/api/athletes/${id}/assessments`, 'visit-key-0200', baselineVisit())).status).toBe(201);
    expect(await t.db('create_keys').whereIn('key', ['athlete-key-0200', 'visit-key-0200'])).toHaveLength(2);
    expect((await owner.post(`/api/athletes/${id}/erasure`, { confirmName: 'Pia Ashgrove' })).status).toBe(200);
    expect(await t.db('create_keys').whereIn('key', ['athlete-key-0200', 'visit-key-0200'])).toHaveLength(0);
  });
});

describe('a new plan sent again', () => {
  const plan = (title: string) => ({
    title,
    assessmentId: null,
    notes: null,
    stages: [
      {
        name: 'Isometric holds',
        goal: '',
        targetWeeks: 2,
        progressionText: '',
        criteria: [],
        exercises: [
          {
            exerciseId,
            dose: { sets: 3, reps: 10, holdSeconds: null, tempo: null, load: null, restSeconds: 60, daysPerWeek: 3 },
            notes: null,
          },
        ],
      },
    ],
  });

  it('the same key twice at once and after success: one draft plan; the same key for another athlete or title 422', async () => {
    const answers = await thrice(coach, `/api/athletes/${adaId}/plans`, 'plan-key-0001', plan('Calf capacity'));
    expect(answers.map((r) => r.status)).toEqual([201, 201, 201]);
    expect(new Set(answers.map((r) => r.body.id)).size).toBe(1);
    expect(await t.db('plans').where({ title: 'Calf capacity' })).toHaveLength(1);
    expect((await keyed(coach, `/api/athletes/${adaId}/plans`, 'plan-key-0001', plan('Calf capacity, take two'))).status).toBe(422);
    const other = (await t.db('athletes').whereNot({ id: adaId }).first()).id;
    expect((await keyed(coach, `/api/athletes/${other}/plans`, 'plan-key-0001', plan('Calf capacity'))).status).toBe(422);
    expect(await t.db('plans').whereLike('title', 'Calf capacity%')).toHaveLength(1);
  });
});

describe('a new price sent again', () => {
  it('the same key twice at once and after success: one price on the list; another key makes another', async () => {
    const body = { item: 'Video review', amountMinor: 4000 };
    const answers = await thrice(owner, '/api/prices', 'price-key-0001', body);
    expect(answers.map((r) => r.status)).toEqual([201, 201, 201]);
    expect(new Set(answers.map((r) => r.body.id)).size).toBe(1);
    expect((await keyed(owner, '/api/prices', 'price-key-0001', { ...body, amountMinor: 4500 })).status).toBe(422);
    expect(await t.db('prices').where({ item: 'Video review' })).toHaveLength(1);
    expect((await keyed(owner, '/api/prices', 'price-key-0002', body)).status).toBe(201);
    expect(await t.db('prices').where({ item: 'Video review' })).toHaveLength(2);
  });
});

describe('a new library exercise sent again', () => {
  it('the same key after success answers the exercise it made (not 409 exercise_name_taken); another key 409 as before', async () => {
    const body = {
      name: 'Wall calf raise hold',
      purpose: 'Calf capacity',
      region: (await t.db('exercises').where({ id: exerciseId }).first()).region,
      kind: (await t.db('exercises').where({ id: exerciseId }).first()).kind,
      dose: { sets: 3, reps: null, holdSeconds: 30, tempo: null, load: null, restSeconds: 60, daysPerWeek: 3 },
      instructions: ['Rise onto the toes and hold.'],
      cautions: '',
    };
    const answers = await thrice(coach, '/api/exercises', 'exercise-key-0001', body);
    expect(answers.map((r) => r.status)).toEqual([201, 201, 201]);
    expect(new Set(answers.map((r) => r.body.id)).size).toBe(1);
    const other = await keyed(coach, '/api/exercises', 'exercise-key-0002', body);
    expect(other.status).toBe(409);
    expect(other.body.error.code).toBe('exercise_name_taken');
    expect(await t.db('exercises').where({ name: 'Wall calf raise hold' })).toHaveLength(1);
  });
});

describe('a new visit sent again', () => {
  it('the same key twice at once and after success: one visit; another key makes a second visit the same day (a second test may be meant)', async () => {
    const count = async () => (await t.db('assessments').where({ athlete_id: adaId, date: '2026-11-29' })).length;
    const answers = await thrice(coach, `/api/athletes/${adaId}/assessments`, 'visit-key-0001', baselineVisit('2026-11-29'));
    expect(answers.map((r) => r.status)).toEqual([201, 201, 201]);
    expect(new Set(answers.map((r) => r.body.id)).size).toBe(1);
    expect(await count()).toBe(1);
    expect((await keyed(coach, `/api/athletes/${adaId}/assessments`, 'visit-key-0002', baselineVisit('2026-11-29'))).status).toBe(201);
    expect(await count()).toBe(2);
  });
});
