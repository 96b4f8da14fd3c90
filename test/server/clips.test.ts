/**
 * Assessments and clips through the API: upload, processing by the in-process worker, media
 * access, and every bad input leaving no file and no row. Clip metadata is checked against
 * ffprobe (outside reference).
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { makeTestApp, OTHER, signedIn, storedNames, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { ffmpegRun, ffprobeCounted, makeClip, tempDir } from './media/fixtures';
import { baselineVisit } from '../support/bodies';
import { assessmentPrefix } from '../../server/storage/media-keys';
import { putJson } from '../../server/storage/stored-objects';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let dir: string;
let cleanup: () => Promise<void>;
let good: string;
let faststart: string;
let adaId: number;
let assessmentId: number;

beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('clips-api'));
  good = await makeClip(path.join(dir, 'good.mp4'), { fps: 30, width: 320, height: 180, seconds: 2 });
  faststart = await makeClip(path.join(dir, 'faststart.mp4'), { fps: 30, width: 320, height: 180, seconds: 2, movflags: '+faststart' });
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  const res = await c.post(`/api/athletes/${adaId}/assessments`, {
    date: '2026-11-30',
    kind: 'baseline',
    surface: 'treadmill',
    speed: { value: 10.8, unit: 'kmh' },
    inclinePercent: 1,
    shoes: 'Daily trainer',
    cameraNotes: 'Tripod 3 m, hip height',
    notes: 'Left buttock pain 4/10',
  });
  expect(res.status).toBe(201);
  assessmentId = res.body.id;
});
afterAll(async () => {
  await t?.close();
  await cleanup?.();
});

const upload = (client: Client, id: number, file: string, name = path.basename(file)) =>
  client.agent
    .post(`/api/assessments/${id}/clips`)
    .set('X-XSRF-TOKEN', (client as unknown as { token: string }).token)
    .attach('file', file, name);

async function ready(): Promise<void> {
  await t.worker!.idle();
}

/** Upload temp files (always local) and the clips with stored media (in the app's store, local or bucket). */
async function leftovers(): Promise<{ tmp: string[]; clipDirs: string[] }> {
  return {
    tmp: fs.readdirSync(path.join(t.config.uploadsDir, 'tmp')),
    clipDirs: await storedNames(t.store, 'clips/'),
  };
}

describe('assessments', () => {
  it('stores the belt speed in m/s (10.8 km/h = 3.0 m/s by definition of the units) and lists newest first', async () => {
    const list = await c.get(`/api/athletes/${adaId}/assessments`);
    expect(list.body.assessments.find((x: { id: number }) => x.id === assessmentId)).toMatchObject({
      date: '2026-11-30',
      kind: 'baseline',
      surface: 'treadmill',
      speedUnit: 'kmh',
      inclinePercent: 1,
    });
    expect(list.body.assessments.find((x: { id: number }) => x.id === assessmentId).speedMps).toBeCloseTo(3.0, 10);
    const pace = await c.post(`/api/athletes/${adaId}/assessments`, {
      date: '2026-12-01',
      kind: 'retest',
      surface: 'road',
      speed: { value: 300, unit: 's_per_km' },
      inclinePercent: null,
      shoes: null,
      cameraNotes: null,
      notes: null,
    });
    expect(pace.body.speedMps).toBeCloseTo(1000 / 300, 10); // 5:00 min/km
    const again = await c.get(`/api/athletes/${adaId}/assessments`);
    const dates = again.body.assessments.map((a: { date: string }) => a.date);
    expect(dates[0]).toBe('2026-12-01');
    expect(dates).toEqual([...dates].sort().reverse());
    await c.delete(`/api/assessments/${pace.body.id}`);
  });

  it('refuses bad assessment input with field paths', async () => {
    const base = baselineVisit();
    const cases: [Record<string, unknown>, (string | number)[]][] = [
      [{ speed: { value: 60, unit: 'kmh' } }, ['speed', 'value']],
      [{ speed: { value: 10, unit: 'knots' } }, ['speed', 'unit']],
      [{ date: '2026-13-01' }, ['date']],
      [{ kind: 'followup' }, ['kind']],
      [{ inclinePercent: 90 }, ['inclinePercent']],
      [{ shoes: 'x'.repeat(121) }, ['shoes']],
    ];
    for (const [over, p] of cases) {
      const res = await c.post(`/api/athletes/${adaId}/assessments`, { ...base, ...over });
      expect(res.status, JSON.stringify(over)).toBe(422);
      expect(res.body.error.details[0].path).toEqual(p);
    }
  });

  it('keeps coach notes from the athlete', async () => {
    const a = await signedIn(t.app, athlete.email, athlete.password);
    const res = await a.get(`/api/assessments/${assessmentId}`);
    expect(res.status).toBe(200);
    expect(res.body.notes).toBeNull();
    expect((await c.get(`/api/assessments/${assessmentId}`)).body.notes).toBe('Left buttock pain 4/10');
  });
});

describe('upload and processing', () => {
  let clipId: number;

  it('accepts a clip, processes it to ready, and its metadata matches ffprobe -count_frames (outside reference)', async () => {
    const res = await upload(c, assessmentId, good, 'Ada treadmill.mp4');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ status: 'queued', originalName: 'Ada treadmill.mp4', assessmentId });
    clipId = res.body.id;
    await ready();
    const clip = (await c.get(`/api/clips/${clipId}`)).body;
    const ref = await ffprobeCounted(good);
    expect(clip).toMatchObject({
      status: 'ready',
      frameCount: ref.nbReadFrames,
      width: ref.width,
      height: ref.height,
      fps: 30,
      effectiveFps: 30,
      error: null,
    });
    expect(clip.thumbCount).toBeGreaterThan(0);
    expect(await t.store.stat(`clips/${clipId}/original.mp4`)).not.toBeNull();
    expect((await leftovers()).tmp).toEqual([]);
  });

  it('serves frames, thumbnails, poster and manifest privately, and audits the first view', async () => {
    const frame = await c.get(`/api/clips/${clipId}/frames/0`);
    expect(frame.status).toBe(200);
    expect(frame.headers['content-type']).toBe('image/jpeg');
    expect(frame.headers['cache-control']).toBe('private, max-age=31536000, immutable');
    expect((await c.get(`/api/clips/${clipId}/frames/59`)).status).toBe(200);
    expect((await c.get(`/api/clips/${clipId}/frames/60`)).status).toBe(404);
    expect((await c.get(`/api/clips/${clipId}/frames/-1`)).status).toBe(404);
    expect((await c.get(`/api/clips/${clipId}/frames/..%2F..%2Fmanifest.json`)).status).toBe(404);
    expect((await c.get(`/api/clips/${clipId}/thumbs/0`)).status).toBe(200);
    expect((await c.get(`/api/clips/${clipId}/poster`)).headers['content-type']).toBe('image/jpeg');
    const manifest = await c.get(`/api/clips/${clipId}/manifest`);
    expect(manifest.body).toMatchObject({ frameCount: 60, fps: 30 });
    expect(manifest.body.timestampsMs).toHaveLength(60);
    const original = await c.get(`/api/clips/${clipId}/original`);
    expect(original.headers['content-disposition']).toContain('attachment');
    const views = await t.db('audit_log').where({ action: 'media.viewed' });
    expect(views).toHaveLength(1);
  });

  it('keeps media from other athletes and other clinics (404)', async () => {
    const otherCoach = await signedIn(t.app, OTHER.coach.email, OTHER.coach.password);
    expect((await otherCoach.get(`/api/clips/${clipId}/frames/0`)).status).toBe(404);
    expect((await otherCoach.get(`/api/clips/${clipId}`)).status).toBe(404);
    expect((await upload(otherCoach, assessmentId, good)).status).toBe(404);
    expect((await c.get(`/api/clips/${clipId + 1000}/frames/0`)).status).toBe(404);
  });

  it('saves per-clip settings: near side, direction, capture frame rate (effective fps follows)', async () => {
    const res = await c.patch(`/api/clips/${clipId}`, { nearSide: 'left', direction: 'right_to_left', captureFps: 240 });
    expect(res.body).toMatchObject({ nearSide: 'left', direction: 'right_to_left', captureFps: 240, fps: 30, effectiveFps: 240 });
    expect((await c.patch(`/api/clips/${clipId}`, { captureFps: 0 })).status).toBe(422);
    expect((await c.patch(`/api/clips/${clipId}`, { nearSide: 'middle' })).status).toBe(422);
  });

  it('the athlete uploads to their own assessment and may delete only their own uploads', async () => {
    const a = await signedIn(t.app, athlete.email, athlete.password);
    await a.refreshToken();
    const res = await upload(a, assessmentId, good, 'phone.mp4');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.uploadedByName).toBe('Ada Kestrel');
    await ready();
    expect((await a.delete(`/api/clips/${clipId}`)).status).toBe(403);
    expect((await a.delete(`/api/clips/${res.body.id}`)).status).toBe(204);
    expect(await t.store.list(`clips/${res.body.id}/`)).toEqual([]);
  });

  it('deleting a clip removes its rows and every file', async () => {
    const res = await upload(c, assessmentId, good);
    await ready();
    const id = res.body.id as number;
    expect((await c.delete(`/api/clips/${id}`)).status).toBe(204);
    expect(await t.db('clips').where({ id })).toHaveLength(0);
    expect(await t.store.list(`clips/${id}/`)).toEqual([]);
    expect((await c.get(`/api/clips/${id}`)).status).toBe(404);
  });

  it("a server stop while a clip's files are removed leaves its row, so deleting it again removes the rest", async () => {
    const res = await upload(c, assessmentId, good);
    await ready();
    const id = res.body.id as number;
    const prefix = `clips/${id}/`;
    // What a SIGKILL halfway through the removal leaves: some files gone, the request unanswered.
    const removePrefix = vi.spyOn(t.store, 'removePrefix').mockImplementationOnce(async () => {
      await t.store.remove(`${prefix}original.mp4`);
      throw new Error('the server stopped');
    });
    try {
      expect((await c.delete(`/api/clips/${id}`)).status).not.toBe(204);
    } finally {
      removePrefix.mockRestore();
    }
    // The clip is still there to delete (else its frames would stay with no row naming them).
    expect(await t.db('clips').where({ id })).toHaveLength(1);
    expect((await t.store.list(prefix)).length).toBeGreaterThan(0);
    expect((await c.delete(`/api/clips/${id}`)).status).toBe(204);
    expect(await t.db('clips').where({ id })).toHaveLength(0);
    expect(await t.store.list(prefix)).toEqual([]);
  });

  it("a server stop while an assessment's files are removed leaves the assessment, so deleting it again removes the rest", async () => {
    const visit = await c.post(`/api/athletes/${adaId}/assessments`, baselineVisit());
    const id = visit.body.id as number;
    const clipId = (await upload(c, id, good)).body.id as number;
    await ready();
    // A visit summary's PDF lives under the assessment's prefix.
    await putJson(t.store, `${assessmentPrefix(id)}summaries/1.pdf`, { stands: 'for a PDF' });
    // The stop comes as the assessment's own folder is removed (its clips are gone by then).
    const original = t.store.removePrefix.bind(t.store);
    let stopped = false;
    const removePrefix = vi.spyOn(t.store, 'removePrefix').mockImplementation(async (p) => {
      if (stopped || !p.startsWith('assessments/')) return original(p);
      stopped = true;
      throw new Error('the server stopped');
    });
    try {
      expect((await c.delete(`/api/assessments/${id}`)).status).not.toBe(204);
    } finally {
      removePrefix.mockRestore();
    }
    expect((await c.get(`/api/assessments/${id}`)).status).toBe(200);
    expect((await c.delete(`/api/assessments/${id}`)).status).toBe(204);
    expect(await t.store.list(`clips/${clipId}/`)).toEqual([]);
    expect(await t.store.list(assessmentPrefix(id))).toEqual([]);
  });
});

describe('bad uploads: a clear 4xx, no file and no row left', () => {
  async function refused(file: string, name: string, status: number, code?: string) {
    const before = (await t.db('clips').count({ n: '*' }))[0]!.n;
    const dirsBefore = (await leftovers()).clipDirs.length;
    const res = await upload(c, assessmentId, file, name);
    expect(res.status, JSON.stringify(res.body)).toBe(status);
    if (code) expect(res.body.error.code).toBe(code);
    expect(res.body.error.message.length).toBeGreaterThan(10);
    expect((await t.db('clips').count({ n: '*' }))[0]!.n).toBe(before);
    expect((await leftovers()).tmp).toEqual([]);
    expect((await leftovers()).clipDirs.length).toBe(dirsBefore);
    return res;
  }

  it('zero-byte file → 422', async () => {
    const f = path.join(dir, 'zero.mp4');
    fs.writeFileSync(f, '');
    await refused(f, 'zero.mp4', 422, 'empty_file');
  });

  it('text named .mp4 → 422', async () => {
    const f = path.join(dir, 'notes.mp4');
    fs.writeFileSync(f, 'not a video\n'.repeat(100));
    await refused(f, 'notes.mp4', 422, 'not_video');
  });

  it('PNG named .mp4 → 422', async () => {
    const f = path.join(dir, 'still.mp4');
    await ffmpegRun(['-f', 'lavfi', '-i', 'testsrc2=size=64x64', '-frames:v', '1', '-f', 'image2', '-c:v', 'png', f]);
    await refused(f, 'still.mp4', 422, 'not_video');
  });

  it('truncated mp4 → 422', async () => {
    const f = path.join(dir, 'half.mp4');
    const bytes = fs.readFileSync(good);
    fs.writeFileSync(f, bytes.subarray(0, bytes.length >> 1));
    await refused(f, 'half.mp4', 422, 'truncated');
  });

  it('audio-only file → 422', async () => {
    const f = path.join(dir, 'sine.m4a');
    await ffmpegRun(['-f', 'lavfi', '-i', 'sine=f=440:d=1', '-c:a', 'aac', f]);
    await refused(f, 'sine.m4a', 422, 'no_video_stream');
  });

  it('a path-traversal file name is only a label; the file lands in the clip folder', async () => {
    const res = await upload(c, assessmentId, good, '../../../etc/passwd.mp4');
    expect(res.status).toBe(201);
    expect(res.body.originalName).toBe('passwd.mp4');
    await ready();
    expect(await storedNames(t.store, `clips/${res.body.id}/`)).toContain('original.mp4');
    await c.delete(`/api/clips/${res.body.id}`);
  });

  it('two files in one request → 422', async () => {
    const token = (c as unknown as { token: string }).token;
    const res = await c.agent
      .post(`/api/assessments/${assessmentId}/clips`)
      .set('X-XSRF-TOKEN', token)
      .attach('file', good)
      .attach('file', good);
    expect(res.status).toBe(422);
    expect((await leftovers()).tmp).toEqual([]);
  });

  it('no file at all → 422', async () => {
    const res = await c.post(`/api/assessments/${assessmentId}/clips`, { file: 'nothing' });
    expect(res.status).toBe(422);
  });

  it('upload without video consent → 409 consent_required', async () => {
    const farid = await t.db('athletes').where({ first_name: 'Farid' }).first();
    const created = await c.post(`/api/athletes/${farid.id}/assessments`, {
      date: '2026-11-30',
      kind: 'baseline',
      surface: 'track',
      speed: null,
      inclinePercent: null,
      shoes: null,
      cameraNotes: null,
      notes: null,
    });
    const res = await upload(c, created.body.id, good);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('consent_required');
    expect((await leftovers()).tmp).toEqual([]);
  });

  it('a file over the limit → 413', async () => {
    const small = await makeTestApp({ uploadMaxBytes: 20_000 });
    try {
      const sc = await signedIn(small.app, coach.email, coach.password);
      const ada = (await small.db('athletes').where({ email: athlete.email }).first()).id;
      const a = await sc.post(`/api/athletes/${ada}/assessments`, {
        date: '2026-11-30',
        kind: 'baseline',
        surface: 'trail',
        speed: null,
        inclinePercent: null,
        shoes: null,
        cameraNotes: null,
        notes: null,
      });
      const res = await upload(sc, a.body.id, good);
      expect(res.status).toBe(413);
      expect(res.body.error.code).toBe('file_too_large');
      expect(fs.readdirSync(path.join(small.config.uploadsDir, 'tmp'))).toEqual([]);
      expect(await small.db('clips')).toHaveLength(0);
    } finally {
      await small.close();
    }
  });

  it('a corrupt stream that ffprobe accepts ends failed with the reason; Retry queues it again', async () => {
    const bytes = Buffer.from(fs.readFileSync(faststart));
    const mdat = bytes.indexOf('mdat');
    const middle = mdat + Math.floor((bytes.length - mdat) / 2);
    for (let i = middle; i < middle + 4000 && i < bytes.length; i++) bytes[i] = (i * 37) & 0xff;
    const f = path.join(dir, 'corrupt.mp4');
    fs.writeFileSync(f, bytes);
    const res = await upload(c, assessmentId, f);
    expect(res.status).toBe(201);
    await ready();
    const clip = (await c.get(`/api/clips/${res.body.id}`)).body;
    expect(clip.status).toBe('failed');
    expect(clip.error).toMatch(/damaged/);
    expect(await storedNames(t.store, `clips/${res.body.id}/`)).toEqual(['original.mp4']);
    const retried = await c.post(`/api/clips/${res.body.id}/retry`);
    expect(retried.status).toBe(202);
    expect(retried.body.status).toBe('queued');
    await ready();
    expect((await c.get(`/api/clips/${res.body.id}`)).body.status).toBe('failed');
    const notFailed = (await t.db('clips').where({ status: 'ready' }).first()).id;
    expect((await c.post(`/api/clips/${notFailed}/retry`)).status).toBe(409);
  });
});
