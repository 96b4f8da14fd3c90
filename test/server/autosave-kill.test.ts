/**
 * Durability of autosave: a real server process (SQLite in WAL with synchronous=NORMAL) answers a
 * run of annotation saves and is killed with SIGKILL while one is in flight. Read straight from the
 * database file afterwards, every save it acknowledged (200) is there: its revision in the audit
 * log, the clip at that revision or the one after it (a save committed but not yet answered), and
 * the stored points those of the matching save. A commit is in the WAL file before its answer is
 * sent; only a power loss could drop the last ones (synchronous=NORMAL syncs at checkpoints).
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client } from '../support/test-app';
import { folderDb, freePort, seededDir, serverProcess, type ServerProcess } from '../support/server-process';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import type { ClipAnnotationsWrite } from '../../src/contracts/annotations';
import { makeClip } from './media/fixtures';

const [, coach] = DEMO_SIGN_INS;
let dir: string;
let cleanup: () => Promise<void>;
let server: ServerProcess;

beforeAll(async () => {
  ({ dir, cleanup } = await seededDir('autosave-kill'));
  server = serverProcess(dir, await freePort());
});
afterAll(async () => {
  server?.killHard();
  await cleanup?.();
});

/** The document of save `n`: the right hip moved to a position that names the save. */
const docOf = (baseRevision: number, n: number): ClipAnnotationsWrite => ({
  baseRevision,
  landmarks: [
    { frame: 2, side: 'right', points: { hip: { x: 0.1 + n / 10_000, y: 0.4 }, knee: { x: 0.5, y: 0.6 } } },
    { frame: 5, side: 'left', points: { hip: { x: 0.3, y: 0.4 } } },
  ],
  events: [],
  scale: null,
  gauges: [],
});

describe('kill -9 during autosave', () => {
  it('every acknowledged save is in the database after the process is killed mid-save', async () => {
    const clipFile = await makeClip(path.join(dir, 'short.mp4'), { fps: 30, width: 160, height: 90, seconds: 1 });
    await server.start();
    const c = new Client(server.url);
    await c.signIn(coach.email, coach.password);
    const athletes = (await c.get('/api/athletes')).body.athletes as { id: number; lastName: string }[];
    const ada = athletes.find((a) => a.lastName === 'Kestrel')!;
    const visits = (await c.get(`/api/athletes/${ada.id}/assessments`)).body.assessments as { id: number }[];
    const up = await c.agent
      .post(`/api/assessments/${visits[0]!.id}/clips`)
      .set('X-XSRF-TOKEN', await c.xsrf())
      .attach('file', clipFile);
    expect(up.status).toBe(201);
    const clipId = up.body.id as number;
    for (const t0 = Date.now(); (await c.get(`/api/clips/${clipId}`)).body.status !== 'ready';) {
      if (Date.now() - t0 > 120_000) throw new Error('the clip never became ready');
      await new Promise((r) => setTimeout(r, 200));
    }

    // Saves one after another; the kill lands while the 25th is on its way.
    const acked: { revision: number; n: number }[] = [];
    let revision = 0;
    for (let n = 1; n <= 25; n++) {
      const pending = c.put(`/api/clips/${clipId}/annotations`, docOf(revision, n));
      if (n === 25) {
        await new Promise((r) => setTimeout(r, 2));
        server.killHard();
        await pending.catch(() => undefined);
        break;
      }
      const res = await pending;
      expect(res.status).toBe(200);
      revision = res.body.revision as number;
      acked.push({ revision, n });
    }
    expect(acked).toHaveLength(24);

    const db = folderDb(dir);
    try {
      const audited = await db('audit_log').where({ action: 'clip.annotated' }).select<{ detail: string }[]>('detail');
      const revisions = new Set(audited.map((r) => (JSON.parse(r.detail) as { revision: number }).revision));
      for (const a of acked) expect(revisions.has(a.revision)).toBe(true);
      const stored = (await db('clips').where({ id: clipId }).first<{ annotation_revision: number }>('annotation_revision'))!;
      const last = acked.at(-1)!;
      // The last answered save, or the unanswered one after it if it committed before the kill.
      expect([last.revision, last.revision + 1]).toContain(stored.annotation_revision);
      const n = stored.annotation_revision === last.revision ? last.n : 25;
      const hip = await db('clip_landmarks').where({ clip_id: clipId, frame: 2, side: 'right', landmark: 'hip' }).first<{ x: number }>('x');
      expect(hip?.x).toBeCloseTo(0.1 + n / 10_000, 9);
    } finally {
      await db.destroy();
    }
  }, 240_000);
});
