/**
 * Walks every API route as each kind of caller and checks the status. A new route must be added
 * to ROUTES, or the "every route is listed" check fails. Callers: anonymous, the demo clinic's
 * athlete (self), coach and owner, and a second clinic's athlete, coach and owner. Targets include
 * athletes who have no account: one of the demo clinic (Teodor) and one of the second clinic.
 *
 * A guarded route names its action and what it is about; the expected status of each caller comes
 * from the access table (`server/policy/access-table.ts`, the same table the server enforces), and
 * a check makes sure each mounted route's guard names that very action. Public routes state their
 * status outright.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Express } from 'express';
import { makeClip, tempDir } from './media/fixtures';
import { Client, makeTestApp, OTHER, signedIn, type TestApp } from '../support/test-app';
import { onPostgres } from '../support/test-db';
import { selectRows } from '../../server/db/dialect';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { listRouteActions, listRoutes } from '../support/routes';
import { oneStagePlan } from '../support/plans';
import type { Action } from '../../server/policy/access-table';
import { decide, decideRole, type Actor, type Owner, type ResourceState } from '../../server/policy/decide';
import { Jimp } from 'jimp';
import { clinicLogoKey, demoClipKeys, demoPictureKey, exportKey } from '../../server/storage/media-keys';
import { markedJpeg } from '../support/pictures';
import { intakeWith } from '../support/bodies';

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

/**
 * What a guarded route is about, for the policy to decide who gets past: the self athlete's
 * records, another athlete's of the same clinic (without an account), the second clinic's athlete
 * (without an account), a record of the demo clinic that is no athlete's, or the caller's own
 * clinic (lists and new records).
 */
type On = 'self' | 'teammate' | 'foreign' | 'demoClinic' | 'own';

interface Access {
  /** The action the route's guard names (checked against the mounted route). */
  action: Action;
  on: On;
  /** What a caller the policy lets through gets. */
  ok: number;
  /** The resource's state the policy's conditions read (published, draft, marked, uploader, fields sent). */
  state?: ResourceState;
  /** Outcomes decided after the policy (e.g. a body naming another clinic's athlete: 422). */
  also?: Partial<Record<Who, number>>;
}

interface RouteCase {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete' | 'head';
  /** Express path pattern as mounted, for the completeness check. */
  pattern: string;
  path: (c: Ctx) => string;
  body?: (c: Ctx) => unknown;
  /** A guarded route: the access table (`server/policy/access-table.ts`) decides the expected statuses. */
  access?: Access;
  /** A public route (no guard): what every caller gets. */
  expect?: Expect;
  /** Runs before each call (fresh rows for DELETE and the like). */
  before?: () => Promise<void>;
  /** Server-sent events: only the status line is read. */
  stream?: boolean;
  /** Request headers beyond the session's (e.g. the tus protocol's). */
  headers?: Record<string, string>;
}

const intake = intakeWith({ videoRecording: true, shareStills: true });

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

/** A public route: every caller gets the same status. */
const all = (status: number): Expect => Object.fromEntries(WHO.map((w) => [w, status])) as Expect;

// ─── Callers and targets as the policy sees them ──────────────────────────────────────────
// The policy compares clinics and accounts by id only, so the walk names them symbolically.
const DEMO_CLINIC = 1;
const SECOND_CLINIC = 2;
const SELF_USER_ID = 101;
const COACH_ID = 102;
const ACTORS: Record<Who, Actor | null> = {
  anonymous: null,
  athleteSelf: { id: SELF_USER_ID, role: 'athlete', clinicId: DEMO_CLINIC },
  athleteOther: { id: 201, role: 'athlete', clinicId: SECOND_CLINIC },
  coach: { id: COACH_ID, role: 'coach', clinicId: DEMO_CLINIC },
  coachOtherClinic: { id: 202, role: 'coach', clinicId: SECOND_CLINIC },
  owner: { id: 103, role: 'owner', clinicId: DEMO_CLINIC },
  ownerOtherClinic: { id: 203, role: 'owner', clinicId: SECOND_CLINIC },
};
const OWNERS: Record<Exclude<On, 'own'>, Owner> = {
  self: { clinicId: DEMO_CLINIC, athleteUserId: SELF_USER_ID },
  teammate: { clinicId: DEMO_CLINIC, athleteUserId: null },
  foreign: { clinicId: SECOND_CLINIC, athleteUserId: null },
  demoClinic: { clinicId: DEMO_CLINIC },
};

/** The status a caller gets: the policy's refusal, else what the route answers once past it. */
function statusFor(route: RouteCase, who: Who): number {
  if (!route.access) return expected(route.expect!, who);
  const a = route.access;
  const also = a.also?.[who];
  if (also !== undefined) return also;
  const actor = ACTORS[who];
  // Lists and new records are the caller's own clinic's: only the role decides.
  const d = a.on === 'own' ? decideRole(actor, a.action) : decide(actor, a.action, { ...OWNERS[a.on], ...a.state });
  return d.allowed ? a.ok : d.status;
}

// "athleteOther" is an athlete of another clinic reading the same ids: always 404 for athlete ids.
const ROUTES: RouteCase[] = [
  { method: 'get', pattern: '/api/health', path: () => '/api/health', expect: all(200) },
  { method: 'get', pattern: '/api/config', path: () => '/api/config', expect: all(200) },
  { method: 'get', pattern: '/api/auth/csrf', path: () => '/api/auth/csrf', expect: all(200) },
  { method: 'get', pattern: '/api/auth/me', path: () => '/api/auth/me', expect: all(200) },
  { method: 'get', pattern: '/api/staff', path: () => '/api/staff', access: { action: 'staff:list', on: 'own', ok: 200 } },
  {
    method: 'post',
    pattern: '/api/staff/invitations',
    path: () => '/api/staff/invitations',
    body: () => ({ email: `walk-${Math.random().toString(36).slice(2)}@x.test`, name: 'Walker' }),
    access: { action: 'staff:invite', on: 'own', ok: 201 },
  },
  {
    method: 'delete',
    pattern: '/api/staff/invitations/:id',
    path: (c) => `/api/staff/invitations/${c.pendingInvitationId}`,
    access: { action: 'staff:revoke-invitation', on: 'demoClinic', ok: 204 },
  },
  {
    method: 'post',
    pattern: '/api/staff/:id/deactivate',
    path: () => `/api/staff/${staffc.coachId}/deactivate`,
    body: () => ({}),
    before: () => scratchCoach(true),
    access: { action: 'staff:deactivate', on: 'demoClinic', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/staff/:id/reactivate',
    path: () => `/api/staff/${staffc.coachId}/reactivate`,
    before: () => scratchCoach(false),
    access: { action: 'staff:reactivate', on: 'demoClinic', ok: 200 },
  },
  { method: 'get', pattern: '/api/coaches', path: () => '/api/coaches', access: { action: 'coach:list', on: 'own', ok: 200 } },
  { method: 'get', pattern: '/api/athletes', path: () => '/api/athletes', access: { action: 'athlete:list', on: 'own', ok: 200 } },
  {
    method: 'post',
    pattern: '/api/athletes',
    path: () => '/api/athletes',
    body: () => ({ firstName: 'Walk', lastName: 'Er' }),
    access: { action: 'athlete:create', on: 'own', ok: 201 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id',
    path: (c) => `/api/athletes/${c.selfAthleteId}`,
    access: { action: 'athlete:read', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id',
    path: (c) => `/api/athletes/${c.otherAthleteId}`,
    access: { action: 'athlete:read', on: 'teammate', ok: 200 },
  },
  {
    method: 'patch',
    pattern: '/api/athletes/:id',
    path: (c) => `/api/athletes/${c.selfAthleteId}`,
    body: () => ({ firstName: 'Ada' }),
    access: { action: 'athlete:update', on: 'self', ok: 200, state: { fields: ['firstName'] } },
  },
  {
    method: 'patch',
    pattern: '/api/athletes/:id',
    path: (c) => `/api/athletes/${c.otherAthleteId}`,
    body: () => ({ firstName: 'Teodor' }),
    access: { action: 'athlete:update', on: 'teammate', ok: 200, state: { fields: ['firstName'] } },
  },
  {
    method: 'put',
    pattern: '/api/athletes/:id/intake',
    path: (c) => `/api/athletes/${c.selfAthleteId}/intake`,
    body: () => intake,
    access: { action: 'athlete:update-intake', on: 'self', ok: 200 },
  },
  {
    method: 'put',
    pattern: '/api/athletes/:id/intake',
    path: (c) => `/api/athletes/${c.otherAthleteId}/intake`,
    body: () => intake,
    access: { action: 'athlete:update-intake', on: 'teammate', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/invitation',
    path: (c) => `/api/athletes/${c.otherAthleteId}/invitation`,
    access: { action: 'athlete:invite', on: 'teammate', ok: 201 },
  },
  // The second clinic's athlete without an account: everyone of the demo clinic gets 404.
  {
    method: 'get',
    pattern: '/api/athletes/:id',
    path: (c) => `/api/athletes/${c.foreignAthleteId}`,
    access: { action: 'athlete:read', on: 'foreign', ok: 200 },
  },
  {
    method: 'patch',
    pattern: '/api/athletes/:id',
    path: (c) => `/api/athletes/${c.foreignAthleteId}`,
    body: () => ({ firstName: 'Foreign' }),
    access: { action: 'athlete:update', on: 'foreign', ok: 200, state: { fields: ['firstName'] } },
  },
  {
    method: 'put',
    pattern: '/api/athletes/:id/intake',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/intake`,
    body: () => intake,
    access: { action: 'athlete:update-intake', on: 'foreign', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/invitation',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/invitation`,
    access: { action: 'athlete:invite', on: 'foreign', ok: 201 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/assessments',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/assessments`,
    access: { action: 'assessment:list', on: 'foreign', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/assessments',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/assessments`,
    body: () => assessment,
    access: { action: 'assessment:create', on: 'foreign', ok: 201 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/plans',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/plans`,
    access: { action: 'plan:list', on: 'foreign', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/stills',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/stills`,
    access: { action: 'still:list', on: 'foreign', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/annotated-clips',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/annotated-clips`,
    access: { action: 'annotated-clip:list', on: 'foreign', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/summaries',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/summaries`,
    access: { action: 'summary:list', on: 'foreign', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/measure-trends',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/measure-trends`,
    access: { action: 'comparison:read', on: 'foreign', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/comparison',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/comparison`,
    access: { action: 'comparison:read', on: 'foreign', ok: 422 },
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
    method: 'post',
    pattern: '/api/auth/password',
    path: () => '/api/auth/password',
    // A wrong current password: nobody's password changes during the walk.
    body: () => ({ currentPassword: 'not-the-password', newPassword: 'long-enough-pw' }),
    expect: { ...all(422), anonymous: 401 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/assessments',
    path: (c) => `/api/athletes/${c.selfAthleteId}/assessments`,
    access: { action: 'assessment:list', on: 'self', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/assessments',
    path: (c) => `/api/athletes/${c.otherAthleteId}/assessments`,
    body: () => assessment,
    access: { action: 'assessment:create', on: 'teammate', ok: 201 },
  },
  {
    method: 'get',
    pattern: '/api/assessments/:id',
    path: (c) => `/api/assessments/${c.assessmentId}`,
    access: { action: 'assessment:read', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/assessments/:id',
    path: (c) => `/api/assessments/${c.otherAssessmentId}`,
    access: { action: 'assessment:read', on: 'teammate', ok: 200 },
  },
  {
    method: 'patch',
    pattern: '/api/assessments/:id',
    path: (c) => `/api/assessments/${c.assessmentId}`,
    body: () => ({ shoes: 'Trail shoe' }),
    access: { action: 'assessment:update', on: 'self', ok: 200 },
  },
  {
    method: 'delete',
    pattern: '/api/assessments/:id',
    path: (c) => `/api/assessments/${c.scratchAssessmentId}`,
    before: () => scratchAssessment(),
    access: { action: 'assessment:delete', on: 'self', ok: 204 },
  },
  // Access passes, then the JSON body is refused as "no file" (422): the walk checks who gets past the gate.
  {
    method: 'post',
    pattern: '/api/assessments/:id/clips',
    path: (c) => `/api/assessments/${c.assessmentId}/clips`,
    body: () => ({}),
    access: { action: 'clip:upload', on: 'self', ok: 422 },
  },
  {
    method: 'post',
    pattern: '/api/assessments/:id/clips',
    path: (c) => `/api/assessments/${c.otherAssessmentId}/clips`,
    body: () => ({}),
    access: { action: 'clip:upload', on: 'teammate', ok: 422 },
  },
  // Resumable uploads: creation passes the gate (201); an upload answers only the coach who created it.
  {
    method: 'post',
    pattern: '/api/assessments/:id/clip-uploads',
    path: (c) => `/api/assessments/${c.assessmentId}/clip-uploads`,
    headers: { 'Tus-Resumable': '1.0.0', 'Upload-Length': '1000' },
    access: { action: 'clip:upload', on: 'self', ok: 201 },
  },
  {
    method: 'post',
    pattern: '/api/assessments/:id/clip-uploads',
    path: (c) => `/api/assessments/${c.otherAssessmentId}/clip-uploads`,
    headers: { 'Tus-Resumable': '1.0.0', 'Upload-Length': '1000' },
    access: { action: 'clip:upload', on: 'teammate', ok: 201 },
  },
  {
    method: 'head',
    pattern: '/api/assessments/:id/clip-uploads/:uploadId',
    path: (c) => `/api/assessments/${c.assessmentId}/clip-uploads/${uc.uploadId}`,
    headers: { 'Tus-Resumable': '1.0.0' },
    access: { action: 'clip:upload', on: 'self', ok: 200, also: { athleteSelf: 404, owner: 404 } },
  },
  {
    method: 'patch',
    pattern: '/api/assessments/:id/clip-uploads/:uploadId',
    path: (c) => `/api/assessments/${c.assessmentId}/clip-uploads/${uc.uploadId}`,
    headers: { 'Tus-Resumable': '1.0.0', 'Upload-Offset': '0', 'Content-Type': 'application/offset+octet-stream' },
    access: { action: 'clip:upload', on: 'self', ok: 204, also: { athleteSelf: 404, owner: 404 } },
  },
  {
    method: 'delete',
    pattern: '/api/assessments/:id/clip-uploads/:uploadId',
    path: (c) => `/api/assessments/${c.assessmentId}/clip-uploads/${uc.scratchUploadId}`,
    headers: { 'Tus-Resumable': '1.0.0' },
    before: () => scratchUpload(),
    access: { action: 'clip:upload', on: 'self', ok: 204, also: { athleteSelf: 404, owner: 404 } },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/processing-events',
    path: (c) => `/api/athletes/${c.selfAthleteId}/processing-events`,
    stream: true,
    access: { action: 'processing:follow', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/clinic/processing-events',
    path: () => '/api/clinic/processing-events',
    stream: true,
    access: { action: 'processing:follow-clinic', on: 'own', ok: 200 },
  },
  { method: 'get', pattern: '/api/clips/:id', path: (c) => `/api/clips/${c.clipId}`, access: { action: 'clip:read', on: 'self', ok: 200 } },
  {
    method: 'patch',
    pattern: '/api/clips/:id',
    path: (c) => `/api/clips/${c.clipId}`,
    body: () => ({ nearSide: 'right' }),
    access: { action: 'clip:update-settings', on: 'self', ok: 200, state: { marked: false } },
  },
  // The scratch clip was uploaded by the coach: the athlete may not delete it.
  {
    method: 'delete',
    pattern: '/api/clips/:id',
    path: (c) => `/api/clips/${c.scratchClipId}`,
    before: () => scratchClip(),
    access: { action: 'clip:delete', on: 'self', ok: 204, state: { uploadedBy: COACH_ID } },
  },
  {
    method: 'post',
    pattern: '/api/clips/:id/retry',
    path: (c) => `/api/clips/${c.scratchClipId}` + '/retry',
    before: () => scratchClip(),
    access: { action: 'clip:retry', on: 'self', ok: 202 },
  },
  {
    method: 'get',
    pattern: '/api/clips/:id/poster',
    path: (c) => `/api/clips/${c.clipId}/poster`,
    access: { action: 'clip:read-media', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/clips/:id/thumbs/:n',
    path: (c) => `/api/clips/${c.clipId}/thumbs/0`,
    access: { action: 'clip:read-media', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/clips/:id/frames/:n',
    path: (c) => `/api/clips/${c.clipId}/frames/1`,
    access: { action: 'clip:read-media', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/clips/:id/manifest',
    path: (c) => `/api/clips/${c.clipId}/manifest`,
    access: { action: 'clip:read-media', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/clips/:id/original',
    path: (c) => `/api/clips/${c.clipId}/original`,
    access: { action: 'clip:read-media', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/clips/:id/annotations',
    path: (c) => `/api/clips/${c.clipId}/annotations`,
    access: { action: 'annotation:read', on: 'self', ok: 200 },
  },
  {
    method: 'put',
    pattern: '/api/clips/:id/annotations',
    path: (c) => `/api/clips/${c.clipId}/annotations`,
    body: () => ({ baseRevision: 0, landmarks: [], events: [], scale: null }),
    before: () => resetRevision(),
    access: { action: 'annotation:write', on: 'self', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/clips/:id/events/proposals',
    path: (c) => `/api/clips/${c.clipId}/events/proposals`,
    body: () => ({ baseRevision: 0 }),
    before: () => resetRevision(),
    // The walk's clip has no landmarks: the caller allowed in hears why nothing can be proposed.
    access: { action: 'event:propose', on: 'self', ok: 422 },
  },
  {
    method: 'post',
    pattern: '/api/clips/:id/follow',
    path: (c) => `/api/clips/${c.clipId}/follow`,
    body: () => ({ startFrame: 0, from: 0, to: 1 }),
    // The walk's clip has no landmarks: the caller allowed in hears there is nothing to follow.
    access: { action: 'landmark:follow', on: 'self', ok: 422 },
  },
  {
    method: 'post',
    pattern: '/api/clips/:id/follow/cancel',
    path: (c) => `/api/clips/${c.clipId}/follow/cancel`,
    // Nothing is being followed on the walk's clip: the caller allowed in hears there is nothing to cancel.
    access: { action: 'landmark:follow', on: 'self', ok: 409 },
  },
  {
    method: 'get',
    pattern: '/api/clips/:id/measures',
    path: (c) => `/api/clips/${c.clipId}/measures`,
    access: { action: 'measure:read', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/assessments/:id/measures',
    path: (c) => `/api/assessments/${c.assessmentId}/measures`,
    access: { action: 'measure:read', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/comparison',
    path: (c) => `/api/athletes/${c.selfAthleteId}/comparison`,
    access: { action: 'comparison:read', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/measure-trends',
    path: (c) => `/api/athletes/${c.selfAthleteId}/measure-trends?keys=hip_extension_toe_off,cadence`,
    access: { action: 'comparison:read', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/reference-bands',
    path: () => '/api/reference-bands',
    access: { action: 'reference-band:list', on: 'own', ok: 200 },
  },
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
    access: { action: 'reference-band:change', on: 'own', ok: 200 },
  },
  {
    method: 'delete',
    pattern: '/api/reference-bands/:key',
    path: () => '/api/reference-bands/cadence',
    access: { action: 'reference-band:change', on: 'own', ok: 204 },
  },
  { method: 'post', pattern: '/api/auth/sign-out', path: () => '/api/auth/sign-out', expect: all(204) },
  // Plans (fixtures in plansFixtures() at the end of this file).
  {
    method: 'get',
    pattern: '/api/exercises',
    path: () => '/api/exercises?region=hamstring',
    access: { action: 'exercise:list', on: 'own', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/exercises',
    path: () => '/api/exercises',
    body: () => ({ ...exercise, name: `Walk ${Math.random().toString(36).slice(2)}` }),
    access: { action: 'exercise:create', on: 'own', ok: 201 },
  },
  {
    method: 'get',
    pattern: '/api/exercises/:id',
    path: () => `/api/exercises/${pc.exerciseId}`,
    access: { action: 'exercise:read', on: 'demoClinic', ok: 200 },
  },
  {
    method: 'patch',
    pattern: '/api/exercises/:id',
    path: () => `/api/exercises/${pc.exerciseId}`,
    body: () => ({ cautions: 'Walked.' }),
    access: { action: 'exercise:update', on: 'demoClinic', ok: 200 },
  },
  {
    method: 'delete',
    pattern: '/api/exercises/:id',
    path: () => `/api/exercises/${pc.scratchExerciseId}`,
    before: () => scratchExercise(),
    access: { action: 'exercise:archive', on: 'demoClinic', ok: 204 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/plans',
    path: (c) => `/api/athletes/${c.selfAthleteId}/plans`,
    access: { action: 'plan:list', on: 'self', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/plans',
    path: (c) => `/api/athletes/${c.otherAthleteId}/plans`,
    body: () => planBody(),
    access: { action: 'plan:create', on: 'teammate', ok: 201 },
  },
  {
    method: 'get',
    pattern: '/api/plans/:id',
    path: () => `/api/plans/${pc.planId}`,
    access: { action: 'plan:read', on: 'self', ok: 200, state: { draft: false } },
  },
  {
    method: 'get',
    pattern: '/api/plans/:id',
    path: () => `/api/plans/${pc.otherPlanId}`,
    access: { action: 'plan:read', on: 'teammate', ok: 200, state: { draft: false } },
  },
  {
    method: 'put',
    pattern: '/api/plans/:id',
    path: () => `/api/plans/${pc.draftPlanId}`,
    body: () => ({ ...planBody(), baseRevision: 0 }),
    before: () => resetPlanRevision(),
    access: { action: 'plan:update', on: 'teammate', ok: 200 },
  },
  {
    method: 'delete',
    pattern: '/api/plans/:id',
    path: () => `/api/plans/${pc.scratchPlanId}`,
    before: () => scratchPlan(),
    access: { action: 'plan:delete', on: 'teammate', ok: 204 },
  },
  {
    method: 'post',
    pattern: '/api/plans/:id/transitions',
    path: () => `/api/plans/${pc.planId}/transitions`,
    body: () => ({ action: 'pause' }),
    before: () => planActive(),
    access: { action: 'plan:transition', on: 'self', ok: 200 },
  },
  {
    method: 'put',
    pattern: '/api/plans/:id/pain-rule',
    path: () => `/api/plans/${pc.planId}/pain-rule`,
    body: () => ({ maxDuring: 5, morningMustSettle: true, settledMorningMax: 2, noWeeklyRise: true }),
    access: { action: 'plan:set-pain-rule', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/plans/:id/progress',
    path: () => `/api/plans/${pc.planId}/progress`,
    access: { action: 'plan:read-progress', on: 'self', ok: 200, state: { draft: false } },
  },
  {
    method: 'get',
    pattern: '/api/plans/:id/progress',
    path: () => `/api/plans/${pc.otherPlanId}/progress`,
    access: { action: 'plan:read-progress', on: 'teammate', ok: 200, state: { draft: false } },
  },
  { method: 'get', pattern: '/api/plan-alerts', path: () => '/api/plan-alerts', access: { action: 'plan-alert:list', on: 'own', ok: 200 } },
  {
    method: 'get',
    pattern: '/api/plans/:id/logs',
    path: () => `/api/plans/${pc.planId}/logs`,
    access: { action: 'plan-log:list', on: 'self', ok: 200, state: { draft: false } },
  },
  {
    method: 'get',
    pattern: '/api/plans/:id/logs',
    path: () => `/api/plans/${pc.otherPlanId}/logs`,
    access: { action: 'plan-log:list', on: 'teammate', ok: 200, state: { draft: false } },
  },
  {
    method: 'post',
    pattern: '/api/plans/:id/logs',
    path: () => `/api/plans/${pc.planId}/logs`,
    body: () => logBody(),
    before: () => planActive(),
    access: { action: 'plan-log:create', on: 'self', ok: 201, state: { draft: false } },
  },
  {
    method: 'post',
    pattern: '/api/plans/:id/logs',
    path: () => `/api/plans/${pc.otherPlanId}/logs`,
    body: () => logBody(),
    access: { action: 'plan-log:create', on: 'teammate', ok: 201, state: { draft: false } },
  },
  {
    method: 'put',
    pattern: '/api/plans/:id/logs/:key/morning',
    path: () => `/api/plans/${pc.planId}/logs/${pc.logKey}/morning`,
    body: () => ({ pain: 1 }),
    access: { action: 'plan-log:morning-check', on: 'self', ok: 200, state: { draft: false } },
  },
  // Billing (fixtures in billingFixtures() at the end of this file). Coaches have no billing access.
  {
    method: 'get',
    pattern: '/api/billing/settings',
    path: () => '/api/billing/settings',
    access: { action: 'billing-settings:read', on: 'own', ok: 200 },
  },
  {
    method: 'put',
    pattern: '/api/billing/settings',
    path: () => '/api/billing/settings',
    body: () => ({ currency: 'EUR' }),
    access: { action: 'billing-settings:update', on: 'own', ok: 200 },
  },
  { method: 'get', pattern: '/api/prices', path: () => '/api/prices', access: { action: 'price:list', on: 'own', ok: 200 } },
  {
    method: 'post',
    pattern: '/api/prices',
    path: () => '/api/prices',
    body: () => priceBody,
    access: { action: 'price:create', on: 'own', ok: 201 },
  },
  {
    method: 'patch',
    pattern: '/api/prices/:id',
    path: () => `/api/prices/${bc.priceId}`,
    body: () => ({ description: 'Walked.' }),
    access: { action: 'price:update', on: 'demoClinic', ok: 200 },
  },
  {
    method: 'delete',
    pattern: '/api/prices/:id',
    path: () => `/api/prices/${bc.scratchPriceId}`,
    before: () => scratchPrice(),
    access: { action: 'price:archive', on: 'demoClinic', ok: 204 },
  },
  // Everyone signed in but coaches: the owner sees the clinic's, an athlete their own (possibly none).
  {
    method: 'get',
    pattern: '/api/invoices',
    path: () => '/api/invoices?status=issued',
    access: { action: 'invoice:list', on: 'own', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/invoices',
    path: () => '/api/invoices',
    body: (c) => invoiceBody(c.selfAthleteId),
    // The body names the demo clinic's athlete: the second clinic's owner gets past the guard, then 422.
    access: { action: 'invoice:create', on: 'own', ok: 201, also: { ownerOtherClinic: 422 } },
  },
  {
    method: 'get',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.openInvoiceId}`,
    access: { action: 'invoice:read', on: 'self', ok: 200, state: { draft: false } },
  },
  {
    method: 'get',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.draftInvoiceId}`,
    access: { action: 'invoice:read', on: 'self', ok: 200, state: { draft: true } },
  },
  {
    method: 'get',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.otherAthleteInvoiceId}`,
    access: { action: 'invoice:read', on: 'teammate', ok: 200, state: { draft: false } },
  },
  {
    method: 'put',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.draftInvoiceId}`,
    body: (c) => invoiceBody(c.selfAthleteId),
    access: { action: 'invoice:update', on: 'self', ok: 200, state: { draft: true } },
  },
  {
    method: 'put',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.openInvoiceId}`,
    body: (c) => invoiceBody(c.selfAthleteId),
    access: { action: 'invoice:update', on: 'self', ok: 409, state: { draft: false } },
  },
  {
    method: 'delete',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.scratchInvoiceId}`,
    before: () => scratchInvoice(),
    access: { action: 'invoice:delete', on: 'self', ok: 204, state: { draft: false } },
  },
  {
    method: 'delete',
    pattern: '/api/invoices/:id',
    path: () => `/api/invoices/${bc.openInvoiceId}`,
    access: { action: 'invoice:delete', on: 'self', ok: 409, state: { draft: false } },
  },
  {
    method: 'post',
    pattern: '/api/invoices/:id/issue',
    path: () => `/api/invoices/${bc.scratchInvoiceId}/issue`,
    before: () => scratchInvoice(),
    access: { action: 'invoice:issue', on: 'self', ok: 200, state: { draft: false } },
  },
  {
    method: 'post',
    pattern: '/api/invoices/:id/cancel',
    path: () => `/api/invoices/${bc.scratchInvoiceId}/cancel`,
    before: () => scratchInvoice(),
    access: { action: 'invoice:cancel', on: 'self', ok: 200, state: { draft: false } },
  },
  {
    method: 'post',
    pattern: '/api/invoices/:id/payments',
    path: () => `/api/invoices/${bc.scratchInvoiceId}/payments`,
    before: () => scratchIssuedInvoice(),
    body: () => ({ method: 'bank_transfer', paidOn: new Date().toISOString().slice(0, 10), note: 'Walk' }),
    access: { action: 'invoice:record-payment', on: 'self', ok: 200, state: { draft: false } },
  },
  {
    method: 'post',
    pattern: '/api/invoices/:id/refund',
    path: () => `/api/invoices/${bc.paidInvoiceId}/refund`,
    before: () => paidInvoice(),
    access: { action: 'invoice:refund', on: 'self', ok: 200, state: { draft: false } },
  },
  {
    method: 'post',
    pattern: '/api/invoices/:id/checkout',
    path: () => `/api/invoices/${bc.openInvoiceId}/checkout`,
    access: { action: 'invoice:pay', on: 'self', ok: 200, state: { draft: false } },
  },
  {
    method: 'post',
    pattern: '/api/invoices/:id/checkout',
    path: () => `/api/invoices/${bc.otherAthleteInvoiceId}/checkout`,
    access: { action: 'invoice:pay', on: 'teammate', ok: 200, state: { draft: false } },
  },
  {
    method: 'get',
    pattern: '/api/clinic/legal-details',
    path: () => '/api/clinic/legal-details',
    access: { action: 'clinic-legal:read', on: 'own', ok: 200 },
  },
  {
    method: 'put',
    pattern: '/api/clinic/legal-details',
    path: () => '/api/clinic/legal-details',
    body: () => ({ legalName: 'Walk Clinic Ltd', address: '1 Walk Lane\nWalktown', taxNumber: 'WK 123', contactLine: 'walk@clinic.test' }),
    access: { action: 'clinic-legal:update', on: 'own', ok: 200 },
  },
  // The clinic's brand (the caller's own clinic: no id) and logo (fixtures in demoFixtures()).
  {
    method: 'get',
    pattern: '/api/clinic/brand',
    path: () => '/api/clinic/brand',
    access: { action: 'clinic-brand:read', on: 'own', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/clinic/logo.png',
    path: () => '/api/clinic/logo.png',
    access: { action: 'clinic-brand:read', on: 'own', ok: 200 },
  },
  // A JSON body is no picture: whoever the policy lets through gets 400 (the upload itself is tested in demonstrations.test.ts).
  {
    method: 'put',
    pattern: '/api/clinic/logo',
    path: () => '/api/clinic/logo',
    body: () => ({ file: 'x' }),
    access: { action: 'clinic-logo:update', on: 'own', ok: 400 },
  },
  {
    method: 'delete',
    pattern: '/api/clinic/logo',
    path: () => '/api/clinic/logo',
    access: { action: 'clinic-logo:update', on: 'own', ok: 204 },
  },
  // Demonstration pictures: the self athlete reaches those of exercises on their own plan only.
  {
    method: 'get',
    pattern: '/api/exercises/:id/demonstrations',
    path: () => `/api/exercises/${dc.plannedExerciseId}/demonstrations`,
    access: { action: 'demo:list', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/exercises/:id/demonstrations',
    path: () => `/api/exercises/${dc.unplannedExerciseId}/demonstrations`,
    access: { action: 'demo:list', on: 'teammate', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/exercises/:id/demonstrations',
    path: () => `/api/exercises/${dc.foreignExerciseId}/demonstrations`,
    access: { action: 'demo:list', on: 'foreign', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/demo-pictures/:id/picture.jpg',
    path: () => `/api/demo-pictures/${dc.plannedPictureId}/picture.jpg`,
    access: { action: 'demo:read', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/demo-pictures/:id/thumb.jpg',
    path: () => `/api/demo-pictures/${dc.unplannedPictureId}/thumb.jpg`,
    access: { action: 'demo:read', on: 'teammate', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/demo-pictures/:id/picture.jpg',
    path: () => `/api/demo-pictures/${dc.foreignPictureId}/picture.jpg`,
    access: { action: 'demo:read', on: 'foreign', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/exercises/:id/demo-pictures',
    path: () => `/api/exercises/${dc.unplannedExerciseId}/demo-pictures`,
    body: () => ({ file: 'x' }),
    access: { action: 'demo:create', on: 'demoClinic', ok: 400 },
  },
  {
    method: 'patch',
    pattern: '/api/demo-pictures/:id',
    path: () => `/api/demo-pictures/${dc.plannedPictureId}`,
    body: () => ({ caption: 'Walk caption' }),
    access: { action: 'demo:update', on: 'demoClinic', ok: 200 },
  },
  {
    method: 'delete',
    pattern: '/api/demo-pictures/:id',
    path: () => `/api/demo-pictures/${dc.scratchPictureId}`,
    before: async () => {
      dc.scratchPictureId = await storedPicture(dc.unplannedExerciseId);
    },
    access: { action: 'demo:delete', on: 'demoClinic', ok: 204 },
  },
  // Demonstration clips (ready rows with their files, fixtures in demoFixtures()); the upload itself is tested in demo-clips.test.ts.
  {
    method: 'post',
    pattern: '/api/exercises/:id/demo-clip',
    path: () => `/api/exercises/${dc.clipFreeExerciseId}/demo-clip`,
    body: () => ({}),
    access: { action: 'demo:create', on: 'demoClinic', ok: 422 },
  },
  {
    method: 'get',
    pattern: '/api/demo-clips/:id/video.mp4',
    path: () => `/api/demo-clips/${dc.plannedClipId}/video.mp4?v=1`,
    access: { action: 'demo:read', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/demo-clips/:id/poster.jpg',
    path: () => `/api/demo-clips/${dc.unplannedClipId}/poster.jpg?v=1`,
    access: { action: 'demo:read', on: 'teammate', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/demo-clips/:id/video.mp4',
    path: () => `/api/demo-clips/${dc.foreignClipId}/video.mp4?v=1`,
    access: { action: 'demo:read', on: 'foreign', ok: 200 },
  },
  {
    method: 'patch',
    pattern: '/api/demo-clips/:id',
    path: () => `/api/demo-clips/${dc.plannedClipId}`,
    body: () => ({ caption: 'Walk clip' }),
    access: { action: 'demo:update', on: 'demoClinic', ok: 200 },
  },
  {
    method: 'delete',
    pattern: '/api/demo-clips/:id',
    path: () => `/api/demo-clips/${dc.scratchClipId}`,
    before: async () => {
      dc.scratchClipId = await storedClip(dc.clipFreeExerciseId);
    },
    access: { action: 'demo:delete', on: 'demoClinic', ok: 204 },
  },
  {
    method: 'get',
    pattern: '/api/invoices/:id/receipt',
    path: () => `/api/invoices/${bc.receiptInvoiceId}/receipt`,
    access: { action: 'invoice:read-receipt', on: 'self', ok: 200, state: { draft: false } },
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
    access: { action: 'still:create', on: 'self', ok: 202 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/stills',
    path: (c) => `/api/athletes/${c.selfAthleteId}/stills`,
    access: { action: 'still:list', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/stills/:id',
    path: () => `/api/stills/${sc.stillId}`,
    access: { action: 'still:read', on: 'self', ok: 200, state: { published: true } },
  },
  {
    method: 'get',
    pattern: '/api/stills/:id',
    path: () => `/api/stills/${sc.scratchStillId}`,
    before: () => scratchStill(),
    access: { action: 'still:read', on: 'self', ok: 200, state: { published: false } },
  },
  {
    method: 'patch',
    pattern: '/api/stills/:id',
    path: () => `/api/stills/${sc.scratchStillId}`,
    body: () => ({ caption: 'Walked' }),
    before: () => scratchStill(),
    access: { action: 'still:update', on: 'self', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/stills/:id/publish',
    path: () => `/api/stills/${sc.scratchStillId}/publish`,
    before: () => scratchStill(),
    access: { action: 'still:publish', on: 'self', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/stills/:id/unpublish',
    path: () => `/api/stills/${sc.scratchStillId}/unpublish`,
    before: () => scratchStill(),
    access: { action: 'still:publish', on: 'self', ok: 200 },
  },
  {
    method: 'delete',
    pattern: '/api/stills/:id',
    path: () => `/api/stills/${sc.scratchStillId}`,
    before: () => scratchStill(),
    access: { action: 'still:delete', on: 'self', ok: 204 },
  },
  {
    method: 'get',
    pattern: '/api/stills/:id/image.png',
    path: () => `/api/stills/${sc.stillId}/image.png`,
    access: { action: 'still:read', on: 'self', ok: 200, state: { published: true } },
  },
  {
    method: 'get',
    pattern: '/api/stills/:id/image.jpg',
    path: () => `/api/stills/${sc.stillId}/image.jpg`,
    access: { action: 'still:read', on: 'self', ok: 200, state: { published: true } },
  },
  {
    method: 'get',
    pattern: '/api/stills/:id/image.png',
    path: () => `/api/stills/${sc.scratchStillId}/image.png`,
    before: () => scratchStill(),
    access: { action: 'still:read', on: 'self', ok: 200, state: { published: false } },
  },
  {
    method: 'post',
    pattern: '/api/assessments/:id/summaries',
    path: (c) => `/api/assessments/${c.assessmentId}/summaries`,
    body: () => ({ findings: '', planText: '', stillIds: [] }),
    access: { action: 'summary:create', on: 'self', ok: 202 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/summaries',
    path: (c) => `/api/athletes/${c.selfAthleteId}/summaries`,
    access: { action: 'summary:list', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/summaries/:id',
    path: () => `/api/summaries/${sc.summaryId}`,
    access: { action: 'summary:read', on: 'self', ok: 200, state: { published: true } },
  },
  {
    method: 'post',
    pattern: '/api/summaries/:id/publish',
    path: () => `/api/summaries/${sc.scratchSummaryId}/publish`,
    before: () => scratchSummary(),
    access: { action: 'summary:publish', on: 'self', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/summaries/:id/unpublish',
    path: () => `/api/summaries/${sc.scratchSummaryId}/unpublish`,
    before: () => scratchSummary(),
    access: { action: 'summary:publish', on: 'self', ok: 200 },
  },
  {
    method: 'delete',
    pattern: '/api/summaries/:id',
    path: () => `/api/summaries/${sc.scratchSummaryId}`,
    before: () => scratchSummary(),
    access: { action: 'summary:delete', on: 'self', ok: 204 },
  },
  {
    method: 'get',
    pattern: '/api/summaries/:id/pdf',
    path: () => `/api/summaries/${sc.summaryId}/pdf`,
    access: { action: 'summary:read', on: 'self', ok: 200, state: { published: true } },
  },
  {
    method: 'get',
    pattern: '/api/summaries/:id/pdf',
    path: () => `/api/summaries/${sc.scratchSummaryId}/pdf`,
    before: () => scratchSummary(),
    access: { action: 'summary:read', on: 'self', ok: 200, state: { published: false } },
  },
  // Annotated clips (fixtures in annotatedClipFixtures() at the end of this file): the walk's clip
  // is published, so its own athlete plays it; scratch ones take the writes.
  {
    method: 'post',
    pattern: '/api/clips/:id/annotated-clips',
    path: (c) => `/api/clips/${c.clipId}/annotated-clips`,
    body: () => ({ fromFrame: 0, toFrame: 5, factor: 1, caption: 'Walk', showAngles: true }),
    access: { action: 'annotated-clip:create', on: 'self', ok: 202 },
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/side-by-side-clips',
    path: (c) => `/api/athletes/${c.selfAthleteId}/side-by-side-clips`,
    body: () => ({ baselineClipId: ac.baselineClipId, retestClipId: ac.retestClipId, factor: 1, caption: 'Walk', showAngles: true }),
    access: { action: 'annotated-clip:create', on: 'self', ok: 202 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/annotated-clips',
    path: (c) => `/api/athletes/${c.selfAthleteId}/annotated-clips`,
    access: { action: 'annotated-clip:list', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/annotated-clips/:id',
    path: () => `/api/annotated-clips/${ac.clipId}`,
    access: { action: 'annotated-clip:read', on: 'self', ok: 200, state: { published: true } },
  },
  {
    method: 'get',
    pattern: '/api/annotated-clips/:id',
    path: () => `/api/annotated-clips/${ac.scratchId}`,
    before: () => scratchAnnotatedClip(),
    access: { action: 'annotated-clip:read', on: 'self', ok: 200, state: { published: false } },
  },
  {
    method: 'post',
    pattern: '/api/annotated-clips/:id/publish',
    path: () => `/api/annotated-clips/${ac.scratchId}/publish`,
    before: () => scratchAnnotatedClip(),
    access: { action: 'annotated-clip:publish', on: 'self', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/annotated-clips/:id/unpublish',
    path: () => `/api/annotated-clips/${ac.scratchId}/unpublish`,
    before: () => scratchAnnotatedClip(),
    access: { action: 'annotated-clip:publish', on: 'self', ok: 200 },
  },
  {
    method: 'delete',
    pattern: '/api/annotated-clips/:id',
    path: () => `/api/annotated-clips/${ac.scratchId}`,
    before: () => scratchAnnotatedClip(),
    access: { action: 'annotated-clip:delete', on: 'self', ok: 204 },
  },
  {
    method: 'get',
    pattern: '/api/annotated-clips/:id/video.mp4',
    path: () => `/api/annotated-clips/${ac.clipId}/video.mp4`,
    access: { action: 'annotated-clip:read', on: 'self', ok: 200, state: { published: true } },
  },
  {
    method: 'get',
    pattern: '/api/annotated-clips/:id/video.mp4',
    path: () => `/api/annotated-clips/${ac.scratchId}/video.mp4`,
    before: () => scratchAnnotatedClip(),
    access: { action: 'annotated-clip:read', on: 'self', ok: 200, state: { published: false } },
  },
  {
    method: 'get',
    pattern: '/api/portal/shared',
    path: () => '/api/portal/shared',
    access: { action: 'portal-shared:list', on: 'own', ok: 200 },
  },
  // ── Athlete data: export, erasure, clip erasure, retention ──
  {
    method: 'get',
    pattern: '/api/athletes/:id/data',
    path: (c) => `/api/athletes/${c.selfAthleteId}/data`,
    access: { action: 'athlete-data:read', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/data',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/data`,
    access: { action: 'athlete-data:read', on: 'foreign', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/data-exports',
    path: (c) => `/api/athletes/${c.selfAthleteId}/data-exports`,
    access: { action: 'data-export:list', on: 'self', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/athletes/:id/data-exports',
    path: (c) => `/api/athletes/${c.otherAthleteId}/data-exports`,
    access: { action: 'data-export:list', on: 'teammate', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/data-exports',
    path: (c) => `/api/athletes/${c.selfAthleteId}/data-exports`,
    before: () => settleExports(),
    access: { action: 'data-export:create', on: 'self', ok: 202 },
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/data-exports',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/data-exports`,
    before: () => settleExports(),
    access: { action: 'data-export:create', on: 'foreign', ok: 202 },
  },
  {
    method: 'get',
    pattern: '/api/data-exports/:id/download',
    path: () => `/api/data-exports/${xc.exportId}/download`,
    access: { action: 'data-export:download', on: 'self', ok: 200 },
  },
  // A wrong name passes the gate and is refused (422): the walk erases nobody.
  {
    method: 'post',
    pattern: '/api/athletes/:id/erasure',
    path: (c) => `/api/athletes/${c.otherAthleteId}/erasure`,
    body: () => ({ confirmName: 'Somebody Else' }),
    access: { action: 'athlete:erase', on: 'teammate', ok: 422 },
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/erasure',
    path: (c) => `/api/athletes/${c.foreignAthleteId}/erasure`,
    body: () => ({ confirmName: 'Somebody Else' }),
    access: { action: 'athlete:erase', on: 'foreign', ok: 422 },
  },
  {
    method: 'post',
    pattern: '/api/athletes/:id/clips/erasure',
    path: (c) => `/api/athletes/${c.otherAthleteId}/clips/erasure`,
    body: () => ({ confirm: true }),
    access: { action: 'clip:erase-all', on: 'teammate', ok: 200 },
  },
  {
    method: 'get',
    pattern: '/api/clinic/retention',
    path: () => '/api/clinic/retention',
    access: { action: 'retention:read', on: 'own', ok: 200 },
  },
  {
    method: 'put',
    pattern: '/api/clinic/retention',
    path: () => '/api/clinic/retention',
    body: () => ({ months: 120 }),
    access: { action: 'retention:update', on: 'own', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/clinic/retention/reviews',
    path: () => '/api/clinic/retention/reviews',
    before: () => retentionOn(),
    access: { action: 'retention:review', on: 'own', ok: 200 },
  },
  {
    method: 'post',
    pattern: '/api/clinic/retention/reviews/:id/confirm',
    path: () => `/api/clinic/retention/reviews/${xc.reviewId}/confirm`,
    before: () => scratchReview(),
    access: { action: 'retention:confirm', on: 'demoClinic', ok: 200 },
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

/** The walk's draft plan back at revision 0, so each caller's save names the revision stored. */
async function resetPlanRevision(): Promise<void> {
  await t.db('plans').where({ id: pc.draftPlanId }).update({ revision: 0 });
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
  await demoFixtures();
  await annotatedClipFixtures();
  uc.uploadId = await coachUpload();
  await privacyFixtures();
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
      const status = statusFor(route, who);
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
        const res = route.method === 'get' ? await c.get(path) : await c.send(route.method, path, route.body?.(ctx), route.headers);
        expect(res.status, JSON.stringify(res.body)).toBe(status);
        // (A HEAD answer has no body.)
        if (res.status >= 400 && route.method !== 'head')
          expect(res.body.error).toMatchObject({ code: expect.any(String), message: expect.any(String) });
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

  it("every route's guard names the action the walk derives its statuses from; public routes have none", () => {
    const actions = listRouteActions(t.app);
    const wrong = ROUTES.filter((r) => actions.get(`${r.method.toUpperCase()} ${r.pattern}`) !== (r.access?.action ?? null)).map(
      (r) =>
        `${r.method.toUpperCase()} ${r.pattern}: guard ${actions.get(`${r.method.toUpperCase()} ${r.pattern}`)}, walk ${r.access?.action ?? null}`,
    );
    expect(wrong).toEqual([]);
  });
});

// ─── Resumable upload fixtures ────────────────────────────────────────────────────────────

const uc = { uploadId: '', scratchUploadId: '' };

/** A resumable upload of 1000 bytes the coach created on the self athlete's assessment; its id. */
async function coachUpload(): Promise<string> {
  const res = await coachClient.send('post', `/api/assessments/${ctx.assessmentId}/clip-uploads`, undefined, {
    'Tus-Resumable': '1.0.0',
    'Upload-Length': '1000',
  });
  return String(res.headers['location']).split('/').pop()!;
}

async function scratchUpload(): Promise<void> {
  uc.scratchUploadId = await coachUpload();
}

/** Every column of every table of the app's schema, on either engine. */
async function tableColumns(db: TestApp['db']): Promise<{ table: string; column: string }[]> {
  if (onPostgres)
    return selectRows(
      db,
      `SELECT table_name AS "table", column_name AS "column" FROM information_schema.columns WHERE table_schema = current_schema()`,
    );
  const tables = await selectRows<{ name: string }>(db, `SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%'`);
  const out: { table: string; column: string }[] = [];
  for (const { name } of tables)
    for (const c of await selectRows<{ name: string }>(db, `PRAGMA table_info(${name})`)) out.push({ table: name, column: c.name });
  return out;
}

/**
 * Erasure, checked last against everything the walk made: the self athlete (with clips, stills,
 * summaries, annotated clips, a plan, invoices, an export) is erased by the owner; then every route
 * of the walk about one of their records answers 404, the roster lists nothing of them, the uploads
 * folder holds none of their files, no text in any table holds their name or e-mail, and their
 * sign-in is over. Invoices stay, with the reference instead of the name.
 */
describe('after erasing the self athlete', () => {
  /** The erased athlete's record ids by the API path segment that names them. */
  const erased: Record<string, Set<number>> = {};
  const SEGMENT_TABLES: Record<string, string> = {
    athletes: 'athletes',
    assessments: 'assessments',
    clips: 'clips',
    stills: 'stills',
    summaries: 'visit_summaries',
    'annotated-clips': 'annotated_clips',
    plans: 'plans',
    'data-exports': 'data_exports',
  };
  let prefixes: string[] = [];
  let partialUpload = false;
  let reference = '';
  let invoiceIds: number[] = [];
  let plantedLine = 0;
  let athleteClient: Client;
  const SURNAME = 'Kestrel';
  const EMAIL = 'ada.kestrel@runner.test';

  beforeAll(async () => {
    await t.worker!.idle();
    const id = ctx.selfAthleteId;
    for (const [segment, table] of Object.entries(SEGMENT_TABLES))
      erased[segment] = new Set(
        (await t
          .db(table)
          .where(table === 'athletes' ? { id } : { athlete_id: id })
          .pluck('id')) as number[],
      );
    prefixes = [
      ...[...erased['clips']!].map((c) => `clips/${c}/`),
      ...[...erased['assessments']!].map((a) => `assessments/${a}/`),
      `exports/${id}/`,
    ];
    invoiceIds = (await t.db('invoices').where({ athlete_id: id }).whereNot({ status: 'draft' }).pluck('id')) as number[];
    // Staff typed the athlete's name and contact into a kept invoice's free text: the erasure must find them there too.
    await t
      .db('invoices')
      .where({ id: invoiceIds[0] })
      .update({ note: `Sessions for Ada ${SURNAME} (${EMAIL.toUpperCase()})`, payment_note: 'Paid by ada at the desk' });
    plantedLine = (await t.db('invoice_lines').where({ invoice_id: invoiceIds[0] }).first<{ id: number }>())!.id;
    await t
      .db('invoice_lines')
      .where({ id: plantedLine })
      .update({ description: `Gait assessment, ${SURNAME}, Ada` });
    // A resumable upload the coach left unfinished on the athlete's assessment: its bytes are theirs too.
    partialUpload = (await import('node:fs')).existsSync(path.join(t.config.uploadsDir, 'tmp', 'resumable', uc.uploadId));
    athleteClient = await clientFor(t.app, 'athleteSelf');
    const owner = await clientFor(t.app, 'owner');
    const wrong = await owner.post(`/api/athletes/${id}/erasure`, { confirmName: 'Ada Kestrell' });
    expect(wrong.status).toBe(422);
    expect(wrong.body.error.details[0].path).toEqual(['confirmName']);
    // Typed with other spacing and case: still the athlete's full name.
    const res = await owner.post(`/api/athletes/${id}/erasure`, { confirmName: '  ada   KESTREL ' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    reference = res.body.reference;
    expect(reference).toMatch(/^E-[0-9A-F]{4,}$/);
  });

  it('the walk had records and files of the athlete to erase', () => {
    expect(erased['clips']!.size).toBeGreaterThanOrEqual(3);
    expect(erased['stills']!.size + erased['summaries']!.size + erased['annotated-clips']!.size).toBeGreaterThan(2);
    expect(erased['plans']!.size).toBeGreaterThan(0);
    expect(invoiceIds.length).toBeGreaterThan(0);
  });

  it('every route of the walk about an erased record answers 404 to the owner and the coach (403 where their role never may), 401 to the signed-out athlete', async () => {
    const checked: string[] = [];
    const clients = { owner: await clientFor(t.app, 'owner'), coach: await clientFor(t.app, 'coach'), athleteSelf: athleteClient };
    for (const route of ROUTES) {
      const path = route.path(ctx);
      const m = /^\/api\/([a-z-]+)\/(\d+)/.exec(path);
      if (!m || !erased[m[1]!]?.has(Number(m[2]))) continue;
      checked.push(`${route.method.toUpperCase()} ${path}`);
      for (const who of ['owner', 'coach', 'athleteSelf'] as const) {
        const c = clients[who];
        // A role the action never allows is refused first (403, leaking nothing); past it, the record is gone (404).
        const role = route.access ? decideRole(ACTORS[who], route.access.action) : { allowed: true, status: 200 };
        const want = who === 'athleteSelf' ? 401 : role.allowed ? 404 : role.status;
        if (route.stream) {
          expect(await streamStatus(c, path), `${route.method} ${path} as ${who}`).toBe(want);
          continue;
        }
        const res = route.method === 'get' ? await c.get(path) : await c.send(route.method, path, route.body?.(ctx));
        // A write with the ended session's CSRF token is refused before the sign-in check (403).
        const allowed = who === 'athleteSelf' && route.method !== 'get' ? [401, 403] : [want];
        expect(allowed, `${route.method.toUpperCase()} ${path} as ${who}: ${res.status} ${JSON.stringify(res.body)}`).toContain(res.status);
      }
    }
    expect(checked.length).toBeGreaterThan(40);
  }, 120_000);

  it('the roster and every list find nothing of the athlete; kept invoices carry the reference', async () => {
    const owner = await clientFor(t.app, 'owner');
    const roster = (await owner.get('/api/athletes')).body.athletes as { id: number; lastName: string }[];
    expect(roster.map((a) => a.id)).not.toContain(ctx.selfAthleteId);
    expect(JSON.stringify(roster)).not.toContain(SURNAME);
    const invoices = (await owner.get(`/api/invoices?athleteId=${ctx.selfAthleteId}`)).body.invoices as {
      id: number;
      athleteName: string;
    }[];
    expect(invoices.map((i) => i.id).sort()).toEqual([...invoiceIds].sort());
    for (const i of invoices) expect(i.athleteName).toBe(`Erased athlete ${reference}`);
    const receipt = await owner.binary(`/api/invoices/${bc.paidInvoiceId}/receipt`);
    expect(receipt.status).toBe(200);
  });

  it('the uploads folder and the media store hold no file of the athlete', async () => {
    const fs = await import('node:fs');
    const local = (fs.readdirSync(t.config.uploadsDir, { recursive: true }) as string[]).map((f) => f.split('\\').join('/'));
    // Partial uploads stay in the local folder; media is in the app's store (the same folder, or a bucket).
    const files = [...new Set([...local, ...(await t.mediaKeys())])];
    expect(files.length).toBeGreaterThan(0);
    expect(files.filter((f) => prefixes.some((p) => `${f}/`.startsWith(p)))).toEqual([]);
    expect(partialUpload).toBe(true);
    expect(files.filter((f) => f.includes(uc.uploadId))).toEqual([]);
  });

  it("no text in any table holds the athlete's name or e-mail, not even an invoice's note or line typed by staff", async () => {
    const columns = await tableColumns(t.db);
    expect(columns.length).toBeGreaterThan(100);
    const found: string[] = [];
    for (const { table, column } of columns)
      for (const needle of [SURNAME, EMAIL]) {
        const [row] = await selectRows<{ n: number }>(t.db, `SELECT count(*) AS n FROM ${table} WHERE CAST("${column}" AS TEXT) LIKE ?`, [
          `%${needle}%`,
        ]);
        if (Number(row!.n) > 0) found.push(`${table}.${column} ∋ ${needle} (${row!.n})`);
      }
    expect(found).toEqual([]);
    // The planted free text now names the reference, word for word otherwise.
    expect(await t.db('invoices').where({ id: invoiceIds[0] }).first('note', 'payment_note')).toEqual({
      note: `Sessions for ${reference} (${reference})`,
      payment_note: `Paid by ${reference} at the desk`,
    });
    expect((await t.db('invoice_lines').where({ id: plantedLine }).first('description')).description).toBe(
      `Gait assessment, ${reference}, ${reference}`,
    );
  });

  it('one audit entry says who erased whom (by the reference) and when; the account and its sessions are gone', async () => {
    const entries = await t.db('audit_log').where({ athlete_id: ctx.selfAthleteId });
    expect(entries).toHaveLength(1);
    const ownerRow = await t.db('users').where({ email: owner.email }).first();
    expect(entries[0]).toMatchObject({ action: 'athlete.erased', actor_id: ownerRow.id });
    expect(JSON.parse(entries[0].detail)).toEqual({ reference, keptInvoices: invoiceIds.length });
    expect(await t.db('users').where({ email: EMAIL }).first()).toBeUndefined();
    expect((await athleteClient.get('/api/auth/me')).body.user).toBeNull();
    const again = await new Client(t.app).post('/api/auth/sign-in', { email: EMAIL, password: athlete.password });
    expect(again.status).toBe(401);
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

const planBody = () => oneStagePlan('Walk plan', pc.exerciseId, exercise.dose);

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

// ─── Demonstration and logo fixtures ──────────────────────────────────────────────────────

/** Pictures the walk reads: on the self athlete's plan, on no plan of theirs, of the second clinic. */
const dc = {
  plannedExerciseId: 0,
  unplannedExerciseId: 0,
  foreignExerciseId: 0,
  plannedPictureId: 0,
  unplannedPictureId: 0,
  foreignPictureId: 0,
  scratchPictureId: 0,
  /** An exercise of the demo clinic on no plan and without a clip (uploads, the scratch clip). */
  clipFreeExerciseId: 0,
  plannedClipId: 0,
  unplannedClipId: 0,
  foreignClipId: 0,
  scratchClipId: 0,
};

/** A stored picture row with its files (written straight to the store: processing is tested elsewhere). */
async function storedPicture(exerciseId: number): Promise<number> {
  const ex = await t.db('exercises').where({ id: exerciseId }).first();
  const [row] = await t
    .db('demo_pictures')
    .insert({
      clinic_id: ex.clinic_id,
      exercise_id: exerciseId,
      position: 0,
      caption: '',
      width: 8,
      height: 8,
      thumb_width: 8,
      thumb_height: 8,
      created_by: null,
      created_at: new Date().toISOString(),
    })
    .returning('id');
  const id = (row as { id: number }).id;
  const objects = t.store;
  const jpeg = await markedJpeg(8, 8, 2);
  await objects.put(demoPictureKey(exerciseId, id, 'full'), jpeg);
  await objects.put(demoPictureKey(exerciseId, id, 'thumb'), jpeg);
  return id;
}

/** A ready demonstration clip row with its files (any bytes: processing is tested elsewhere); replaces the exercise's clip. */
async function storedClip(exerciseId: number): Promise<number> {
  const ex = await t.db('exercises').where({ id: exerciseId }).first();
  await t.db('demo_clips').where({ exercise_id: exerciseId }).delete();
  const at = new Date().toISOString();
  const [row] = await t
    .db('demo_clips')
    .insert({
      clinic_id: ex.clinic_id,
      exercise_id: exerciseId,
      position: 0,
      caption: '',
      stored_name: 'original.mp4',
      status: 'ready',
      version: 1,
      duration_s: 2,
      width: 8,
      height: 8,
      created_at: at,
      updated_at: at,
    })
    .returning('id');
  const id = (row as { id: number }).id;
  const store = t.store;
  const keys = demoClipKeys(exerciseId, id);
  await store.put(keys.video(1), Buffer.from('walk video'));
  await store.put(keys.poster(1), await markedJpeg(8, 8, 2));
  return id;
}

async function demoFixtures(): Promise<void> {
  dc.plannedExerciseId = pc.exerciseId;
  const onPlans = await t
    .db('stage_exercises as se')
    .join('plan_stages as ps', 'ps.id', 'se.stage_id')
    .join('plans as p', 'p.id', 'ps.plan_id')
    .where('p.athlete_id', ctx.selfAthleteId)
    .pluck('se.exercise_id');
  dc.unplannedExerciseId = (await t.db('exercises').where({ clinic_id: 1 }).whereNotIn('id', onPlans).first()).id;
  const otherCoach = await clientFor(t.app, 'coachOtherClinic');
  dc.foreignExerciseId = (await otherCoach.post('/api/exercises', { ...exercise, name: 'Foreign walk exercise' })).body.id;
  dc.plannedPictureId = await storedPicture(dc.plannedExerciseId);
  dc.unplannedPictureId = await storedPicture(dc.unplannedExerciseId);
  dc.foreignPictureId = await storedPicture(dc.foreignExerciseId);
  dc.clipFreeExerciseId = (
    await t
      .db('exercises')
      .where({ clinic_id: 1 })
      .whereNotIn('id', [...onPlans, dc.unplannedExerciseId])
      .first()
  ).id;
  dc.plannedClipId = await storedClip(dc.plannedExerciseId);
  dc.unplannedClipId = await storedClip(dc.unplannedExerciseId);
  dc.foreignClipId = await storedClip(dc.foreignExerciseId);
  // Both clinics have a logo for GET /api/clinic/logo.png.
  const objects = t.store;
  for (const clinicId of await t.db('clinics').pluck('id')) {
    await objects.put(clinicLogoKey(clinicId, 1), await new Jimp({ width: 4, height: 2, color: 0x00000000 }).getBuffer('image/png'));
    await t.db('clinics').where({ id: clinicId }).update({ logo_version: 1, logo_width: 4, logo_height: 2 });
  }
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

// ─── Annotated clips ──────────────────────────────────────────────────────────────────────
const ac = { clipId: 0, scratchId: 0, baselineClipId: 0, retestClipId: 0 };

/** A rendered, unpublished annotated clip of the walk's clip. */
async function scratchAnnotatedClip(): Promise<void> {
  const res = await coachClient.post(`/api/clips/${ctx.clipId}/annotated-clips`, {
    fromFrame: 0,
    toFrame: 5,
    factor: 1,
    caption: 'Scratch',
    showAngles: true,
  });
  expect(res.status, JSON.stringify(res.body)).toBe(202);
  ac.scratchId = res.body.id;
  await t.worker!.idle();
}

/** One published annotated clip, and two more clips of the self athlete with an initial contact marked (side by side). */
async function annotatedClipFixtures(): Promise<void> {
  await scratchAnnotatedClip();
  ac.clipId = ac.scratchId;
  expect((await coachClient.post(`/api/annotated-clips/${ac.clipId}/publish`, {})).status).toBe(200);
  const ids: number[] = [];
  for (const name of ['sbs-a', 'sbs-b']) {
    const file = await makeClip(`${clipDir.dir}/${name}.mp4`, { fps: 30, width: 160, height: 90, seconds: 1 });
    const up = await coachClient.agent
      .post(`/api/assessments/${ctx.assessmentId}/clips`)
      .set('X-XSRF-TOKEN', await coachClient.xsrf())
      .attach('file', file);
    ids.push(up.body.id);
  }
  await t.worker!.idle();
  for (const id of ids) {
    const marked = await coachClient.put(`/api/clips/${id}/annotations`, {
      baseRevision: 0,
      landmarks: [],
      events: [{ frame: 3, side: 'right', kind: 'initial_contact' }],
      scale: null,
    });
    expect(marked.status, JSON.stringify(marked.body)).toBe(200);
  }
  [ac.baselineClipId, ac.retestClipId] = ids as [number, number];
}

// ─── Athlete data ─────────────────────────────────────────────────────────────────────────
const xc = { exportId: 0, reviewId: 0 };

/** No export is being built (a new one may start). */
async function settleExports(): Promise<void> {
  await t.db('data_exports').where({ status: 'building' }).update({ status: 'failed', error: 'walk' });
}

/** Retention on in the demo clinic (120 months: nothing is due). */
async function retentionOn(): Promise<void> {
  await t.db('clinics').where({ id: 1 }).update({ clip_retention_months: 120 });
}

/** A fresh, empty retention list of the demo clinic (the latest, unconfirmed). */
async function scratchReview(): Promise<void> {
  await retentionOn();
  const [row] = await t
    .db('clip_retention_reviews')
    .insert({ clinic_id: 1, items: '[]', total_bytes: 0, listed_at: new Date().toISOString() })
    .returning('id');
  xc.reviewId = (row as { id: number }).id;
}

/** A ready export of the self athlete whose link is valid for a day, with a small zip stored under its key. */
async function privacyFixtures(): Promise<void> {
  const at = new Date();
  const [row] = await t
    .db('data_exports')
    .insert({
      clinic_id: 1,
      athlete_id: ctx.selfAthleteId,
      status: 'ready',
      size_bytes: 4,
      file_count: 2,
      ready_at: at.toISOString(),
      expires_at: new Date(at.getTime() + 86_400_000).toISOString(),
      created_at: at.toISOString(),
    })
    .returning('id');
  xc.exportId = (row as { id: number }).id;
  await t.store.put(exportKey(ctx.selfAthleteId, xc.exportId), Buffer.from('PK\x05\x06'));
}
