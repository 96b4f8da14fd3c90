/**
 * Drawing apart (`DRAW_APART`, what `npm start` runs): the web server's own worker takes every kind
 * but the drawing ones, and a worker process limited to them (`WORKER_KINDS=drawing`) draws stills
 * and visit summaries. While no drawing worker runs, a still and a summary wait queued (never
 * failed) as the progress stream shows; once one starts they end ready, their progress reaching the
 * stream through the web server; and the web process never mapped Skia (@napi-rs/canvas's native
 * module) into its memory — read from the kernel's `/proc/<pid>/maps`, which in the drawing worker
 * does list it (so the check can see it).
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeClip } from './media/fixtures';
import { coachFollowing, uploadClips, waitClipsReady } from '../support/processes-flow';
import {
  folderDb,
  freePort,
  seededDir,
  serverProcess,
  workerProcess,
  type ServerProcess,
  type WorkerProcess,
} from '../support/server-process';
import { onPostgres, titleSkippedWhen } from '../support/test-db';
import type { Db } from '../../server/db/knex';
import type { Client } from '../support/test-app';

let folder: { dir: string; cleanup: () => Promise<void> } | undefined;
let server: ServerProcess | undefined;
let worker: WorkerProcess | undefined;
let db: Db | undefined;

beforeAll(async () => {
  if (!onPostgres) folder = await seededDir('drawing-apart');
});
afterAll(async () => {
  worker?.killHard();
  server?.killHard();
  await db?.destroy();
  await folder?.cleanup();
});

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
/** Whether the process's memory maps name a file with `part` in it (a loaded shared library). */
const mapsName = (pid: number, part: string) => fs.readFileSync(`/proc/${pid}/maps`, 'utf8').toLowerCase().includes(part);

async function waitStatus(c: Client, url: string, want: string, withinMs = 90_000): Promise<Record<string, unknown>> {
  const t0 = Date.now();
  for (;;) {
    const body = (await c.get(url)).body as Record<string, unknown>;
    if (body['status'] === want) return body;
    if (body['status'] === 'failed') throw new Error(`${url} failed: ${JSON.stringify(body)}`);
    if (Date.now() - t0 > withinMs) throw new Error(`${url} still ${String(body['status'])}`);
    await sleep(250);
  }
}

describe('drawing apart from the web process', () => {
  it.skipIf(onPostgres)(
    titleSkippedWhen(
      onPostgres,
      'a still and a summary wait queued without a drawing worker, end ready with one, and the web process never loads Skia',
      'the kinds split is SQLite only: pg-boss offers every item to every worker',
    ),
    async () => {
      const { dir } = folder!;
      const file = await makeClip(path.join(dir, 'clip.mp4'), { fps: 60, width: 640, height: 360, seconds: 1 });
      server = serverProcess(dir, await freePort(), { DRAW_APART: 'true', WORKER_POLL_MS: '100' });
      await server.start();
      db = folderDb(dir);
      const { client: c, athleteId, stream } = await coachFollowing(server.url);

      // Frames are extracted by the web server's own worker (not a drawing kind).
      const [clipId] = await uploadClips(c, athleteId, [file]);
      await waitClipsReady(c, [clipId!], 120_000);
      const assessmentId = ((await c.get(`/api/clips/${clipId}`)).body as { assessmentId: number }).assessmentId;

      const still = await c.post(`/api/clips/${clipId}/stills`, { frameIndex: 5, caption: 'Toe-off', showAngles: true });
      expect(still.status).toBe(202);
      const summary = await c.post(`/api/assessments/${assessmentId}/summaries`, { findings: 'Apart', planText: '', stillIds: [] });
      expect(summary.status).toBe(202);
      const stillId = still.body.id as number;
      const summaryId = summary.body.id as number;

      // No drawing worker yet: both wait queued, untouched (no attempt used), and the stream says queued.
      await sleep(2_000);
      const waiting = await db('processed_items').whereIn('kind', ['render_still', 'render_summary']).orderBy('id');
      expect(waiting.map((r: { state: string; attempts: number }) => [r.state, r.attempts])).toEqual([
        ['queued', 0],
        ['queued', 0],
      ]);
      expect((await c.get(`/api/stills/${stillId}`)).body.status).toBe('rendering');
      expect(stream.events.some((e) => e.subject === 'still' && e.id === stillId && e.state === 'queued')).toBe(true);

      worker = workerProcess(dir, { WORKER_KINDS: 'drawing' });
      await worker.start();
      await waitStatus(c, `/api/stills/${stillId}`, 'ready');
      await waitStatus(c, `/api/summaries/${summaryId}`, 'ready');
      // The drawing worker's progress reached the coach's stream through the web server (the relay).
      await stream.waitFor((e) => e.subject === 'still' && e.id === stillId && e.state === 'ready', 10_000);
      const png = await c.agent.get(`/api/stills/${stillId}/image.png`).buffer(true);
      expect(png.status).toBe(200);

      expect(mapsName(worker.pid!, 'skia')).toBe(true);
      expect(mapsName(server.pid!, 'skia')).toBe(false);
      stream.close();
    },
    240_000,
  );
});
