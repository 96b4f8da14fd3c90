import { DEFAULT_PAIN_RULE, type PlanDetail } from '../../../contracts/plans';

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
