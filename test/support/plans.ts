/** Plans that tests put in front of an athlete: one stage holding one exercise at its dose. */
import { expect } from 'vitest';
import type { Client } from './test-app';

/** The body of POST /api/athletes/:id/plans for a one-stage plan holding `exerciseId` at `dose`. */
export function oneStagePlan(title: string, exerciseId: number, dose: unknown) {
  return {
    title,
    assessmentId: null,
    notes: null,
    stages: [
      { name: 'Holds', goal: '', targetWeeks: 2, progressionText: '', criteria: [], exercises: [{ exerciseId, dose, notes: null }] },
    ],
  };
}

/** The body of POST /api/exercises for an invented hip mobility exercise named `name`; `over` changes its fields. */
export function exerciseBody(name: string, over: Record<string, unknown> = {}) {
  return {
    name,
    purpose: 'Invented for this test.',
    region: 'hip',
    kind: 'mobility',
    instructions: ['Step one.'],
    cautions: '',
    dose: { sets: 2, reps: 5, holdSeconds: null, tempo: null, load: null, restSeconds: null, daysPerWeek: 3 },
    ...over,
  };
}

/** Creates and starts a one-stage plan for `athleteId` holding `exercise` at its own dose; answers the plan id. */
export async function startPlanWith(coach: Client, athleteId: number, exercise: { id: number; dose: unknown }): Promise<number> {
  const plan = await coach.post(`/api/athletes/${athleteId}/plans`, oneStagePlan('Calf loading', exercise.id, exercise.dose));
  expect(plan.status, JSON.stringify(plan.body)).toBe(201);
  expect((await coach.post(`/api/plans/${plan.body.id}/transitions`, { action: 'start' })).status).toBe(200);
  return plan.body.id as number;
}
