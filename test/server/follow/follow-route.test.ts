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
});
