/**
 * Two server processes sharing one database and uploads folder (behind one address, a client's
 * requests reach either): an upload holding every byte whose acceptance was cut short is asked
 * about (HEAD) on both at once. It becomes one clip, never two; every answer is 423 (being made
 * into a clip: ask again) or complete naming that clip; the stored original's SHA-256 is the source
 * file's (outside reference: the bytes on disk before upload).
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { folderDb, freePort, seededDir, serverProcess, type ServerProcess } from '../support/server-process';
import { sha256, tusCreate, tusHead } from '../support/tus-client';
import { sessionJson, signIn } from '../bench/support/bench-server';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeClip } from './media/fixtures';
import { baselineVisit } from '../support/bodies';

const [, coach] = DEMO_SIGN_INS;
let dir: string;
let cleanup: () => Promise<void>;
let a: ServerProcess;
let b: ServerProcess;

beforeAll(async () => {
  ({ dir, cleanup } = await seededDir('resumable-two'));
  a = serverProcess(dir, await freePort());
  b = serverProcess(dir, await freePort());
});
afterAll(async () => {
  a?.killHard();
  b?.killHard();
  await cleanup?.();
});

describe('two servers sharing the uploads folder', () => {
  it('a stranded upload asked about on both at once becomes one clip; every answer is 423 or that clip', async () => {
    const clip = await makeClip(path.join(dir, 'run.mp4'), { fps: 60, width: 640, height: 360, seconds: 3 });
    const size = fs.statSync(clip).size;
    await Promise.all([a.start(), b.start()]);
    const s = await signIn(a.url, coach.email, coach.password);
    const athletes = (await sessionJson<{ athletes: { id: number; lastName: string }[] }>(a.url, s, 'GET', '/api/athletes')).body.athletes;
    const ada = athletes.find((x) => x.lastName === 'Kestrel')!;
    const assessment = (await sessionJson<{ id: number }>(a.url, s, 'POST', `/api/athletes/${ada.id}/assessments`, baselineVisit())).body;
    const created = await tusCreate(a.url, s, assessment.id, size, { filename: 'shared.mp4' });
    expect(created.status).toBe(201);
    const onA = created.location!;
    const onB = onA.replace(a.url, b.url);
    const id = onA.split('/').pop()!;
    // What a SIGKILL during the last PATCH's acceptance leaves: every byte held, no clip named.
    fs.copyFileSync(clip, path.join(dir, 'uploads', 'tmp', 'resumable', id));

    const heads = await Promise.all([onA, onB, onA, onB].map((url) => tusHead(s, url)));
    const db = folderDb(dir);
    try {
      const clips = await db('clips').where({ assessment_id: assessment.id }).select('id');
      expect(clips).toHaveLength(1);
      const clipId = clips[0]!.id as number;
      const answers = heads.map((h) => (h.status === 423 ? 'accepting' : `${h.status} clip ${h.headers['trailframe-clip-id']}`));
      for (const answer of answers) expect(['accepting', `200 clip ${clipId}`]).toContain(answer);
      for (const url of [onA, onB]) expect((await tusHead(s, url)).headers['trailframe-clip-id']).toBe(String(clipId));
      expect(await sha256(path.join(dir, 'uploads', 'clips', String(clipId), 'original.mp4'))).toBe(await sha256(clip));
      expect(await db('resumable_upload_claims').select()).toEqual([]);
    } finally {
      await db.destroy();
    }
  }, 240_000);
});
