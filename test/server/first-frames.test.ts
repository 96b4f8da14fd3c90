/**
 * First frames reviewable: while a clip's frames are extracted, the ones that exist are served at
 * once, one not written yet answers 409 `frame_not_ready` (never a 500, never a half-written
 * JPEG), one past the end 404, and the manifest is the plan (`complete: false`) with the frame
 * count ffprobe -count_frames gives (outside reference) — so the review can open on frame 0 and
 * fill in. Waits on the clip's state, never on wall time.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { ffprobeCounted, makeClip, tempDir } from './media/fixtures';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let dir: string;
let cleanup: () => Promise<void>;
let file: string;
let assessmentId: number;

beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('first-frames'));
  // 1,200 frames: extraction takes seconds, so the clip is seen part-way.
  file = await makeClip(path.join(dir, 'ten-seconds.mp4'), { fps: 120, width: 640, height: 360, seconds: 10 });
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  const adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  assessmentId = (await t.db('assessments').where({ athlete_id: adaId }).first()).id;
});
afterAll(async () => {
  await t?.close();
  await cleanup?.();
});

const JPEG_START = Buffer.from([0xff, 0xd8]);
const JPEG_END = Buffer.from([0xff, 0xd9]);
const binary = (url: string) =>
  c.agent
    .get(url)
    .buffer(true)
    .parse((res, done) => {
      const chunks: Buffer[] = [];
      res.on('data', (b: Buffer) => chunks.push(b));
      res.on('end', () => done(null, Buffer.concat(chunks)));
    });

describe('frames while a clip is extracted', () => {
  it('serves the frames that exist, 409 for the rest, and the planned manifest until ready', async () => {
    const up = await c.agent
      .post(`/api/assessments/${assessmentId}/clips`)
      .set('X-XSRF-TOKEN', await c.xsrf())
      .attach('file', file);
    expect(up.status).toBe(201);
    const id = up.body.id as number;
    const ref = await ffprobeCounted(file);

    // Until the worker has written frames (state, not time).
    let clip = (await c.get(`/api/clips/${id}`)).body;
    while (clip.status !== 'ready' && !(clip.status === 'extracting' && (clip.progress?.done ?? 0) > 0)) {
      expect(clip.status).not.toBe('failed');
      await new Promise((r) => setTimeout(r, 20));
      clip = (await c.get(`/api/clips/${id}`)).body;
    }
    const seenPartWay = clip.status === 'extracting';
    const manifest = (await c.get(`/api/clips/${id}/manifest`)).body;
    const frame0 = await binary(`/api/clips/${id}/frames/0`);
    expect(frame0.status).toBe(200);
    expect(frame0.headers['content-type']).toBe('image/jpeg');
    expect((frame0.body as Buffer).subarray(0, 2)).toEqual(JPEG_START);
    expect((frame0.body as Buffer).subarray(-2)).toEqual(JPEG_END);
    expect(manifest.frameCount).toBe(ref.nbReadFrames);
    expect((await c.get(`/api/clips/${id}/frames/${ref.nbReadFrames}`)).status).toBe(404);

    if (seenPartWay && manifest.complete === false) {
      const last = await c.get(`/api/clips/${id}/frames/${ref.nbReadFrames - 1}`);
      // Written by now only if extraction ended in between.
      if (last.status !== 200) {
        expect(last.status).toBe(409);
        expect(last.body.error.code).toBe('frame_not_ready');
      }
    }

    await t.worker!.idle();
    clip = (await c.get(`/api/clips/${id}`)).body;
    expect(clip).toMatchObject({ status: 'ready', frameCount: ref.nbReadFrames });
    const final = (await c.get(`/api/clips/${id}/manifest`)).body;
    expect(final.frameCount).toBe(ref.nbReadFrames);
    expect(final.complete).not.toBe(false);
    const last = await binary(`/api/clips/${id}/frames/${ref.nbReadFrames - 1}`);
    expect(last.status).toBe(200);
    expect((last.body as Buffer).subarray(-2)).toEqual(JPEG_END);
  }, 120_000);
});
