/**
 * Editing a running plan must not throw away the athlete's offline logs: stage-exercise ids stay
 * stable across edits (updated in place, new ones inserted, removed ones deleted), and a session
 * the athlete queued before an edit is accepted — matched by exercise when its stage exercise was
 * replaced, or kept and flagged for the coach when its exercise left the stage.
 */
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { plansRepository } from '../../server/plans/plans-repository';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import type { Exercise, LogWrite, PlanDetail, PlanReplace } from '../../src/contracts/plans';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let a: Client;
let plan: PlanDetail;
let library: Exercise[];
let keyN = 0;
const newKey = () => `edit-${Date.now().toString(36)}-${++keyN}`;
const today = () => new Date().toISOString().slice(0, 10);

/** The plan as the plan builder sends it back: every field, with the ids it has, from the revision it was read at. */
function asWrite(p: PlanDetail, withExerciseIds = true): PlanReplace {
  return {
    baseRevision: p.revision,
    title: p.title,
    assessmentId: p.assessmentId,
    notes: p.notes,
    stages: p.stages.map((s) => ({
      id: s.id,
      name: s.name,
      goal: s.goal,
      targetWeeks: s.targetWeeks,
      progressionText: s.progressionText,
      criteria: s.criteria,
      exercises: s.exercises.map((e) => ({
        ...(withExerciseIds ? { id: e.id } : {}),
        exerciseId: e.exerciseId,
        dose: e.dose,
        notes: e.notes,
      })),
    })),
  };
}

const current = (p: PlanDetail) => p.stages.find((s) => s.id === p.currentStageId)!;
const itemIds = (p: PlanDetail) => p.stages.flatMap((s) => s.exercises.map((e) => e.id));

/** A session as the portal queues it (with each exercise's library id beside its stage-exercise id). */
function queuedLog(p: PlanDetail): LogWrite {
  const stage = current(p);
  return {
    key: newKey(),
    stageId: stage.id,
    date: today(),
    painDuring: 2,
    sets: stage.exercises.map((e) => ({ stageExerciseId: e.id, exerciseId: e.exerciseId, setsDone: e.dose.sets })),
    note: 'Queued offline',
  };
}

beforeEach(async () => {
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  a = await signedIn(t.app, athlete.email, athlete.password);
  const adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  library = (await c.get('/api/exercises')).body.exercises;
  // Any three exercises of the demo library will do.
  const [e1, e2, e3] = library.filter((e) => !e.archived);
  const ex = (e: Exercise) => ({ exerciseId: e.id, dose: e.dose, notes: null });
  const stage = (name: string, items: Exercise[]) => ({
    name,
    goal: `${name} goal`,
    targetWeeks: 2,
    progressionText: 'When it feels easy.',
    criteria: [],
    exercises: items.map(ex),
  });
  const created = await c.post(`/api/athletes/${adaId}/plans`, {
    title: 'High hamstring: staged loading',
    assessmentId: null,
    notes: null,
    stages: [stage('Isometric holds', [e1!, e2!]), stage('Slow lengthening', [e3!])],
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  for (const p of (await c.get(`/api/athletes/${adaId}/plans`)).body.plans as { id: number; status: string }[]) {
    if (p.status === 'active' || p.status === 'paused') await c.post(`/api/plans/${p.id}/transitions`, { action: 'finish' });
  }
  plan = (await c.post(`/api/plans/${created.body.id}/transitions`, { action: 'start' })).body;
  expect(plan.status).toBe('active');
});
afterEach(async () => {
  await t.close();
});

describe('stage-exercise ids across edits', () => {
  it('an unchanged save keeps every id, with or without the ids in the body', async () => {
    expect(current(plan).exercises.length).toBeGreaterThan(0);
    const same = await c.put(`/api/plans/${plan.id}`, asWrite(plan));
    expect(same.status, JSON.stringify(same.body)).toBe(200);
    expect(itemIds(same.body)).toEqual(itemIds(plan));
    const older = await c.put(`/api/plans/${plan.id}`, asWrite(same.body, false));
    expect(older.status).toBe(200);
    expect(itemIds(older.body)).toEqual(itemIds(plan));
  });

  it('an edit updates in place, inserts the new and deletes the removed', async () => {
    const body = asWrite(plan);
    const stageIndex = plan.stages.indexOf(current(plan));
    const items = body.stages[stageIndex]!.exercises;
    const kept = items[0]!;
    kept.dose = { ...kept.dose, sets: kept.dose.sets + 1 };
    const used = new Set(items.map((e) => e.exerciseId));
    const extra = library.find((e) => !used.has(e.id) && !e.archived)!;
    const removed = items.length > 1 ? items.pop()! : null;
    items.push({ exerciseId: extra.id, dose: extra.dose, notes: null });
    const res = await c.put(`/api/plans/${plan.id}`, body);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const after = res.body.stages[stageIndex].exercises as { id: number; exerciseId: number; dose: { sets: number } }[];
    expect(after[0]).toMatchObject({ id: (kept as { id: number }).id, dose: { sets: kept.dose.sets } });
    expect(after.at(-1)!.exerciseId).toBe(extra.id);
    expect(itemIds(plan)).not.toContain(after.at(-1)!.id);
    if (removed) expect(after.map((e) => e.id)).not.toContain((removed as { id: number }).id);
    // Other stages untouched.
    const others = (p: PlanDetail) => p.stages.filter((_, i) => i !== stageIndex).flatMap((s) => s.exercises.map((e) => e.id));
    expect(others(res.body)).toEqual(others(plan));
  });

  it('an id of another stage’s exercise is refused with the field path', async () => {
    const body = asWrite(plan);
    const stageIndex = plan.stages.indexOf(current(plan));
    const other = plan.stages.find((s) => s.id !== current(plan).id && s.exercises.length)!;
    (body.stages[stageIndex]!.exercises[0] as { id?: number }).id = other.exercises[0]!.id;
    const res = await c.put(`/api/plans/${plan.id}`, body);
    expect(res.status).toBe(422);
    expect(res.body.error.details[0].path).toEqual(['stages', stageIndex, 'exercises', 0, 'id']);
  });
});

describe('a session queued offline before the coach edited the plan', () => {
  it('is accepted after an unchanged re-save', async () => {
    const log = queuedLog(plan);
    await c.put(`/api/plans/${plan.id}`, asWrite(plan, false));
    const res = await a.post(`/api/plans/${plan.id}/logs`, log);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.reviewNote).toBeNull();
  });

  it('is matched by exercise when its stage exercise was replaced by the same exercise', async () => {
    const log = queuedLog(plan);
    const body = asWrite(plan);
    const stageIndex = plan.stages.indexOf(current(plan));
    // Removed and added again: a new stage-exercise id for the same library exercise.
    body.stages[stageIndex]!.exercises = body.stages[stageIndex]!.exercises.map(({ exerciseId, dose, notes }) => ({
      exerciseId,
      dose,
      notes,
    }));
    const first = body.stages[stageIndex]!.exercises.shift()!;
    const edited = await c.put(`/api/plans/${plan.id}`, body);
    body.stages[stageIndex]!.exercises = [
      ...(edited.body as PlanDetail).stages[stageIndex]!.exercises.map((e) => ({
        id: e.id,
        exerciseId: e.exerciseId,
        dose: e.dose,
        notes: e.notes,
      })),
      first,
    ];
    body.baseRevision = (edited.body as PlanDetail).revision;
    const readded = await c.put(`/api/plans/${plan.id}`, body);
    const now = current(readded.body);
    const newItem = now.exercises.find((e) => e.exerciseId === first.exerciseId)!;
    expect(newItem.id).not.toBe(log.sets[0]!.stageExerciseId);
    const res = await a.post(`/api/plans/${plan.id}/logs`, log);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.sets.find((s: { stageExerciseId: number }) => s.stageExerciseId === newItem.id).setsDone).toBe(log.sets[0]!.setsDone);
    expect(res.body.reviewNote).toBeNull();
  });

  it('is kept and flagged for the coach when one of its exercises left the stage', async () => {
    const log = queuedLog(plan);
    const body = asWrite(plan);
    const stageIndex = plan.stages.indexOf(current(plan));
    const gone = body.stages[stageIndex]!.exercises.shift()!;
    if (body.stages[stageIndex]!.exercises.length === 0) {
      const extra = library.find((e) => e.id !== gone.exerciseId && !e.archived)!;
      body.stages[stageIndex]!.exercises.push({ exerciseId: extra.id, dose: extra.dose, notes: null });
    }
    expect((await c.put(`/api/plans/${plan.id}`, body)).status).toBe(200);
    const res = await a.post(`/api/plans/${plan.id}/logs`, log);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const name = library.find((e) => e.id === gone.exerciseId)!.name;
    expect(res.body.reviewNote).toContain(name);
    expect(res.body.sets.find((s: { name: string }) => s.name === name)).toMatchObject({
      stageExerciseId: log.sets[0]!.stageExerciseId,
      setsDone: log.sets[0]!.setsDone,
    });
    const coachView = (await c.get(`/api/plans/${plan.id}/logs`)).body.logs.find((l: { key: string }) => l.key === log.key);
    expect(coachView.reviewNote).toContain(name);
    // The same key again answers the stored entry.
    const again = await a.post(`/api/plans/${plan.id}/logs`, log);
    expect(again.status).toBe(200);
    expect(again.body.id).toBe(res.body.id);
  });
});

describe('two coaches editing one plan', () => {
  it('the later save from the older revision gets 409 stale_revision with the stored plan, and writes nothing; the athlete’s log stays', async () => {
    const [, , second] = DEMO_SIGN_INS;
    const c2 = await signedIn(t.app, second!.email, second!.password);
    expect((await a.post(`/api/plans/${plan.id}/logs`, queuedLog(plan))).status).toBe(201);
    const first = (await c.get(`/api/plans/${plan.id}`)).body as PlanDetail;
    const other = (await c2.get(`/api/plans/${plan.id}`)).body as PlanDetail;
    const mine = { ...asWrite(first), title: 'Saved first', baseRevision: first.revision };
    mine.stages[1]!.targetWeeks = 5;
    const saved = await c.put(`/api/plans/${plan.id}`, mine);
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    expect(saved.body.revision).toBe(first.revision + 1);

    const stale = await c2.put(`/api/plans/${plan.id}`, { ...asWrite(other), title: 'From the older copy', baseRevision: other.revision });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_revision');
    expect(stale.body.error.details.current).toMatchObject({ id: plan.id, title: 'Saved first', revision: first.revision + 1 });
    const stored = (await c.get(`/api/plans/${plan.id}`)).body as PlanDetail;
    expect(stored).toMatchObject({ title: 'Saved first', revision: first.revision + 1 });
    expect(stored.stages[1]!.targetWeeks).toBe(5);

    // From the stored copy the second coach's save goes through; the log entry is still there.
    const current: PlanDetail = stale.body.error.details.current;
    const again = await c2.put(`/api/plans/${plan.id}`, { ...asWrite(current), title: 'Saved second', baseRevision: current.revision });
    expect(again.status, JSON.stringify(again.body)).toBe(200);
    expect(again.body).toMatchObject({ title: 'Saved second', revision: first.revision + 2 });
    expect((await a.get(`/api/plans/${plan.id}/logs`)).body.logs).toHaveLength(1);
    expect((await c.put(`/api/plans/${plan.id}`, { ...mine, baseRevision: -1 })).status).toBe(422);
  });
});

describe('a save that names no base revision', () => {
  it('is refused with 422 naming baseRevision, and the stored plan (with a colleague’s save) is untouched', async () => {
    const theirs = await c.put(`/api/plans/${plan.id}`, { ...asWrite(plan), title: 'A colleague’s save' });
    expect(theirs.status, JSON.stringify(theirs.body)).toBe(200);
    const { baseRevision: _omitted, ...withoutRevision } = { ...asWrite(plan), title: 'Would overwrite it' };
    const res = await c.put(`/api/plans/${plan.id}`, withoutRevision);
    expect(res.status).toBe(422);
    expect(res.body.error.details).toContainEqual(expect.objectContaining({ path: ['baseRevision'] }));
    expect(res.body.error.message).toMatch(/base revision/i);
    for (const wrong of [null, '1', 1.5]) {
      expect((await c.put(`/api/plans/${plan.id}`, { ...withoutRevision, baseRevision: wrong })).status).toBe(422);
    }
    const stored = (await c.get(`/api/plans/${plan.id}`)).body as PlanDetail;
    expect(stored).toMatchObject({ title: 'A colleague’s save', revision: plan.revision + 1 });
  });
});

describe('a stage removed by an edit while the plan moves on to it', () => {
  it('is refused with 409 stage_in_use when the plan advanced between the checks and the save, and the stage stays', async () => {
    const next = plan.stages.find((st) => st.id !== plan.currentStageId)!;
    const body = asWrite(plan);
    body.stages = body.stages.filter((st) => st.id !== next.id);
    // Another coach advances the plan to that stage just after this edit's first check (as if the two
    // requests interleaved): the check inside the save's transaction must see it.
    const original = plansRepository.logCountByStage.bind(plansRepository);
    const spy = vi.spyOn(plansRepository, 'logCountByStage').mockImplementationOnce(async (db, ids) => {
      const counts = await original(db, ids);
      await t.db('plan_stages').where({ id: next.id }).update({ started_at: new Date().toISOString() });
      await t.db('plans').where({ id: plan.id }).update({ current_stage_id: next.id });
      return counts;
    });
    try {
      const res = await c.put(`/api/plans/${plan.id}`, body);
      expect(res.status, JSON.stringify(res.body)).toBe(409);
      expect(res.body.error.code).toBe('stage_in_use');
    } finally {
      spy.mockRestore();
    }
    const after = (await c.get(`/api/plans/${plan.id}`)).body as PlanDetail;
    expect(after.stages.map((st) => st.id)).toContain(next.id);
    expect(after.currentStageId).toBe(next.id);
  });
});

describe('moving stages of a running plan', () => {
  const stored = async () => (await c.get(`/api/plans/${plan.id}`)).body as PlanDetail;

  it('refuses to put a stage still to come before the current one (it would never run), and writes nothing', async () => {
    const reversed = asWrite(plan);
    reversed.stages.reverse();
    const res = await c.put(`/api/plans/${plan.id}`, reversed);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('started_stage_moved');
    expect(res.body.error.message).toContain('“Isometric holds”');
    const newFirst = asWrite(plan);
    newFirst.stages.unshift({ name: 'Warm-up', goal: '', targetWeeks: 1, progressionText: '', criteria: [], exercises: [] });
    expect((await c.put(`/api/plans/${plan.id}`, newFirst)).body.error.code).toBe('started_stage_moved');
    const after = await stored();
    expect(after.stages.map((s) => s.id)).toEqual(plan.stages.map((s) => s.id));
    expect(after.revision).toBe(plan.revision);
  });

  it('refuses to put a completed stage after the current one (advancing would start it again over its history)', async () => {
    const advanced = (await c.post(`/api/plans/${plan.id}/transitions`, { action: 'advance' })).body as PlanDetail;
    expect(advanced.currentStagePosition).toBe(2);
    const firstStarted = advanced.stages[0]!.startedAt;
    const reversed = asWrite(advanced);
    reversed.stages.reverse();
    const res = await c.put(`/api/plans/${plan.id}`, reversed);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('started_stage_moved');
    const after = await stored();
    expect(after.stages.map((s) => s.id)).toEqual(advanced.stages.map((s) => s.id));
    expect(after.stages[0]!.startedAt).toBe(firstStarted);
  });

  it('lets the stages still to come move among themselves', async () => {
    const body = asWrite(plan);
    body.stages.push({ name: 'Running drills', goal: '', targetWeeks: 2, progressionText: '', criteria: [], exercises: [] });
    const added = await c.put(`/api/plans/${plan.id}`, body);
    expect(added.status, JSON.stringify(added.body)).toBe(200);
    const moved = asWrite(added.body);
    moved.stages = [moved.stages[0]!, moved.stages[2]!, moved.stages[1]!];
    const res = await c.put(`/api/plans/${plan.id}`, moved);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.stages.map((s: { name: string }) => s.name)).toEqual(['Isometric holds', 'Running drills', 'Slow lengthening']);
  });
});
