/**
 * Proposed gait events through the API. The landmarks are the synthetic runner's ground truth
 * (scripts/demo-clip — a synthetic fixture with known truth, not a real person or a published
 * dataset) laid on a plain clip of the same size and rate, as if a coach had marked every frame;
 * its truth says which frames are initial contact and toe-off. The rules are the coordinate method
 * (Zeni et al. 2008 [pub]) refined for running (Fellin et al. 2010 [pub]), as quoted in REFERENCES.md.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip, tempDir } from './media/fixtures';
import { buildGroundTruth, type GroundTruth } from '../../scripts/demo-clip/ground-truth';
import type { ClipAnnotations, EventProposalsResult, FrameLandmarks, GaitEventMark } from '../../src/contracts/annotations';
import type { ClipMeasures } from '../../src/contracts/measures';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let dir: { dir: string; cleanup: () => Promise<void> };
let clipId: number;
let truth: GroundTruth;

beforeAll(async () => {
  dir = await tempDir('proposals');
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  const assessmentId = (await t.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  const file = await makeClip(path.join(dir.dir, 'plain.mp4'), { fps: 120, width: 640, height: 360, seconds: 2 });
  const res = await c.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await c.xsrf())
    .attach('file', file);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  clipId = res.body.id;
  await t.worker!.idle();
  truth = buildGroundTruth({ fps: 120, width: 640, height: 360, seconds: 2, hipExtensionDeg: 6, facing: 'right' });
}, 120_000);
afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

const propose = (baseRevision: unknown) => c.post(`/api/clips/${clipId}/events/proposals`, { baseRevision });
const annotations = async () => (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
function truthLandmarks(frames = truth.frameCount): FrameLandmarks[] {
  return truth.frames.slice(0, frames).flatMap((f) => [
    { frame: f.index, side: 'right' as const, points: f.landmarksNormalised.near },
    { frame: f.index, side: 'left' as const, points: f.landmarksNormalised.far },
  ]);
}

describe('POST /api/clips/:id/events/proposals', () => {
  it('422 too_few_landmarked_frames without enough marked frames; nothing changes', async () => {
    const none = await propose(0);
    expect(none.status).toBe(422);
    expect(none.body.error.code).toBe('too_few_landmarked_frames');
    expect(none.body.error.message).toContain('96 frames in a row');
    // 40 frames marked (a third of a second): still too few for one stride.
    const put = await c.put(`/api/clips/${clipId}/annotations`, {
      baseRevision: 0,
      landmarks: truthLandmarks(40),
      events: [],
      scale: null,
    });
    expect(put.status, JSON.stringify(put.body)).toBe(200);
    const few = await propose(1);
    expect(few.status).toBe(422);
    expect(few.body.error.message).toContain('longest run on this clip is 40 frames');
    expect((await annotations()).revision).toBe(1);
  });

  it('422 for a body without a whole-number baseRevision', async () => {
    expect((await propose('one')).status).toBe(422);
  });

  it('proposes events within 1 frame of the truth (synthetic fixture), keeps a placed event as it is, and measures wait for acceptance', async () => {
    const placedIc = truth.events.near.initialContact[0]!;
    const placed: GaitEventMark = { frame: placedIc, side: 'right', kind: 'initial_contact' };
    const put = await c.put(`/api/clips/${clipId}/annotations`, {
      baseRevision: 1,
      landmarks: truthLandmarks(),
      events: [placed],
      scale: null,
    });
    expect(put.status, JSON.stringify(put.body)).toBe(200);

    const stale = await propose(1);
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('stale_revision');

    const res = await propose(2);
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const result = res.body as EventProposalsResult;
    expect(result.annotations.revision).toBe(3);
    expect(result.proposed).toBeGreaterThanOrEqual(8);
    const events = result.annotations.events;
    // The placed contact is still there, still placed, and no proposal sits beside it.
    expect(events.filter((e) => e.side === 'right' && Math.abs(e.frame - placedIc) <= 12)).toEqual([{ ...placed, origin: 'placed' }]);
    const proposed = events.filter((e) => e.origin === 'proposed');
    expect(proposed.length).toBe(result.proposed);
    for (const e of proposed) {
      const t0 = truth.events[e.side === 'right' ? 'near' : 'far'][e.kind === 'initial_contact' ? 'initialContact' : 'toeOff'];
      expect(
        t0.some((f) => Math.abs(f - e.frame) <= 1),
        `${e.side} ${e.kind} at ${e.frame}`,
      ).toBe(true);
    }
    expect(result.skipped.some((s) => s.includes('next to the initial contact placed'))).toBe(true);

    const measures = (await c.get(`/api/clips/${clipId}/measures`)).body as ClipMeasures;
    expect(measures.notes.some((n) => n.includes(`${result.proposed} proposed events not counted until accepted`))).toBe(true);
  });

  it('asking again replaces proposals not yet accepted and leaves accepted ones alone', async () => {
    const current = await annotations();
    const firstProposal = current.events.find((e) => e.origin === 'proposed')!;
    const accepted = current.events.map((e) => (e === firstProposal ? { ...e, origin: 'accepted' as const } : e));
    const put = await c.put(`/api/clips/${clipId}/annotations`, {
      baseRevision: current.revision,
      landmarks: current.landmarks,
      events: accepted,
      scale: current.scale,
    });
    expect(put.status, JSON.stringify(put.body)).toBe(200);
    const again = await propose(current.revision + 1);
    expect(again.status, JSON.stringify(again.body)).toBe(200);
    const events = (again.body as EventProposalsResult).annotations.events;
    expect(events).toContainEqual({ ...firstProposal, origin: 'accepted' });
    // One event per side and frame: nothing doubled.
    expect(new Set(events.map((e) => `${e.side}:${e.frame}`)).size).toBe(events.length);
    expect(events.filter((e) => e.origin === 'proposed').length).toBe(current.events.filter((e) => e.origin === 'proposed').length - 1);
  });
});
