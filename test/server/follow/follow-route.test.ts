/**
 * Marker following through the API: a coach places the six near-side markers on one frame of a
 * synthetic runner clip (scripts/demo-clip — a synthetic fixture rendered with its ground truth,
 * not a real person), asks to follow them, and the processed item saves followed points with
 * their confidence. The reference is the generator's ground truth, not the follower's output.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { generateRunnerClip } from '../../../scripts/demo-clip/clip';
import type { GroundTruth } from '../../../scripts/demo-clip/ground-truth';
import { DEMO_SIGN_INS } from '../../../seeds/demo-scenario';
import type { ClipAnnotations, FrameLandmarks } from '../../../src/contracts/annotations';
import { makeTestApp, signedIn, type Client, type TestApp } from '../../support/test-app';
import { tempDir } from '../media/fixtures';
import { NEAR_MARKERS, quantile } from './follow-fixture';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let dir: { dir: string; cleanup: () => Promise<void> };
let clipId: number;
let truth: GroundTruth;
const START = 20;

beforeAll(async () => {
  dir = await tempDir('follow-route');
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  const assessmentId = (await t.db('assessments').where({ athlete_id: ada.id, kind: 'baseline' }).first()).id;
  const file = path.join(dir.dir, 'runner.mp4');
  // Synthetic fixture: 640×360 at 120 fps (the capture rate the follower is built for), 0.75 s,
  // facing right (the right side is near the camera).
  truth = await generateRunnerClip({
    outFile: file,
    fps: 120,
    width: 640,
    height: 360,
    seconds: 0.75,
    hipExtensionDeg: 8,
    facing: 'right',
  });
  const res = await c.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await c.xsrf())
    .attach('file', file);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  clipId = res.body.id;
  await t.worker!.idle();
}, 180_000);
afterAll(async () => {
  await t?.close();
  await dir?.cleanup();
});

const startRow = (): FrameLandmarks => ({
  frame: START,
  side: truth.nearSide,
  points: Object.fromEntries(NEAR_MARKERS.map((k) => [k, truth.frames[START]!.landmarksNormalised.near[k]])),
});

describe('POST /api/clips/:id/follow', () => {
  it('refuses a start frame without landmarks (422) and a range outside the clip (422), changing nothing', async () => {
    const none = await c.post(`/api/clips/${clipId}/follow`, { startFrame: START, from: 0, to: 89 });
    expect(none.status).toBe(422);
    expect(none.body.error.code).toBe('no_start_landmarks');
    const outside = await c.post(`/api/clips/${clipId}/follow`, { startFrame: START, from: 0, to: 600 });
    expect(outside.status).toBe(422);
    const reversed = await c.post(`/api/clips/${clipId}/follow`, { startFrame: 50, from: 0, to: 40 });
    expect(reversed.status).toBe(422);
    expect(await t.db('processed_items').where({ kind: 'follow_markers' }).count({ n: '*' })).toEqual([{ n: 0 }]);
  });

  it('a clip id the clinic does not hold answers 404 (other clinics: the access walk)', async () => {
    const other = await signedIn(t.app, owner.email, owner.password);
    expect((await other.post(`/api/clips/999999/follow`, { startFrame: 0, from: 0, to: 1 })).status).toBe(404);
  });

  it('follows the placed markers over the clip: followed points with confidence, median error ≤ 2 px and 95th percentile ≤ 5 px against the truth', async () => {
    const saved = await c.put(`/api/clips/${clipId}/annotations`, { baseRevision: 0, landmarks: [startRow()], events: [], scale: null });
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    const started = await c.post(`/api/clips/${clipId}/follow`, { startFrame: START, from: 0, to: truth.frameCount - 1 });
    expect(started.status, JSON.stringify(started.body)).toBe(202);
    expect(started.body.kind).toBe('follow_markers');
    expect((await c.post(`/api/clips/${clipId}/follow`, { startFrame: START, from: 0, to: 30 })).body.error?.code).toBe('follow_running');
    await t.worker!.idle();
    const item = await t.db('processed_items').where({ id: started.body.itemId }).first();
    expect(item.state, item.error).toBe('ready');
    expect(item.progress_done).toBe(item.progress_total);

    const read = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    const rows = read.landmarks.filter((l) => l.side === truth.nearSide);
    expect(rows).toHaveLength(truth.frameCount);
    const errors: number[] = [];
    const missing: string[] = [];
    for (const row of rows) {
      for (const k of NEAR_MARKERS) {
        const p = row.points[k];
        if (!p) {
          missing.push(`${row.frame} ${k}`);
          continue;
        }
        if (row.frame === START) {
          expect(p.origin).toBe('placed');
          continue;
        }
        expect(p.origin).toBe('followed');
        expect(p.confidence).toBeGreaterThanOrEqual(0);
        expect(p.confidence).toBeLessThanOrEqual(1);
        const want = truth.frames[row.frame]!.landmarks.near[k];
        errors.push(Math.hypot(p.x * truth.width - want.x, p.y * truth.height - want.y));
      }
    }
    expect(missing).toEqual([]);
    expect(quantile(errors, 0.5)).toBeLessThanOrEqual(2);
    expect(quantile(errors, 0.95)).toBeLessThanOrEqual(5);
    const audit = await t.db('audit_log').where({ action: 'clip.markers-followed' }).first();
    expect(audit).toBeTruthy();
  });

  it('a correction on a followed frame resumes following from it: the corrected point stays placed, the frames after it are followed again, the frames before it stay', async () => {
    const CORRECTED = 50;
    const last = truth.frameCount - 1;
    const before = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    // The coach finds the knee drifted from frame 50 on (shifted 12 px here) and drags it back onto its marker there.
    const knee = truth.frames[CORRECTED]!.landmarksNormalised.near.knee;
    const landmarks = before.landmarks.map((row) => {
      if (row.side !== truth.nearSide || row.frame < CORRECTED) return row;
      const k = row.points.knee!;
      const point =
        row.frame === CORRECTED
          ? { x: knee.x, y: knee.y, origin: 'placed' as const }
          : { ...k, x: k.x + 12 / truth.width, confidence: 0.3 };
      return { ...row, points: { ...row.points, knee: point } };
    });
    const saved = await c.put(`/api/clips/${clipId}/annotations`, { baseRevision: before.revision, landmarks, events: [], scale: null });
    expect(saved.status, JSON.stringify(saved.body)).toBe(200);
    const started = await c.post(`/api/clips/${clipId}/follow`, { startFrame: CORRECTED, from: CORRECTED, to: last });
    expect(started.status, JSON.stringify(started.body)).toBe(202);
    await t.worker!.idle();

    const after = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    const row = (f: number, a: ClipAnnotations) => a.landmarks.find((l) => l.frame === f && l.side === truth.nearSide)!;
    expect(row(CORRECTED, after).points.knee).toMatchObject({ x: knee.x, y: knee.y, origin: 'placed' });
    for (let f = 0; f < CORRECTED; f++) expect(row(f, after).points, `frame ${f} untouched`).toEqual(row(f, before).points);
    const errors: number[] = [];
    for (let f = CORRECTED + 1; f <= last; f++) {
      const p = row(f, after).points.knee!;
      expect(p.origin).toBe('followed');
      const want = truth.frames[f]!.landmarks.near.knee;
      errors.push(Math.hypot(p.x * truth.width - want.x, p.y * truth.height - want.y));
    }
    // Against the generator's truth: back on the marker (the 12 px drift is gone).
    expect(quantile(errors, 0.5)).toBeLessThanOrEqual(2);
    expect(quantile(errors, 0.95)).toBeLessThanOrEqual(5);
  });

  it('a clip not ready answers 409, a clip filmed without markers 422 naming it; nothing is queued or changed', async () => {
    const read = async () => (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    const items = async () => (await t.db('processed_items').where({ kind: 'follow_markers' }).count({ n: '*' }))[0];
    const countBefore = await items();
    const before = await read();
    await t.db('clips').where({ id: clipId }).update({ status: 'queued' });
    const notReady = await c.post(`/api/clips/${clipId}/follow`, { startFrame: START, from: 0, to: 30 });
    await t.db('clips').where({ id: clipId }).update({ status: 'ready' });
    expect(notReady.status).toBe(409);
    expect(notReady.body.error.code).toBe('clip_not_ready');

    // Synthetic fixture without tape markers (tapeMarkers: false): the landmarks sit on bare skin and clothes.
    const bareFile = path.join(dir.dir, 'bare.mp4');
    const bareTruth = await generateRunnerClip({
      outFile: bareFile,
      fps: 120,
      width: 640,
      height: 360,
      seconds: 0.25,
      hipExtensionDeg: 8,
      facing: 'right',
      tapeMarkers: false,
    });
    const assessmentId = (await t.db('clips').where({ id: clipId }).first()).assessment_id;
    const up = await c.agent
      .post(`/api/assessments/${assessmentId}/clips`)
      .set('X-XSRF-TOKEN', await c.xsrf())
      .attach('file', bareFile);
    expect(up.status).toBe(201);
    await t.worker!.idle();
    const bareRow = {
      frame: 0,
      side: bareTruth.nearSide,
      points: Object.fromEntries(NEAR_MARKERS.map((k) => [k, bareTruth.frames[0]!.landmarksNormalised.near[k]])),
    };
    expect(
      (await c.put(`/api/clips/${up.body.id}/annotations`, { baseRevision: 0, landmarks: [bareRow], events: [], scale: null })).status,
    ).toBe(200);
    const bare = await c.post(`/api/clips/${up.body.id}/follow`, { startFrame: 0, from: 0, to: bareTruth.frameCount - 1 });
    expect(bare.status).toBe(422);
    expect(bare.body.error.code).toBe('no_markers_found');
    expect(bare.body.error.message).toMatch(/tape marker.*Nothing was changed/);
    expect((await c.get(`/api/clips/${up.body.id}/annotations`)).body.landmarks).toHaveLength(1);
    expect(await items()).toEqual(countBefore);
    expect((await read()).revision).toBe(before.revision);
  });

  it('Cancel stops a follow: the item is cancelled, nothing it followed is saved, the landmarks stay as they were; cancelling again answers 409', async () => {
    await t.worker!.stop(); // the follow stays queued, so the cancel meets it for certain
    const before = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    const started = await c.post(`/api/clips/${clipId}/follow`, { startFrame: START, from: 0, to: truth.frameCount - 1 });
    expect(started.status).toBe(202);
    const cancelled = await c.post(`/api/clips/${clipId}/follow/cancel`, {});
    expect(cancelled.status).toBe(200);
    expect(cancelled.body).toEqual({ cancelled: 1 });
    expect((await t.db('processed_items').where({ id: started.body.itemId }).first()).state).toBe('cancelled');
    const after = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    expect(after.revision).toBe(before.revision);
    expect(after.landmarks).toEqual(before.landmarks);
    const again = await c.post(`/api/clips/${clipId}/follow/cancel`, {});
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('follow_not_running');
  });
});
