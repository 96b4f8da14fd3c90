/**
 * Plans API: exercise library, plans with stages, status changes, the athlete's log (idempotent),
 * progress, progression and alerts. The default pain rule is REFERENCES.md's pain-monitoring entry
 * (Silbernagel et al. 2007 [mem] — from memory); stage criteria in these plans are invented to test
 * the logic.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { makeTestApp, OTHER, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { DEMO_EXERCISES } from '../../seeds/demo-exercises';
import { seedDemoHamstringPlan } from '../../seeds/demo-plans';
import type { Exercise, PlanDetail, PlanWrite, StageWrite } from '../../src/contracts/plans';
import { DEFAULT_PAIN_RULE } from '../../src/contracts/plans';
import { ExerciseBody } from '../../server/plans/plans-schemas';

const [, coach, , athlete] = DEMO_SIGN_INS;
const DAY = 86_400_000;
let t: TestApp;
let c: Client;
let a: Client;
let adaId: number;
let library: Exercise[];

const isoDay = (offsetDays = 0) => new Date(Date.now() + offsetDays * DAY).toISOString().slice(0, 10);

beforeEach(async () => {
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  a = await signedIn(t.app, athlete.email, athlete.password);
  adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  library = (await c.get('/api/exercises')).body.exercises;
});
afterEach(async () => {
  await t.close();
});

const ex = (name: string) => {
  const e = library.find((x) => x.name === name);
  if (!e) throw new Error(`no exercise ${name}`);
  return { exerciseId: e.id, dose: e.dose, notes: null };
};

function stage(name: string, exercises: string[], over: Partial<StageWrite> = {}): StageWrite {
  return {
    name,
    goal: `${name} goal`,
    targetWeeks: 2,
    progressionText: 'When it feels easy.',
    criteria: [],
    exercises: exercises.map(ex),
    ...over,
  };
}

function threeStages(over: Partial<PlanWrite> = {}): PlanWrite {
  return {
    title: 'Hamstring strain: staged loading',
    assessmentId: null,
    notes: 'Coach-only note',
    stages: [
      stage('Isometric holds', ['Bent-knee bridge hold', 'Prone hamstring hold'], {
        criteria: [
          { kind: 'pain_during_at_most', max: 3, sessions: 2 },
          { kind: 'settled_by_morning', sessions: 2 },
        ],
      }),
      stage('Slow lengthening', ['Hip-flexed knee extension']),
      stage('Fast and running drills', ['Springy skips', 'Walk-jog return intervals']),
    ],
    ...over,
  };
}

async function createPlan(body: PlanWrite = threeStages()): Promise<PlanDetail> {
  const res = await c.post(`/api/athletes/${adaId}/plans`, body);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body;
}

async function startedPlan(): Promise<PlanDetail> {
  const plan = await createPlan();
  const res = await c.post(`/api/plans/${plan.id}/transitions`, { action: 'start' });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body;
}

let keyN = 0;
const newKey = () => `key-${Date.now().toString(36)}-${++keyN}-${Math.random().toString(36).slice(2, 8)}`;

function logBody(plan: PlanDetail, over: Record<string, unknown> = {}) {
  const current = plan.stages.find((s) => s.id === plan.currentStageId)!;
  return {
    key: newKey(),
    stageId: current.id,
    date: isoDay(),
    painDuring: 2,
    sets: current.exercises.map((e) => ({ stageExerciseId: e.id, setsDone: e.dose.sets })),
    note: null,
    ...over,
  };
}

const logCount = async () => Number((await t.db('log_entries').count({ n: '*' }))[0]!.n);

describe('exercise library', () => {
  it('seeds the clinic library in our own words, searchable by text, region, loading kind and source', async () => {
    expect(library.map((e) => e.name)).toEqual(
      expect.arrayContaining([
        'Bent-knee bridge hold',
        'Hip-flexed knee extension',
        'Gliding split',
        'Nordic hamstring lowering',
        'Heavy slow calf raise',
      ]),
    );
    expect(library).toHaveLength(DEMO_EXERCISES.length);
    const iso = (await c.get('/api/exercises?kind=isometric&region=hamstring')).body.exercises.map((e: Exercise) => e.name);
    expect(iso.sort()).toEqual(['Bent-knee bridge hold', 'Prone hamstring hold']);
    const text = (await c.get('/api/exercises?q=HEEL drop')).body.exercises.map((e: Exercise) => e.name);
    expect(text).toEqual(['Heel drop from a step, bent knee', 'Heel drop from a step, straight knee']);
    // The source is searchable too: the three exercises of the lengthening programme.
    const askling = (await c.get('/api/exercises?q=askling')).body.exercises.map((e: Exercise) => e.name);
    expect(askling).toEqual(['Gliding split', 'Hip-flexed knee extension', 'Single-leg forward tilt with reach']);
    // LIKE wildcards are matched literally: "%" finds only texts with a per cent sign, "_" none.
    const percent = (await c.get('/api/exercises?q=%25')).body.exercises.map((e: Exercise) => e.name);
    expect(percent).toEqual(['Step-rate run']);
    expect((await c.get('/api/exercises?q=_')).body.exercises).toEqual([]);
    expect((await c.get('/api/exercises?kind=jumping')).status).toBe(422);
  });

  it('every demo exercise cites a published programme of REFERENCES.md ("Published exercise programmes", from memory)', () => {
    // Author, year and journal as REFERENCES.md lists them (all [mem] — from memory — except
    // Heiderscheit et al. 2011, read in the publication [pub]).
    const programmes = [
      'Goom, Malliaras, Reiman & Purdam 2016, J Orthop Sports Phys Ther 46(6):483–493',
      'Askling et al. 2013, Br J Sports Med 47:953–959',
      'Sherry & Best 2004, J Orthop Sports Phys Ther 34:116–125',
      'Petersen et al. 2011, Am J Sports Med 39:2296–2303',
      'Alfredson et al. 1998, Am J Sports Med 26:360–366',
      'Beyer et al. 2015, Am J Sports Med 43:1704–1711',
      'Heiderscheit et al. 2011, Med Sci Sports Exerc 43(2):296–302',
      'Crossley et al. 2016, Br J Sports Med 50:839–843',
      'Rio et al. 2015, Br J Sports Med 49:1277–1283',
      'Heiderscheit et al. 2010, J Orthop Sports Phys Ther 40(2):67–81',
    ];
    for (const e of DEMO_EXERCISES) {
      const cited = programmes.filter((p) => e.source.startsWith(p));
      expect(cited, e.name).toHaveLength(1);
      if (!cited[0]!.startsWith('Heiderscheit et al. 2011')) expect(e.source, e.name).toContain('from memory');
      // Purpose, steps, a progression step and what to watch, within the API's limits.
      expect(e.instructions.at(-1), e.name).toMatch(/^To progress/);
      expect(e.cautions.length, e.name).toBeGreaterThan(20);
    }
    const served = library.find((e) => e.name === 'Gliding split')!;
    expect(served.source).toMatch(/^Askling et al\. 2013, Br J Sports Med 47:953–959/);
  });
  it('every demo exercise passes the API’s own validation', () => {
    for (const e of DEMO_EXERCISES) expect(ExerciseBody.safeParse(e).success, e.name).toBe(true);
  });

  it('creates, edits and archives an exercise; archived ones leave the library list', async () => {
    const body = {
      name: 'Split-squat hold',
      purpose: 'Thigh endurance.',
      region: 'thigh',
      kind: 'isometric',
      dose: { sets: 3, reps: null, holdSeconds: 45, tempo: null, load: null, restSeconds: 60, daysPerWeek: 3 },
      instructions: ['Step into a split stance.', 'Lower halfway and hold.'],
      cautions: '',
    };
    const created = await c.post('/api/exercises', body);
    expect(created.status).toBe(201);
    // Without a source the exercise is the clinic's own: stored with an empty source.
    expect(created.body).toMatchObject({ name: 'Split-squat hold', archived: false, dose: { holdSeconds: 45 }, source: '' });
    const patched = await c.patch(`/api/exercises/${created.body.id}`, { purpose: 'Front-of-thigh endurance.' });
    expect(patched.body.purpose).toBe('Front-of-thigh endurance.');
    const sourced = await c.patch(`/api/exercises/${created.body.id}`, { source: '  Crossley et al. 2016, Br J Sports Med 50:839–843 ' });
    expect(sourced.body).toMatchObject({
      source: 'Crossley et al. 2016, Br J Sports Med 50:839–843',
      purpose: 'Front-of-thigh endurance.',
    });
    // Another edit leaves the source alone; a source past 300 characters is refused and changes nothing.
    expect((await c.patch(`/api/exercises/${created.body.id}`, { cautions: 'Ease off if the knee aches.' })).body.source).toBe(
      'Crossley et al. 2016, Br J Sports Med 50:839–843',
    );
    const tooLong = await c.patch(`/api/exercises/${created.body.id}`, { source: 'x'.repeat(301) });
    expect(tooLong.status).toBe(422);
    expect(tooLong.body.error.details[0].path).toEqual(['source']);
    expect((await c.get(`/api/exercises/${created.body.id}`)).body.source).toBe('Crossley et al. 2016, Br J Sports Med 50:839–843');
    expect((await c.post('/api/exercises', { ...body, name: 'split-SQUAT hold' })).body.error.code).toBe('exercise_name_taken');
    expect((await c.delete(`/api/exercises/${created.body.id}`)).status).toBe(204);
    expect((await c.get('/api/exercises')).body.exercises.map((e: Exercise) => e.name)).not.toContain('Split-squat hold');
    expect((await c.get('/api/exercises?archived=true')).body.exercises.map((e: Exercise) => e.name)).toEqual(['Split-squat hold']);
  });

  it('refuses negative or missing doses with field paths, and writes nothing', async () => {
    const before = (await t.db('exercises').count({ n: '*' }))[0]!.n;
    const base = { name: 'X', purpose: 'Y', region: 'hip', kind: 'mobility', instructions: ['Z'], cautions: '' };
    const cases: [Record<string, unknown>, string][] = [
      [{ sets: -1, reps: 5, holdSeconds: null, tempo: null, load: null, restSeconds: null, daysPerWeek: 3 }, 'dose.sets'],
      [{ sets: 3, reps: -5, holdSeconds: null, tempo: null, load: null, restSeconds: null, daysPerWeek: 3 }, 'dose.reps'],
      [{ sets: 3, reps: 5, holdSeconds: null, tempo: null, load: null, restSeconds: -10, daysPerWeek: 3 }, 'dose.restSeconds'],
      [{ sets: 3, reps: null, holdSeconds: null, tempo: null, load: null, restSeconds: null, daysPerWeek: 3 }, 'dose.reps'],
      [{ sets: 3, reps: 5, holdSeconds: null, tempo: null, load: null, restSeconds: null, daysPerWeek: 8 }, 'dose.daysPerWeek'],
    ];
    for (const [dose, path] of cases) {
      const res = await c.post('/api/exercises', { ...base, dose });
      expect(res.status).toBe(422);
      expect(res.body.error.details.map((d: { path: string[] }) => d.path.join('.'))).toContain(path);
    }
    expect((await t.db('exercises').count({ n: '*' }))[0]!.n).toBe(before);
  });

  it('another clinic sees neither the library nor an exercise by id (404)', async () => {
    const other = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    expect((await other.get('/api/exercises')).body.exercises).toEqual([]);
    expect((await other.get(`/api/exercises/${library[0]!.id}`)).status).toBe(404);
    expect((await other.patch(`/api/exercises/${library[0]!.id}`, { purpose: 'x' })).status).toBe(404);
  });
});

describe('plans', () => {
  it('builds a three-stage plan from the library, linked to the assessment it came from', async () => {
    const retest = await t.db('assessments').where({ athlete_id: adaId, kind: 'retest' }).first();
    const plan = await createPlan(threeStages({ assessmentId: retest.id }));
    expect(plan).toMatchObject({
      status: 'draft',
      athleteId: adaId,
      assessmentId: retest.id,
      assessmentDate: retest.date,
      stageCount: 3,
      currentStageId: null,
      painRule: DEFAULT_PAIN_RULE,
      notes: 'Coach-only note',
    });
    expect(plan.stages.map((s) => s.name)).toEqual(['Isometric holds', 'Slow lengthening', 'Fast and running drills']);
    expect(plan.stages[0]!.exercises.map((e) => e.exercise.name)).toEqual(['Bent-knee bridge hold', 'Prone hamstring hold']);
    expect(plan.stages[0]!.sessionsPerWeek).toBe(4);
    expect(await t.db('audit_log').where({ athlete_id: adaId, action: 'plan.created' })).toHaveLength(1);
  });

  it('a plan for an athlete of another clinic is 404, and so is another clinic’s plan', async () => {
    const otherAthlete = await t.db('athletes').where({ email: OTHER.athlete.email }).first();
    expect((await c.post(`/api/athletes/${otherAthlete.id}/plans`, threeStages())).status).toBe(404);
    const plan = await createPlan();
    const other = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    expect((await other.post(`/api/athletes/${adaId}/plans`, threeStages())).status).toBe(404);
    expect((await other.get(`/api/plans/${plan.id}`)).status).toBe(404);
    expect((await other.post(`/api/plans/${plan.id}/transitions`, { action: 'start' })).status).toBe(404);
    expect(await t.db('plans').where({ athlete_id: otherAthlete.id })).toHaveLength(0);
  });

  it('refuses another athlete’s assessment, unknown or archived exercises, and bad doses (422, nothing written)', async () => {
    const before = (await t.db('plans').count({ n: '*' }))[0]!.n;
    const teodorVisit = await t.db('assessments').whereNot({ athlete_id: adaId }).first();
    const bad1 = await c.post(`/api/athletes/${adaId}/plans`, threeStages({ assessmentId: teodorVisit.id }));
    expect(bad1.status).toBe(422);
    expect(bad1.body.error.details[0].path).toEqual(['assessmentId']);
    const body = threeStages();
    body.stages[1]!.exercises[0]!.exerciseId = 999_999;
    const bad2 = await c.post(`/api/athletes/${adaId}/plans`, body);
    expect(bad2.body.error.details[0].path).toEqual(['stages', 1, 'exercises', 0, 'exerciseId']);
    await c.delete(`/api/exercises/${library.find((e) => e.name === 'Prone hamstring hold')!.id}`);
    expect((await c.post(`/api/athletes/${adaId}/plans`, threeStages())).status).toBe(422);
    const body3 = threeStages();
    body3.stages[0]!.exercises = [{ ...ex('Hip-flexed knee extension'), dose: { ...ex('Hip-flexed knee extension').dose, sets: -2 } }];
    const bad3 = await c.post(`/api/athletes/${adaId}/plans`, body3);
    expect(bad3.status).toBe(422);
    expect(bad3.body.error.details[0].path).toEqual(['stages', 0, 'exercises', 0, 'dose', 'sets']);
    expect((await c.post(`/api/athletes/${adaId}/plans`, { ...threeStages(), stages: [] })).status).toBe(422);
    expect((await t.db('plans').count({ n: '*' }))[0]!.n).toBe(before);
  });

  it('the athlete sees their plan only once started, without coach notes; never drafts', async () => {
    const plan = await createPlan();
    expect((await a.get(`/api/plans/${plan.id}`)).status).toBe(404);
    expect((await a.get(`/api/athletes/${adaId}/plans`)).body.plans.filter((p: { title: string }) => p.title === plan.title)).toEqual([]);
    await c.post(`/api/plans/${plan.id}/transitions`, { action: 'start' });
    const mine = await a.get(`/api/plans/${plan.id}`);
    expect(mine.status).toBe(200);
    expect(mine.body).toMatchObject({ status: 'active', notes: null, currentStagePosition: 1 });
    expect(mine.body.stages[0].exercises[0].exercise.instructions.length).toBeGreaterThan(0);
    expect((await a.post(`/api/athletes/${adaId}/plans`, threeStages())).status).toBe(403);
    expect((await a.post(`/api/plans/${plan.id}/transitions`, { action: 'pause' })).status).toBe(403);
  });

  it('start → advance → pause → resume → finish, with clear 409s for the wrong order', async () => {
    const plan = await createPlan();
    const go = (action: string) => c.post(`/api/plans/${plan.id}/transitions`, { action });
    expect((await go('advance')).status).toBe(409);
    expect((await go('pause')).body.error.code).toBe('invalid_transition');
    const started = (await go('start')).body as PlanDetail;
    expect(started).toMatchObject({ status: 'active', currentStageId: started.stages[0]!.id });
    expect(started.stages[0]!.startedAt).not.toBeNull();
    expect((await go('start')).status).toBe(409);
    const second = await go('advance');
    expect(second.body).toMatchObject({ currentStageId: started.stages[1]!.id, currentStagePosition: 2 });
    expect(second.body.stages[0].completedAt).not.toBeNull();
    expect((await go('pause')).body.status).toBe('paused');
    expect((await go('advance')).status).toBe(409);
    expect((await go('resume')).body.status).toBe('active');
    await go('advance');
    expect((await go('advance')).body.error.code).toBe('last_stage');
    const done = await go('finish');
    expect(done.body).toMatchObject({ status: 'finished' });
    expect(done.body.finishedAt).not.toBeNull();
    expect((await go('resume')).status).toBe(409);
    expect((await c.put(`/api/plans/${plan.id}`, { ...threeStages(), baseRevision: done.body.revision })).body.error.code).toBe(
      'plan_finished',
    );
    expect((await go('jump')).status).toBe(422);
  });

  it('one running plan per athlete; only drafts can be deleted', async () => {
    const first = await startedPlan();
    const second = await createPlan();
    expect((await c.post(`/api/plans/${second.id}/transitions`, { action: 'start' })).body.error.code).toBe('athlete_has_active_plan');
    expect((await c.delete(`/api/plans/${first.id}`)).body.error.code).toBe('plan_not_draft');
    expect((await c.delete(`/api/plans/${second.id}`)).status).toBe(204);
    expect(await t.db('plan_stages').where({ plan_id: second.id })).toHaveLength(0);
  });

  it('a plan cannot start without exercises in its first stage', async () => {
    const plan = await createPlan(threeStages({ stages: [stage('Empty', [])] }));
    expect((await c.post(`/api/plans/${plan.id}/transitions`, { action: 'start' })).body.error.code).toBe('plan_incomplete');
  });

  it('PUT replaces content, keeping stage ids; a started stage cannot be removed', async () => {
    const plan = await startedPlan();
    const body = threeStages();
    body.stages = plan.stages.map((s) => ({
      id: s.id,
      name: s.name,
      goal: s.goal,
      targetWeeks: s.targetWeeks,
      progressionText: s.progressionText,
      criteria: s.criteria,
      exercises: s.exercises.map((e) => ({ exerciseId: e.exerciseId, dose: e.dose, notes: e.notes })),
    }));
    body.stages[1]!.targetWeeks = 4;
    body.stages.push(stage('Back to running', ['Step-rate run']));
    const res = await c.put(`/api/plans/${plan.id}`, { ...body, baseRevision: plan.revision });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.stages.map((s: { id: number }) => s.id).slice(0, 3)).toEqual(plan.stages.map((s) => s.id));
    expect(res.body.stages[1].targetWeeks).toBe(4);
    expect(res.body.stages).toHaveLength(4);
    const without = await c.put(`/api/plans/${plan.id}`, { ...body, stages: body.stages.slice(1), baseRevision: res.body.revision });
    expect(without.body.error.code).toBe('stage_in_use');
    const foreign = await c.put(`/api/plans/${plan.id}`, {
      ...body,
      stages: [{ ...body.stages[0]!, id: 424242 }],
      baseRevision: res.body.revision,
    });
    expect(foreign.status).toBe(422);
  });
});

describe('athlete log', () => {
  it('logs a session with sets and pain; the coach and the athlete read it back', async () => {
    const plan = await startedPlan();
    const body = logBody(plan, { painDuring: 3, note: 'Felt steady' });
    const res = await a.post(`/api/plans/${plan.id}/logs`, body);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ key: body.key, painDuring: 3, morningPain: null, stageName: 'Isometric holds', note: 'Felt steady' });
    expect(res.body.sets).toEqual([
      { stageExerciseId: plan.stages[0]!.exercises[0]!.id, name: 'Bent-knee bridge hold', setsPrescribed: 5, setsDone: 5 },
      { stageExerciseId: plan.stages[0]!.exercises[1]!.id, name: 'Prone hamstring hold', setsPrescribed: 4, setsDone: 4 },
    ]);
    expect((await c.get(`/api/plans/${plan.id}/logs`)).body.logs).toHaveLength(1);
    expect((await a.get(`/api/plans/${plan.id}/logs`)).body.logs[0].id).toBe(res.body.id);
  });

  it('is idempotent: a retried POST with the same key answers the same entry (200) and adds nothing', async () => {
    const plan = await startedPlan();
    const body = logBody(plan);
    const first = await a.post(`/api/plans/${plan.id}/logs`, body);
    expect(first.status).toBe(201);
    const again = await a.post(`/api/plans/${plan.id}/logs`, body);
    expect(again.status).toBe(200);
    expect(again.body).toEqual(first.body);
    // Even a retry that arrives after the coach moved the plan on answers the stored entry.
    await c.post(`/api/plans/${plan.id}/transitions`, { action: 'advance' });
    expect((await a.post(`/api/plans/${plan.id}/logs`, body)).status).toBe(200);
    expect(await logCount()).toBe(1 + 7); // the seeded demo plan holds 7 sessions
  });

  it('copies of one submission sent at once make exactly one row', async () => {
    const plan = await startedPlan();
    const body = logBody(plan);
    const results = await Promise.all([1, 2, 3, 4].map(() => a.post(`/api/plans/${plan.id}/logs`, body)));
    expect(results.map((r) => r.status).sort()).toEqual([200, 200, 200, 201]);
    expect(new Set(results.map((r) => r.body.id)).size).toBe(1);
    expect(await t.db('log_entries').where({ idempotency_key: body.key })).toHaveLength(1);
  });

  it('refuses pain outside 0–10, negative sets, bad dates and unknown exercises (422), keeping nothing half-written', async () => {
    const plan = await startedPlan();
    const before = await logCount();
    const cases: [Record<string, unknown>, string][] = [
      [{ painDuring: 11 }, 'painDuring'],
      [{ painDuring: -1 }, 'painDuring'],
      [{ painDuring: 2.5 }, 'painDuring'],
      [{ painDuring: '3' }, 'painDuring'],
      [{ sets: [{ stageExerciseId: plan.stages[0]!.exercises[0]!.id, setsDone: -1 }] }, 'sets.0.setsDone'],
      [{ sets: [{ stageExerciseId: plan.stages[1]!.exercises[0]!.id, setsDone: 1 }] }, 'sets.0.stageExerciseId'],
      [{ date: isoDay(3) }, 'date'],
      [{ date: isoDay(-30) }, 'date'],
      [{ date: '2026-02-30' }, 'date'],
      [{ key: 'short' }, 'key'],
    ];
    for (const [over, path] of cases) {
      const res = await a.post(`/api/plans/${plan.id}/logs`, logBody(plan, over));
      expect(res.status, `${JSON.stringify(over)} → ${JSON.stringify(res.body)}`).toBe(422);
      expect(res.body.error.details.map((d: { path: (string | number)[] }) => d.path.join('.'))).toContain(path);
    }
    expect(await logCount()).toBe(before);
  });

  it('refuses a log for a stage that is not current (409) and for a paused plan', async () => {
    const plan = await startedPlan();
    const second = plan.stages[1]!;
    const res = await a.post(`/api/plans/${plan.id}/logs`, logBody(plan, { stageId: second.id, sets: [] }));
    expect(res.status).toBe(409);
    expect(res.body.error).toMatchObject({ code: 'stage_not_current' });
    expect(res.body.error.message).toContain('Slow lengthening');
    await c.post(`/api/plans/${plan.id}/transitions`, { action: 'pause' });
    expect((await a.post(`/api/plans/${plan.id}/logs`, logBody(plan))).body.error.code).toBe('plan_not_active');
  });

  it('only the athlete logs their own plan: staff 403, another clinic 404, a key of another plan 409', async () => {
    const plan = await startedPlan();
    expect((await c.post(`/api/plans/${plan.id}/logs`, logBody(plan))).status).toBe(403);
    const other = await signedIn(t.app, OTHER.athlete.email, OTHER.athlete.password);
    expect((await other.post(`/api/plans/${plan.id}/logs`, logBody(plan))).status).toBe(404);
    expect((await other.get(`/api/plans/${plan.id}/logs`)).status).toBe(404);
    const seeded = await t.db('log_entries').first();
    const reused = await a.post(`/api/plans/${plan.id}/logs`, logBody(plan, { key: seeded.idempotency_key }));
    expect(reused.status).toBe(409);
    expect(reused.body.error.code).toBe('idempotency_key_reused');
  });

  it('one-tap morning check by key (repeatable), 0–10 only', async () => {
    const plan = await startedPlan();
    const body = logBody(plan);
    await a.post(`/api/plans/${plan.id}/logs`, body);
    const res = await a.put(`/api/plans/${plan.id}/logs/${body.key}/morning`, { pain: 1 });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ morningPain: 1 });
    expect(res.body.morningAt).toEqual(expect.any(String));
    expect((await a.put(`/api/plans/${plan.id}/logs/${body.key}/morning`, { pain: 1 })).body.morningAt).toBe(res.body.morningAt);
    expect((await a.put(`/api/plans/${plan.id}/logs/${body.key}/morning`, { pain: 12 })).status).toBe(422);
    expect((await a.put(`/api/plans/${plan.id}/logs/unknown-key-123/morning`, { pain: 1 })).status).toBe(404);
    expect((await c.put(`/api/plans/${plan.id}/logs/${body.key}/morning`, { pain: 1 })).status).toBe(403);
  });
});

describe('progress, progression and alerts', () => {
  it('suggests the next stage once the (invented) criteria are met; the coach decides', async () => {
    const plan = await startedPlan();
    const progress = async () => (await c.get(`/api/plans/${plan.id}/progress`)).body;
    expect((await progress()).progression).toMatchObject({ stageId: plan.stages[0]!.id, ready: false, nextStageId: plan.stages[1]!.id });
    for (const [offset, pain] of [
      [-1, 3],
      [0, 2],
    ] as const) {
      const body = logBody(plan, { date: isoDay(offset), painDuring: pain });
      await a.post(`/api/plans/${plan.id}/logs`, body);
      await a.put(`/api/plans/${plan.id}/logs/${body.key}/morning`, { pain: 1 });
    }
    const p = await progress();
    expect(p.progression.ready).toBe(true);
    expect(p.progression.checks.map((x: { met: boolean }) => x.met)).toEqual([true, true]);
    // Nothing moved by itself.
    expect((await c.get(`/api/plans/${plan.id}`)).body.currentStageId).toBe(plan.stages[0]!.id);
  });

  it('counts sessions done against prescribed per week, and lists pain over time', async () => {
    const plan = await startedPlan();
    await a.post(`/api/plans/${plan.id}/logs`, logBody(plan, { painDuring: 2 }));
    const p = (await a.get(`/api/plans/${plan.id}/progress`)).body;
    expect(p.adherence.at(-1)).toMatchObject({ done: 1 });
    expect(p.adherence.at(-1).prescribed).toBeGreaterThan(0);
    expect(p.pain).toEqual([{ date: isoDay(), painDuring: 2, morningPain: null, stageId: plan.stages[0]!.id }]);
  });

  it('from memory (Silbernagel 2007 [mem]): pain above 5/10 and a week-over-week rise alert on the plan and the roster, naming the rule', async () => {
    const plan = await startedPlan();
    // Test fixture: the plan began two weeks ago, so two sessions can sit in last week.
    const weekAgo = new Date(Date.now() - 14 * DAY).toISOString();
    await t.db('plans').where({ id: plan.id }).update({ started_at: weekAgo });
    await t.db('plan_stages').where({ plan_id: plan.id }).update({ started_at: weekAgo });
    const monday = (offset: number) => {
      const d = new Date(Date.now() + offset * DAY);
      d.setUTCDate(d.getUTCDate() - ((d.getUTCDay() + 6) % 7));
      return d.toISOString().slice(0, 10);
    };
    const lastMonday = monday(-7);
    const lastWeek = [lastMonday, new Date(Date.parse(lastMonday) + DAY).toISOString().slice(0, 10)];
    for (const date of lastWeek) await a.post(`/api/plans/${plan.id}/logs`, logBody(plan, { painDuring: 2, date }));
    // One session at 3/10, inside the 5/10 limit: one session is not a weekly trend — no alert.
    await a.post(`/api/plans/${plan.id}/logs`, logBody(plan, { painDuring: 3 }));
    const quiet = (await c.get('/api/plan-alerts')).body.alerts;
    expect(quiet.find((x: { athleteId: number }) => x.athleteId === adaId)).toBeUndefined();

    const res = await a.post(`/api/plans/${plan.id}/logs`, logBody(plan, { painDuring: 6 }));
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const progress = (await c.get(`/api/plans/${plan.id}/progress`)).body.alerts as { kind: string; message: string }[];
    expect(progress.map((x) => x.kind)).toEqual(['during_above_max', 'weekly_rise_during']);
    expect(progress[0]!.message).toMatch(/^Pain 6\/10 during on \d+ \w+ — above this plan's limit of 5\/10\.$/);
    // Weekly means: 2 (2, 2) → 4.5 (3, 6).
    expect(progress[1]!.message).toMatch(/^Weekly pain rising: 2 → 4\.5 /);
    const roster = (await c.get('/api/plan-alerts')).body.alerts;
    expect(roster.find((x: { athleteId: number }) => x.athleteId === adaId)).toMatchObject({
      planId: plan.id,
      alerts: expect.arrayContaining([expect.objectContaining({ kind: 'weekly_rise_during', value: 4.5, limit: 2 })]),
    });
    expect((await c.get(`/api/athletes/${adaId}/plans`)).body.plans[0].alerts).toHaveLength(2);

    // The coach edits the rule for this plan: a higher limit and no weekly check clear both alerts.
    const edited = await c.put(`/api/plans/${plan.id}/pain-rule`, {
      maxDuring: 6,
      morningMustSettle: true,
      settledMorningMax: 2,
      noWeeklyRise: false,
    });
    expect(edited.body.painRule).toEqual({ maxDuring: 6, morningMustSettle: true, settledMorningMax: 2, noWeeklyRise: false });
    expect((await c.get(`/api/plans/${plan.id}/progress`)).body.alerts).toEqual([]);
    expect(
      (await c.put(`/api/plans/${plan.id}/pain-rule`, { maxDuring: 11, morningMustSettle: true, settledMorningMax: 2, noWeeklyRise: true }))
        .status,
    ).toBe(422);
  });

  it('the seeded demo Achilles plan shows a week-over-week rise on the roster', async () => {
    const carys = await t.db('athletes').where({ last_name: 'Holmgren' }).first();
    const roster = (await c.get('/api/plan-alerts')).body.alerts;
    expect(roster.find((x: { athleteId: number }) => x.athleteId === carys.id)?.alerts.map((x: { kind: string }) => x.kind)).toContain(
      'weekly_rise_during',
    );
    const other = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    expect((await other.get('/api/plan-alerts')).body.alerts).toEqual([]);
  });
});

describe('the demo plans', () => {
  // Staging as the cited programmes stage loading — isometric, then isotonic or lengthening, then
  // energy storage and return to running (Goom et al. 2016, REFERENCES.md [mem], from memory).
  const kindsOf = (plan: PlanDetail) => plan.stages.map((s) => s.exercises.map((e) => e.exercise.kind));

  it('the demo athlete’s hamstring-strain plan runs in its lengthening stage, linked to her Re-test, and she sees it', async () => {
    const ada = await t.db('athletes').where({ id: adaId }).first();
    const retest = await t.db('assessments').where({ athlete_id: adaId, kind: 'retest' }).first();
    await seedDemoHamstringPlan(t.db, ada.clinic_id, ada, retest.id);
    const [summary] = (await a.get(`/api/athletes/${adaId}/plans`)).body.plans;
    expect(summary).toMatchObject({
      status: 'active',
      assessmentId: retest.id,
      currentStagePosition: 2,
      currentStageName: 'Lengthening',
      alerts: [],
    });
    const plan: PlanDetail = (await a.get(`/api/plans/${summary.id}`)).body;
    expect(plan.stages.map((s) => s.name)).toEqual(['Holds and easy agility', 'Lengthening', 'Spring and return to running']);
    const [first, second, third] = kindsOf(plan);
    expect(first).toContain('isometric');
    expect(second).toEqual(['eccentric', 'eccentric', 'eccentric']);
    expect(third).toEqual(expect.arrayContaining(['ballistic', 'running_drill']));
    // The lengthening stage is the lengthening programme's three exercises (Askling et al. 2013 [mem]).
    expect(plan.stages[1]!.exercises.every((e) => e.exercise.source.startsWith('Askling et al. 2013'))).toBe(true);
    expect((await a.get(`/api/plans/${plan.id}/logs`)).body.logs).toHaveLength(12);
  });

  it('the demo Achilles plan goes from holds to heavy slow strength to spring and running', async () => {
    const carys = await t.db('athletes').where({ last_name: 'Holmgren' }).first();
    const [summary] = (await c.get(`/api/athletes/${carys.id}/plans`)).body.plans;
    const plan: PlanDetail = (await c.get(`/api/plans/${summary.id}`)).body;
    expect(plan.stages.map((s) => s.name)).toEqual(['Isometric holds', 'Heavy slow strength', 'Spring and running']);
    const [first, second, third] = kindsOf(plan);
    expect(first).toContain('isometric');
    expect(second).toEqual(expect.arrayContaining(['isotonic', 'eccentric']));
    expect(third).toEqual(expect.arrayContaining(['ballistic', 'running_drill']));
  });
});
