/**
 * Several machines' worth of processes on one PostgreSQL database: two web servers (A and B, no
 * worker of their own) and two worker processes (`npm run worker`) sharing the media folder. A coach
 * signed in on A uploads three clips and follows the athlete's progress stream on A; one worker is
 * killed with SIGKILL in the middle of an extraction. Every clip ends ready with every frame (counted
 * by ffprobe -count_frames, the outside reference), the items came to the workers through pg-boss,
 * and the stream on A showed each clip's progress (made in the worker processes, so carried by
 * LISTEN/NOTIFY: on PostgreSQL no process reads the table for it) up to ready. The session made on A
 * is honoured by B (sessions live in the database).
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Db } from '../../server/db/knex';
import { BOSS_SCHEMA, ITEMS_QUEUE } from '../../server/processing/item-dispatch';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { followProcessingEvents } from '../support/event-stream';
import { killMidExtraction, uploadClips, waitClipsReady } from '../support/processes-flow';
import {
  folderDb,
  freePort,
  seededDir,
  serverProcess,
  workerProcess,
  type ServerProcess,
  type WorkerProcess,
} from '../support/server-process';
import { Client } from '../support/test-app';
import { onPostgres, titleSkippedWhen } from '../support/test-db';
import { ffprobeCounted, makeClip } from './media/fixtures';

const [, coach] = DEMO_SIGN_INS;
let dir: string;
let cleanup: (() => Promise<void>) | undefined;
let servers: ServerProcess[] = [];
let workers: WorkerProcess[] = [];
let db: Db | undefined;

beforeAll(async () => {
  if (!onPostgres) return;
  ({ dir, cleanup } = await seededDir('several-servers'));
  servers = [await freePort(), await freePort()].map((port) => serverProcess(dir, port, { RUN_WORKER: 'false' }));
  // One item at a time each; a lease of 5 s so a heartbeat held up on a loaded machine does not look like a dead worker.
  workers = [0, 1].map(() => workerProcess(dir, { WORKER_CONCURRENCY: '1', JOB_MAX_ATTEMPTS: '3', JOB_LEASE_SECONDS: '5' }));
});
afterAll(async () => {
  for (const w of workers) w.killHard();
  for (const s of servers) s.killHard();
  await db?.destroy();
  await cleanup?.();
});

describe('two web servers and two workers on PostgreSQL', () => {
  it.skipIf(!onPostgres)(
    titleSkippedWhen(
      !onPostgres,
      'a coach on server A follows three clips to ready while a worker is killed mid-extraction',
      'needs DATABASE_URL: runs in the PostgreSQL run of the suite',
    ),
    async () => {
      const files = await Promise.all(
        [1, 2, 3].map((n) => makeClip(path.join(dir, `clip-${n}.mp4`), { fps: 120, width: 1280, height: 720, seconds: 4 })),
      );
      // One after another: four processes compiling at once on a loaded machine start slowly.
      for (const s of servers) await s.start();
      for (const w of workers) await w.start();
      const [a, b] = servers as [ServerProcess, ServerProcess];
      db = folderDb(dir);
      const onA = new Client(a.url);
      await onA.signIn(coach.email, coach.password);
      const athletes = (await onA.get('/api/athletes')).body.athletes as { id: number; lastName: string }[];
      const ada = athletes.find((x) => x.lastName === 'Kestrel')!;
      const stream = await followProcessingEvents(`${a.url}/api/athletes/${ada.id}/processing-events`, onA.cookieHeader());
      const clipIds = await uploadClips(onA, ada.id, files);

      const killed = await killMidExtraction(db, workers[0]!);
      const ready = await waitClipsReady(onA, clipIds);
      for (const [i, id] of clipIds.entries()) {
        expect(ready.get(id)!.frameCount).toBe((await ffprobeCounted(files[i]!)).nbReadFrames);
      }
      const takenOver = await db('processed_items').where({ id: killed.id }).first();
      expect(takenOver.state).toBe('ready');
      expect(takenOver.attempts).toBeGreaterThanOrEqual(2);

      // The items travelled as pg-boss jobs (one per clip at least; the killed one was offered again or swept).
      const jobs = await db.raw(`select count(*) as n from ${BOSS_SCHEMA}.job where name = ?`, [ITEMS_QUEUE]);
      const archived = await db.raw(`select count(*) as n from ${BOSS_SCHEMA}.archive where name = ?`, [ITEMS_QUEUE]);
      expect(Number(jobs.rows[0].n) + Number(archived.rows[0].n)).toBeGreaterThanOrEqual(clipIds.length);

      // The coach on A saw every clip's progress, made in the worker processes, up to ready.
      for (const id of clipIds) {
        await stream.waitFor((e) => e.subject === 'clip' && e.id === id && e.state === 'ready', 10_000);
        const progress = stream.events.filter((e) => e.subject === 'clip' && e.id === id && e.state === 'running' && e.progress);
        expect(progress.some((e) => e.progress!.done > 0)).toBe(true);
      }
      stream.close();

      // B honours the session signed in on A, and serves the same clip.
      const onB = new Client(b.url);
      const cookie = onA.cookieHeader();
      const clipOnB = await onB.agent.get(`/api/clips/${clipIds[0]}`).set('Cookie', cookie);
      expect(clipOnB.status).toBe(200);
      expect(clipOnB.body.status).toBe('ready');
    },
    420_000,
  );
});
