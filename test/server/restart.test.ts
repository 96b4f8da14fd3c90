/**
 * Durability: the server is killed with SIGKILL (with its ffmpeg) while extracting frames; after a
 * restart the expired lease is claimed again and the clip ends `ready` with every frame, as
 * counted by ffprobe -count_frames (outside reference).
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { uploadToNewVisit } from '../support/bodies';
import { Client } from '../support/test-app';
import { freePort, seededDir, serverProcess, type ServerProcess } from '../support/server-process';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { ffprobeCounted, makeClip } from './media/fixtures';

const [, coach] = DEMO_SIGN_INS;
let dir: string;
let cleanup: () => Promise<void>;
let port: number;
let server: ServerProcess;
const startServer = () => server.start();
const killHard = () => server?.killHard();

beforeAll(async () => {
  ({ dir, cleanup } = await seededDir('restart'));
  port = await freePort();
  server = serverProcess(dir, port);
});
afterAll(async () => {
  killHard();
  await cleanup?.();
});

describe('kill -9 during extraction', () => {
  it('restart resumes the job and the clip ends ready with every frame', async () => {
    const clipFile = await makeClip(path.join(dir, 'long.mp4'), { fps: 120, width: 1280, height: 720, seconds: 6 });
    await startServer();
    const c = new Client(`http://127.0.0.1:${port}`);
    await c.signIn(coach.email, coach.password);
    const athletes = (await c.get('/api/athletes')).body.athletes as { id: number; lastName: string }[];
    const ada = athletes.find((a) => a.lastName === 'Kestrel')!;
    const clipId = await uploadToNewVisit(c, ada.id, clipFile);

    // Wait until frames are being written, then pull the plug.
    const t0 = Date.now();
    for (;;) {
      const clip = (await c.get(`/api/clips/${clipId}`)).body;
      if (clip.status === 'extracting' && clip.progress?.done > 0) break;
      if (clip.status === 'ready') throw new Error('extraction finished before the kill; use a longer clip');
      if (Date.now() - t0 > 60_000) throw new Error(`never saw extraction (status ${clip.status})`);
      await new Promise((r) => setTimeout(r, 50));
    }
    killHard();

    await startServer();
    const again = new Client(`http://127.0.0.1:${port}`);
    await again.signIn(coach.email, coach.password);
    const t1 = Date.now();
    let clip;
    for (;;) {
      clip = (await again.get(`/api/clips/${clipId}`)).body;
      if (clip.status === 'ready' || clip.status === 'failed') break;
      if (Date.now() - t1 > 120_000) throw new Error(`clip stuck in ${clip.status}`);
      await new Promise((r) => setTimeout(r, 250));
    }
    const ref = await ffprobeCounted(clipFile);
    expect(clip.status).toBe('ready');
    expect(clip.frameCount).toBe(ref.nbReadFrames);
    const clipDir = path.join(dir, 'uploads', 'clips', String(clipId));
    expect(fs.readdirSync(path.join(clipDir, 'frames'))).toHaveLength(ref.nbReadFrames);
    expect(fs.readdirSync(clipDir).filter((f) => f.startsWith('.extract-'))).toEqual([]);
  }, 240_000);
});
