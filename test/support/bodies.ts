import { expect } from 'vitest';
import type { Client } from './test-app';

/** An intake with nothing filled in but the two consents (PUT /api/athletes/:id/intake). */
export const intakeWith = (consents: { videoRecording: boolean; shareStills: boolean }) => ({
  dateOfBirth: null,
  heightCm: null,
  distanceUnit: 'km',
  weeklyDistance: null,
  longestRecentRun: null,
  goalEvent: null,
  goalDate: null,
  surfaces: [],
  injuries: [],
  pain: [],
  consents,
});

/** A baseline visit on the treadmill with nothing else filled in (POST /api/athletes/:id/assessments). */
export const baselineVisit = (date = '2026-11-30') => ({
  date,
  kind: 'baseline',
  surface: 'treadmill',
  speed: null,
  inclinePercent: null,
  shoes: null,
  cameraNotes: null,
  notes: null,
});

/** Uploads `clipFile` into the visit in one request (multipart) and answers the response as it came. */
export async function uploadClip(c: Client, assessmentId: number, clipFile: string) {
  return c.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await c.xsrf())
    .attach('file', clipFile);
}

/** Opens a baseline visit for the athlete and uploads `clipFile` into it in one request; answers the clip's id (201 expected). */
export async function uploadToNewVisit(c: Client, athleteId: number, clipFile: string): Promise<number> {
  const visit = await c.post(`/api/athletes/${athleteId}/assessments`, baselineVisit());
  expect(visit.status, JSON.stringify(visit.body)).toBe(201);
  const up = await uploadClip(c, visit.body.id as number, clipFile);
  expect(up.status, JSON.stringify(up.body)).toBe(201);
  return up.body.id as number;
}
