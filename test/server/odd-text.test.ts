/**
 * Text that arrives outside JSON bodies: multipart form fields and file names (demonstration
 * captions, clip and picture uploads), tus Upload-Metadata values (base64 of the file name) and
 * escapes in paths and query strings. Bytes that are not UTF-8 (RFC 3629: `C3 28` is a cut
 * two-byte character, `ED A0 80` an encoded surrogate, `C0 80` an overlong NUL) and a NUL answer
 * the same 400 `invalid_text` as a JSON body does, on SQLite and PostgreSQL alike, and nothing is
 * stored; well-formed text in other scripts goes through unchanged.
 */
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { storedExerciseFiles } from '../support/demonstrations';
import { markedJpeg } from '../support/pictures';
import { baselineVisit } from '../support/bodies';
import { exerciseBody } from '../support/plans';
import { signIn } from '../bench/support/bench-server';
import { tusHeaders, type TusSession } from '../support/tus-client';
import { resumableUploadDir } from '../../server/storage/upload-temps';

const [, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let server: http.Server;
let base: string;
let tus: TusSession;
let exerciseId: number;
let athleteId: number;
let assessmentId: number;
let jpeg: Buffer;

/** Bytes that are not UTF-8, or a NUL, each between two letters. */
const BROKEN: { what: string; bytes: number[] }[] = [
  { what: 'a NUL', bytes: [0x00] },
  { what: 'a cut two-byte character', bytes: [0xc3, 0x28] },
  { what: 'a surrogate in UTF-8 bytes', bytes: [0xed, 0xa0, 0x80] },
  { what: 'an overlong NUL', bytes: [0xc0, 0x80] },
  { what: 'a byte that starts no character', bytes: [0xff] },
];
const broken = (bytes: number[]) => Buffer.concat([Buffer.from('a'), Buffer.from(bytes), Buffer.from('b')]);
/** Combining marks, right-to-left, CJK and an emoji outside the BMP. */
const WORLDLY = 'Zoe\u0308 \u05e9\u05dc\u05d5\u05dd \u8dd1\u6b65 \u{1F3C3}';

const BOUNDARY = 'odd-text-boundary';
/** A multipart body by hand, so field values and file names go as the exact bytes given. */
function multipart(parts: { name: string; value?: Buffer; filename?: Buffer; file?: Buffer; type?: string }[]): Buffer {
  const chunks: Buffer[] = [];
  for (const p of parts) {
    chunks.push(Buffer.from(`--${BOUNDARY}\r\nContent-Disposition: form-data; name="${p.name}"`));
    // A NUL cannot stand in a header line (busboy refuses the part header: 400 bad_upload); it comes percent-escaped (RFC 8187).
    if (p.filename?.includes(0)) chunks.push(Buffer.from(`; filename*=UTF-8''${encodeURIComponent(p.filename.toString('latin1'))}`));
    else if (p.filename) chunks.push(Buffer.from('; filename="'), p.filename, Buffer.from('"'));
    chunks.push(Buffer.from(p.file ? `\r\nContent-Type: ${p.type ?? 'application/octet-stream'}\r\n\r\n` : '\r\n\r\n'));
    chunks.push(p.file ?? p.value ?? Buffer.alloc(0), Buffer.from('\r\n'));
  }
  chunks.push(Buffer.from(`--${BOUNDARY}--\r\n`));
  return Buffer.concat(chunks);
}
async function postMultipart(url: string, body: Buffer) {
  return c.agent
    .post(url)
    .set('X-XSRF-TOKEN', await c.xsrf())
    .set('Content-Type', `multipart/form-data; boundary=${BOUNDARY}`)
    .serialize((b: unknown) => b as string)
    .send(body);
}

beforeAll(async () => {
  t = await makeTestApp();
  c = await signedIn(t.app, coach.email, coach.password);
  server = http.createServer(t.app).listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  tus = await signIn(base, coach.email, coach.password);
  exerciseId = (await c.get('/api/exercises')).body.exercises[0].id;
  athleteId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  assessmentId = (await c.post(`/api/athletes/${athleteId}/assessments`, baselineVisit())).body.id;
  jpeg = await markedJpeg(320, 240);
});
afterAll(async () => {
  server?.close();
  await t?.close();
});

describe('multipart text fields and file names', () => {
  it('a demonstration picture whose caption or file name is not UTF-8 or holds a NUL: 400 invalid_text, no row, no file', async () => {
    const url = `/api/exercises/${exerciseId}/demo-pictures`;
    const filesBefore = await storedExerciseFiles(t.store);
    for (const { what, bytes } of BROKEN) {
      const inCaption = await postMultipart(
        url,
        multipart([
          { name: 'caption', value: broken(bytes) },
          { name: 'file', filename: Buffer.from('p.jpg'), file: jpeg, type: 'image/jpeg' },
        ]),
      );
      expect(inCaption.status, `caption with ${what}: ${JSON.stringify(inCaption.body)}`).toBe(400);
      expect(inCaption.body.error.code, what).toBe('invalid_text');
      const inName = await postMultipart(url, multipart([{ name: 'file', filename: broken(bytes), file: jpeg, type: 'image/jpeg' }]));
      expect(inName.status, `file name with ${what}`).toBe(400);
      expect(inName.body.error.code, what).toBe('invalid_text');
    }
    expect(await t.db('demo_pictures').where({ exercise_id: exerciseId }).count({ n: '*' }).first()).toEqual({ n: 0 });
    expect(await storedExerciseFiles(t.store)).toEqual(filesBefore);
  });

  it('a caption in other scripts (combining marks, Hebrew, CJK, emoji) is stored and answered unchanged', async () => {
    const res = await postMultipart(
      `/api/exercises/${exerciseId}/demo-pictures`,
      multipart([
        { name: 'caption', value: Buffer.from(WORLDLY, 'utf8') },
        { name: 'file', filename: Buffer.from('\u00e9t\u00e9 \u8dd1.jpg', 'utf8'), file: jpeg, type: 'image/jpeg' },
      ]),
    );
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.caption).toBe(WORLDLY);
    expect((await t.db('demo_pictures').where({ id: res.body.id }).first()).caption).toBe(WORLDLY);
  });

  it('a one-request clip upload whose file name is not UTF-8 or holds a NUL: 400 invalid_text, no clip, no temp file left', async () => {
    const before = await t.db('clips').count({ n: '*' }).first();
    for (const { what, bytes } of BROKEN) {
      const res = await postMultipart(
        `/api/assessments/${assessmentId}/clips`,
        multipart([
          { name: 'file', filename: Buffer.concat([broken(bytes), Buffer.from('.mp4')]), file: Buffer.alloc(2048, 1), type: 'video/mp4' },
        ]),
      );
      expect(res.status, `${what}: ${JSON.stringify(res.body)}`).toBe(400);
      expect(res.body.error.code, what).toBe('invalid_text');
    }
    expect(await t.db('clips').count({ n: '*' }).first()).toEqual(before);
    // The temp file goes when the answer closes.
    const temps = () => fs.readdirSync(path.join(t.config.uploadsDir, 'tmp')).filter((n) => n !== 'resumable');
    await vi.waitFor(() => expect(temps()).toEqual([]), { timeout: 2000 });
  });
});

describe('tus Upload-Metadata', () => {
  const create = (filename: Buffer) =>
    fetch(`${base}/api/assessments/${assessmentId}/clip-uploads`, {
      method: 'POST',
      headers: tusHeaders(tus, {
        'upload-length': '2048',
        'upload-metadata': `filename ${filename.toString('base64')},filetype ${Buffer.from('video/mp4').toString('base64')}`,
      }),
    });

  it('a file name whose base64 decodes to bytes that are not UTF-8 or to a NUL: 400 invalid_text, no upload made', async () => {
    const partsBefore = fs.existsSync(resumableUploadDir(t.config.uploadsDir))
      ? fs.readdirSync(resumableUploadDir(t.config.uploadsDir))
      : [];
    for (const { what, bytes } of BROKEN) {
      const res = await create(Buffer.concat([broken(bytes), Buffer.from('.mp4')]));
      expect(res.status, what).toBe(400);
      expect(((await res.json()) as { error: { code: string } }).error.code, what).toBe('invalid_text');
    }
    const partsAfter = fs.existsSync(resumableUploadDir(t.config.uploadsDir))
      ? fs.readdirSync(resumableUploadDir(t.config.uploadsDir))
      : [];
    expect(partsAfter).toEqual(partsBefore);
  });

  it('a file name in other scripts is accepted (201)', async () => {
    const res = await create(Buffer.from(`${WORLDLY}.mp4`, 'utf8'));
    expect(res.status).toBe(201);
    await fetch(new URL(res.headers.get('location')!, base), { method: 'DELETE', headers: tusHeaders(tus) });
  });
});

describe('escapes in paths and query strings', () => {
  const ESCAPED = ['%00', '%C3%28', '%ED%A0%80', '%C0%80', '%FF', 'a%E0%A4'];
  const filterRoutes = () => [
    (v: string) => `/api/exercises?q=${v}`,
    (v: string) => `/api/exercises?region=${v}`,
    (v: string) => `/api/prices?archived=${v}`,
    (v: string) => `/api/invoices?status=${v}`,
    (v: string) => `/api/invoices?from=${v}`,
    (v: string) => `/api/athletes/${athleteId}/comparison?baseline=${v}`,
    (v: string) => `/api/athletes/${athleteId}/measure-trends?keys=${v}`,
    (v: string) => `/api/athletes/${v}`,
    (v: string) => `/api/athletes/${athleteId}/plans?x=${v}`,
  ];

  it('a NUL or bytes that are not UTF-8 in a search, a filter or a route parameter: 400 invalid_text on every such route', async () => {
    for (const route of filterRoutes()) {
      for (const v of ESCAPED) {
        const res = await c.get(route(v));
        expect(res.status, `${route(v)}: ${JSON.stringify(res.body).slice(0, 200)}`).toBe(400);
        expect(res.body.error.code, route(v)).toBe('invalid_text');
      }
    }
  });

  it('well-formed escapes still work: an emoji, accents and CJK in the exercise search answer 200', async () => {
    for (const q of ['%F0%9F%8F%83', 'Zo%C3%AB', '%E8%B7%91%E6%AD%A5', '100%25']) {
      const res = await c.get(`/api/exercises?q=${q}`);
      expect(res.status, q).toBe(200);
      expect(Array.isArray(res.body.exercises)).toBe(true);
    }
  });
});

describe('names in other scripts in the exercise library', () => {
  it('are found case-insensitively by their own letters and listed in alphabetical order, the same on both databases', async () => {
    for (const name of ['Ångström lunge', 'Élan stride', 'Øresund step', 'Zed hold', '跑步 drill']) {
      expect((await c.post('/api/exercises', exerciseBody(name))).status, name).toBe(201);
    }
    const names = async (q: string) =>
      ((await c.get(`/api/exercises?q=${encodeURIComponent(q)}`)).body.exercises as { name: string }[]).map((e) => e.name);
    // Upper and lower case of É, Å and Ø are one letter each (Unicode case mapping, from memory).
    expect(await names('élan')).toEqual(['Élan stride']);
    expect(await names('ÅNGSTRÖM')).toEqual(['Ångström lunge']);
    expect(await names('øresund')).toEqual(['Øresund step']);
    expect(await names('跑步')).toEqual(['跑步 drill']);
    // English alphabetical order (Unicode collation, en; from memory): Å among the A's, É among the E's, Ø among the O's.
    const all = await names('');
    const at = (n: string) => all.indexOf(n);
    expect(at('Ångström lunge')).toBe(0);
    expect(at('Élan stride')).toBeLessThan(at('Forward step-down'));
    expect(at('Élan stride')).toBeGreaterThan(at('Bent-knee bridge hold'));
    expect(at('Øresund step')).toBeLessThan(at('Prone hamstring hold'));
    expect(at('Øresund step')).toBeGreaterThan(at('Nordic hamstring lowering'));
    expect(at('Zed hold')).toBeLessThan(at('跑步 drill'));
  });
});

describe('over-long multipart text', () => {
  it('a caption over its limit, or past what the form reader takes, is 422 naming the limit; no row', async () => {
    const url = `/api/exercises/${exerciseId}/demo-pictures`;
    const before = await t.db('demo_pictures').count({ n: '*' }).first();
    for (const caption of ['x'.repeat(121), '跑'.repeat(1000), 'x'.repeat(50_000)]) {
      const res = await postMultipart(
        url,
        multipart([
          { name: 'caption', value: Buffer.from(caption, 'utf8') },
          { name: 'file', filename: Buffer.from('p.jpg'), file: jpeg, type: 'image/jpeg' },
        ]),
      );
      expect(res.status, `${caption.length}: ${JSON.stringify(res.body)}`).toBe(422);
      expect(res.body.error.message).toContain('at most 120 characters');
    }
    const clip = await postMultipart(
      `/api/exercises/${exerciseId}/demo-clip`,
      multipart([
        { name: 'caption', value: Buffer.from('x'.repeat(20_000)) },
        { name: 'file', filename: Buffer.from('c.mp4'), file: Buffer.alloc(2048, 1), type: 'video/mp4' },
      ]),
    );
    expect(clip.status, JSON.stringify(clip.body)).toBe(422);
    expect(clip.body.error.message).toContain('at most 120 characters');
    expect(await t.db('demo_pictures').count({ n: '*' }).first()).toEqual(before);
  });
});

describe('the price list', () => {
  it('is in alphabetical order of items on both databases: case and accents second (Unicode collation, en; from memory)', async () => {
    const owner = await signedIn(t.app, DEMO_SIGN_INS[0].email, DEMO_SIGN_INS[0].password);
    for (const item of ['Zed session', 'ankle check', 'Élan review']) {
      expect((await owner.post('/api/prices', { item, amountMinor: 1000 })).status, item).toBe(201);
    }
    const items = ((await owner.get('/api/prices')).body.prices as { item: string }[]).map((p) => p.item);
    const ours = items.filter((i) => ['Zed session', 'ankle check', 'Élan review'].includes(i));
    expect(ours).toEqual(['ankle check', 'Élan review', 'Zed session']);
  });
});
