/**
 * Claims on resumable uploads (`resumable_upload_claims`) left by a server killed while it was
 * making an upload into a clip. Before, such a row stayed until its lease ran out (the retried
 * upload answered 423 meanwhile) and for ever when nobody asked again; now the claim of a process
 * that is gone is taken over at once, and the sweep removes lapsed and dead claims.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { folderDb, freePort, seededDir, serverProcess, type ServerProcess } from '../support/server-process';
import { sha256, tusCreate, tusHead } from '../support/tus-client';
import { sessionJson, signIn } from '../bench/support/bench-server';
import { openTestDb, type TestDb } from '../support/test-db';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip } from './media/fixtures';
import { baselineVisit } from '../support/bodies';
import { uploadClaims } from '../../server/clips/upload-claims';

const [, coach] = DEMO_SIGN_INS;
const inSeconds = (s: number) => new Date(Date.now() + s * 1000).toISOString();
/** A process id no process has here (a killed server's). */
function deadPid(): number {
  for (let pid = 4_000_000; ; pid--) {
    try {
      process.kill(pid, 0);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ESRCH') return pid;
    }
  }
}

describe('a server killed while making an upload into a clip', () => {
  let dir: string;
  let cleanup: () => Promise<void>;
  let server: ServerProcess;

  beforeAll(async () => {
    ({ dir, cleanup } = await seededDir('claims-sweep'));
    server = serverProcess(dir, await freePort());
  });
  afterAll(async () => {
    server?.killHard();
    await cleanup?.();
  });

  it('leaves a claim that the restarted server takes over at once: the retried upload completes with its clip', async () => {
    const clip = await makeClip(path.join(dir, 'run.mp4'), { fps: 30, width: 320, height: 180, seconds: 2 });
    const size = fs.statSync(clip).size;
    await server.start();
    const s = await signIn(server.url, coach.email, coach.password);
    const athletes = (await sessionJson<{ athletes: { id: number; lastName: string }[] }>(server.url, s, 'GET', '/api/athletes')).body
      .athletes;
    const ada = athletes.find((x) => x.lastName === 'Kestrel')!;
    const assessment = (await sessionJson<{ id: number }>(server.url, s, 'POST', `/api/athletes/${ada.id}/assessments`, baselineVisit()))
      .body;
    const created = await tusCreate(server.url, s, assessment.id, size, { filename: 'killed.mp4' });
    expect(created.status).toBe(201);
    const id = created.location!.split('/').pop()!;
    const killedPid = server.pid!;
    server.killHard();
    // What SIGKILL during the last PATCH's acceptance leaves: every byte held, no clip named, and
    // the killed process's claim with most of its lease to run.
    fs.copyFileSync(clip, path.join(dir, 'uploads', 'tmp', 'resumable', id));
    const db = folderDb(dir);
    try {
      await db('resumable_upload_claims').insert({
        upload_id: id,
        holder: `${os.hostname()}:${killedPid}:${crypto.randomUUID()}`,
        expires_at: inSeconds(18),
      });
      await server.start();
      const head = await tusHead(s, created.location!);
      expect(head.status, head.body).toBe(200);
      expect(head.offset).toBe(size);
      const clips = await db('clips').where({ assessment_id: assessment.id }).pluck('id');
      expect(clips).toHaveLength(1);
      expect(head.headers['trailframe-clip-id']).toBe(String(clips[0]));
      expect(await sha256(path.join(dir, 'uploads', 'clips', String(clips[0]), 'original.mp4'))).toBe(await sha256(clip));
      expect(await db('resumable_upload_claims').select()).toEqual([]);
    } finally {
      await db.destroy();
    }
  }, 240_000);
});

describe('the claims sweep', () => {
  let t: TestDb;
  beforeAll(async () => {
    t = await openTestDb();
  });
  afterAll(async () => {
    await t?.close();
  });

  it('removes lapsed claims and those of processes gone from this machine; keeps live ones', async () => {
    const claims = uploadClaims(t.db);
    const release = await claims.take('a'.repeat(32));
    expect(release).not.toBeNull();
    const uuid = () => crypto.randomUUID();
    await t.db('resumable_upload_claims').insert([
      // Another machine's, lapsed: its server was killed long ago.
      { upload_id: 'b'.repeat(32), holder: `elsewhere:123:${uuid()}`, expires_at: inSeconds(-60) },
      // Another machine's, within its lease: maybe working.
      { upload_id: 'c'.repeat(32), holder: `elsewhere:123:${uuid()}`, expires_at: inSeconds(15) },
      // This machine's, its process gone.
      { upload_id: 'd'.repeat(32), holder: `${os.hostname()}:${deadPid()}:${uuid()}`, expires_at: inSeconds(15) },
      // This machine's, a live process (this one's parent).
      { upload_id: 'e'.repeat(32), holder: `${os.hostname()}:${process.ppid}:${uuid()}`, expires_at: inSeconds(15) },
      // This process's pid but no claim it holds: a killed server's whose pid came back (a container's pid 1).
      { upload_id: 'f'.repeat(32), holder: `${os.hostname()}:${process.pid}:${uuid()}`, expires_at: inSeconds(15) },
    ]);
    expect(await claims.sweep()).toBe(3);
    expect((await t.db('resumable_upload_claims').orderBy('upload_id').pluck('upload_id')).map((u: string) => u[0])).toEqual([
      'a',
      'c',
      'e',
    ]);
    await release!();
    expect((await t.db('resumable_upload_claims').pluck('upload_id')).map((u: string) => u[0]).sort()).toEqual(['c', 'e']);
  });
});
