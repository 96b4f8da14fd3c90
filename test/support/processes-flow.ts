/**
 * Steps shared by the tests that run web servers and workers as processes (workers-apart,
 * several-servers): upload clips as a coach, kill a worker in the middle of an extraction, wait
 * until every clip is ready.
 */
import type { Db } from '../../server/db/knex';
import type { Client } from './test-app';
import type { WorkerProcess } from './server-process';

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
  const assessment = await c.post(`/api/athletes/${athleteId}/assessments`, {
    date: '2026-11-30',
    kind: 'baseline',
    surface: 'treadmill',
    speed: null,
    inclinePercent: null,
    shoes: null,
    cameraNotes: null,
    notes: null,
  });
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
