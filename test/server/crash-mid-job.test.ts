/**
 * Crash safety of the long media jobs: a web server (no worker of its own) and a worker process
 * (`npm run worker`) over one database and uploads folder. The worker is killed with SIGKILL (with
 * its ffmpeg) in the middle of rendering an annotated clip, and again in the middle of following
 * markers; a new worker process is started. Each item ends ready on a later attempt; while it is
 * not, nothing half written is served; afterwards no partial file is left in the uploads folder.
 * References outside the project: ffprobe (Debian's) counts the served video's frames against the
 * slow-motion rule recomputed by hand ([calc]); the synthetic runner's ground truth (scripts/demo-clip)
 * gives the frame count and the marker positions.
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '../../server/db/knex';
import { Client } from '../support/test-app';
import {
  folderDb,
  freePort,
  seededDir,
  serverProcess,
  workerProcess,
  type ServerProcess,
  type WorkerProcess,
} from '../support/server-process';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { generateRunnerClip, type GroundTruth } from '../../scripts/demo-clip/clip';
import { marksFromTruth } from '../../scripts/demo-clip/demo-marks';
import type { ClipAnnotations, FrameLandmarks } from '../../src/contracts/annotations';
import { ffprobeCounted } from './media/fixtures';
import { NEAR_MARKERS } from './follow/follow-fixture';

const [, coach, , athlete] = DEMO_SIGN_INS;
let dir: string;
let cleanup: () => Promise<void>;
let server: ServerProcess;
let worker: WorkerProcess;
let db: Db;
let c: Client;
let truth: GroundTruth;
let clipId: number;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
/** One item at a time; a lease of 5 s, so a heartbeat held up on a loaded machine does not look like a dead worker. */
const WORKER_ENV = { WORKER_CONCURRENCY: '1', JOB_MAX_ATTEMPTS: '3', JOB_LEASE_SECONDS: '5' };

interface ItemRow {
  id: number;
  state: string;
  attempts: number;
  claimed_by: string | null;
  progress_done: number | null;
  error: string | null;
}

/** Every file under `folder`, relative to it. */
function filesUnder(folder: string): string[] {
  if (!fs.existsSync(folder)) return [];
  return (fs.readdirSync(folder, { recursive: true }) as string[]).filter((f) => fs.statSync(path.join(folder, f)).isFile()).sort();
}

/** Waits until the worker runs item `itemId` and has reported progress, then SIGKILLs it (and its ffmpeg). */
async function killMidJob(itemId: number): Promise<ItemRow> {
  const tag = `:${worker.pid}:`;
  const t0 = Date.now();
  for (;;) {
    const row = (await db('processed_items').where({ id: itemId }).first()) as ItemRow;
    if (row.state === 'running' && row.claimed_by?.includes(tag) && (row.progress_done ?? 0) > 0) {
      worker.killHard();
      return row;
    }
    if (row.state === 'ready' || row.state === 'failed') throw new Error(`item ${itemId} ended (${row.state}) before it could be killed`);
    if (Date.now() - t0 > 120_000) throw new Error(`item ${itemId} never reported progress`);
    await sleep(30);
  }
}

/** Waits until item `itemId` has ended. */
async function ended(itemId: number): Promise<ItemRow> {
  const t0 = Date.now();
  for (;;) {
    const row = (await db('processed_items').where({ id: itemId }).first()) as ItemRow;
    if (row.state === 'ready' || row.state === 'failed') return row;
    if (Date.now() - t0 > 240_000) throw new Error(`item ${itemId} did not end`);
    await sleep(200);
  }
}

beforeAll(async () => {
  ({ dir, cleanup } = await seededDir('crash-mid-job'));
  server = serverProcess(dir, await freePort(), { RUN_WORKER: 'false' });
  worker = workerProcess(dir, WORKER_ENV);
  await server.start();
  await worker.start();
  db = folderDb(dir);
  c = new Client(server.url);
  await c.signIn(coach.email, coach.password);
  const adaId = (await db('athletes').where({ email: athlete.email }).first()).id as number;
  const assessmentId = (await db('assessments').where({ athlete_id: adaId, kind: 'baseline' }).first()).id as number;
  const file = path.join(dir, 'runner.mp4');
  // Synthetic runner, 640×360 at 120 fps (the capture rate following is built for), 2 s = 240 frames.
  truth = await generateRunnerClip({ outFile: file, fps: 120, width: 640, height: 360, seconds: 2, hipExtensionDeg: 8, facing: 'right' });
  const up = await c.agent
    .post(`/api/assessments/${assessmentId}/clips`)
    .set('X-XSRF-TOKEN', await c.xsrf())
    .attach('file', file);
  expect(up.status, JSON.stringify(up.body)).toBe(201);
  clipId = up.body.id as number;
  const t0 = Date.now();
  while ((await c.get(`/api/clips/${clipId}`)).body.status !== 'ready') {
    if (Date.now() - t0 > 180_000) throw new Error('the clip never got ready');
    await sleep(250);
  }
  await c.patch(`/api/clips/${clipId}`, { nearSide: truth.nearSide, direction: 'left_to_right' });
}, 300_000);
afterAll(async () => {
  worker?.killHard();
  server?.killHard();
  await db?.destroy();
  await cleanup?.();
});

/** The clip's folder of annotated-clip videos. */
const annotatedDir = () => path.join(dir, 'uploads', 'clips', String(clipId), 'annotated');

/**
 * Asks for an annotated clip of the whole runner clip at 1/8 speed and SIGKILLs the worker once it
 * is rendering; by then ffmpeg's half-written file is in the clip's folder.
 */
async function renderKilledMidway(caption: string): Promise<{ id: number; item: ItemRow; videoUrl: string }> {
  const made = await c.post(`/api/clips/${clipId}/annotated-clips`, {
    fromFrame: 0,
    toFrame: 239,
    factor: 0.125,
    caption,
    showAngles: true,
  });
  expect(made.status, JSON.stringify(made.body)).toBe(202);
  const id = made.body.id as number;
  const item = (await db('processed_items').where({ kind: 'render_annotated_clip', subject_id: id }).first()) as ItemRow;
  await killMidJob(item.id);
  expect(filesUnder(annotatedDir())).toContain(`.${id}-v1.mp4.rendering`);
  return { id, item, videoUrl: made.body.videoUrl as string };
}

describe('a worker killed mid-job, and a new one started', () => {
  it('renders the annotated clip to ready on a later attempt; nothing half written is served or left', async () => {
    const marks = marksFromTruth(truth, 'events');
    const saved = await c.put(`/api/clips/${clipId}/annotations`, marks);
    expect(saved.status, JSON.stringify(saved.body).slice(0, 300)).toBe(200);
    const { id, item, videoUrl } = await renderKilledMidway('Hip drive at toe-off.');
    // Killed mid-render: ffmpeg's half-written file is in the clip's folder, but nothing serves it.
    expect((await c.get(`/api/annotated-clips/${id}`)).body.status).toBe('rendering');
    expect((await c.agent.get(videoUrl)).status).toBe(404);

    worker = workerProcess(dir, WORKER_ENV);
    await worker.start();
    const done = await ended(item.id);
    expect(done.state, done.error ?? '').toBe('ready');
    expect(done.attempts).toBeGreaterThanOrEqual(2);
    const clip = (await c.get(`/api/annotated-clips/${id}`)).body;
    expect(clip.status).toBe('ready');

    // The whole video: 240 frames of 120 fps at 1/8 show 15 a second; ⌈24 ÷ 15⌉ = 2 copies → 480 frames at 30 fps ([calc]).
    const res = await c.agent.get(clip.videoUrl as string).buffer(true);
    expect(res.status).toBe(200);
    const served = path.join(dir, 'served.mp4');
    fs.writeFileSync(served, res.body as Buffer);
    expect((await ffprobeCounted(served)).nbReadFrames).toBe(480);
    // Only the finished video is left: no partial file of the killed attempt.
    expect(filesUnder(annotatedDir())).toEqual([`${id}-v1.mp4`]);
  }, 400_000);

  it('removes the partial file of a render killed mid-way when its clip is deleted before another attempt', async () => {
    const { id, item } = await renderKilledMidway('');

    expect((await c.delete(`/api/annotated-clips/${id}`)).status).toBe(204);
    expect(filesUnder(annotatedDir()).filter((f) => f.startsWith(`${id}-`) || f.startsWith(`.${id}-`))).toEqual([]);
    // Its item is cancelled; a new worker (past the killed one's lease) finds nothing to finish and writes nothing.
    expect(((await db('processed_items').where({ id: item.id }).first()) as ItemRow).state).toBe('cancelled');
    worker = workerProcess(dir, WORKER_ENV);
    await worker.start();
    await sleep(7_000);
    expect(((await db('processed_items').where({ id: item.id }).first()) as ItemRow).state).toBe('cancelled');
    expect(filesUnder(annotatedDir()).filter((f) => f.startsWith(`${id}-`) || f.startsWith(`.${id}-`))).toEqual([]);
  }, 400_000);

  it('follows the markers to ready on a later attempt, saving the followed points once; no file is left behind', async () => {
    const before = filesUnder(path.join(dir, 'uploads'));
    const START = 20;
    const startRow: FrameLandmarks = {
      frame: START,
      side: truth.nearSide,
      points: Object.fromEntries(NEAR_MARKERS.map((k) => [k, truth.frames[START]!.landmarksNormalised.near[k]])),
    };
    const current = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations & { revision: number };
    const saved = await c.put(`/api/clips/${clipId}/annotations`, {
      baseRevision: current.revision,
      landmarks: [startRow],
      events: [],
      scale: null,
    });
    expect(saved.status, JSON.stringify(saved.body).slice(0, 300)).toBe(200);
    const started = await c.post(`/api/clips/${clipId}/follow`, { startFrame: START, from: 0, to: truth.frameCount - 1 });
    expect(started.status, JSON.stringify(started.body)).toBe(202);
    const itemId = started.body.itemId as number;
    await killMidJob(itemId);
    // Killed mid-following: nothing of it was saved.
    const midway = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    expect(midway.landmarks).toHaveLength(1);

    worker = workerProcess(dir, WORKER_ENV);
    await worker.start();
    const done = await ended(itemId);
    expect(done.state, done.error ?? '').toBe('ready');
    expect(done.attempts).toBeGreaterThanOrEqual(2);
    const read = (await c.get(`/api/clips/${clipId}/annotations`)).body as ClipAnnotations;
    // Every frame of the clip (the truth's frame count) has its near-side markers, saved once.
    expect(read.landmarks.filter((l) => l.side === truth.nearSide)).toHaveLength(truth.frameCount);
    expect(await db('audit_log').where({ action: 'clip.markers-followed' }).count({ n: '*' })).toEqual([{ n: 1 }]);
    expect(filesUnder(path.join(dir, 'uploads'))).toEqual(before);
  }, 400_000);
});
