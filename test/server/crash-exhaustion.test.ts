/**
 * Durability when every attempt is cut short: the server (with its ffmpeg) is killed with SIGKILL
 * during the extraction of one clip three times in a row, using up the job's three attempts. After
 * the next start the clip must not stay "extracting": it ends `failed` with a reason, and Retry
 * brings it to `ready` with every frame, as counted by ffprobe -count_frames (outside reference).
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { uploadToNewVisit } from '../support/bodies';
import { Client } from '../support/test-app';
import { folderDb, freePort, seededDir, serverProcess, type ServerProcess } from '../support/server-process';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { ffprobeCounted, makeClip } from './media/fixtures';

const [, coach] = DEMO_SIGN_INS;
let dir: string;
let cleanup: () => Promise<void>;
let server: ServerProcess;

beforeAll(async () => {
  ({ dir, cleanup } = await seededDir('crash-exhaustion'));
  server = serverProcess(dir, await freePort(), { JOB_MAX_ATTEMPTS: '3' });
});
afterAll(async () => {
  server?.killHard();
  await cleanup?.();
});

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function signedInClient(): Promise<Client> {
  const c = new Client(server.url);
  await c.signIn(coach.email, coach.password);
  return c;
}

/** Polls the clip until `done` says so. */
async function waitFor(
  c: Client,
  clipId: number,
  what: string,
  done: (clip: { status: string; progress: { done: number } | null }) => boolean,
  ms = 120_000,
) {
  const t0 = Date.now();
  for (;;) {
    const clip = (await c.get(`/api/clips/${clipId}`)).body;
    if (done(clip)) return clip;
    if (Date.now() - t0 > ms) throw new Error(`waited for ${what}; clip is ${clip.status}`);
    await sleep(50);
  }
}

/** Polls the processed item until attempt `n` of the clip's extraction is running. */
async function waitForAttempt(n: number, ms = 60_000): Promise<void> {
  const t0 = Date.now();
  const db = folderDb(dir);
  try {
    for (;;) {
      const row = (await db('processed_items').where({ kind: 'extract_frames' }).orderBy('id', 'desc').first()) as
        { state: string; attempts: number } | undefined;
      if (row && row.state === 'running' && row.attempts === n) return;
      if (Date.now() - t0 > ms) throw new Error(`waited for attempt ${n} of the extraction`);
      await sleep(50);
    }
  } finally {
    await db.destroy();
  }
}

describe('kill -9 during every attempt of one extraction', () => {
  it('the clip ends failed with a reason after the third kill, and Retry brings it to ready', async () => {
    const clipFile = await makeClip(path.join(dir, 'long.mp4'), { fps: 120, width: 1280, height: 720, seconds: 6 });
    await server.start();
    let c = await signedInClient();
    const athletes = (await c.get('/api/athletes')).body.athletes as { id: number; lastName: string }[];
    const ada = athletes.find((a) => a.lastName === 'Kestrel')!;
    const clipId = await uploadToNewVisit(c, ada.id, clipFile);

    for (let kill = 1; kill <= 3; kill++) {
      if (kill > 1) {
        await server.start();
        c = await signedInClient();
      }
      // The restarted server claims the job again only once the killed attempt's lease ran out:
      // wait for attempt number `kill` to be running, not for the clip's progress of an earlier one.
      await waitForAttempt(kill);
      await waitFor(c, clipId, `extraction (attempt ${kill})`, (clip) => {
        if (clip.status === 'ready' || clip.status === 'failed') throw new Error(`clip ended ${clip.status} before kill ${kill}`);
        return clip.status === 'extracting' && (clip.progress?.done ?? 0) > 0;
      });
      server.killHard();
    }

    await server.start();
    c = await signedInClient();
    const failed = await waitFor(c, clipId, 'the clip to fail', (clip) => clip.status === 'failed' || clip.status === 'ready');
    expect(failed.status).toBe('failed');
    expect((failed as unknown as { error: string }).error).toMatch(/interrupted 3 times/);

    const retry = await c.post(`/api/clips/${clipId}/retry`);
    expect(retry.status, JSON.stringify(retry.body)).toBe(202);
    const ready = await waitFor(c, clipId, 'ready after Retry', (clip) => clip.status === 'ready' || clip.status === 'failed');
    const ref = await ffprobeCounted(clipFile);
    expect(ready.status).toBe('ready');
    expect((ready as unknown as { frameCount: number }).frameCount).toBe(ref.nbReadFrames);
  }, 420_000);
});
