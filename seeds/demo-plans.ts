import type { Knex } from 'knex';
import { DEFAULT_PAIN_RULE, type Dose, type ExerciseRegion, type LoadingKind, type ProgressionCriterion } from '../src/contracts/plans';
import { addDays, dayOf, weekStart } from '../src/plans-rules';

/**
 * The demo exercise library and one running demo plan. Every description is written for
 * Trailframe in our own words (no text from any outside source); the plan, its people and its
 * numbers are invented.
 */

interface DemoExercise {
  name: string;
  purpose: string;
  region: ExerciseRegion;
  kind: LoadingKind;
  dose: Dose;
  instructions: string[];
  cautions: string;
}

const dose = (d: Partial<Dose> & Pick<Dose, 'sets' | 'daysPerWeek'>): Dose => ({ reps: null, holdSeconds: null, tempo: null, load: null, restSeconds: null, ...d });

export const DEMO_EXERCISES: DemoExercise[] = [
  {
    name: 'Long-lever hamstring bridge hold',
    purpose: 'Loads the hamstrings near their longer length without movement, as a calm first step after a high-hamstring flare.',
    region: 'hamstring',
    kind: 'isometric',
    dose: dose({ sets: 4, holdSeconds: 30, load: 'Body weight', restSeconds: 60, daysPerWeek: 4 }),
    instructions: [
      'Lie on your back with both heels on a low step or box, knees only slightly bent.',
      'Press your heels down into the step and lift your hips until your body makes a straight line from shoulders to heels.',
      'Keep breathing and hold the position without letting the hips sag.',
      'Lower slowly, rest, then repeat. Move the step closer if you feel it in the back of the knee rather than the thigh.',
    ],
    cautions: 'A cramp in the back of the thigh is common at first: lower down, shake it out and try with the heels closer.',
  },
  {
    name: 'Heel-slide hamstring lowers',
    purpose: 'Slow lengthening work for the hamstrings with the body weight shared between both legs.',
    region: 'hamstring',
    kind: 'eccentric',
    dose: dose({ sets: 3, reps: 6, tempo: '4 s out, reset', restSeconds: 90, daysPerWeek: 3 }),
    instructions: [
      'Lie on your back on a smooth floor with a small towel under each heel, knees bent, and lift your hips into a bridge.',
      'Keeping the hips up, let your heels slide away from you over about four seconds.',
      'When the legs are nearly straight, lower your hips to the floor.',
      'Pull the heels back in with the hips down, lift into the bridge again and repeat.',
    ],
    cautions: 'Stop the slide earlier if the hips drop sharply or pain grips the sitting bone.',
  },
  {
    name: 'Split-stance hip-drive pulses',
    purpose: 'Quick, short drives of the hip into flexion from a split stance, to bring back speed once slow loading feels easy.',
    region: 'hip',
    kind: 'ballistic',
    dose: dose({ sets: 3, reps: 10, tempo: 'Fast up, controlled return', restSeconds: 60, daysPerWeek: 2 }),
    instructions: [
      'Stand tall in a split stance with the working leg behind, hands on hips or on a wall.',
      'Drive the rear knee forward and up as fast as you can, letting the opposite arm swing.',
      'Return the foot to the start with control and reset your posture before the next pulse.',
      'Keep the trunk upright: the movement comes from the hip, not from leaning back.',
    ],
    cautions: 'Begin at half speed for the first set. Leave this out on days the hamstring feels tight from the morning.',
  },
  {
    name: 'Wall-supported hip-extension drill',
    purpose: 'Teaches the leg to travel behind the body from the hip without arching the lower back.',
    region: 'hip',
    kind: 'running_drill',
    dose: dose({ sets: 3, reps: 8, tempo: '2 s back, 1 s hold', restSeconds: 30, daysPerWeek: 4 }),
    instructions: [
      'Stand facing a wall with both hands on it at shoulder height and lean slightly forward.',
      'Brace gently as if someone were about to tap your stomach.',
      'Sweep one straight leg back behind you, squeezing the buttock, and stop before the lower back arches.',
      'Hold for a moment, bring the leg through to a high knee, then repeat on the same side.',
    ],
    cautions: 'If you feel it in the lower back, make the backward swing smaller.',
  },
  {
    name: 'Hip-hinge hold',
    purpose: 'Holds a forward hip hinge with a long spine, loading the hamstrings and buttocks together.',
    region: 'hamstring',
    kind: 'isometric',
    dose: dose({ sets: 3, holdSeconds: 40, load: 'Body weight, then a light kettlebell', restSeconds: 60, daysPerWeek: 3 }),
    instructions: [
      'Stand with feet hip-width apart and knees softly bent.',
      'Push your hips back as if closing a drawer behind you, keeping the back long and the chest proud.',
      'Stop where you feel a firm pull in the back of the thighs and hold there.',
      'Stand up by driving the hips forward.',
    ],
    cautions: 'Do not chase depth; a longer hold matters more than a deeper hinge.',
  },
  {
    name: 'Single-leg bridge march',
    purpose: 'Builds buttock and hamstring strength on one leg while the pelvis stays level.',
    region: 'hip',
    kind: 'isotonic',
    dose: dose({ sets: 3, reps: 10, tempo: 'Steady', restSeconds: 60, daysPerWeek: 3 }),
    instructions: [
      'Lie on your back with knees bent and feet flat, then lift into a two-leg bridge.',
      'Lift one foot a hand-width off the floor without the hips tipping or dropping.',
      'Put it down and lift the other foot, like a slow march.',
      'Each lift of one foot counts as one repetition.',
    ],
    cautions: 'Lower to the floor and rest if one side of the pelvis starts to sink.',
  },
  {
    name: 'Single-leg hinge reach',
    purpose: 'Slow lengthening of the hamstring of the standing leg with balance and hip control.',
    region: 'hamstring',
    kind: 'eccentric',
    dose: dose({ sets: 3, reps: 8, tempo: '3 s down, 1 s up', load: 'Body weight', restSeconds: 75, daysPerWeek: 3 }),
    instructions: [
      'Stand on one leg with a soft knee, the other foot just off the floor.',
      'Tip forward from the hip while the free leg reaches back, lowering over three seconds.',
      'Reach your hands toward the floor as far as your back stays long.',
      'Return to standing by squeezing the buttock of the standing leg.',
    ],
    cautions: 'Hold a chair or wall for balance at first; wobbling is fine, twisting the pelvis is not.',
  },
  {
    name: 'Bent-knee calf hold',
    purpose: 'A calm, heavy hold for the deep calf muscle and Achilles tendon.',
    region: 'calf_achilles',
    kind: 'isometric',
    dose: dose({ sets: 5, holdSeconds: 45, load: 'Body weight on one leg', restSeconds: 60, daysPerWeek: 4 }),
    instructions: [
      'Stand on one leg on the edge of a step with the knee bent a little and a hand on the wall.',
      'Rise halfway onto the ball of the foot.',
      'Hold the height steady without the ankle rolling out.',
      'Lower with control and change legs.',
    ],
    cautions: 'Tendon pain that builds during the hold is a sign to shorten it.',
  },
  {
    name: 'Slow step-down',
    purpose: 'Controlled single-leg lowering for the knee and thigh, as for steep descents.',
    region: 'knee',
    kind: 'eccentric',
    dose: dose({ sets: 3, reps: 8, tempo: '3 s down', restSeconds: 60, daysPerWeek: 3 }),
    instructions: [
      'Stand sideways on a low step on one leg.',
      'Bend the standing knee over the middle toes and lower the other heel toward the floor over three seconds.',
      'Touch the heel lightly, then straighten back up.',
      'Keep the knee from falling inward.',
    ],
    cautions: 'Use a lower step if the kneecap aches during the movement.',
  },
  {
    name: 'Marching skip',
    purpose: 'A rhythmic running drill that joins a quick foot strike under the hip with a high knee drive.',
    region: 'whole_leg',
    kind: 'running_drill',
    dose: dose({ sets: 4, reps: 1, tempo: '20 m each', restSeconds: 45, daysPerWeek: 2 }),
    instructions: [
      'Skip forward, lifting one knee to hip height while the other foot taps the ground under you.',
      'Swing the arms in time with the legs.',
      'Land on the ball of the foot, close to under the hip.',
      'Walk back to the start as rest.',
    ],
    cautions: 'Keep it springy and light; stop the set if the hamstring tugs on landing.',
  },
  {
    name: 'Low ankle hops',
    purpose: 'Short, stiff, quick hops that bring back spring to the calf and Achilles before running.',
    region: 'calf_achilles',
    kind: 'ballistic',
    dose: dose({ sets: 3, reps: 20, tempo: 'Quick contacts', restSeconds: 60, daysPerWeek: 2 }),
    instructions: [
      'Stand tall with feet hip-width apart.',
      'Hop a few centimetres off the ground using mostly the ankles, knees nearly straight.',
      'Keep contacts short and quiet.',
      'Once easy on two feet, try on one foot.',
    ],
    cautions: 'Stop if pain sharpens at the back of the heel or in the shin.',
  },
  {
    name: 'Half-kneeling hip opener',
    purpose: 'Eases the front of the hip so the thigh can travel behind the body at toe-off.',
    region: 'hip',
    kind: 'mobility',
    dose: dose({ sets: 2, holdSeconds: 45, restSeconds: 15, daysPerWeek: 5 }),
    instructions: [
      'Kneel on one knee on a cushion with the other foot flat in front.',
      'Tuck the tailbone under and squeeze the buttock of the kneeling side.',
      'Shift forward a little until you feel a stretch at the front of the hip.',
      'Breathe slowly and hold, then change sides.',
    ],
    cautions: 'A sharp pinch in the front of the hip means shift less far forward.',
  },
  {
    name: 'Side bridge hold',
    purpose: 'Trunk and side-hip endurance to keep the pelvis steady on long runs.',
    region: 'trunk',
    kind: 'isometric',
    dose: dose({ sets: 3, holdSeconds: 30, restSeconds: 45, daysPerWeek: 3 }),
    instructions: [
      'Lie on your side propped on a forearm with the elbow under the shoulder and knees bent.',
      'Lift your hips so the body makes a straight line from knees to head.',
      'Hold without rolling forward or back.',
      'Progress by straightening the legs.',
    ],
    cautions: 'Shoulder pain is a reason to use a wall-supported version standing up.',
  },
  {
    name: 'Relaxed build-up runs',
    purpose: 'Short runs that rise from easy to brisk pace, the last step before normal running sessions.',
    region: 'whole_leg',
    kind: 'running_drill',
    dose: dose({ sets: 1, reps: 4, tempo: '60–80 m, build to brisk', restSeconds: 90, daysPerWeek: 2 }),
    instructions: [
      'After an easy warm-up jog, start each run at jogging pace.',
      'Build speed smoothly over the distance to a brisk but relaxed pace.',
      'Ease off before the end rather than stopping hard.',
      'Walk back to the start.',
    ],
    cautions: 'Keep at least a day between sessions with fast running while the plan is in this stage.',
  },
];

/** Stages of the demo calf plan (invented, for the demo only). */
const CALF_PLAN = {
  title: 'Calf strain: staged return to 10 km',
  notes: 'Invented demo plan. Keep runs on flat road while in stage 2.',
  stages: [
    {
      name: 'Calm holds',
      goal: 'Settle the calf with steady holds and get used to daily loading.',
      targetWeeks: 2,
      progressionText: 'Move on once holds feel steady and pain stays low the next morning.',
      criteria: [{ kind: 'pain_during_at_most', max: 3, sessions: 3 }, { kind: 'settled_by_morning', sessions: 3 }] as ProgressionCriterion[],
      exercises: ['Bent-knee calf hold', 'Side bridge hold'],
    },
    {
      name: 'Slow strength',
      goal: 'Build single-leg strength with slow lowering.',
      targetWeeks: 3,
      progressionText: 'Move on when all sets feel controlled on three sessions in a row.',
      criteria: [{ kind: 'all_sets_done', sessions: 3 }, { kind: 'weeks_in_stage', weeks: 2 }] as ProgressionCriterion[],
      exercises: ['Slow step-down', 'Single-leg bridge march'],
    },
    {
      name: 'Spring and running',
      goal: 'Bring back spring and short runs before normal training.',
      targetWeeks: 3,
      progressionText: 'Return to normal running when hops and build-ups cause no pain the next morning.',
      criteria: [{ kind: 'settled_by_morning', sessions: 4 }] as ProgressionCriterion[],
      exercises: ['Low ankle hops', 'Relaxed build-up runs'],
    },
  ],
};

/**
 * Adds the demo library to the clinic and a running plan for the demo calf athlete whose pain
 * during rose this week (so the roster shows an alert). Runs inside the demo seed's transaction.
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
        archived: false,
        created_by: coachId,
        created_at: at,
        updated_at: at,
      })
      .returning('id');
    ids.set(e.name, (row as { id: number }).id);
  }

  const carys = await trx('athletes').where({ clinic_id: clinicId, last_name: 'Holmgren' }).first<{ id: number; coach_id: number } | undefined>();
  if (!carys) return;
  const today = dayOf(now);
  const started = addDays(weekStart(today), -14);
  // A calm week (pain during 2, 2, 2), then a harder one (3, 3, 4): the weekly mean of pain
  // during rises 2 → 3.3, inside the 5/10 limit; today's session is the first of this week.
  await insertRunningPlan(trx, {
    clinicId, athlete: carys, ids, plan: CALF_PLAN, assessmentId: null, at, keyPrefix: 'demo-seed-calf',
    stageStarts: [started],
    sessions: [
      { date: addDays(started, 0), during: 2, morning: 1, done: 5 },
      { date: addDays(started, 2), during: 2, morning: 1, done: 5 },
      { date: addDays(started, 4), during: 2, morning: 1, done: 4 },
      { date: addDays(started, 7), during: 3, morning: 1, done: 5 },
      { date: addDays(started, 9), during: 3, morning: 1, done: 5 },
      { date: addDays(started, 11), during: 4, morning: 1, done: 5 },
      { date: today, during: 4, morning: null, done: 3, note: 'Calf felt tight on the stairs at work.' },
    ],
  });
}

/** Stages of the demo athlete's hamstring plan after her Baseline (invented, demo only). */
const HAMSTRING_PLAN = {
  title: 'High-hamstring pain: staged loading and hip extension',
  notes: 'Invented demo plan. Hills and long descents stay out until stage 3.',
  stages: [
    {
      name: 'Isometric holds',
      goal: 'Calm the tendon with steady holds it tolerates every day.',
      targetWeeks: 3,
      progressionText: 'Move on once holds cause no more than mild pain and it has settled by the next morning.',
      criteria: [{ kind: 'pain_during_at_most', max: 3, sessions: 3 }, { kind: 'settled_by_morning', sessions: 3 }] as ProgressionCriterion[],
      exercises: ['Long-lever hamstring bridge hold', 'Hip-hinge hold'],
    },
    {
      name: 'Slow lengthening',
      goal: 'Build strength through length with slow lowering, and practise hip extension.',
      targetWeeks: 4,
      progressionText: 'Move on when all sets are done with control on three sessions in a row and mornings stay settled.',
      criteria: [{ kind: 'all_sets_done', sessions: 3 }, { kind: 'settled_by_morning', sessions: 3 }] as ProgressionCriterion[],
      exercises: ['Heel-slide hamstring lowers', 'Single-leg hinge reach', 'Wall-supported hip-extension drill'],
    },
    {
      name: 'Fast work and running drills',
      goal: 'Bring back speed through the hip and the push-off, then normal running.',
      targetWeeks: 3,
      progressionText: 'Return to hills when fast work causes no pain the next morning.',
      criteria: [{ kind: 'settled_by_morning', sessions: 4 }] as ProgressionCriterion[],
      exercises: ['Split-stance hip-drive pulses', 'Relaxed build-up runs'],
    },
  ],
};

/**
 * The full demo's plan for the athlete with high-hamstring pain (the one who can sign in):
 * isometric holds since her Baseline, now in the slow-lengthening stage with calm logs, linked
 * to her Re-test. Only with the rendered demo clips (`npm start`), so tests that build her a
 * plan start from none.
 */
export async function seedDemoHamstringPlan(trx: Knex, clinicId: number, athlete: { id: number; coach_id: number }, assessmentId: number | null, now = new Date()): Promise<void> {
  const rows = await trx('exercises').where({ clinic_id: clinicId }).select<{ id: number; name: string }[]>('id', 'name');
  const ids = new Map(rows.map((r) => [r.name, r.id]));
  const today = dayOf(now);
  const stage1 = addDays(weekStart(today), -28);
  const stage2 = addDays(weekStart(today), -7);
  await insertRunningPlan(trx, {
    clinicId, athlete, ids, plan: HAMSTRING_PLAN, assessmentId, at: now.toISOString(), keyPrefix: 'demo-seed-hamstring',
    stageStarts: [stage1, stage2],
    sessions: [
      { date: addDays(stage1, 0), during: 3, morning: 2, done: 3, stage: 0 },
      { date: addDays(stage1, 2), during: 3, morning: 1, done: 4, stage: 0 },
      { date: addDays(stage1, 5), during: 2, morning: 1, done: 4, stage: 0 },
      { date: addDays(stage1, 8), during: 2, morning: 1, done: 4, stage: 0 },
      { date: addDays(stage1, 12), during: 2, morning: 0, done: 4, stage: 0 },
      { date: addDays(stage1, 16), during: 2, morning: 0, done: 4, stage: 0 },
      { date: addDays(stage2, 0), during: 2, morning: 0, done: 2, stage: 1, note: 'Lowers felt strange but not painful.' },
      { date: addDays(stage2, 3), during: 2, morning: 0, done: 3, stage: 1 },
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
  p: { clinicId: number; athlete: { id: number; coach_id: number }; ids: Map<string, number>; plan: typeof CALF_PLAN; assessmentId: number | null; at: string; keyPrefix: string; stageStarts: string[]; sessions: DemoSession[] },
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
  await trx('plans').where({ id: planId }).update({ current_stage_id: stages[p.stageStarts.length - 1]!.id });
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
      sets: JSON.stringify(stage.items.map((it) => ({ stageExerciseId: it.id, name: it.name, setsPrescribed: it.sets, setsDone: Math.min(it.sets, s.done) }))),
      note: s.note ?? null,
      created_by: null,
      created_at: created > at ? at : created,
      updated_at: created > at ? at : created,
    });
  }
}
