/**
 * Walks every API route as each kind of caller and checks the status. A new route must be added
 * to ROUTES, or the "every route is listed" check fails. Callers: anonymous, the demo clinic's
 * athlete (self), coach and owner, and a second clinic's athlete, coach and owner. Targets include
 * athletes who have no account: one of the demo clinic (Teodor) and one of the second clinic.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Express } from 'express';
import { makeClip, tempDir } from './media/fixtures';
import { Client, makeTestApp, OTHER, signedIn, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { listRoutes } from '../support/routes';

type Who = 'anonymous' | 'athleteSelf' | 'athleteOther' | 'coach' | 'coachOtherClinic' | 'owner' | 'ownerOtherClinic';
const WHO: Who[] = ['anonymous', 'athleteSelf', 'athleteOther', 'coach', 'coachOtherClinic', 'owner', 'ownerOtherClinic'];
/** Expected statuses; the other clinic's owner answers as its coach unless stated. */
type Expect = Record<Exclude<Who, 'ownerOtherClinic'>, number> & { ownerOtherClinic?: number };
const expected = (e: Expect, who: Who): number => (who === 'ownerOtherClinic' ? (e.ownerOtherClinic ?? e.coachOtherClinic) : e[who]);

interface Ctx {
  /** The demo athlete with an account (the "self" athlete). */
  selfAthleteId: number;
  /** An athlete of the same clinic, not the signed-in athlete, without an account. */
  otherAthleteId: number;
  /** An athlete of the second clinic without an account (for 404s across clinics). */
  foreignAthleteId: number;
  pendingInvitationId: number;
  /** The self athlete's assessment, with a ready clip. */
  assessmentId: number;
  /** An assessment of another athlete of the same clinic. */
  otherAssessmentId: number;
  clipId: number;
  /** Made fresh before each DELETE / retry call. */
  scratchAssessmentId: number;
  scratchClipId: number;
}

interface RouteCase {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  /** Express path pattern as mounted, for the completeness check. */
  pattern: string;
  path: (c: Ctx) => string;
  body?: (c: Ctx) => unknown;
  expect: Expect;
  /** Runs before each call (fresh rows for DELETE and the like). */
  before?: () => Promise<void>;
  /** Server-sent events: only the status line is read. */
  stream?: boolean;
}

const intake = {
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
  consents: { videoRecording: true, shareStills: true },
};

const assessment = {
  date: '2026-11-30',
  kind: 'baseline',
  surface: 'treadmill',
  speed: { value: 11, unit: 'kmh' },
  inclinePercent: 1,
  shoes: null,
  cameraNotes: null,
  notes: null,
};

const all = (status: number): Expect => Object.fromEntries(WHO.map((w) => [w, status])) as Expect;
const staffOnly = (ok: number, otherClinic = 403): Expect => ({
  anonymous: 401,
  athleteSelf: 403,
  athleteOther: 403,
  coach: ok,
  coachOtherClinic: otherClinic,
  owner: ok,
});
/** Readable by clinic staff and by the athlete it belongs to. */
const selfAndStaff = (ok: number): Expect => ({
  anonymous: 401,
  athleteSelf: ok,
  athleteOther: 404,
  coach: ok,
  coachOtherClinic: 404,
  owner: ok,
});
/** Writable by clinic staff only. */
const staffWrite = (ok: number): Expect => ({
  anonymous: 401,
  athleteSelf: 403,
  athleteOther: 403,
  coach: ok,
  coachOtherClinic: 404,
  owner: ok,
});
/** Owner only; `otherOwner` is what the second clinic's owner gets (404 for this clinic's ids, ok for their own lists). */
const ownerOnly = (ok: number, otherOwner = 404): Expect => ({
  anonymous: 401,
  athleteSelf: 403,
  athleteOther: 403,
  coach: 403,
  coachOtherClinic: 403,
  owner: ok,
  ownerOtherClinic: otherOwner,
});
/** A route about the second clinic's athlete who has no account: only that clinic's staff get past. */
const foreign = (ok: number, athletes = 404): Expect => ({
  anonymous: 401,
  athleteSelf: athletes,
  athleteOther: athletes,
  coach: 404,
  coachOtherClinic: ok,
  owner: 404,
});

// "athleteOther" is an athlete of another clinic reading the same ids: always 404 for athlete ids.
const ROUTES: RouteCase[] = [
  { method: 'get', pattern: '/api/health', path: () => '/api/health', expect: all(200) },
  { method: 'get', pattern: '/api/config', path: () => '/api/config', expect: all(200) },
  { method: 'get', pattern: '/api/auth/csrf', path: () => '/api/auth/csrf', expect: all(200) },
  { method: 'get', pattern: '/api/auth/me', path: () => '/api/auth/me', expect: all(200) },
  { method: 'get', pattern: '/api/staff', path: () => '/api/staff', expect: ownerOnly(200, 200) },
  {
    method: 'post',
    pattern: '/api/staff/invitations',
    path: () => '/api/staff/invitations',
    body: () => ({ email: `walk-${Math.random().toString(36).slice(2)}@x.test`, name: 'Walker' }),
    expect: ownerOnly(201, 201),
  },
  {
    method: 'delete',
    pattern: '/api/staff/invitations/:id',
    path: (c) => `/api/staff/invitations/${c.pendingInvitationId}`,
    expect: ownerOnly(204),
  },
  {
    method: 'post',
    pattern: '/api/staff/:id/deactivate',
    path: () => `/api/staff/${staffc.coachId}/deactivate`,
    body: () => ({}),
    before: () => scratchCoach(true),
    expect: ownerOnly(200),
  },
  {
    method: 'post',
    pattern: '/api/staff/:id/reactivate',
    path: () => `/api/staff/${staffc.coachId}/reactivate`,
    before: () => scratchCoach(false),
    expect: ownerOnly(200),
  },
  { method: 'get', pattern: '/api/coaches', path: () => '/api/coaches', expect: staffOnly(200, 200) },
  { method: 'get', pattern: '/api/athletes', path: () => '/api/athletes', expect: staffOnly(200, 200) },
  {
    method: 'post',
    pattern: '/api/athletes',
    path: () => '/api/athletes',
    body: () => ({ firstName: 'Walk', lastName: 'Er' }),
    expect: staffOnly(201, 201),
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id',
    path: (c) => `/api/athletes/${c.selfAthleteId}`,
    expect: { anonymous: 401, athleteSelf: 200, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id',
    path: (c) => `/api/athletes/${c.otherAthleteId}`,
    expect: { anonymous: 401, athleteSelf: 404, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 },
  },
  {
    method: 'patch',
    pattern: '/api/athletes/:id',
    path: (c) => `/api/athletes/${c.selfAthleteId}`,
    body: () => ({ firstName: 'Ada' }),
    expect: { anonymous: 401, athleteSelf: 200, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 },
  },
  {
    method: 'patch',
    pattern: '/api/athletes/:id',
    path: (c) => `/api/athletes/${c.otherAthleteId}`,
    body: () => ({ firstName: 'Teodor' }),
    expect: { anonymous: 401, athleteSelf: 404, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 },
  },
  {
    method: 'put',
    pattern: '/api/athletes/:id/intake',
    path: (c) => `/api/athletes/${c.selfAthleteId}/intake`,
    body: () => intake,
    expect: { anonymous: 401, athleteSelf: 200, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 },
  },
  {
    method: 'put',
    pattern: '/api/athletes/:id/intake',
    path: (c) => `/api/athletes/${c.otherAthleteId}/intake`,
    body: () => intake,
    expect: { anonymous: 401, athleteSelf: 404, athleteOther: 404, coach: 200, coachOtherClinic: 404, owner: 200 },
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/invitation',
    path: (c) => `/api/athletes/${c.otherAthleteId}/invitation`,
    expect: { ...staffOnly(201), coachOtherClinic: 404 },
  },
  // The second clinic's athlete without an account: everyone of the demo clinic gets 404.
  { method: 'get', pattern: '/api/athletes/:id', path: (c) => `/api/athletes/${c.foreignAthleteId}`, expect: foreign(200) },
  {
    method: 'patch',
    pattern: '/api/athletes/:id',
    path: (c) => `/api/athletes/${c.foreignAthleteId}`,
    body: () => ({ firstName: 'Foreign' }),
    expect: foreign(200),
  },
  {
    method: 'put',
    pattern: '/api/athletes/:id/intake',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/intake`,
    body: () => intake,
    expect: foreign(200),
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/invitation',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/invitation`,
    expect: foreign(201, 403),
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/assessments',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/assessments`,
    expect: foreign(200),
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/assessments',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/assessments`,
    body: () => assessment,
    expect: foreign(201, 403),
  },
  { method: 'get', pattern: '/api/athletes/:id/plans', path: (c) => `/api/athletes/${c.foreignAthleteId}/plans`, expect: foreign(200) },
  { method: 'get', pattern: '/api/athletes/:id/stills', path: (c) => `/api/athletes/${c.foreignAthleteId}/stills`, expect: foreign(200) },
  {
    method: 'get',
    pattern: '/api/athletes/:id/summaries',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/summaries`,
    expect: foreign(200),
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/measure-trends',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/measure-trends`,
    expect: foreign(200, 403),
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/comparison',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/comparison`,
    expect: foreign(422, 403),
  },
  { method: 'get', pattern: '/api/invitations/:token', path: () => `/api/invitations/${'u'.repeat(43)}`, expect: all(404) },
  {
    method: 'post',
    pattern: '/api/invitations/:token/accept',
    path: () => `/api/invitations/${'u'.repeat(43)}/accept`,
    body: () => ({ name: 'X', password: 'long-enough-pw' }),
    expect: all(404),
  },
  {
    method: 'post',
    pattern: '/api/password-resets',
    path: () => '/api/password-resets',
    body: () => ({ email: 'nobody@nowhere.test' }),
    expect: all(202),
  },
  { method: 'get', pattern: '/api/password-resets/:token', path: () => `/api/password-resets/${'u'.repeat(43)}`, expect: all(404) },
  {
    method: 'post',
    pattern: '/api/password-resets/:token',
    path: () => `/api/password-resets/${'u'.repeat(43)}`,
    body: () => ({ password: 'long-enough-pw' }),
    expect: all(404),
  },
  {
    method: 'post',
    pattern: '/api/auth/sign-in',
    path: () => '/api/auth/sign-in',
    body: () => ({ email: 'nobody@nowhere.test', password: 'x' }),
    expect: all(401),
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/assessments',
    path: (c) => `/api/athletes/${c.selfAthleteId}/assessments`,
    expect: selfAndStaff(200),
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/assessments',
    path: (c) => `/api/athletes/${c.otherAthleteId}/assessments`,
    body: () => assessment,
    expect: staffWrite(201),
  },
  { method: 'get', pattern: '/api/assessments/:id', path: (c) => `/api/assessments/${c.assessmentId}`, expect: selfAndStaff(200) },
  {
    method: 'get',
    pattern: '/api/assessments/:id',
    path: (c) => `/api/assessments/${c.otherAssessmentId}`,
    expect: { ...selfAndStaff(200), athleteSelf: 404 },
  },
  {
    method: 'patch',
    pattern: '/api/assessments/:id',
    path: (c) => `/api/assessments/${c.assessmentId}`,
    body: () => ({ shoes: 'Trail shoe' }),
    expect: staffWrite(200),
  },
  {
    method: 'delete',
    pattern: '/api/assessments/:id',
    path: (c) => `/api/assessments/${c.scratchAssessmentId}`,
    before: () => scratchAssessment(),
    expect: staffWrite(204),
  },
  // Access passes, then the JSON body is refused as "no file" (422): the walk checks who gets past the gate.
  {
    method: 'post',
    pattern: '/api/assessments/:id/clips',
    path: (c) => `/api/assessments/${c.assessmentId}/clips`,
    body: () => ({}),
    expect: selfAndStaff(422),
  },
  {
    method: 'post',
    pattern: '/api/assessments/:id/clips',
    path: (c) => `/api/assessments/${c.otherAssessmentId}/clips`,
    body: () => ({}),
    expect: { ...selfAndStaff(422), athleteSelf: 404 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/processing-events',
    path: (c) => `/api/athletes/${c.selfAthleteId}/processing-events`,
    stream: true,
    expect: selfAndStaff(200),
  },
  { method: 'get', pattern: '/api/clips/:id', path: (c) => `/api/clips/${c.clipId}`, expect: selfAndStaff(200) },
  {
    method: 'patch',
    pattern: '/api/clips/:id',
    path: (c) => `/api/clips/${c.clipId}`,
    body: () => ({ nearSide: 'right' }),
    expect: selfAndStaff(200),
  },
  // The scratch clip was uploaded by the coach: the athlete may not delete it.
  {
    method: 'delete',
    pattern: '/api/clips/:id',
    path: (c) => `/api/clips/${c.scratchClipId}`,
    before: () => scratchClip(),
    expect: { ...selfAndStaff(204), athleteSelf: 403 },
  },
  {
    method: 'post',
    pattern: '/api/clips/:id/retry',
    path: (c) => `/api/clips/${c.scratchClipId}` + '/retry',
    before: () => scratchClip(),
    expect: selfAndStaff(202),
  },
  { method: 'get', pattern: '/api/clips/:id/poster', path: (c) => `/api/clips/${c.clipId}/poster`, expect: selfAndStaff(200) },
  { method: 'get', pattern: '/api/clips/:id/thumbs/:n', path: (c) => `/api/clips/${c.clipId}/thumbs/0`, expect: selfAndStaff(200) },
  { method: 'get', pattern: '/api/clips/:id/frames/:n', path: (c) => `/api/clips/${c.clipId}/frames/1`, expect: selfAndStaff(200) },
  { method: 'get', pattern: '/api/clips/:id/manifest', path: (c) => `/api/clips/${c.clipId}/manifest`, expect: selfAndStaff(200) },
  { method: 'get', pattern: '/api/clips/:id/original', path: (c) => `/api/clips/${c.clipId}/original`, expect: selfAndStaff(200) },
  { method: 'get', pattern: '/api/clips/:id/annotations', path: (c) => `/api/clips/${c.clipId}/annotations`, expect: staffWrite(200) },
  {
    method: 'put',
    pattern: '/api/clips/:id/annotations',
    path: (c) => `/api/clips/${c.clipId}/annotations`,
    body: () => ({ baseRevision: 0, landmarks: [], events: [], scale: null }),
    before: () => resetRevision(),
    expect: staffWrite(200),
  },
  { method: 'get', pattern: '/api/clips/:id/measures', path: (c) => `/api/clips/${c.clipId}/measures`, expect: staffWrite(200) },
  {
    method: 'get',
    pattern: '/api/assessments/:id/measures',
    path: (c) => `/api/assessments/${c.assessmentId}/measures`,
    expect: staffWrite(200),
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/comparison',
    path: (c) => `/api/athletes/${c.selfAthleteId}/comparison`,
    expect: staffWrite(200),
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/measure-trends',
    path: (c) => `/api/athletes/${c.selfAthleteId}/measure-trends?keys=hip_extension_toe_off,cadence`,
    expect: staffWrite(200),
  },
  { method: 'get', pattern: '/api/reference-bands', path: () => '/api/reference-bands', expect: staffOnly(200, 200) },
  {
    method: 'put',
    pattern: '/api/reference-bands/:key',
    path: () => '/api/reference-bands/cadence',
    body: () => ({
      low: 160,
      high: 180,
      unit: 'steps/min',
      context: 'Clinic runners',
      source: 'Clinic audit (internal)',
      evidence: 'trade',
    }),
    expect: ownerOnly(200, 200),
  },
  { method: 'delete', pattern: '/api/reference-bands/:key', path: () => '/api/reference-bands/cadence', expect: ownerOnly(204, 204) },
  { method: 'post', pattern: '/api/auth/sign-out', path: () => '/api/auth/sign-out', expect: all(204) },
  // Plans (fixtures in plansFixtures() at the end of this file).
  { method: 'get', pattern: '/api/exercises', path: () => '/api/exercises?region=hamstring', expect: staffOnly(200, 200) },
  {
    method: 'post',
    pattern: '/api/exercises',
    path: () => '/api/exercises',
    body: () => ({ ...exercise, name: `Walk ${Math.random().toString(36).slice(2)}` }),
    expect: staffOnly(201, 201),
  },
  { method: 'get', pattern: '/api/exercises/:id', path: () => `/api/exercises/${pc.exerciseId}`, expect: staffWrite(200) },
  {
    method: 'patch',
    pattern: '/api/exercises/:id',
    path: () => `/api/exercises/${pc.exerciseId}`,
    body: () => ({ cautions: 'Walked.' }),
    expect: staffWrite(200),
  },
  {
    method: 'delete',
    pattern: '/api/exercises/:id',
    path: () => `/api/exercises/${pc.scratchExerciseId}`,
    before: () => scratchExercise(),
    expect: staffWrite(204),
  },
  { method: 'get', pattern: '/api/athletes/:id/plans', path: (c) => `/api/athletes/${c.selfAthleteId}/plans`, expect: selfAndStaff(200) },
  {
    method: 'post',
    pattern: '/api/athletes/:id/plans',
    path: (c) => `/api/athletes/${c.otherAthleteId}/plans`,
    body: () => planBody(),
    expect: staffWrite(201),
  },
  { method: 'get', pattern: '/api/plans/:id', path: () => `/api/plans/${pc.planId}`, expect: selfAndStaff(200) },
  {
    method: 'get',
    pattern: '/api/plans/:id',
    path: () => `/api/plans/${pc.otherPlanId}`,
    expect: { ...selfAndStaff(200), athleteSelf: 404 },
  },
  { method: 'put', pattern: '/api/plans/:id', path: () => `/api/plans/${pc.draftPlanId}`, body: () => planBody(), expect: staffWrite(200) },
  {
    method: 'delete',
    pattern: '/api/plans/:id',
    path: () => `/api/plans/${pc.scratchPlanId}`,
    before: () => scratchPlan(),
    expect: staffWrite(204),
  },
  {
    method: 'post',
    pattern: '/api/plans/:id/transitions',
    path: () => `/api/plans/${pc.planId}/transitions`,
    body: () => ({ action: 'pause' }),
    before: () => planActive(),
    expect: staffWrite(200),
  },
  {
    method: 'put',
    pattern: '/api/plans/:id/pain-rule',
    path: () => `/api/plans/${pc.planId}/pain-rule`,
    body: () => ({ maxDuring: 5, morningMustSettle: true, settledMorningMax: 2, noWeeklyRise: true }),
    expect: staffWrite(200),
  },
  { method: 'get', pattern: '/api/plans/:id/progress', path: () => `/api/plans/${pc.planId}/progress`, expect: selfAndStaff(200) },
  {
    method: 'get',
    pattern: '/api/plans/:id/progress',
    path: () => `/api/plans/${pc.otherPlanId}/progress`,
    expect: { ...selfAndStaff(200), athleteSelf: 404 },
  },
  { method: 'get', pattern: '/api/plan-alerts', path: () => '/api/plan-alerts', expect: staffOnly(200, 200) },
  { method: 'get', pattern: '/api/plans/:id/logs', path: () => `/api/plans/${pc.planId}/logs`, expect: selfAndStaff(200) },
  {
    method: 'get',
    pattern: '/api/plans/:id/logs',
    path: () => `/api/plans/${pc.otherPlanId}/logs`,
    expect: { ...selfAndStaff(200), athleteSelf: 404 },
  },
  {
    method: 'post',
    pattern: '/api/plans/:id/logs',
    path: () => `/api/plans/${pc.planId}/logs`,
    body: () => logBody(),
    before: () => planActive(),
    expect: { anonymous: 401, athleteSelf: 201, athleteOther: 404, coach: 403, coachOtherClinic: 403, owner: 403 },
  },
  {
    method: 'post',
    pattern: '/api/plans/:id/logs',
    path: () => `/api/plans/${pc.otherPlanId}/logs`,
    body: () => logBody(),
    expect: { anonymous: 401, athleteSelf: 404, athleteOther: 404, coach: 403, coachOtherClinic: 403, owner: 403 },
  },
  {
    method: 'put',
    pattern: '/api/plans/:id/logs/:key/morning',
    path: () => `/api/plans/${pc.planId}/logs/${pc.logKey}/morning`,
    body: () => ({ pain: 1 }),
    expect: { anonymous: 401, athleteSelf: 200, athleteOther: 404, coach: 403, coachOtherClinic: 403, owner: 403 },
  },
  // Billing (fixtures in billingFixtures() at the end of this file). Coaches have no billing access.
  { method: 'get', pattern: '/api/billing/settings', path: () => '/api/billing/settings', expect: ownerOnly(200, 200) },
  {
    method: 'put',
    pattern: '/api/billing/settings',
    path: () => '/api/billing/settings',
    body: () => ({ currency: 'EUR' }),
    expect: ownerOnly(200, 200),
  },
  { method: 'get', pattern: '/api/prices', path: () => '/api/prices', expect: ownerOnly(200, 200) },
  { method: 'post', pattern: '/api/prices', path: () => '/api/prices', body: () => priceBody, expect: ownerOnly(201, 201) },
  {
    method: 'patch',
    pattern: '/api/prices/:id',
    path: () => `/api/prices/${bc.priceId}`,
    body: () => ({ description: 'Walked.' }),
    expect: ownerOnly(200),
  },
  {
    method: 'delete',
    pattern: '/api/prices/:id',
    path: () => `/api/prices/${bc.scratchPriceId}`,
    before: () => scratchPrice(),
    expect: ownerOnly(204),
  },
  // Everyone signed in but coaches: the owner sees the clinic's, an athlete their own (possibly none).
  {
    method: 'get',
    pattern: '/api/invoices',
    path: () => '/api/invoices?status=issued',
    expect: { anonymous: 401, athleteSelf: 200, athleteOther: 200, coach: 403, coachOtherClinic: 403, owner: 200, ownerOtherClinic: 200 },
  },
  {
    method: 'post',
    pattern: '/api/invoices',
    path: () => '/api/invoices',
    body: (c) => invoiceBody(c.selfAthleteId),
    expect: ownerOnly(201, 422),
  },
  { method: 'get', pattern: '/api/invoices/:id', path: () => `/api/invoices/${bc.openInvoiceId}`, expect: billingSelf(200) },
  {
    method: 'get',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.draftInvoiceId}`,
    expect: { ...billingSelf(200), athleteSelf: 404 },
  },
  {
    method: 'get',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.otherAthleteInvoiceId}`,
    expect: { ...billingSelf(200), athleteSelf: 404 },
  },
  {
    method: 'put',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.draftInvoiceId}`,
    body: (c) => invoiceBody(c.selfAthleteId),
    expect: ownerOnly(200),
  },
  {
    method: 'put',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.openInvoiceId}`,
    body: (c) => invoiceBody(c.selfAthleteId),
    expect: ownerOnly(409),
  },
  {
    method: 'delete',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.scratchInvoiceId}`,
    before: () => scratchInvoice(),
    expect: ownerOnly(204),
  },
  { method: 'delete', pattern: '/api/invoices/:id', path: () => `/api/invoices/${bc.openInvoiceId}`, expect: ownerOnly(409) },
  {
    method: 'post',
    pattern: '/api/invoices/:id/issue',
    path: () => `/api/invoices/${bc.scratchInvoiceId}/issue`,
    before: () => scratchInvoice(),
    expect: ownerOnly(200),
  },
  {
    method: 'post',
    pattern: '/api/invoices/:id/cancel',
    path: () => `/api/invoices/${bc.scratchInvoiceId}/cancel`,
    before: () => scratchInvoice(),
    expect: ownerOnly(200),
  },
  {
    method: 'post',
    pattern: '/api/invoices/:id/payments',
    path: () => `/api/invoices/${bc.scratchInvoiceId}/payments`,
    before: () => scratchIssuedInvoice(),
    body: () => ({ method: 'bank_transfer', paidOn: new Date().toISOString().slice(0, 10), note: 'Walk' }),
    expect: ownerOnly(200),
  },
  {
    method: 'post',
    pattern: '/api/invoices/:id/refund',
    path: () => `/api/invoices/${bc.paidInvoiceId}/refund`,
    before: () => paidInvoice(),
    expect: ownerOnly(200),
  },
  {
    method: 'post',
    pattern: '/api/invoices/:id/checkout',
    path: () => `/api/invoices/${bc.openInvoiceId}/checkout`,
    expect: { anonymous: 401, athleteSelf: 200, athleteOther: 404, coach: 403, coachOtherClinic: 403, owner: 403 },
  },
  {
    method: 'post',
    pattern: '/api/invoices/:id/checkout',
    path: () => `/api/invoices/${bc.otherAthleteInvoiceId}/checkout`,
    expect: { anonymous: 401, athleteSelf: 404, athleteOther: 404, coach: 403, coachOtherClinic: 403, owner: 403 },
  },
  { method: 'get', pattern: '/api/clinic/legal-details', path: () => '/api/clinic/legal-details', expect: ownerOnly(200, 200) },
  {
    method: 'put',
    pattern: '/api/clinic/legal-details',
    path: () => '/api/clinic/legal-details',
    body: () => ({ legalName: 'Walk Clinic Ltd', address: '1 Walk Lane\nWalktown', taxNumber: 'WK 123', contactLine: 'walk@clinic.test' }),
    expect: ownerOnly(200, 200),
  },
  {
    method: 'get',
    pattern: '/api/invoices/:id/receipt',
    path: () => `/api/invoices/${bc.receiptInvoiceId}/receipt`,
    expect: billingSelf(200),
  },
  // Public but signature-checked: without a valid provider signature every caller gets 400 (and no CSRF 403).
  {
    method: 'post',
    pattern: '/api/billing/webhook',
    path: () => '/api/billing/webhook',
    body: () => ({ id: 'evt_walk', type: 'checkout.session.completed', data: { object: {} } }),
    expect: all(400),
  },
  // Stills and visit summaries (fixtures in sharingFixtures() at the end of this file). The walk's
  // still and summary are published, so their own athlete reads them; scratch ones take the writes.
  {
    method: 'post',
    pattern: '/api/clips/:id/stills',
    path: (c) => `/api/clips/${c.clipId}/stills`,
    body: () => ({ frameIndex: 0, caption: 'Walk', showAngles: true }),
    expect: staffWrite(202),
  },
  { method: 'get', pattern: '/api/athletes/:id/stills', path: (c) => `/api/athletes/${c.selfAthleteId}/stills`, expect: selfAndStaff(200) },
  { method: 'get', pattern: '/api/stills/:id', path: () => `/api/stills/${sc.stillId}`, expect: selfAndStaff(200) },
  {
    method: 'get',
    pattern: '/api/stills/:id',
    path: () => `/api/stills/${sc.scratchStillId}`,
    before: () => scratchStill(),
    expect: { ...selfAndStaff(200), athleteSelf: 404 },
  },
  {
    method: 'patch',
    pattern: '/api/stills/:id',
    path: () => `/api/stills/${sc.scratchStillId}`,
    body: () => ({ caption: 'Walked' }),
    before: () => scratchStill(),
    expect: staffWrite(200),
  },
  {
    method: 'post',
    pattern: '/api/stills/:id/publish',
    path: () => `/api/stills/${sc.scratchStillId}/publish`,
    before: () => scratchStill(),
    expect: staffWrite(200),
  },
  {
    method: 'post',
    pattern: '/api/stills/:id/unpublish',
    path: () => `/api/stills/${sc.scratchStillId}/unpublish`,
    before: () => scratchStill(),
    expect: staffWrite(200),
  },
  {
    method: 'delete',
    pattern: '/api/stills/:id',
    path: () => `/api/stills/${sc.scratchStillId}`,
    before: () => scratchStill(),
    expect: staffWrite(204),
  },
  { method: 'get', pattern: '/api/stills/:id/image.png', path: () => `/api/stills/${sc.stillId}/image.png`, expect: selfAndStaff(200) },
  { method: 'get', pattern: '/api/stills/:id/image.jpg', path: () => `/api/stills/${sc.stillId}/image.jpg`, expect: selfAndStaff(200) },
  {
    method: 'get',
    pattern: '/api/stills/:id/image.png',
    path: () => `/api/stills/${sc.scratchStillId}/image.png`,
    before: () => scratchStill(),
    expect: { ...selfAndStaff(200), athleteSelf: 404 },
  },
  {
    method: 'post',
    pattern: '/api/assessments/:id/summaries',
    path: (c) => `/api/assessments/${c.assessmentId}/summaries`,
    body: () => ({ findings: '', planText: '', stillIds: [] }),
    expect: staffWrite(202),
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/summaries',
    path: (c) => `/api/athletes/${c.selfAthleteId}/summaries`,
    expect: selfAndStaff(200),
  },
  { method: 'get', pattern: '/api/summaries/:id', path: () => `/api/summaries/${sc.summaryId}`, expect: selfAndStaff(200) },
  {
    method: 'post',
    pattern: '/api/summaries/:id/publish',
    path: () => `/api/summaries/${sc.scratchSummaryId}/publish`,
    before: () => scratchSummary(),
    expect: staffWrite(200),
  },
  {
    method: 'post',
    pattern: '/api/summaries/:id/unpublish',
    path: () => `/api/summaries/${sc.scratchSummaryId}/unpublish`,
    before: () => scratchSummary(),
    expect: staffWrite(200),
  },
  {
    method: 'delete',
    pattern: '/api/summaries/:id',
    path: () => `/api/summaries/${sc.scratchSummaryId}`,
    before: () => scratchSummary(),
    expect: staffWrite(204),
  },
  { method: 'get', pattern: '/api/summaries/:id/pdf', path: () => `/api/summaries/${sc.summaryId}/pdf`, expect: selfAndStaff(200) },
  {
    method: 'get',
    pattern: '/api/summaries/:id/pdf',
    path: () => `/api/summaries/${sc.scratchSummaryId}/pdf`,
    before: () => scratchSummary(),
    expect: { ...selfAndStaff(200), athleteSelf: 404 },
  },
  {
    method: 'get',
    pattern: '/api/portal/shared',
    path: () => '/api/portal/shared',
    expect: { anonymous: 401, athleteSelf: 200, athleteOther: 200, coach: 403, coachOtherClinic: 403, owner: 403 },
  },
];

const [owner, coach, , athlete] = DEMO_SIGN_INS;
const CREDENTIALS: Record<Exclude<Who, 'anonymous'>, { email: string; password: string }> = {
  athleteSelf: athlete,
  athleteOther: OTHER.athlete,
  coach,
  coachOtherClinic: OTHER.coach,
  owner,
  ownerOtherClinic: OTHER.owner,
};

let t: TestApp;
let ctx: Ctx;
let server: http.Server;
let coachClient: Client;
let clipDir: { dir: string; cleanup: () => Promise<void> };

async function scratchAssessment(): Promise<void> {
  ctx.scratchAssessmentId = (await coachClient.post(`/api/athletes/${ctx.selfAthleteId}/assessments`, assessment)).body.id;
}

/** A failed clip row (uploaded by the coach) on the self athlete's assessment, without files. */
async function scratchClip(): Promise<void> {
  const at = new Date().toISOString();
  const coachRow = await t.db('users').where({ email: coach.email }).first();
  const [row] = await t
    .db('clips')
    .insert({
      clinic_id: 1,
      athlete_id: ctx.selfAthleteId,
      assessment_id: ctx.assessmentId,
      uploaded_by: coachRow.id,
      original_name: 'x.mp4',
      stored_name: 'original.mp4',
      size_bytes: 1,
      container: 'mp4',
      status: 'failed',
      error: 'test',
      created_at: at,
      updated_at: at,
    })
    .returning('id');
  ctx.scratchClipId = (row as { id: number }).id;
}

/** Puts the walk's clip back at annotation revision 0, so each PUT starts from it. */
async function resetRevision(): Promise<void> {
  await t.db('clips').where({ id: ctx.clipId }).update({ annotation_revision: 0 });
}

/** Status of a server-sent-events route: read the head, then hang up. */
async function streamStatus(c: Client, path: string): Promise<number> {
  const port = (server.address() as AddressInfo).port;
  const controller = new AbortController();
  const res = await fetch(`http://127.0.0.1:${port}${path}`, { headers: { cookie: c.cookieHeader() }, signal: controller.signal });
  controller.abort();
  return res.status;
}

async function clientFor(app: Express, who: Who): Promise<Client> {
  if (who === 'anonymous') return new Client(app);
  const cred = CREDENTIALS[who];
  return signedIn(app, cred.email, cred.password);
}

beforeAll(async () => {
  t = await makeTestApp(
    { rateLimit: { signInAttempts: 1000, accountAttempts: 1000, resetRequests: 1000, windowMs: 60_000 } },
    { fakePayments: true },
  );
  const self = await t.db('athletes').where({ email: athlete.email }).first();
  const other = await t.db('athletes').where({ email: 'teodor.brannick@runner.test' }).first();
  const otherClinic = await t.db('clinics').where({ name: OTHER.clinic }).first();
  const [foreignRow] = await t
    .db('athletes')
    .insert({
      clinic_id: otherClinic.id,
      user_id: null,
      coach_id: null,
      first_name: 'Foreign',
      last_name: 'Noaccount',
      email: 'foreign.noaccount@runner.test',
      created_at: new Date().toISOString(),
      updated_at: new Date().toISOString(),
    })
    .returning('id');
  ctx = {
    selfAthleteId: self.id,
    otherAthleteId: other.id,
    foreignAthleteId: (foreignRow as { id: number }).id,
    pendingInvitationId: 0,
    assessmentId: 0,
    otherAssessmentId: 0,
    clipId: 0,
    scratchAssessmentId: 0,
    scratchClipId: 0,
  };
  coachClient = await clientFor(t.app, 'coach');
  ctx.assessmentId = (await coachClient.post(`/api/athletes/${self.id}/assessments`, assessment)).body.id;
  ctx.otherAssessmentId = (await coachClient.post(`/api/athletes/${other.id}/assessments`, assessment)).body.id;
  clipDir = await tempDir('access');
  const file = await makeClip(`${clipDir.dir}/walk.mp4`, { fps: 30, width: 160, height: 90, seconds: 1 });
  const up = await coachClient.agent
    .post(`/api/assessments/${ctx.assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await coachClient.xsrf())
    .attach('file', file);
  ctx.clipId = up.body.id;
  await t.worker!.idle();
  await plansFixtures();
  await billingFixtures();
  await sharingFixtures();
  server = http.createServer(t.app).listen(0, '127.0.0.1');
});
afterAll(async () => {
  server?.close();
  await t.close();
  await clipDir?.cleanup();
});

describe('access walk: every route × every caller', () => {
  for (const route of ROUTES) {
    for (const who of WHO) {
      const status = expected(route.expect, who);
      it(`${route.method.toUpperCase()} ${route.pattern} as ${who} → ${status}`, async () => {
        const c = await clientFor(t.app, who);
        if (route.pattern === '/api/staff/invitations/:id') {
          const o = await clientFor(t.app, 'owner');
          ctx.pendingInvitationId = (
            await o.post('/api/staff/invitations', { email: `rev-${Math.random().toString(36).slice(2)}@x.test`, name: 'Rev' })
          ).body.id;
        }
        if (route.pattern === '/api/athletes/:id/invitation') {
          await t.db('invitations').whereIn('athlete_id', [ctx.otherAthleteId, ctx.foreignAthleteId]).delete();
        }
        await route.before?.();
        const path = route.path(ctx);
        if (route.stream) {
          expect(await streamStatus(c, path)).toBe(status);
          return;
        }
        const res = route.method === 'get' ? await c.get(path) : await c.send(route.method, path, route.body?.(ctx));
        expect(res.status, JSON.stringify(res.body)).toBe(status);
        if (res.status >= 400) expect(res.body.error).toMatchObject({ code: expect.any(String), message: expect.any(String) });
      });
    }
  }

  it('every mounted API route is listed in this walk', () => {
    const mounted = listRoutes(t.app);
    const listed = new Set(ROUTES.map((r) => `${r.method.toUpperCase()} ${r.pattern}`));
    expect(mounted.length).toBeGreaterThanOrEqual(20);
    const missing = mounted.filter((r) => !listed.has(r));
    expect(missing).toEqual([]);
  });
});

// ─── Staff fixtures ───────────────────────────────────────────────────────────────────────

const staffc = { coachId: 0 };

/** A coach of the demo clinic without athletes, active or already deactivated. */
async function scratchCoach(active: boolean): Promise<void> {
  const at = new Date().toISOString();
  const [row] = await t
    .db('users')
    .insert({
      clinic_id: 1,
      email: `scratch-${Math.random().toString(36).slice(2)}@larchwood-clinic.test`,
      name: 'Scratch Coach',
      role: 'coach',
      password_hash: null,
      active,
      deactivated_at: active ? null : at,
      created_at: at,
      updated_at: at,
    })
    .returning('id');
  staffc.coachId = (row as { id: number }).id;
}

// ─── Plans fixtures ───────────────────────────────────────────────────────────────────────

const exercise = {
  purpose: 'Walk-through exercise.',
  region: 'hip',
  kind: 'mobility',
  instructions: ['Step one.'],
  cautions: '',
  dose: { sets: 2, reps: 5, holdSeconds: null, tempo: null, load: null, restSeconds: null, daysPerWeek: 3 },
};

/** Ids the plan routes of the walk use: the self athlete's active plan and a log, another athlete's plan. */
const pc = { exerciseId: 0, scratchExerciseId: 0, planId: 0, stageId: 0, otherPlanId: 0, draftPlanId: 0, scratchPlanId: 0, logKey: '' };

const planBody = () => ({
  title: 'Walk plan',
  assessmentId: null,
  notes: null,
  stages: [
    {
      name: 'Holds',
      goal: '',
      targetWeeks: 2,
      progressionText: '',
      criteria: [],
      exercises: [{ exerciseId: pc.exerciseId, dose: exercise.dose, notes: null }],
    },
  ],
});

const logBody = () => ({
  key: `walk-${Math.random().toString(36).slice(2)}`,
  stageId: pc.stageId,
  date: new Date().toISOString().slice(0, 10),
  painDuring: 2,
  sets: [],
  note: null,
});

async function scratchExercise(): Promise<void> {
  pc.scratchExerciseId = (
    await coachClient.post('/api/exercises', { ...exercise, name: `Scratch ${Math.random().toString(36).slice(2)}` })
  ).body.id;
}

async function scratchPlan(): Promise<void> {
  pc.scratchPlanId = (await coachClient.post(`/api/athletes/${ctx.otherAthleteId}/plans`, planBody())).body.id;
}

/** Puts the self athlete's plan back to active (the walk pauses it). */
async function planActive(): Promise<void> {
  await t.db('plans').where({ id: pc.planId }).update({ status: 'active' });
}

async function plansFixtures(): Promise<void> {
  pc.exerciseId = (await coachClient.get('/api/exercises')).body.exercises[0].id;
  const plan = (await coachClient.post(`/api/athletes/${ctx.selfAthleteId}/plans`, planBody())).body;
  pc.planId = plan.id;
  pc.stageId = plan.stages[0].id;
  await coachClient.post(`/api/plans/${plan.id}/transitions`, { action: 'start' });
  pc.draftPlanId = (await coachClient.post(`/api/athletes/${ctx.otherAthleteId}/plans`, planBody())).body.id;
  // The seeded demo plan of another athlete of the same clinic.
  pc.otherPlanId = (await t.db('plans').whereNot({ athlete_id: ctx.selfAthleteId }).andWhere({ status: 'active' }).first()).id;
  const self = await clientFor(t.app, 'athleteSelf');
  const body = logBody();
  await self.post(`/api/plans/${plan.id}/logs`, body);
  pc.logKey = body.key;
}

// ─── Billing fixtures ─────────────────────────────────────────────────────────────────────

/** Invoices the billing routes of the walk use (owner-made; the self athlete's unless named). */
const bc = {
  priceId: 0,
  scratchPriceId: 0,
  openInvoiceId: 0,
  draftInvoiceId: 0,
  otherAthleteInvoiceId: 0,
  scratchInvoiceId: 0,
  paidInvoiceId: 0,
  receiptInvoiceId: 0,
};
const priceBody = { item: 'Walk check', description: '', amountMinor: 1000, taxRateBp: null };
const invoiceBody = (athleteId: number) => ({
  athleteId,
  assessmentId: null,
  dueDate: '2026-12-31',
  note: null,
  lines: [{ priceId: null, description: 'Walk', quantity: 1, unitAmountMinor: 1000, taxRateBp: 2000 }],
});
/** Readable by the owner and the athlete billed; coaches have no billing access. */
function billingSelf(ok: number): Record<Who, number> {
  return { anonymous: 401, athleteSelf: ok, athleteOther: 404, coach: 403, coachOtherClinic: 403, owner: ok, ownerOtherClinic: 404 };
}
let ownerClient: Client;

async function scratchPrice(): Promise<void> {
  bc.scratchPriceId = (await ownerClient.post('/api/prices', priceBody)).body.id;
}

async function scratchInvoice(): Promise<void> {
  bc.scratchInvoiceId = (await ownerClient.post('/api/invoices', invoiceBody(ctx.selfAthleteId))).body.id;
}

async function scratchIssuedInvoice(): Promise<void> {
  bc.scratchInvoiceId = await openInvoice(ctx.selfAthleteId);
}

async function openInvoice(athleteId: number): Promise<number> {
  const id = (await ownerClient.post('/api/invoices', invoiceBody(athleteId))).body.id;
  await ownerClient.post(`/api/invoices/${id}/issue`);
  return id;
}

/** An invoice of the self athlete, paid on the fake payment page (the webhook marks it paid). */
async function paidInvoice(): Promise<void> {
  const id = await openInvoice(ctx.selfAthleteId);
  const self = await clientFor(t.app, 'athleteSelf');
  const url = (await self.post(`/api/invoices/${id}/checkout`)).body.url as string;
  await fetch(`${url}/pay`, { method: 'POST', redirect: 'manual' });
  await t.fakePayments!.idle();
  bc.paidInvoiceId = id;
}

async function billingFixtures(): Promise<void> {
  ownerClient = await clientFor(t.app, 'owner');
  bc.priceId = (await ownerClient.post('/api/prices', priceBody)).body.id;
  bc.openInvoiceId = await openInvoice(ctx.selfAthleteId);
  bc.draftInvoiceId = (await ownerClient.post('/api/invoices', invoiceBody(ctx.selfAthleteId))).body.id;
  bc.otherAthleteInvoiceId = await openInvoice(ctx.otherAthleteId);
  await paidInvoice();
  bc.receiptInvoiceId = bc.paidInvoiceId;
}

// ─── Stills and visit summaries ───────────────────────────────────────────────────────────
const sc = { stillId: 0, scratchStillId: 0, summaryId: 0, scratchSummaryId: 0 };

/** A rendered, unpublished still of the walk's clip. */
async function scratchStill(): Promise<void> {
  sc.scratchStillId = (
    await coachClient.post(`/api/clips/${ctx.clipId}/stills`, { frameIndex: 0, caption: 'Scratch', showAngles: true })
  ).body.id;
  await t.worker!.idle();
}

/** A rendered, unpublished visit summary of the walk's assessment. */
async function scratchSummary(): Promise<void> {
  sc.scratchSummaryId = (
    await coachClient.post(`/api/assessments/${ctx.assessmentId}/summaries`, { findings: '', planText: '', stillIds: [] })
  ).body.id;
  await t.worker!.idle();
}

async function sharingFixtures(): Promise<void> {
  await scratchStill();
  sc.stillId = sc.scratchStillId;
  expect((await coachClient.post(`/api/stills/${sc.stillId}/publish`, {})).status).toBe(200);
  await scratchSummary();
  sc.summaryId = sc.scratchSummaryId;
  expect((await coachClient.post(`/api/summaries/${sc.summaryId}/publish`, {})).status).toBe(200);
}
