import type { Knex } from 'knex';
import { DEFAULT_PAIN_RULE, type ProgressionCriterion } from '../src/contracts/plans';
import { addDays, dayOf, weekStart } from '../src/plans-rules';
import { DEMO_EXERCISES } from './demo-exercises';

/**
 * The demo clinic's library (see `demo-exercises.ts`) and its two running demo plans, staged as
 * the cited programmes stage loading: isometric holds, then isotonic or lengthening work, then
 * energy storage and a graded return to running. The plans, their people and their numbers are
 * invented.
 */

/** Stages of the demo Achilles plan (invented, for the demo only). */
const ACHILLES_PLAN = {
  title: 'Achilles tendon pain: staged loading back to 10 km',
  notes: 'Invented demo plan. Flat routes only and no speed work until stage 3.',
  stages: [
    {
      name: 'Isometric holds',
      goal: 'Ease tendon pain with heavy, steady holds and keep the calf loaded every day.',
      targetWeeks: 2,
      progressionText: 'Move on once the holds feel steady and the tendon is no stiffer the next morning.',
      criteria: [
        { kind: 'pain_during_at_most', max: 3, sessions: 3 },
        { kind: 'settled_by_morning', sessions: 3 },
      ] as ProgressionCriterion[],
      exercises: ['Isometric calf hold', 'Side-lying hip abduction'],
    },
    {
      name: 'Heavy slow strength',
      goal: 'Build calf and tendon strength with slow, heavy raises and lowering.',
      targetWeeks: 6,
      progressionText: 'Move on when every set is done on three sessions in a row and at least four weeks have passed.',
      criteria: [
        { kind: 'all_sets_done', sessions: 3 },
        { kind: 'weeks_in_stage', weeks: 4 },
      ] as ProgressionCriterion[],
      exercises: ['Heavy slow calf raise', 'Heel drop from a step, straight knee', 'Heel drop from a step, bent knee'],
    },
    {
      name: 'Spring and running',
      goal: 'Bring back spring, then running in graded steps at a slightly quicker step rate.',
      targetWeeks: 4,
      progressionText: 'Back to normal training when skips and runs cause no pain the next morning and the coach agrees.',
      criteria: [{ kind: 'settled_by_morning', sessions: 4 }] as ProgressionCriterion[],
      exercises: ['Springy skips', 'Walk-jog return intervals', 'Step-rate run'],
    },
  ],
};

/**
 * Adds the demo library to the clinic and a running plan for the demo athlete with Achilles
 * tendon pain, whose pain during rose this week (so the roster shows an alert). Runs inside the
 * demo seed's transaction.
 */
export async function seedDemoPlans(trx: Knex, clinicId: number, coachId: number, now = new Date()): Promise<void> {
  const at = now.toISOString();
  const ids = new Map<string, number>();
  for (const e of DEMO_EXERCISES) {
    const [row] = await trx('exercises')
      .insert({
        clinic_id: clinicId,
        name: e.name,
        purpose: e.purpose,
        region: e.region,
        kind: e.kind,
        sets: e.dose.sets,
        reps: e.dose.reps,
        hold_seconds: e.dose.holdSeconds,
        tempo: e.dose.tempo,
        load: e.dose.load,
        rest_seconds: e.dose.restSeconds,
        days_per_week: e.dose.daysPerWeek,
        instructions: JSON.stringify(e.instructions),
        cautions: e.cautions,
        source: e.source,
        archived: false,
        created_by: coachId,
        created_at: at,
        updated_at: at,
      })
      .returning('id');
    ids.set(e.name, (row as { id: number }).id);
  }

  const carys = await trx('athletes')
    .where({ clinic_id: clinicId, last_name: 'Holmgren' })
    .first<{ id: number; coach_id: number } | undefined>();
  if (!carys) return;
  const today = dayOf(now);
  const started = addDays(weekStart(today), -14);
  // A calm week (pain during 2, 2, 2), then a harder one (3, 3, 4): the weekly mean of pain
  // during rises 2 → 3.3, inside the 5/10 limit; today's session is the first of this week.
  await insertRunningPlan(trx, {
    clinicId,
    athlete: carys,
    ids,
    plan: ACHILLES_PLAN,
    assessmentId: null,
    at,
    keyPrefix: 'demo-seed-achilles',
    stageStarts: [started],
    sessions: [
      { date: addDays(started, 0), during: 2, morning: 1, done: 5 },
      { date: addDays(started, 2), during: 2, morning: 1, done: 5 },
      { date: addDays(started, 4), during: 2, morning: 1, done: 4 },
      { date: addDays(started, 7), during: 3, morning: 1, done: 5 },
      { date: addDays(started, 9), during: 3, morning: 1, done: 5 },
      { date: addDays(started, 11), during: 4, morning: 1, done: 5 },
      { date: today, during: 4, morning: null, done: 3, note: 'Tendon stiff after a long day on my feet.' },
    ],
  });
}

/** Stages of the demo athlete's plan after her hamstring strain (invented, demo only). */
const HAMSTRING_PLAN = {
  title: 'Hamstring strain: staged loading back to the trails',
  notes: 'Invented demo plan. Sprint finishes and steep descents wait until stage 3 is done and the coach agrees.',
  stages: [
    {
      name: 'Holds and easy agility',
      goal: 'Load the healing hamstring with steady holds, and get hips and trunk moving together at low speed.',
      targetWeeks: 3,
      progressionText: 'Move on once holds and drills cause no more than mild pain that has settled by the next morning.',
      criteria: [
        { kind: 'pain_during_at_most', max: 3, sessions: 3 },
        { kind: 'settled_by_morning', sessions: 3 },
      ] as ProgressionCriterion[],
      exercises: ['Bent-knee bridge hold', 'Side-step and grapevine', 'Rotating body bridge'],
    },
    {
      name: 'Lengthening',
      goal: 'Strength at long hamstring lengths, growing in range and then in speed, with balance on one leg.',
      targetWeeks: 4,
      progressionText: 'Move on when every set is done with control on three sessions in a row and mornings stay settled.',
      criteria: [
        { kind: 'all_sets_done', sessions: 3 },
        { kind: 'settled_by_morning', sessions: 3 },
      ] as ProgressionCriterion[],
      exercises: ['Hip-flexed knee extension', 'Single-leg forward tilt with reach', 'Gliding split'],
    },
    {
      name: 'Spring and return to running',
      goal: 'Quick, springy loading, then running in graded steps; heavy lengthening work stays on as protection.',
      targetWeeks: 4,
      progressionText: 'Back to hill sessions and racing when running at full pace is pain-free, strength is full and the coach agrees.',
      criteria: [{ kind: 'settled_by_morning', sessions: 4 }] as ProgressionCriterion[],
      exercises: ['Springy skips', 'Walk-jog return intervals', 'Nordic hamstring lowering'],
    },
  ],
};

/**
 * The full demo's plan for the athlete recovering from a hamstring strain (the one who can sign
 * in): holds and easy agility since her Baseline, now in the lengthening stage with calm logs,
 * linked to her Re-test. Only with the rendered demo clips (`npm start`), so tests that build her
 * a plan start from none.
 */
export async function seedDemoHamstringPlan(
  trx: Knex,
  clinicId: number,
  athlete: { id: number; coach_id: number },
  assessmentId: number | null,
  now = new Date(),
): Promise<void> {
  const rows = await trx('exercises').where({ clinic_id: clinicId }).select<{ id: number; name: string }[]>('id', 'name');
  const ids = new Map(rows.map((r) => [r.name, r.id]));
  const today = dayOf(now);
  const stage1 = addDays(weekStart(today), -28);
  const stage2 = addDays(weekStart(today), -7);
  await insertRunningPlan(trx, {
    clinicId,
    athlete,
    ids,
    plan: HAMSTRING_PLAN,
    assessmentId,
    at: now.toISOString(),
    keyPrefix: 'demo-seed-hamstring',
    stageStarts: [stage1, stage2],
    sessions: [
      { date: addDays(stage1, 0), during: 3, morning: 2, done: 3, stage: 0 },
      { date: addDays(stage1, 2), during: 3, morning: 1, done: 4, stage: 0 },
      { date: addDays(stage1, 4), during: 3, morning: 1, done: 5, stage: 0 },
      { date: addDays(stage1, 7), during: 2, morning: 1, done: 5, stage: 0 },
      { date: addDays(stage1, 9), during: 2, morning: 1, done: 5, stage: 0, note: 'Grapevine at a light jog today, no pull.' },
      { date: addDays(stage1, 11), during: 2, morning: 0, done: 5, stage: 0 },
      { date: addDays(stage1, 14), during: 2, morning: 0, done: 5, stage: 0 },
      { date: addDays(stage1, 16), during: 2, morning: 0, done: 5, stage: 0 },
      { date: addDays(stage1, 18), during: 1, morning: 0, done: 5, stage: 0 },
      { date: addDays(stage2, 0), during: 2, morning: 0, done: 2, stage: 1, note: 'The glides felt awkward but not painful.' },
      { date: addDays(stage2, 2), during: 1, morning: 0, done: 3, stage: 1 },
      { date: addDays(stage2, 4), during: 1, morning: 0, done: 3, stage: 1 },
    ],
  });
}

interface DemoSession {
  date: string;
  during: number;
  morning: number | null;
  /** Sets done of each exercise (capped at the prescribed sets). */
  done: number;
  /** Index of the stage the session belongs to (default the first). */
  stage?: number;
  note?: string;
}

/**
 * Inserts an active plan with its stages, doses from the library, the default pain rule and the
 * athlete's logged sessions; stages up to `stageStarts.length` are started (the last one current,
 * the earlier ones completed when the next started).
 */
async function insertRunningPlan(
  trx: Knex,
  p: {
    clinicId: number;
    athlete: { id: number; coach_id: number };
    ids: Map<string, number>;
    plan: typeof ACHILLES_PLAN;
    assessmentId: number | null;
    at: string;
    keyPrefix: string;
    stageStarts: string[];
    sessions: DemoSession[];
  },
): Promise<void> {
  const { clinicId, athlete, at } = p;
  const startedAt = `${p.stageStarts[0]}T08:00:00.000Z`;
  const [plan] = await trx('plans')
    .insert({
      clinic_id: clinicId,
      athlete_id: athlete.id,
      assessment_id: p.assessmentId,
      title: p.plan.title,
      status: 'active',
      current_stage_id: null,
      notes: p.plan.notes,
      started_at: startedAt,
      finished_at: null,
      created_by: athlete.coach_id,
      created_at: startedAt,
      updated_at: startedAt,
    })
    .returning('id');
  const planId = (plan as { id: number }).id;
  const stages: { id: number; items: { id: number; name: string; sets: number }[] }[] = [];
  for (const [i, s] of p.plan.stages.entries()) {
    const start = p.stageStarts[i];
    const next = p.stageStarts[i + 1];
    const [stage] = await trx('plan_stages')
      .insert({
        clinic_id: clinicId,
        plan_id: planId,
        position: i + 1,
        name: s.name,
        goal: s.goal,
        target_weeks: s.targetWeeks,
        progression_text: s.progressionText,
        criteria: JSON.stringify(s.criteria),
        started_at: start ? `${start}T08:00:00.000Z` : null,
        completed_at: next ? `${next}T08:00:00.000Z` : null,
      })
      .returning('id');
    const stageId = (stage as { id: number }).id;
    const items: { id: number; name: string; sets: number }[] = [];
    for (const [j, name] of s.exercises.entries()) {
      const e = DEMO_EXERCISES.find((x) => x.name === name)!;
      const [item] = await trx('stage_exercises')
        .insert({
          clinic_id: clinicId,
          stage_id: stageId,
          exercise_id: p.ids.get(name),
          position: j + 1,
          sets: e.dose.sets,
          reps: e.dose.reps,
          hold_seconds: e.dose.holdSeconds,
          tempo: e.dose.tempo,
          load: e.dose.load,
          rest_seconds: e.dose.restSeconds,
          days_per_week: e.dose.daysPerWeek,
          notes: null,
        })
        .returning('id');
      items.push({ id: (item as { id: number }).id, name, sets: e.dose.sets });
    }
    stages.push({ id: stageId, items });
  }
  await trx('plans')
    .where({ id: planId })
    .update({ current_stage_id: stages[p.stageStarts.length - 1]!.id });
  await trx('alert_rules').insert({
    plan_id: planId,
    clinic_id: clinicId,
    max_during: DEFAULT_PAIN_RULE.maxDuring,
    morning_must_settle: DEFAULT_PAIN_RULE.morningMustSettle,
    settled_morning_max: DEFAULT_PAIN_RULE.settledMorningMax,
    no_weekly_rise: DEFAULT_PAIN_RULE.noWeeklyRise,
    updated_by: athlete.coach_id,
    updated_at: startedAt,
  });
  for (const [n, s] of p.sessions.entries()) {
    const stage = stages[s.stage ?? 0]!;
    const created = `${s.date}T18:00:00.000Z`;
    await trx('log_entries').insert({
      clinic_id: clinicId,
      athlete_id: athlete.id,
      plan_id: planId,
      stage_id: stage.id,
      idempotency_key: `${p.keyPrefix}-${n + 1}`,
      session_date: s.date,
      pain_during: s.during,
      morning_pain: s.morning,
      morning_at: s.morning === null ? null : `${addDays(s.date, 1)}T07:00:00.000Z`,
      sets: JSON.stringify(
        stage.items.map((it) => ({ stageExerciseId: it.id, name: it.name, setsPrescribed: it.sets, setsDone: Math.min(it.sets, s.done) })),
      ),
      note: s.note ?? null,
      created_by: null,
      created_at: created > at ? at : created,
      updated_at: created > at ? at : created,
    });
  }
}
