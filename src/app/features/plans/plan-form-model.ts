/**
 * Reactive-form models of the exercise dialog and the plan builder, and their conversion to the
 * API bodies. The form mirrors the body's shape (stages.1.exercises.0.dose.sets …), so a 422's
 * field paths land on the right control.
 */
import {
  AbstractControl,
  FormArray,
  FormControl,
  FormGroup,
  NonNullableFormBuilder,
  ValidationErrors,
  ValidatorFn,
  Validators,
} from '@angular/forms';
import type {
  Dose,
  Exercise,
  ExerciseRegion,
  ExerciseWrite,
  LoadingKind,
  PlanDetail,
  PlanWrite,
  ProgressionCriterion,
  ProgressionCriterionKind,
  StageWrite,
} from '../../../contracts/plans';
import { DEFAULT_PAIN_RULE, PLAN_LIMITS } from '../../../contracts/plans';
import { requiredTrimmed } from '../../shared/forms/validators';
import { planWriteOf } from './plan-merge';

const L = PLAN_LIMITS;

/** Null or a whole number. Error: `{ whole: true }`. */
export const wholeNumber: ValidatorFn = (c: AbstractControl): ValidationErrors | null =>
  c.value === null || c.value === '' || Number.isInteger(c.value) ? null : { whole: true };

const range = (limits: { min: number; max: number }) => [Validators.min(limits.min), Validators.max(limits.max), wholeNumber];

/** A dose needs reps, a hold time, or both. Error on the group: `{ repsOrHold: true }`. */
export const repsOrHold: ValidatorFn = (g: AbstractControl): ValidationErrors | null => {
  const v = (g as DoseGroup).getRawValue();
  return v.reps === null && v.holdSeconds === null ? { repsOrHold: true } : null;
};

export type DoseGroup = FormGroup<{
  sets: FormControl<number | null>;
  reps: FormControl<number | null>;
  holdSeconds: FormControl<number | null>;
  tempo: FormControl<string>;
  load: FormControl<string>;
  restSeconds: FormControl<number | null>;
  daysPerWeek: FormControl<number | null>;
}>;

export function doseGroup(fb: NonNullableFormBuilder, d: Dose): DoseGroup {
  return fb.group(
    {
      sets: fb.control<number | null>(d.sets, [Validators.required, ...range(L.sets)]),
      reps: fb.control<number | null>(d.reps, range(L.reps)),
      holdSeconds: fb.control<number | null>(d.holdSeconds, range(L.holdSeconds)),
      tempo: fb.control(d.tempo ?? '', Validators.maxLength(L.text.tempo)),
      load: fb.control(d.load ?? '', Validators.maxLength(L.text.load)),
      restSeconds: fb.control<number | null>(d.restSeconds, range(L.restSeconds)),
      daysPerWeek: fb.control<number | null>(d.daysPerWeek, [Validators.required, ...range(L.daysPerWeek)]),
    },
    { validators: repsOrHold },
  );
}

const textOrNull = (s: string) => (s.trim() === '' ? null : s.trim());

export function doseFromForm(v: ReturnType<DoseGroup['getRawValue']>): Dose {
  return {
    sets: v.sets ?? 0,
    reps: v.reps,
    holdSeconds: v.holdSeconds,
    tempo: textOrNull(v.tempo),
    load: textOrNull(v.load),
    restSeconds: v.restSeconds,
    daysPerWeek: v.daysPerWeek ?? 0,
  };
}

export const BLANK_DOSE: Dose = { sets: 3, reps: 10, holdSeconds: null, tempo: null, load: null, restSeconds: 60, daysPerWeek: 3 };

// ─── Exercise dialog ──────────────────────────────────────────────────────────────────────

export type ExerciseForm = FormGroup<{
  name: FormControl<string>;
  purpose: FormControl<string>;
  region: FormControl<ExerciseRegion | null>;
  kind: FormControl<LoadingKind | null>;
  dose: DoseGroup;
  /** One step per line. */
  instructions: FormControl<string>;
  cautions: FormControl<string>;
  /** The published programme it comes from (optional). */
  source: FormControl<string>;
}>;

export function createExerciseForm(fb: NonNullableFormBuilder, e?: Exercise): ExerciseForm {
  return fb.group({
    name: fb.control(e?.name ?? '', [Validators.required, requiredTrimmed, Validators.maxLength(L.text.name)]),
    purpose: fb.control(e?.purpose ?? '', [Validators.required, requiredTrimmed, Validators.maxLength(L.text.purpose)]),
    region: fb.control<ExerciseRegion | null>(e?.region ?? null, Validators.required),
    kind: fb.control<LoadingKind | null>(e?.kind ?? null, Validators.required),
    dose: doseGroup(fb, e?.dose ?? BLANK_DOSE),
    instructions: fb.control(e?.instructions.join('\n') ?? '', [Validators.required, requiredTrimmed, stepsValidator]),
    cautions: fb.control(e?.cautions ?? '', Validators.maxLength(L.text.cautions)),
    source: fb.control(e?.source ?? '', Validators.maxLength(L.text.source)),
  });
}

/** Instruction steps typed one per line: blank lines dropped, each trimmed. */
export function splitSteps(text: string): string[] {
  return text
    .split(/\r?\n/)
    .map((s) => s.trim())
    .filter(Boolean);
}

/** At most 12 steps of at most 300 characters. Errors: `{ tooManySteps }`, `{ stepTooLong }`. */
export function stepsValidator(c: AbstractControl): ValidationErrors | null {
  const steps = splitSteps(String(c.value ?? ''));
  if (steps.length > L.instructionSteps.max) return { tooManySteps: true };
  if (steps.some((s) => s.length > L.text.instructionStep)) return { stepTooLong: true };
  return null;
}

export function exerciseFromForm(v: ReturnType<ExerciseForm['getRawValue']>): ExerciseWrite {
  return {
    name: v.name.trim(),
    purpose: v.purpose.trim(),
    region: v.region!,
    kind: v.kind!,
    dose: doseFromForm(v.dose),
    instructions: splitSteps(v.instructions),
    cautions: v.cautions.trim(),
    source: v.source.trim(),
  };
}

// ─── Plan builder ─────────────────────────────────────────────────────────────────────────

export type CriterionGroup = FormGroup<{
  kind: FormControl<ProgressionCriterionKind>;
  max: FormControl<number | null>;
  sessions: FormControl<number | null>;
  weeks: FormControl<number | null>;
}>;

export type StageExerciseGroup = FormGroup<{
  /** The stage exercise's id once saved (kept on save, so the athlete's queued logs still match). */
  id: FormControl<number | null>;
  exerciseId: FormControl<number>;
  /** The library exercise, for display (not sent). */
  info: FormControl<Exercise>;
  dose: DoseGroup;
  notes: FormControl<string>;
}>;

export type StageGroup = FormGroup<{
  id: FormControl<number | null>;
  name: FormControl<string>;
  goal: FormControl<string>;
  targetWeeks: FormControl<number | null>;
  progressionText: FormControl<string>;
  criteria: FormArray<CriterionGroup>;
  exercises: FormArray<StageExerciseGroup>;
}>;

export type PlanForm = FormGroup<{
  title: FormControl<string>;
  assessmentId: FormControl<number | null>;
  notes: FormControl<string>;
  stages: FormArray<StageGroup>;
}>;

/** Default numbers of a new criterion: the pain limit is the plan's pain rule (Silbernagel 2007, from memory). */
export function defaultCriterion(kind: ProgressionCriterionKind, maxDuring = DEFAULT_PAIN_RULE.maxDuring): ProgressionCriterion {
  switch (kind) {
    case 'pain_during_at_most':
      return { kind, max: maxDuring, sessions: 3 };
    case 'weeks_in_stage':
      return { kind, weeks: 2 };
    default:
      return { kind, sessions: 3 };
  }
}

export function criterionGroup(fb: NonNullableFormBuilder, c: ProgressionCriterion): CriterionGroup {
  return fb.group({
    kind: fb.control(c.kind),
    max: fb.control<number | null>('max' in c ? c.max : DEFAULT_PAIN_RULE.maxDuring, [
      Validators.required,
      Validators.min(0),
      Validators.max(10),
      wholeNumber,
    ]),
    sessions: fb.control<number | null>('sessions' in c ? c.sessions : 3, [Validators.required, ...range(L.criterionSessions)]),
    weeks: fb.control<number | null>('weeks' in c ? c.weeks : 2, [Validators.required, ...range(L.criterionWeeks)]),
  });
}

export function criterionFromForm(v: ReturnType<CriterionGroup['getRawValue']>): ProgressionCriterion {
  switch (v.kind) {
    case 'pain_during_at_most':
      return { kind: v.kind, max: v.max ?? 0, sessions: v.sessions ?? 0 };
    case 'weeks_in_stage':
      return { kind: v.kind, weeks: v.weeks ?? 0 };
    default:
      return { kind: v.kind, sessions: v.sessions ?? 0 };
  }
}

export function stageExerciseGroup(
  fb: NonNullableFormBuilder,
  exercise: Exercise,
  dose: Dose = exercise.dose,
  notes: string | null = null,
  id: number | null = null,
): StageExerciseGroup {
  return fb.group({
    id: fb.control<number | null>(id),
    exerciseId: fb.control(exercise.id),
    info: fb.control(exercise),
    dose: doseGroup(fb, dose),
    notes: fb.control(notes ?? '', Validators.maxLength(L.text.doseNotes)),
  });
}

export interface StageSeed {
  id?: number;
  name: string;
  goal: string;
  targetWeeks: number;
  progressionText: string;
  criteria: ProgressionCriterion[];
  exercises: { id?: number; exercise: Exercise; dose: Dose; notes: string | null }[];
}

export function stageGroup(fb: NonNullableFormBuilder, s: StageSeed): StageGroup {
  return fb.group({
    id: fb.control<number | null>(s.id ?? null),
    name: fb.control(s.name, [Validators.required, requiredTrimmed, Validators.maxLength(L.text.stageName)]),
    goal: fb.control(s.goal, Validators.maxLength(L.text.stageGoal)),
    targetWeeks: fb.control<number | null>(s.targetWeeks, [Validators.required, ...range(L.targetWeeks)]),
    progressionText: fb.control(s.progressionText, Validators.maxLength(L.text.progressionText)),
    criteria: fb.array(s.criteria.map((c) => criterionGroup(fb, c))),
    exercises: fb.array(s.exercises.map((e) => stageExerciseGroup(fb, e.exercise, e.dose, e.notes, e.id ?? null))),
  });
}

export const blankStage = (n: number): StageSeed => ({
  name: `Stage ${n}`,
  goal: '',
  targetWeeks: 2,
  progressionText: '',
  criteria: [],
  exercises: [],
});

/**
 * The usual staged loading of a hamstring plan — isometric holds, then slow lengthening, then
 * fast work and running drills — as three empty stages (common practice in the trade; REFERENCES
 * "Loading and return to running" [trade]). Their pain criterion uses the plan's pain rule limit.
 * The coach adds the exercises from the library.
 */
export function threeStageTemplate(maxDuring = DEFAULT_PAIN_RULE.maxDuring): StageSeed[] {
  const pain = defaultCriterion('pain_during_at_most', maxDuring);
  const settled = defaultCriterion('settled_by_morning');
  return [
    {
      name: 'Isometric holds',
      goal: 'Steady holds to calm the area and rebuild tolerance to load.',
      targetWeeks: 2,
      progressionText: 'Move on when the holds feel steady and pain settles by the next morning.',
      criteria: [pain, settled],
      exercises: [],
    },
    {
      name: 'Slow lengthening',
      goal: 'Slow eccentric work through a growing range of movement.',
      targetWeeks: 3,
      progressionText: 'Move on when every set is done with control and pain stays within the rule.',
      criteria: [pain, settled, defaultCriterion('all_sets_done')],
      exercises: [],
    },
    {
      name: 'Fast work and running drills',
      goal: 'Speed, spring and running drills, then a graded return to running.',
      targetWeeks: 3,
      progressionText: 'Return to normal running when fast drills cause no pain the next morning and the coach agrees.',
      criteria: [settled, defaultCriterion('all_sets_done')],
      exercises: [],
    },
  ];
}

export function createPlanForm(fb: NonNullableFormBuilder, plan?: PlanDetail, defaultTitle = ''): PlanForm {
  if (!plan) return planFormFromWrite(fb, { title: defaultTitle, assessmentId: null, notes: null, stages: [] }, new Map());
  return planFormFromWrite(fb, planWriteOf(plan), new Map(plan.stages.flatMap((s) => s.exercises.map((e) => [e.exerciseId, e.exercise]))));
}

/**
 * A plan form holding a plan body (e.g. an edit re-applied on top of a colleague's save);
 * `library` gives each exercise of the body by its id, for display.
 */
export function planFormFromWrite(fb: NonNullableFormBuilder, plan: PlanWrite, library: ReadonlyMap<number, Exercise>): PlanForm {
  return fb.group({
    title: fb.control(plan.title, [Validators.required, requiredTrimmed, Validators.maxLength(L.text.planTitle)]),
    assessmentId: fb.control<number | null>(plan.assessmentId),
    notes: fb.control(plan.notes ?? '', Validators.maxLength(L.text.planNotes)),
    stages: fb.array(
      plan.stages.map((s) =>
        stageGroup(fb, {
          ...s,
          exercises: s.exercises.map((e) => ({ id: e.id, exercise: library.get(e.exerciseId)!, dose: e.dose, notes: e.notes })),
        }),
      ),
    ),
  });
}

export function planFromForm(v: ReturnType<PlanForm['getRawValue']>): PlanWrite {
  return {
    title: v.title.trim(),
    assessmentId: v.assessmentId,
    notes: textOrNull(v.notes),
    stages: v.stages.map((s): StageWrite => {
      const stage: StageWrite = {
        name: s.name.trim(),
        goal: s.goal.trim(),
        targetWeeks: s.targetWeeks ?? 0,
        progressionText: s.progressionText.trim(),
        criteria: s.criteria.map(criterionFromForm),
        exercises: s.exercises.map((e) => ({
          ...(e.id !== null ? { id: e.id } : {}),
          exerciseId: e.exerciseId,
          dose: doseFromForm(e.dose),
          notes: textOrNull(e.notes),
        })),
      };
      if (s.id !== null) stage.id = s.id;
      return stage;
    }),
  };
}

/** Moves an entry of a FormArray by `delta` places (no-op at the ends). */
export function moveInArray(array: FormArray, index: number, delta: number): void {
  const to = index + delta;
  if (to < 0 || to >= array.length) return;
  const control = array.at(index);
  array.removeAt(index, { emitEvent: false });
  array.insert(to, control);
}
