/**
 * Workers apart: one web server (no worker of its own) and two worker processes (`npm run worker`)
 * over the same database and uploads folder. Three clips are uploaded; one worker is killed with
 * SIGKILL (with its ffmpeg) in the middle of an extraction. Every clip ends ready with every
 * frame, as counted by ffprobe -count_frames (outside reference); the killed worker's item is
 * taken over by the other once its lease ran out; and progress made in the worker processes
 * reaches the athlete's progress stream through the web server.
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '../../server/db/knex';
import { Client } from '../support/test-app';
import { followProcessingEvents } from '../support/event-stream';
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
import { ffprobeCounted, makeClip } from './media/fixtures';
import { killMidExtraction, uploadClips, waitClipsReady, type ItemRow } from '../support/processes-flow';

const [, coach] = DEMO_SIGN_INS;
let dir: string;
let cleanup: () => Promise<void>;
let server: ServerProcess;
let workers: WorkerProcess[] = [];
let db: Db;

beforeAll(async () => {
  ({ dir, cleanup } = await seededDir('workers-apart'));
  server = serverProcess(dir, await freePort(), { RUN_WORKER: 'false' });
  // One item at a time each, so the three clips are shared out between the two. A lease of 5 s
  // (renewed every 1.7 s): a heartbeat held up on a loaded machine does not look like a dead worker.
  workers = [0, 1].map(() => workerProcess(dir, { WORKER_CONCURRENCY: '1', JOB_MAX_ATTEMPTS: '3', JOB_LEASE_SECONDS: '5' }));
});
afterAll(async () => {
  for (const w of workers) w.killHard();
  server?.killHard();
  await db?.destroy();
  await cleanup?.();
});

describe('one web server and two worker processes', () => {
  it('every clip ends ready with every frame after a worker is killed mid-extraction', async () => {
    const files = await Promise.all(
      [1, 2, 3].map((n) => makeClip(path.join(dir, `clip-${n}.mp4`), { fps: 120, width: 1280, height: 720, seconds: 4 })),
    );
    await server.start();
    await Promise.all(workers.map((w) => w.start()));
    db = folderDb(dir);
    const c = new Client(server.url);
    await c.signIn(coach.email, coach.password);
    const athletes = (await c.get('/api/athletes')).body.athletes as { id: number; lastName: string }[];
    const ada = athletes.find((a) => a.lastName === 'Kestrel')!;
    const stream = await followProcessingEvents(`${server.url}/api/athletes/${ada.id}/processing-events`, c.cookieHeader());
    const clipIds = await uploadClips(c, ada.id, files);

    // Kill the first worker once it has written frames of a clip.
    const victim = workers[0]!;
    const tag = `:${victim.pid}:`;
    const killed = await killMidExtraction(db, victim);

    const ready = await waitClipsReady(c, clipIds);
    for (const [i, id] of clipIds.entries()) {
      const ref = await ffprobeCounted(files[i]!);
      expect(ready.get(id)!.frameCount).toBe(ref.nbReadFrames);
      const frames = fs.readdirSync(path.join(dir, 'uploads', 'clips', String(id), 'frames'));
      expect(frames).toHaveLength(ref.nbReadFrames);
    }
    // The killed attempt's item was taken over by the other worker: another attempt, not a new item.
    const takenOver = (await db('processed_items').where({ id: killed.id }).first()) as ItemRow;
    expect(takenOver.state).toBe('ready');
    expect(takenOver.attempts).toBeGreaterThanOrEqual(2);
    expect(takenOver.claimed_by).not.toContain(tag);
    const items = await db('processed_items').where({ kind: 'extract_frames' }).whereIn('subject_id', clipIds);
    expect(items).toHaveLength(clipIds.length);

    // Progress made in the worker processes reached the athlete's stream through the web server.
    for (const id of clipIds) {
      await stream.waitFor((e) => e.subject === 'clip' && e.id === id && e.state === 'ready', 10_000);
      expect(stream.events.some((e) => e.subject === 'clip' && e.id === id && e.state === 'running' && (e.progress?.done ?? 0) > 0)).toBe(
        true,
      );
    }
    stream.close();
  }, 420_000);
});
