import { TestBed } from '@angular/core/testing';
import { NonNullableFormBuilder } from '@angular/forms';
import type { Exercise, PlanDetail } from '../../../contracts/plans';
import { DEFAULT_PAIN_RULE } from '../../../contracts/plans';
import {
  createExerciseForm,
  createPlanForm,
  criterionGroup,
  doseGroup,
  exerciseFromForm,
  moveInArray,
  planFromForm,
  splitSteps,
  stageExerciseGroup,
  stageGroup,
  threeStageTemplate,
} from './plan-form-model';

const exercise: Exercise = {
  id: 4,
  name: 'Bent-knee bridge hold',
  purpose: 'Holds a bridge.',
  region: 'hamstring',
  kind: 'isometric',
  dose: { sets: 5, reps: null, holdSeconds: 30, tempo: null, load: 'Body weight', restSeconds: 60, daysPerWeek: 5 },
  instructions: ['Lie on your back.', 'Lift the hips.'],
  cautions: '',
  source: 'Goom et al. 2016, J Orthop Sports Phys Ther 46(6):483–493',
  archived: false,
  createdAt: '',
  updatedAt: '',
};

describe('plan form model', () => {
  let fb: NonNullableFormBuilder;
  beforeEach(() => {
    fb = TestBed.inject(NonNullableFormBuilder);
  });

  it('refuses negative, fractional and missing doses in the form', () => {
    const g = doseGroup(fb, exercise.dose);
    expect(g.valid).toBe(true);
    g.controls.sets.setValue(-1);
    expect(g.controls.sets.hasError('min')).toBe(true);
    g.controls.sets.setValue(2.5);
    expect(g.controls.sets.hasError('whole')).toBe(true);
    g.controls.sets.setValue(3);
    g.controls.holdSeconds.setValue(null);
    expect(g.hasError('repsOrHold')).toBe(true);
    g.controls.reps.setValue(8);
    expect(g.valid).toBe(true);
  });

  it('turns the exercise form into the API body: steps one per line, trimmed, with its source', () => {
    const f = createExerciseForm(fb, exercise);
    expect(f.controls.source.value).toBe(exercise.source);
    f.controls.instructions.setValue('  Lie on your back. \n\n Lift the hips.\n');
    f.controls.dose.controls.tempo.setValue('  ');
    f.controls.source.setValue('  Rio et al. 2015, Br J Sports Med 49:1277–1283 ');
    expect(exerciseFromForm(f.getRawValue())).toMatchObject({
      name: 'Bent-knee bridge hold',
      instructions: ['Lie on your back.', 'Lift the hips.'],
      dose: { tempo: null, load: 'Body weight' },
      source: 'Rio et al. 2015, Br J Sports Med 49:1277–1283',
    });
    f.controls.source.setValue('x'.repeat(301));
    expect(f.controls.source.hasError('maxlength')).toBe(true);
    expect(splitSteps('a\r\nb')).toEqual(['a', 'b']);
    f.controls.instructions.setValue(Array.from({ length: 13 }, (_, i) => `Step ${i}`).join('\n'));
    expect(f.controls.instructions.hasError('tooManySteps')).toBe(true);
  });

  it('builds the three-stage template with criteria that use the plan’s pain limit (Silbernagel 2007, from memory)', () => {
    const stages = threeStageTemplate();
    expect(stages.map((s) => s.name)).toEqual(['Isometric holds', 'Slow lengthening', 'Fast work and running drills']);
    expect(stages[0]!.criteria[0]).toEqual({ kind: 'pain_during_at_most', max: DEFAULT_PAIN_RULE.maxDuring, sessions: 3 });
    expect(stages.every((s) => s.exercises.length === 0)).toBe(true);
  });

  it('round-trips a plan: stage and stage-exercise ids kept (queued logs still match), exercises with doses, criteria by kind', () => {
    const detail = {
      title: 'Plan',
      assessmentId: 12,
      notes: '',
      stages: [
        {
          id: 31,
          position: 1,
          name: 'Holds',
          goal: 'Calm',
          targetWeeks: 2,
          progressionText: 'When calm',
          criteria: [{ kind: 'weeks_in_stage', weeks: 2 }],
          exercises: [{ id: 1, exerciseId: 4, exercise, position: 1, dose: { ...exercise.dose, sets: 4 }, notes: 'Left side only' }],
          sessionsPerWeek: 3,
          startedAt: null,
          completedAt: null,
        },
      ],
    } as unknown as PlanDetail;
    const form = createPlanForm(fb, detail);
    form.controls.stages.push(stageGroup(fb, { name: 'New', goal: '', targetWeeks: 3, progressionText: '', criteria: [], exercises: [] }));
    form.controls.stages.at(1).controls.exercises.push(stageExerciseGroup(fb, exercise));
    form.controls.stages.at(1).controls.criteria.push(criterionGroup(fb, { kind: 'pain_during_at_most', max: 3, sessions: 2 }));
    expect(planFromForm(form.getRawValue())).toEqual({
      title: 'Plan',
      assessmentId: 12,
      notes: null,
      stages: [
        {
          id: 31,
          name: 'Holds',
          goal: 'Calm',
          targetWeeks: 2,
          progressionText: 'When calm',
          criteria: [{ kind: 'weeks_in_stage', weeks: 2 }],
          exercises: [{ id: 1, exerciseId: 4, dose: { ...exercise.dose, sets: 4 }, notes: 'Left side only' }],
        },
        {
          name: 'New',
          goal: '',
          targetWeeks: 3,
          progressionText: '',
          criteria: [{ kind: 'pain_during_at_most', max: 3, sessions: 2 }],
          exercises: [{ exerciseId: 4, dose: exercise.dose, notes: null }],
        },
      ],
    });
    moveInArray(form.controls.stages, 1, -1);
    expect(form.controls.stages.at(0).controls.name.value).toBe('New');
    moveInArray(form.controls.stages, 0, -1);
    expect(form.controls.stages.at(0).controls.name.value).toBe('New');
  });
});
