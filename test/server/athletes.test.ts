import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { makeTestApp, OTHER, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import type { AthleteIntake } from '../../src/contracts/api';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;

beforeEach(async () => {
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
});
afterEach(async () => {
  await t.close();
});

const intake = (over: Partial<AthleteIntake> = {}): AthleteIntake => ({
  dateOfBirth: '1990-05-04',
  heightCm: 172,
  distanceUnit: 'km',
  weeklyDistance: 50,
  longestRecentRun: 21.1,
  goalEvent: 'Spring trail half',
  goalDate: '2027-04-18',
  surfaces: ['trail', 'road'],
  injuries: [{ region: 'hamstring', side: 'left', when: '2026-03', status: 'recovering', notes: 'Proximal, sitting hurts' }],
  pain: [
    { region: 'hamstring', score: 3 },
    { region: 'calf', score: 1 },
  ],
  consents: { videoRecording: true, shareStills: false },
  ...over,
});

async function newAthlete(): Promise<number> {
  const res = await c.post('/api/athletes', { firstName: 'Rhea', lastName: 'Tamsin', email: 'rhea@runner.test' });
  expect(res.status).toBe(201);
  return res.body.id as number;
}

describe('roster', () => {
  it('lists the clinic’s athletes only, with roster fields', async () => {
    const res = await c.get('/api/athletes');
    expect(res.status).toBe(200);
    const names = res.body.athletes.map((a: { lastName: string }) => a.lastName);
    expect(names).toContain('Kestrel');
    expect(names).not.toContain('Athlete'); // the other clinic's athlete
    const ada = res.body.athletes.find((a: { lastName: string }) => a.lastName === 'Kestrel');
    expect(ada).toMatchObject({ hasAccount: true, videoConsent: true, maxPain: 4, coachName: 'Tobin Achterberg' });
  });

  it('creates an athlete assigned to the creating coach by default', async () => {
    const id = await newAthlete();
    const res = await c.get(`/api/athletes/${id}`);
    expect(res.body).toMatchObject({
      firstName: 'Rhea',
      lastName: 'Tamsin',
      coachName: 'Tobin Achterberg',
      hasAccount: false,
      injuries: [],
      pain: [],
      consents: { videoRecording: null, shareStills: null },
    });
    expect(await t.db('audit_log').where({ athlete_id: id, action: 'athlete.created' })).toHaveLength(1);
  });

  it('rejects bad athlete input with field details and writes nothing', async () => {
    const before = (await t.db('athletes').count({ n: '*' }))[0]!.n;
    const cases: [unknown, string][] = [
      [{ lastName: 'X' }, 'firstName'],
      [{ firstName: 'X'.repeat(81), lastName: 'Y' }, 'firstName'],
      [{ firstName: 'X', lastName: 'Y', email: 'nope' }, 'email'],
      [{ firstName: 'X', lastName: 'Y', dateOfBirth: '2020-02-30' }, 'dateOfBirth'],
      [{ firstName: 'X', lastName: 'Y', dateOfBirth: '2999-01-01' }, 'dateOfBirth'],
      [{ firstName: 'X', lastName: 'Y', coachId: 'two' }, 'coachId'],
      [{ firstName: 'X', lastName: 'Y', clinicId: 2 }, ''],
      [{ firstName: 7, lastName: 'Y' }, 'firstName'],
    ];
    for (const [body, field] of cases) {
      const res = await c.post('/api/athletes', body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(res.body.error.code).toBe('validation_failed');
      if (field) expect(res.body.error.details[0].path[0]).toBe(field);
    }
    expect((await t.db('athletes').count({ n: '*' }))[0]!.n).toBe(before);
  });

  it('refuses a coach from another clinic (422) and a duplicate e-mail (409)', async () => {
    const otherCoach = await t.db('users').where({ email: OTHER.coach.email }).first();
    expect((await c.post('/api/athletes', { firstName: 'A', lastName: 'B', coachId: otherCoach.id })).status).toBe(422);
    expect((await c.post('/api/athletes', { firstName: 'A', lastName: 'B', email: 'ADA.kestrel@runner.test' })).status).toBe(409);
  });

  it('updates details and keeps coach notes from athletes', async () => {
    const id = await newAthlete();
    const res = await c.patch(`/api/athletes/${id}`, { lastName: 'Tamsin-Ode', notes: 'Watch left hip drop' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ lastName: 'Tamsin-Ode', notes: 'Watch left hip drop' });
  });
});

describe('intake', () => {
  it('round-trips the whole intake and records consent history', async () => {
    const id = await newAthlete();
    const res = await c.put(`/api/athletes/${id}/intake`, intake());
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      dateOfBirth: '1990-05-04',
      heightCm: 172,
      weeklyDistance: 50,
      longestRecentRun: 21.1,
      surfaces: ['trail', 'road'],
      pain: [
        { region: 'hamstring', score: 3 },
        { region: 'calf', score: 1 },
      ],
      maxPain: 3,
      videoConsent: true,
    });
    expect(res.body.injuries[0]).toMatchObject({ region: 'hamstring', side: 'left', when: '2026-03', status: 'recovering' });
    expect(res.body.consents.videoRecording).toMatchObject({ granted: true, recordedByName: 'Tobin Achterberg' });
    expect(res.body.consents.shareStills).toBeNull();

    await c.put(`/api/athletes/${id}/intake`, intake({ consents: { videoRecording: false, shareStills: false } }));
    const history = await t.db('consents').where({ athlete_id: id, kind: 'video_recording' }).orderBy('id');
    expect(history.map((h) => Boolean(h.granted))).toEqual([true, false]);
  });

  it('stores miles as kilometres (1 mi = 1.609344 km, international definition) and shows them back in miles', async () => {
    const id = await newAthlete();
    const res = await c.put(`/api/athletes/${id}/intake`, intake({ distanceUnit: 'mi', weeklyDistance: 30, longestRecentRun: 13.1 }));
    expect(res.body).toMatchObject({ distanceUnit: 'mi', weeklyDistance: 30, longestRecentRun: 13.1 });
    const row = await t.db('athletes').where({ id }).first();
    expect(row.weekly_km).toBeCloseTo(48.28032, 5);
  });

  it('keeps pain history when the current set changes', async () => {
    const id = await newAthlete();
    await c.put(`/api/athletes/${id}/intake`, intake());
    await c.put(`/api/athletes/${id}/intake`, intake({ pain: [{ region: 'hamstring', score: 1 }] }));
    const rows = await t.db('pain_entries').where({ athlete_id: id });
    expect(rows).toHaveLength(3);
    expect(rows.filter((r) => r.current)).toHaveLength(1);
  });

  it('rejects bad intake with a field path and leaves the saved intake untouched', async () => {
    const id = await newAthlete();
    await c.put(`/api/athletes/${id}/intake`, intake());
    const bad: [Partial<AthleteIntake> | Record<string, unknown>, (string | number)[]][] = [
      [{ pain: [{ region: 'hamstring', score: 11 }] }, ['pain', 0, 'score']],
      [{ pain: [{ region: 'hamstring', score: 2.5 }] }, ['pain', 0, 'score']],
      [
        {
          pain: [
            { region: 'knee', score: 2 },
            { region: 'knee', score: 3 },
          ],
        },
        ['pain', 1, 'region'],
      ],
      [{ injuries: [{ region: 'calf', side: 'left', when: '2999-01', status: 'active', notes: '' }] }, ['injuries', 0, 'when']],
      [{ injuries: [{ region: 'elbow', side: 'left', when: '2020-01', status: 'active', notes: '' }] }, ['injuries', 0, 'region']],
      [{ heightCm: 20 }, ['heightCm']],
      [{ weeklyDistance: -3 }, ['weeklyDistance']],
      [{ distanceUnit: 'mi', weeklyDistance: 300 }, ['weeklyDistance']],
      [{ surfaces: ['moon'] }, ['surfaces', 0]],
      [{ goalDate: '17/07/2027' }, ['goalDate']],
      [{ consents: { videoRecording: 'yes', shareStills: false } }, ['consents', 'videoRecording']],
      [{ extra: 1 }, []],
    ];
    for (const [over, path] of bad) {
      const res = await c.put(`/api/athletes/${id}/intake`, { ...intake(), ...over });
      expect(res.status, JSON.stringify(over)).toBe(422);
      expect(res.body.error.details[0].path).toEqual(path);
    }
    const after = await c.get(`/api/athletes/${id}`);
    expect(after.body.pain).toEqual(intake().pain);
    expect(after.body.injuries).toHaveLength(1);
  });
});

describe('athlete on their own record', () => {
  it('reads and edits their own intake and names, nothing else', async () => {
    const a = await signedIn(t.app, athlete.email, athlete.password);
    const me = (await a.get('/api/auth/me')).body.user;
    expect(me.athleteId).toEqual(expect.any(Number));
    const own = await a.get(`/api/athletes/${me.athleteId}`);
    expect(own.status).toBe(200);
    expect(own.body.notes).toBeUndefined(); // coach notes stay with staff
    expect((await a.put(`/api/athletes/${me.athleteId}/intake`, intake())).status).toBe(200);
    expect((await a.patch(`/api/athletes/${me.athleteId}`, { firstName: 'Adaline' })).body.firstName).toBe('Adaline');
    const coachField = await a.patch(`/api/athletes/${me.athleteId}`, { coachId: null });
    expect(coachField.status).toBe(403);
    const intakeRow = await t.db('consents').where({ athlete_id: me.athleteId }).orderBy('id', 'desc').first();
    expect(intakeRow.recorded_by).toBe(me.id);
  });

  it('cannot see another athlete, here or in another clinic (404)', async () => {
    const a = await signedIn(t.app, athlete.email, athlete.password);
    const others = await t.db('athletes').whereNot({ email: athlete.email }).select('id');
    for (const o of others) {
      expect((await a.get(`/api/athletes/${o.id}`)).status).toBe(404);
      expect((await a.put(`/api/athletes/${o.id}/intake`, intake())).status).toBe(404);
    }
  });
});
