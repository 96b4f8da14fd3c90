import { z } from 'zod';
import { RouteId } from '../http/validate';
import { EXERCISE_REGIONS, LOADING_KINDS, PAIN_SCALE, PLAN_ACTIONS, PLAN_LIMITS } from '../../src/contracts/plans';
import { IsoDate } from '../athletes/athletes-schemas';

const L = PLAN_LIMITS;
const emptyToNull = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? null : v);

/** A whole number in [min, max], with messages that name the field. */
const Int = (label: string, { min, max }: { min: number; max: number }) =>
  z
    .number(`${label} must be a number.`)
    .int(`${label} must be a whole number.`)
    .min(min, min === 0 ? `${label} cannot be negative.` : `${label} must be at least ${min}.`)
    .max(max, `${label} must be at most ${max}.`);

const Pain = (label: string) =>
  z
    .number(`${label} must be a number from ${PAIN_SCALE.min} to ${PAIN_SCALE.max}.`)
    .int(`${label} must be a whole number from ${PAIN_SCALE.min} to ${PAIN_SCALE.max}.`)
    .min(PAIN_SCALE.min, `${label} must be from ${PAIN_SCALE.min} to ${PAIN_SCALE.max}.`)
    .max(PAIN_SCALE.max, `${label} must be from ${PAIN_SCALE.min} to ${PAIN_SCALE.max}.`);

const Required = (max: number, label: string) =>
  z.string(`${label} is required.`).trim().min(1, `${label} is required.`).max(max, `${label} must be at most ${max} characters.`);
const Text = (max: number, label: string) =>
  z.string(`${label} must be text.`).trim().max(max, `${label} must be at most ${max} characters.`);
const NullableText = (max: number, label: string) => z.preprocess(emptyToNull, Text(max, label).nullable());

export const DoseBody = z
  .strictObject({
    sets: Int('Sets', L.sets),
    reps: Int('Reps', L.reps).nullable(),
    holdSeconds: Int('Hold', L.holdSeconds).nullable(),
    tempo: NullableText(L.text.tempo, 'Tempo'),
    load: NullableText(L.text.load, 'Load'),
    restSeconds: Int('Rest', L.restSeconds).nullable(),
    daysPerWeek: Int('Days per week', L.daysPerWeek),
  })
  .superRefine((d, ctx) => {
    if (d.reps === null && d.holdSeconds === null) {
      ctx.addIssue({ code: 'custom', path: ['reps'], message: 'Give reps, a hold time, or both.' });
    }
  });

export const ExerciseBody = z.strictObject({
  name: Required(L.text.name, 'Name'),
  purpose: Required(L.text.purpose, 'Purpose'),
  region: z.enum(EXERCISE_REGIONS, 'Choose a body region.'),
  kind: z.enum(LOADING_KINDS, 'Choose a kind of loading.'),
  dose: DoseBody,
  instructions: z
    .array(Required(L.text.instructionStep, 'Each step'), 'Instructions must be a list of steps.')
    .min(1, 'Give at least one instruction step.')
    .max(L.instructionSteps.max, `Give at most ${L.instructionSteps.max} steps.`),
  cautions: Text(L.text.cautions, 'Cautions'),
  source: Text(L.text.source, 'Source').optional(),
});
export type ExerciseInput = z.output<typeof ExerciseBody>;
export const ExercisePatchBody = ExerciseBody.partial();
export type ExercisePatch = z.output<typeof ExercisePatchBody>;

export const ExerciseQueryParams = z.object({
  q: z.string().trim().max(80).optional(),
  region: z.enum(EXERCISE_REGIONS, 'Unknown region.').optional(),
  kind: z.enum(LOADING_KINDS, 'Unknown kind of loading.').optional(),
  archived: z.enum(['true', 'false']).optional(),
});
export type ExerciseQueryInput = z.output<typeof ExerciseQueryParams>;

const Sessions = Int('Sessions', L.criterionSessions);
export const CriterionBody = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({ kind: z.literal('pain_during_at_most'), max: Pain('Pain limit'), sessions: Sessions }),
    z.strictObject({ kind: z.literal('settled_by_morning'), sessions: Sessions }),
    z.strictObject({ kind: z.literal('all_sets_done'), sessions: Sessions }),
    z.strictObject({ kind: z.literal('sessions_logged'), sessions: Sessions }),
    z.strictObject({ kind: z.literal('weeks_in_stage'), weeks: Int('Weeks', L.criterionWeeks) }),
  ],
  'Choose a kind of criterion.',
);

const Id = z.number('Must be an id.').int('Must be an id.').positive('Must be an id.');

export const StageExerciseBody = z.strictObject({
  /** Id of an existing stage exercise of this stage to keep (PUT); absent for a new one. */
  id: Id.optional(),
  exerciseId: Id,
  dose: DoseBody,
  notes: NullableText(L.text.doseNotes, 'Notes'),
});

export const StageBody = z.strictObject({
  id: Id.optional(),
  name: Required(L.text.stageName, 'Stage name'),
  goal: Text(L.text.stageGoal, 'Goal'),
  targetWeeks: Int('Target duration', L.targetWeeks),
  progressionText: Text(L.text.progressionText, 'Progression'),
  criteria: z.array(CriterionBody).max(8, 'Give at most 8 criteria.'),
  exercises: z.array(StageExerciseBody).max(L.exercisesPerStage.max, `Give at most ${L.exercisesPerStage.max} exercises a stage.`),
});

export const PlanBody = z.strictObject({
  title: Required(L.text.planTitle, 'Title'),
  assessmentId: Id.nullable(),
  notes: NullableText(L.text.planNotes, 'Notes'),
  stages: z.array(StageBody).min(L.stages.min, 'Add at least one stage.').max(L.stages.max, `Give at most ${L.stages.max} stages.`),
});
export type PlanInput = z.output<typeof PlanBody>;

/**
 * Body of PUT /api/plans/:id: the plan, and the revision the edit started from (a newer stored one
 * answers 409). Required: a save that names no revision would silently overwrite a colleague's.
 */
export const PlanPutBody = PlanBody.extend({
  baseRevision: z
    .number('Base revision is required: send the revision of the plan the edit started from.')
    .int('Base revision must be a whole number.')
    .min(0, 'Base revision must be 0 or more.'),
});
export type PlanPutInput = z.output<typeof PlanPutBody>;

export const TransitionBody = z.strictObject({ action: z.enum(PLAN_ACTIONS, 'Choose start, advance, pause, resume or finish.') });

export const PainRuleBody = z.strictObject({
  maxDuring: Pain('Highest pain during'),
  morningMustSettle: z.boolean('Say whether morning pain must settle.'),
  settledMorningMax: Pain('Settled morning pain'),
  noWeeklyRise: z.boolean('Say whether a weekly rise alerts.'),
});

/** Client-generated idempotency key (a UUID fits). */
export const LogKey = z.string('Key is required.').regex(/^[A-Za-z0-9_-]{8,64}$/, 'Key must be 8–64 letters, digits, - or _.');

export const LogBody = z.strictObject({
  key: LogKey,
  stageId: Id,
  date: IsoDate,
  painDuring: Pain('Pain during'),
  sets: z
    .array(z.strictObject({ stageExerciseId: Id, exerciseId: Id.optional(), setsDone: Int('Sets done', { min: 0, max: L.sets.max }) }))
    .max(L.exercisesPerStage.max),
  note: NullableText(L.text.logNote, 'Note'),
});
export type LogInput = z.output<typeof LogBody>;

export const MorningBody = z.strictObject({ pain: Pain('Morning pain') });

export const PlanKeyParams = z.object({
  id: RouteId,
  key: LogKey,
});
