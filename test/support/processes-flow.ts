/**
 * Steps shared by the tests that run web servers and workers as processes (workers-apart,
 * several-servers): start web servers and two workers over one seeded folder, make three clips,
 * follow an athlete's progress as the coach, upload the clips, kill a worker in the middle of an
 * extraction, wait until every clip is ready.
 */
import path from 'node:path';
import type { Db } from '../../server/db/knex';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip } from '../server/media/fixtures';
import { followProcessingEvents, type FollowedStream } from './event-stream';
import { folderDb, freePort, seededDir, serverProcess, workerProcess, type ServerProcess, type WorkerProcess } from './server-process';
import { Client } from './test-app';
import { baselineVisit } from './bodies';

/** Web servers with no worker of their own and two worker processes, over one seeded folder. */
export interface ProcessesApart {
  /** The seeded folder (its database, its uploads folder). */
  readonly dir: string;
  readonly servers: ServerProcess[];
  readonly workers: WorkerProcess[];
  /**
   * Starts `webServers` servers and two workers, one after another (four processes compiling at
   * once on a loaded machine start slowly), with `env` besides the folder's; answers the folder's
   * database as the processes see it.
   */
  start(webServers: number, env?: Record<string, string>): Promise<Db>;
  /** SIGKILLs every process, closes the database and removes the folder. */
  stop(): Promise<void>;
}

/** A seeded folder for {@link ProcessesApart} (`prefix` names its temp folder). */
export async function processesApart(prefix: string): Promise<ProcessesApart> {
  const { dir, cleanup } = await seededDir(prefix);
  const servers: ServerProcess[] = [];
  const workers: WorkerProcess[] = [];
  let db: Db | undefined;
  return {
    dir,
    servers,
    workers,
    async start(webServers, env = {}) {
      for (let i = 0; i < webServers; i++) servers.push(serverProcess(dir, await freePort(), { RUN_WORKER: 'false', ...env }));
      // One item at a time each, so the three clips are shared out between the two. A lease of 5 s
      // (renewed every 1.7 s): a heartbeat held up on a loaded machine does not look like a dead worker.
      const workerEnv = { WORKER_CONCURRENCY: '1', JOB_MAX_ATTEMPTS: '3', JOB_LEASE_SECONDS: '5', ...env };
      for (let i = 0; i < 2; i++) workers.push(workerProcess(dir, workerEnv));
      for (const s of servers) await s.start();
      for (const w of workers) await w.start();
      db = folderDb(dir);
      return db;
    },
    async stop() {
      for (const w of workers) w.killHard();
      for (const s of servers) s.killHard();
      await db?.destroy();
      await cleanup();
    },
  };
}

/** Three 4 s clips at 120 fps, 1280×720 (about 480 frames each: long enough to kill a worker in one). */
export function threeClips(dir: string): Promise<string[]> {
  return Promise.all([1, 2, 3].map((n) => makeClip(path.join(dir, `clip-${n}.mp4`), { fps: 120, width: 1280, height: 720, seconds: 4 })));
}

/** The demo coach signed in on `url`, following the progress stream of the demo athlete Kestrel there. */
export async function coachFollowing(url: string): Promise<{ client: Client; athleteId: number; stream: FollowedStream }> {
  const [, coach] = DEMO_SIGN_INS;
  const client = new Client(url);
  await client.signIn(coach!.email, coach!.password);
  const athletes = (await client.get('/api/athletes')).body.athletes as { id: number; lastName: string }[];
  const athleteId = athletes.find((x) => x.lastName === 'Kestrel')!.id;
  const stream = await followProcessingEvents(`${url}/api/athletes/${athleteId}/processing-events`, client.cookieHeader());
  return { client, athleteId, stream };
}

/** Whether `stream` showed clip `id` running with frames done, then ready (waits up to 10 s for ready). */
export async function sawClipToReady(stream: FollowedStream, id: number): Promise<boolean> {
  await stream.waitFor((e) => e.subject === 'clip' && e.id === id && e.state === 'ready', 10_000);
  return stream.events.some((e) => e.subject === 'clip' && e.id === id && e.state === 'running' && (e.progress?.done ?? 0) > 0);
}

/** The `processed_items` columns these tests read. */
export interface ItemRow {
  id: number;
  subject_id: number;
  state: string;
  attempts: number;
  claimed_by: string | null;
  progress_done: number | null;
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Makes an assessment for the athlete and uploads `files` to it one after another; answers the clip ids. */
export async function uploadClips(c: Client, athleteId: number, files: string[]): Promise<number[]> {
  const assessment = await c.post(`/api/athletes/${athleteId}/assessments`, baselineVisit());
  const clipIds: number[] = [];
  for (const file of files) {
    const up = await c.agent
      .post(`/api/assessments/${assessment.body.id}/clips`)
      .set('X-XSRF-TOKEN', await c.xsrf())
      .attach('file', file);
    if (up.status !== 201) throw new Error(`upload answered ${up.status}: ${JSON.stringify(up.body)}`);
    clipIds.push(up.body.id as number);
  }
  return clipIds;
}

/** Waits until `victim` has written frames of a clip, then SIGKILLs it (with its ffmpeg); answers that item's row. */
export async function killMidExtraction(db: Db, victim: WorkerProcess, withinMs = 120_000): Promise<ItemRow> {
  const tag = `:${victim.pid}:`;
  const t0 = Date.now();
  for (;;) {
    const rows = (await db('processed_items').where({ kind: 'extract_frames', state: 'running' })) as ItemRow[];
    const hit = rows.find((r) => r.claimed_by?.includes(tag) && (r.progress_done ?? 0) > 0);
    if (hit) {
      victim.killHard();
      return hit;
    }
    if (Date.now() - t0 > withinMs) throw new Error('the worker never got to extract frames');
    await sleep(50);
  }
}

/** Polls the clips through `c` until each is ready (throws when one fails); answers them by id. */
export async function waitClipsReady(
  c: Client,
  clipIds: number[],
  withinMs = 240_000,
): Promise<Map<number, { status: string; frameCount: number }>> {
  const ready = new Map<number, { status: string; frameCount: number }>();
  const t0 = Date.now();
  while (ready.size < clipIds.length) {
    for (const id of clipIds) {
      const clip = (await c.get(`/api/clips/${id}`)).body;
      if (clip.status === 'failed') throw new Error(`clip ${id} failed: ${clip.error}`);
      if (clip.status === 'ready') ready.set(id, clip);
    }
    if (Date.now() - t0 > withinMs) throw new Error(`only ${ready.size} of ${clipIds.length} clips got ready`);
    await sleep(250);
  }
  return ready;
}
