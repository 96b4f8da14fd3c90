/**
 * Durability of resumable uploads: the server is killed with SIGKILL while a PATCH is streaming;
 * a new server on the same database and uploads folder answers HEAD with the bytes it had kept,
 * the client continues from there, and the stored original's SHA-256 equals the source file's
 * (outside reference: the bytes on disk before upload). The clip then reaches `ready`.
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freePort, seededDir, serverProcess, type ServerProcess } from '../support/server-process';
import { sha256, tusCreate, tusHead, tusPatch, tusPatchHeld } from '../support/tus-client';
import { httpRequest, sessionJson, signIn } from '../bench/support/bench-server';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip } from './media/fixtures';
import { baselineVisit } from '../support/bodies';

const [, coach] = DEMO_SIGN_INS;
let dir: string;
let cleanup: () => Promise<void>;
let server: ServerProcess;

beforeAll(async () => {
  ({ dir, cleanup } = await seededDir('resumable-restart'));
  server = serverProcess(dir, await freePort());
});
afterAll(async () => {
  server?.killHard();
  await cleanup?.();
});

describe('SIGKILL mid-upload', () => {
  it('a restarted server resumes the upload from the kept offset; the stored original matches the source', async () => {
    const clip = await makeClip(path.join(dir, 'run.mp4'), { fps: 60, width: 640, height: 360, seconds: 4 });
    const size = fs.statSync(clip).size;
    await server.start();
    const base = server.url;
    const s = await signIn(base, coach.email, coach.password);
    const athletes = (await sessionJson<{ athletes: { id: number; lastName: string }[] }>(base, s, 'GET', '/api/athletes')).body.athletes;
    const ada = athletes.find((a) => a.lastName === 'Kestrel')!;
    const assessment = await sessionJson<{ id: number }>(base, s, 'POST', `/api/athletes/${ada.id}/assessments`, baselineVisit());
    const created = await tusCreate(base, s, assessment.body.id, size);
    expect(created.status).toBe(201);

    // 60 % on the wire, the request still open: then the plug is pulled.
    const held = await tusPatchHeld(s, created.location!, clip, 0, Math.floor(size * 0.6));
    await new Promise((r) => setTimeout(r, 500));
    server.killHard();
    held.drop();

    await server.start();
    // The session (stored in the database) and its CSRF token outlive the restart.
    const head = await tusHead(s, created.location!);
    expect(head.status).toBe(200);
    expect(head.offset).toBeGreaterThan(0);
    expect(head.offset).toBeLessThanOrEqual(Math.floor(size * 0.6));

    const done = await tusPatch(s, created.location!, clip, head.offset);
    expect(done.status, done.body).toBe(200);
    const made = JSON.parse(done.body) as { id: number };
    expect(await sha256(path.join(dir, 'uploads', 'clips', String(made.id), 'original.mp4'))).toBe(await sha256(clip));
    const id = created.location!.split('/').pop()!;
    expect(fs.readdirSync(path.join(dir, 'uploads', 'tmp', 'resumable'))).toEqual([`${id}.json`]);

    const t0 = Date.now();
    for (;;) {
      const res = await httpRequest(`${base}/api/clips/${made.id}`, { headers: { cookie: s.cookie } });
      const status = (JSON.parse(res.body) as { status: string }).status;
      if (status === 'ready') break;
      if (status === 'failed' || Date.now() - t0 > 120_000) throw new Error(`clip ended ${status}`);
      await new Promise((r) => setTimeout(r, 250));
    }
  }, 240_000);
});
