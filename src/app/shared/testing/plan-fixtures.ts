import { DEFAULT_PAIN_RULE, type Dose, type PlanDetail, type PlanWrite, type StageWrite } from '../../../contracts/plans';

/** A one-stage plan (id 5, athlete 4, stage 31 "Isometric holds", no exercises) for client specs; `over` changes its fields. */
export function aPlan(over: Partial<PlanDetail> = {}): PlanDetail {
  return {
    id: 5,
    athleteId: 4,
    title: 'Hamstring strain: staged loading',
    status: 'draft',
    assessmentId: null,
    assessmentDate: null,
    stageCount: 1,
    currentStageId: null,
    currentStageName: null,
    currentStagePosition: null,
    alerts: [],
    startedAt: null,
    finishedAt: null,
    createdAt: '2026-11-01T10:00:00Z',
    updatedAt: '2026-11-01T10:00:00Z',
    notes: null,
    revision: 1,
    painRule: DEFAULT_PAIN_RULE,
    stages: [
      {
        id: 31,
        position: 1,
        name: 'Isometric holds',
        goal: 'Calm',
        targetWeeks: 2,
        progressionText: 'When calm',
        criteria: [],
        exercises: [],
        sessionsPerWeek: 0,
        startedAt: null,
        completedAt: null,
      },
    ],
    ...over,
  };
}

/** A dose of `sets` × `reps` with a minute's rest, three days a week. */
export const aDose = (sets: number, reps = 10): Dose => ({
  sets,
  reps,
  holdSeconds: null,
  tempo: null,
  load: null,
  restSeconds: 60,
  daysPerWeek: 3,
});

/** A stage exercise as sent: library exercise `exerciseId` at `sets` × 10, with its stage-exercise `id` when saved. */
export const aStageItem = (id: number | undefined, exerciseId: number, sets = 3): StageWrite['exercises'][number] => ({
  ...(id !== undefined ? { id } : {}),
  exerciseId,
  dose: aDose(sets),
  notes: null,
});

/** A stage as sent, two weeks long, with no criteria; its `id` when saved. */
export const aStageWrite = (id: number | undefined, name: string, exercises: StageWrite['exercises'] = []): StageWrite => ({
  ...(id !== undefined ? { id } : {}),
  name,
  goal: '',
  targetWeeks: 2,
  progressionText: '',
  criteria: [],
  exercises,
});

/** A plan as sent: "Hamstring plan" with `stages`. */
export const aPlanWrite = (stages: StageWrite[]): PlanWrite => ({ title: 'Hamstring plan', assessmentId: null, notes: null, stages });
