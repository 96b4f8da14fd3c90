/**
 * What the demonstration tests (pictures and clips of an exercise) share: a started plan that puts
 * an exercise in front of the demo athlete, multipart uploads, and the files stored for exercises.
 */
import fs from 'node:fs';
import path from 'node:path';
import { expect } from 'vitest';
import type { Client } from './test-app';

/** Creates and starts a one-stage plan for `athleteId` holding `exercise` at its own dose; answers the plan id. */
export async function startPlanWith(coach: Client, athleteId: number, exercise: { id: number; dose: unknown }): Promise<number> {
  const plan = await coach.post(`/api/athletes/${athleteId}/plans`, {
    title: 'Calf loading',
    assessmentId: null,
    notes: null,
    stages: [
      {
        name: 'Holds',
        goal: '',
        targetWeeks: 2,
        progressionText: '',
        criteria: [],
        exercises: [{ exerciseId: exercise.id, dose: exercise.dose, notes: null }],
      },
    ],
  });
  expect(plan.status, JSON.stringify(plan.body)).toBe(201);
  expect((await coach.post(`/api/plans/${plan.body.id}/transitions`, { action: 'start' })).status).toBe(200);
  return plan.body.id as number;
}

/** POSTs `file` (a path, or bytes named `name`) as the multipart field `file`, with an optional caption. */
export async function uploadFile(client: Client, url: string, file: string | Buffer, name?: string, caption?: string) {
  const req = client.agent
    .post(url)
    .set('X-XSRF-TOKEN', await client.xsrf())
    .attach('file', file, name);
  return caption === undefined ? req : req.field('caption', caption);
}

/** Every stored file under `uploads/exercises` (none may stay behind a refusal). */
export function storedExerciseFiles(uploadsDir: string): string[] {
  const root = path.join(uploadsDir, 'exercises');
  if (!fs.existsSync(root)) return [];
  return (fs.readdirSync(root, { recursive: true }) as string[]).filter((f) => fs.statSync(path.join(root, f)).isFile());
}
