/**
 * Resumable clip uploads (tus 1.0.0 at /api/assessments/:id/clip-uploads): a connection cut at
 * 30 % and at 90 % resumes from the offset HEAD answers; the stored original's SHA-256 equals the
 * source file's (outside reference: the bytes on disk before upload); the gate is the same as a
 * one-request upload (other clinic 404, no video consent 409 — also on a PATCH after consent is
 * withdrawn, no CSRF 403); a declared length over the limit is 413; a finished upload that is not
 * a video is refused (ffprobe/magic bytes) and leaves nothing; abandoned partials go by age; an
 * accepted upload answers HEAD as complete (with its clip) so a lost answer is not sent twice.
 */
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import pino from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, OTHER, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { signIn } from '../bench/support/bench-server';
import { sha256, tusCreate, tusHead, tusHeaders, tusPatch, tusPatchCut, type TusSession } from '../support/tus-client';
import { makeClip, tempDir } from './media/fixtures';
import { resumableUploads } from '../../server/clips/resumable-uploads';
import { uploadClaims } from '../../server/clips/upload-claims';
import { resumableUploadDir } from '../../server/storage/upload-temps';
import type { ClipsService } from '../../server/clips/clips-service';
import { baselineVisit } from '../support/bodies';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let server: http.Server;
let base: string;
let dir: string;
let cleanup: () => Promise<void>;
let clip: string;
let coachSession: TusSession;
let adaId: number;
let assessmentId: number;

const assessment = baselineVisit();

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- answers of several routes, read field by field
async function json(s: TusSession, method: string, p: string, body?: unknown): Promise<{ status: number; body: any }> {
  const res = await fetch(`${base}${p}`, {
    method,
    headers: { cookie: s.cookie, 'x-xsrf-token': s.xsrf, ...(body === undefined ? {} : { 'content-type': 'application/json' }) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: res.status, body: res.status === 204 ? null : await res.json() };
}

const partsDir = () => resumableUploadDir(t.config.uploadsDir);
const parts = () => (fs.existsSync(partsDir()) ? fs.readdirSync(partsDir()) : []);
const tmpFiles = () => fs.readdirSync(path.join(t.config.uploadsDir, 'tmp')).filter((n) => n !== 'resumable');

beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('resumable'));
  clip = await makeClip(path.join(dir, 'run.mp4'), { fps: 60, width: 640, height: 360, seconds: 3 });
  t = await makeTestApp();
  server = http.createServer(t.app).listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  coachSession = await signIn(base, coach.email, coach.password);
  adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  assessmentId = (await json(coachSession, 'POST', `/api/athletes/${adaId}/assessments`, assessment)).body.id;
});
afterAll(async () => {
  server?.close();
  await t?.close();
  await cleanup?.();
});

describe('resuming after a dropped connection', () => {
  for (const fraction of [0.3, 0.9]) {
    it(`cut at ${fraction * 100} %: HEAD gives the offset, PATCH continues, the stored original has the source's SHA-256`, async () => {
      const size = fs.statSync(clip).size;
      const created = await tusCreate(base, coachSession, assessmentId, size, { filename: 'run.mp4' });
      expect(created.status).toBe(201);
      const url = created.location!;
      expect(url).toMatch(new RegExp(`/api/assessments/${assessmentId}/clip-uploads/[0-9a-f]{32}$`));

      const cutAt = Math.floor(size * fraction);
      await tusPatchCut(coachSession, url, clip, 0, cutAt);
      const head = await tusHead(coachSession, url);
      expect(head.status).toBe(200);
      expect(head.length).toBe(size);
      // Every byte that reached the server before the drop is kept; nothing past what was sent.
      expect(head.offset).toBeGreaterThan(0);
      expect(head.offset).toBeLessThanOrEqual(cutAt);

      // Continuing from another offset is refused (the client must ask first).
      expect((await tusPatch(coachSession, url, clip, 0)).status).toBe(head.offset === 0 ? 200 : 409);

      const done = await tusPatch(coachSession, url, clip, head.offset);
      expect(done.status, done.body).toBe(200);
      const made = JSON.parse(done.body) as { id: number; status: string; sizeBytes: number; originalName: string };
      expect(made).toMatchObject({ sizeBytes: size, originalName: 'run.mp4' });
      // Outside reference: the source file's own bytes.
      expect(await t.store.withLocalFile(`clips/${made.id}/original.mp4`, (stored) => sha256(stored))).toBe(await sha256(clip));
      // The bytes moved into the store; only the upload's details stay (until swept), so a client
      // whose answer was lost learns from HEAD that it is complete instead of sending it again.
      const id = url.split('/').pop()!;
      expect(parts().filter((n) => n.startsWith(id))).toEqual([`${id}.json`]);
      const after = await tusHead(coachSession, url);
      expect(after).toMatchObject({ status: 200, offset: size, length: size });
      expect(after.headers['trailframe-clip-id']).toBe(String(made.id));
      expect((await tusPatch(coachSession, url, clip, size)).status).toBe(410);
      await t.worker!.idle();
      const ready = await json(coachSession, 'GET', `/api/clips/${made.id}`);
      expect(ready.body.status).toBe('ready');
    });
  }
});

describe('the same gate as a one-request upload', () => {
  it("another clinic's coach: 404 at creation and on the upload's HEAD and PATCH", async () => {
    const other = await signIn(base, OTHER.coach.email, OTHER.coach.password);
    const refused = await tusCreate(base, other, assessmentId, 1000);
    expect(refused.status).toBe(404);
    expect(JSON.parse(refused.body).error.code).toBe('not_found');

    const mine = await tusCreate(base, coachSession, assessmentId, fs.statSync(clip).size);
    expect((await tusHead(other, mine.location!)).status).toBe(404);
    const patch = await tusPatch(other, mine.location!, clip, 0);
    expect(patch.status).toBe(404);
    expect(JSON.parse(patch.body).error.code).toBe('not_found');
    expect((await tusHead(coachSession, mine.location!)).offset).toBe(0);
  });

  it('the athlete uploads to their own assessment; without video consent: 409 at creation and on the next PATCH', async () => {
    const ada = await signIn(base, athlete.email, athlete.password);
    const size = fs.statSync(clip).size;
    const created = await tusCreate(base, ada, assessmentId, size);
    expect(created.status).toBe(201);
    // Someone else's upload (the coach's) is not theirs to continue.
    const coachUpload = await tusCreate(base, coachSession, assessmentId, size);
    expect((await tusPatch(ada, coachUpload.location!, clip, 0)).status).toBe(404);

    await tusPatchCut(ada, created.location!, clip, 0, Math.floor(size / 2));
    const offset = (await tusHead(ada, created.location!)).offset;
    const consent = { clinic_id: 1, athlete_id: adaId, kind: 'video_recording', recorded_by: null, recorded_at: new Date().toISOString() };
    await t.db('consents').insert({ ...consent, granted: 0 });
    try {
      const patch = await tusPatch(ada, created.location!, clip, offset);
      expect(patch.status).toBe(409);
      expect(JSON.parse(patch.body).error.code).toBe('consent_required');
      const again = await tusCreate(base, ada, assessmentId, size);
      expect(again.status).toBe(409);
      expect(JSON.parse(again.body).error.code).toBe('consent_required');
    } finally {
      await t.db('consents').insert({ ...consent, granted: 1 });
    }
  });

  it('without the CSRF header: 403 at creation and on PATCH', async () => {
    const refused = await tusCreate(base, coachSession, assessmentId, 1000, { csrf: false });
    expect(refused.status).toBe(403);
    const mine = await tusCreate(base, coachSession, assessmentId, fs.statSync(clip).size);
    const patch = await tusPatch(coachSession, mine.location!, clip, 0, { csrf: false });
    expect(patch.status).toBe(403);
    expect(JSON.parse(patch.body).error.code).toBe('csrf_invalid');
    expect((await tusHead(coachSession, mine.location!)).offset).toBe(0);
  });

  it('an Upload-Length over the 2 GB limit: 413 in our error shape, nothing created', async () => {
    const before = parts();
    const res = await tusCreate(base, coachSession, assessmentId, t.config.uploadMaxBytes + 1);
    expect(t.config.uploadMaxBytes).toBe(2048 * 1024 * 1024);
    expect(res.status).toBe(413);
    expect(JSON.parse(res.body).error).toMatchObject({ code: 'file_too_large', message: expect.stringContaining('2.0 GB') });
    expect(parts()).toEqual(before);
    expect((await tusCreate(base, coachSession, assessmentId, 'lots')).status).toBe(422);
    expect((await tusCreate(base, coachSession, assessmentId, 0)).status).toBe(422);
  });
});

describe('malformed protocol requests', () => {
  it('a malformed Upload-Offset, Upload-Metadata or Content-Type and the protocol’s own refusals answer JSON in our error shape; the offset stays', async () => {
    const created = await tusCreate(base, coachSession, assessmentId, 100);
    const url = created.location!;
    const patch = (extra: Record<string, string>, bytes: number) =>
      fetch(url, {
        method: 'PATCH',
        headers: tusHeaders(coachSession, { 'content-type': 'application/offset+octet-stream', ...extra }),
        body: new Uint8Array(bytes),
      });
    const answers = [
      { status: 400, res: await patch({ 'upload-offset': '-1' }, 5) },
      { status: 400, res: await patch({ 'upload-offset': '0.5' }, 5) },
      { status: 415, res: await patch({ 'upload-offset': '0', 'content-type': 'text/plain' }, 5) },
      { status: 409, res: await patch({ 'upload-offset': '7' }, 5) },
      { status: 413, res: await patch({ 'upload-offset': '0' }, 150) },
    ];
    const badMeta = await fetch(`${base}/api/assessments/${assessmentId}/clip-uploads`, {
      method: 'POST',
      headers: tusHeaders(coachSession, { 'upload-length': '100', 'upload-metadata': 'filename !!not-base64, x' }),
    });
    answers.push({ status: 400, res: badMeta });
    for (const { status, res } of answers) {
      expect(res.status).toBe(status);
      if (status === 415)
        expect(((await res.clone().json()) as { error: { message: string } }).error.message).toMatch(/offset\+octet-stream/);
      expect(res.headers.get('content-type')).toMatch(/^application\/json/);
      const body = (await res.json()) as { error: { code: string; message: string } };
      expect(body.error).toMatchObject({ code: expect.any(String), message: expect.any(String) });
    }
    expect((await tusHead(coachSession, url)).offset).toBe(0);
  });

  it('malformed headers are refused before the protocol library sees them: 400 bad_upload in our error shape, naming the header, the upload untouched', async () => {
    const size = fs.statSync(clip).size;
    const created = await tusCreate(base, coachSession, assessmentId, size, { filename: 'run.mp4' });
    const url = created.location!;
    const bytes = fs.readFileSync(clip).subarray(0, 1000);
    const octets = 'application/offset+octet-stream';
    const cases: Array<[string, Record<string, string>, string]> = [
      ['PATCH', { 'upload-offset': '-1', 'content-type': octets }, 'Upload-Offset'],
      ['PATCH', { 'upload-offset': 'abc', 'content-type': octets }, 'Upload-Offset'],
      ['PATCH', { 'upload-offset': '007', 'content-type': octets }, 'Upload-Offset'],
      ['PATCH', { 'upload-offset': '0', 'content-type': `${octets}; charset=utf-8` }, 'Content-Type'],
      ['PATCH', { 'upload-offset': '0', 'content-type': octets, 'x-forwarded-proto': 'gopher' }, 'X-Forwarded-Proto'],
    ];
    for (const [method, headers, named] of cases) {
      const res = await fetch(url, { method, headers: tusHeaders(coachSession, headers), body: bytes });
      expect(res.status, JSON.stringify(headers)).toBe(400);
      expect(res.headers.get('content-type')).toMatch(/application\/json/);
      const body = (await res.json()) as { error: { code: string; message: string } };
      expect(body.error.code).toBe('bad_upload');
      expect(body.error.message).toContain(named);
    }
    const metadata = await fetch(`${base}/api/assessments/${assessmentId}/clip-uploads`, {
      method: 'POST',
      headers: tusHeaders(coachSession, { 'upload-length': '10', 'upload-metadata': 'filename !!!' }),
    });
    expect(metadata.status).toBe(400);
    expect(((await metadata.json()) as { error: { code: string; message: string } }).error.message).toContain('Upload-Metadata');
    expect((await tusHead(coachSession, url)).offset).toBe(0);
  });
});

describe('acceptance of the finished upload', () => {
  it('a finished upload that is not a video is refused (422) and leaves no part, row or object', async () => {
    const text = path.join(dir, 'notes.mp4');
    fs.writeFileSync(text, 'These are session notes, not a clip.\n'.repeat(500));
    const clipsBefore = (await t.db('clips').count<{ n: number }[]>({ n: '*' }))[0]!.n;
    const created = await tusCreate(base, coachSession, assessmentId, fs.statSync(text).size, { filename: 'notes.mp4' });
    const id = created.location!.split('/').pop()!;
    const res = await tusPatch(coachSession, created.location!, text, 0);
    expect(res.status).toBe(422);
    expect(res.headers['content-type']).toMatch(/application\/json/);
    expect(JSON.parse(res.body).error.code).toBe('not_video');
    expect(parts().filter((n) => n.startsWith(id))).toEqual([]);
    expect(tmpFiles()).toEqual([]);
    expect((await t.db('clips').count<{ n: number }[]>({ n: '*' }))[0]!.n).toBe(clipsBefore);
    expect((await tusHead(coachSession, created.location!)).status).toBe(404);
  });

  it('an upload holding every byte whose acceptance a server stop cut short is accepted at the next HEAD, once', async () => {
    const size = fs.statSync(clip).size;
    const created = await tusCreate(base, coachSession, assessmentId, size, { filename: 'stranded.mp4' });
    const id = created.location!.split('/').pop()!;
    // What a SIGKILL during the last PATCH's acceptance leaves: the part holds every byte, its
    // details no clip. A tus client that asks HEAD and hears "complete" never sends it again.
    fs.copyFileSync(clip, path.join(partsDir(), id));
    const clipsBefore = (await t.db('clips').count<{ n: number }[]>({ n: '*' }))[0]!.n;

    const [head, again] = await Promise.all([tusHead(coachSession, created.location!), tusHead(coachSession, created.location!)]);
    expect(head).toMatchObject({ status: 200, offset: size, length: size });
    const clipId = Number(head.headers['trailframe-clip-id']);
    expect(clipId).toBeGreaterThan(0);
    expect(again.headers['trailframe-clip-id']).toBe(String(clipId));
    expect((await t.db('clips').count<{ n: number }[]>({ n: '*' }))[0]!.n).toBe(clipsBefore + 1);
    // Outside reference: the source file's own bytes.
    expect(await t.store.withLocalFile(`clips/${clipId}/original.mp4`, (stored) => sha256(stored))).toBe(await sha256(clip));
    expect(parts().filter((n) => n.startsWith(id))).toEqual([`${id}.json`]);
    await t.worker!.idle();
    expect((await json(coachSession, 'GET', `/api/clips/${clipId}`)).body).toMatchObject({ status: 'ready', originalName: 'stranded.mp4' });
  });
});

describe('HEAD while the finishing PATCH is being accepted', () => {
  it('answers 423 upload_locked (the client asks again) or the clip id, never "complete" without a clip', async () => {
    const size = fs.statSync(clip).size;
    const created = await tusCreate(base, coachSession, assessmentId, size, { filename: 'asked.mp4' });
    const id = created.location!.split('/').pop()!;
    const clipsBefore = (await t.db('clips').count<{ n: number }[]>({ n: '*' }))[0]!.n;
    const patch = tusPatch(coachSession, created.location!, clip, 0);
    let patched = false;
    void patch.then(() => (patched = true));
    // Asks as a client does whose last PATCH's connection dropped: once every byte is held, again and again.
    const heads: Awaited<ReturnType<typeof tusHead>>[] = [];
    while (!patched) {
      const held = await fs.promises.stat(path.join(partsDir(), id)).catch(() => null);
      if (held?.size === size) heads.push(await tusHead(coachSession, created.location!));
      else await new Promise((r) => setTimeout(r, 2));
    }
    const done = await patch;
    expect(done.status, done.body).toBe(200);
    const clipId = (JSON.parse(done.body) as { id: number }).id;
    expect(heads.length).toBeGreaterThan(0);
    // 423: still being accepted; 200: complete, naming the clip made.
    const answers = heads.map((h) => (h.status === 423 ? 'accepting' : `${h.status} clip ${h.headers['trailframe-clip-id']}`));
    for (const answer of answers) expect(['accepting', `200 clip ${clipId}`]).toContain(answer);
    const after = await tusHead(coachSession, created.location!);
    expect(after).toMatchObject({ status: 200, offset: size, length: size });
    expect(after.headers['trailframe-clip-id']).toBe(String(clipId));
    expect((await t.db('clips').count<{ n: number }[]>({ n: '*' }))[0]!.n).toBe(clipsBefore + 1);
    await t.worker!.idle();
  });
});

describe('abandoned partial uploads', () => {
  it('are removed once unwritten for the set age; newer ones and their offsets stay', async () => {
    const size = fs.statSync(clip).size;
    const old = await tusCreate(base, coachSession, assessmentId, size);
    await tusPatchCut(coachSession, old.location!, clip, 0, Math.floor(size / 3));
    const fresh = await tusCreate(base, coachSession, assessmentId, size);
    await tusPatchCut(coachSession, fresh.location!, clip, 0, Math.floor(size / 4));
    const freshOffset = (await tusHead(coachSession, fresh.location!)).offset;
    const oldId = old.location!.split('/').pop()!;
    const maxAgeMs = t.config.resumableUploadMaxAgeMs;
    expect(maxAgeMs).toBe(24 * 3_600_000); // RESUMABLE_UPLOAD_MAX_AGE_HOURS default
    const past = new Date(Date.now() - maxAgeMs - 60_000);
    for (const f of [oldId, `${oldId}.json`]) fs.utimesSync(path.join(partsDir(), f), past, past);

    // The sweep the app runs on its timer, over the same folder.
    const sweeper = resumableUploads({
      dir: partsDir(),
      maxBytes: t.config.uploadMaxBytes,
      clips: {} as ClipsService,
      claims: uploadClaims(t.db),
      logger: pino({ level: 'silent' }),
    });
    expect(await sweeper.sweep(maxAgeMs)).toEqual([oldId]);
    expect(parts().filter((n) => n.startsWith(oldId))).toEqual([]);
    expect((await tusHead(coachSession, old.location!)).status).toBe(404);
    expect((await tusHead(coachSession, fresh.location!)).offset).toBe(freshOffset);
  });
});
