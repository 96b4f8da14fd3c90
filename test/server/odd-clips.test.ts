/**
 * Odd clips through the real upload routes (one request and resumable tus): each becomes ready
 * with the frames ffprobe counts (`-count_frames`, outside reference) or fails with words a
 * clinician can act on, no frames left behind. Clips are tiny (160×90, 1 s) so this stays fast.
 */
import { readFile, writeFile } from 'node:fs/promises';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, storedNames, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { signIn } from '../bench/support/bench-server';
import { tusCreate, tusPatch, type TusSession } from '../support/tus-client';
import { baselineVisit } from '../support/bodies';
import { ffmpegRun, ffprobeCounted, ffprobeJson, makeClip, tempDir } from './media/fixtures';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let server: http.Server;
let base: string;
let s: TusSession;
let assessmentId: number;
let dir: string;
let cleanup: () => Promise<void>;
/** Matroska remux shifted to start before zero: half its frames have no time of their own. */
let shifted: string;
/** Faststart MP4 cut just after its header: 30 frames listed, none readable. */
let headerOnly: string;

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- answers of several routes, read field by field
async function json(method: string, p: string, body?: unknown): Promise<{ status: number; body: any }> {
  const res = await fetch(`${base}${p}`, {
    method,
    headers: { cookie: s.cookie, 'x-xsrf-token': s.xsrf, ...(body === undefined ? {} : { 'content-type': 'application/json' }) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: res.status, body: await res.json() };
}

beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('odd-clips'));
  const plain = await makeClip(path.join(dir, 'plain.mp4'), { fps: 30, width: 160, height: 90, seconds: 1 });
  shifted = path.join(dir, 'shifted.mkv');
  await ffmpegRun(['-i', plain, '-c', 'copy', '-output_ts_offset', '-0.5', '-avoid_negative_ts', 'disabled', shifted]);
  const faststart = await makeClip(path.join(dir, 'faststart.mp4'), {
    fps: 30,
    width: 160,
    height: 90,
    seconds: 1,
    movflags: '+faststart',
  });
  const bytes = await readFile(faststart);
  headerOnly = path.join(dir, 'header-only.mp4');
  await writeFile(headerOnly, bytes.subarray(0, bytes.indexOf('mdat') + 104));

  t = await makeTestApp();
  server = http.createServer(t.app).listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  s = await signIn(base, coach.email, coach.password);
  const athleteId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  assessmentId = (await json('POST', `/api/athletes/${athleteId}/assessments`, baselineVisit())).body.id;
});
afterAll(async () => {
  server?.close();
  await t?.close();
  await cleanup?.();
});

/** Uploads `file` in one multipart request or over tus; answers the clip id once processed. */
async function uploaded(file: string, way: 'multipart' | 'tus'): Promise<number> {
  let id: number;
  if (way === 'multipart') {
    const form = new FormData();
    form.append('file', new Blob([await readFile(file)]), path.basename(file));
    const res = await fetch(`${base}/api/assessments/${assessmentId}/clips`, {
      method: 'POST',
      headers: { cookie: s.cookie, 'x-xsrf-token': s.xsrf },
      body: form,
    });
    expect(res.status).toBe(201);
    id = ((await res.json()) as { id: number }).id;
  } else {
    const bytes = await readFile(file);
    const created = await tusCreate(base, s, assessmentId, bytes.length, { filename: path.basename(file) });
    const done = await tusPatch(s, created.location!, file, 0);
    expect(done.status).toBe(200);
    id = (JSON.parse(done.body) as { id: number }).id;
  }
  await t.worker!.idle();
  return id;
}

describe.each(['multipart', 'tus'] as const)('odd clips over %s', (way) => {
  it('a clip whose own frame times are missing or go back is ready with every frame ffprobe -count_frames counts, times computed at its rate', async () => {
    const id = await uploaded(shifted, way);
    const ref = await ffprobeCounted(shifted);
    const clip = (await json('GET', `/api/clips/${id}`)).body;
    expect(clip).toMatchObject({ status: 'ready', error: null, frameCount: ref.nbReadFrames, width: ref.width, height: ref.height });
    const manifest = (await json('GET', `/api/clips/${id}/manifest`)).body;
    expect(manifest.timestampsSource).toBe('computed');
    // ffprobe's r_frame_rate 30/1: i × 1000 / 30.
    expect(ref.rFrameRate).toBe('30/1');
    manifest.timestampsMs.forEach((ms: number, i: number) => expect(ms).toBeCloseTo((i * 1000) / 30, 2));
    const last = await fetch(`${base}/api/clips/${id}/frames/${ref.nbReadFrames - 1}`, { headers: { cookie: s.cookie } });
    expect(last.status).toBe(200);
  });

  it('a clip cut just after its header (ffprobe lists frames but reads none) fails saying none of its frames can be read; only the original stays, for a retry', async () => {
    const listed = (await ffprobeJson(headerOnly, ['-count_frames', '-select_streams', 'v:0', '-show_streams'])).streams[0];
    expect(Number(listed.nb_frames)).toBe(30);
    expect(Number(listed.nb_read_frames ?? 0)).toBe(0);
    const id = await uploaded(headerOnly, way);
    const clip = (await json('GET', `/api/clips/${id}`)).body;
    expect(clip.status).toBe('failed');
    expect(clip.error).toMatch(/none of its frames can be read/);
    expect(clip.error).not.toMatch(/about 0 frames/);
    expect(await storedNames(t.store, `clips/${id}/`)).toEqual(['original.mp4']);
  });
});
