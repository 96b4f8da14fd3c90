/**
 * Upload input that is wrong or cut short: malformed multipart answers 400 with a clear message
 * (never 500, no stack trace in the log); a client that cancels mid-upload is logged at info and
 * leaves no temp file. File names: UTF-8 kept intact, C0/C1 controls and bidi overrides stripped,
 * the extension kept when a long name is shortened, and downloads name the file with `filename*`
 * (RFC 6266 / RFC 8187 encoding, decoded here by hand as the outside check).
 */
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import pino from 'pino';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeTestApp, signedIn, type Client, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { cleanFileName } from '../../server/http/file-names';
import { makeClip, tempDir } from './media/fixtures';
import { baselineVisit } from '../support/bodies';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
let c: Client;
let dir: string;
let cleanup: () => Promise<void>;
let good: string;
let assessmentId: number;
const logs: { level: number; msg: string; err?: unknown }[] = [];

beforeAll(async () => {
  ({ dir, cleanup } = await tempDir('upload-input'));
  good = await makeClip(path.join(dir, 'good.mp4'), { fps: 30, width: 160, height: 90, seconds: 1 });
  const logger = pino({ level: 'info' }, { write: (line: string) => void logs.push(JSON.parse(line)) });
  t = await makeTestApp({}, { logger });
  c = await signedIn(t.app, coach.email, coach.password);
  const adaId = (await t.db('athletes').where({ email: athlete.email }).first()).id;
  const res = await c.post(`/api/athletes/${adaId}/assessments`, baselineVisit());
  assessmentId = res.body.id;
});
afterAll(async () => {
  await t?.close();
  await cleanup?.();
});

const tmpFiles = () => fs.readdirSync(path.join(t.config.uploadsDir, 'tmp'));
const errorsLogged = () => logs.filter((l) => l.level >= 50);
const uploadUrl = () => `/api/assessments/${assessmentId}/clips`;

async function raw(contentType: string, body: string | Buffer) {
  return c.agent
    .post(uploadUrl())
    .set('X-XSRF-TOKEN', await c.xsrf())
    .set('Content-Type', contentType)
    .send(body);
}

describe('malformed multipart: 400 with a clear message, nothing logged as an error, no temp file', () => {
  const part = (boundary: string) =>
    `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="a.mp4"\r\nContent-Type: video/mp4\r\n\r\n${'x'.repeat(2000)}`;
  const cases: [string, string, string | Buffer][] = [
    ['no boundary', 'multipart/form-data', part('b1') + '\r\n--b1--\r\n'],
    ['an empty body', 'multipart/form-data; boundary=b1', ''],
    ['a truncated body (no closing boundary)', 'multipart/form-data; boundary=b1', part('b1')],
    ['a wrong boundary', 'multipart/form-data; boundary=b1', part('zz') + '\r\n--zz--\r\n'],
    ['a garbled part header', 'multipart/form-data; boundary=b1', `--b1\r\n${'\u0000'.repeat(20)}\r\n\r\nabc\r\n--b1--\r\n`],
  ];
  for (const [what, type, body] of cases) {
    it(`${what} → 400 bad_upload`, async () => {
      const before = errorsLogged().length;
      const res = await raw(type, body);
      expect(res.status, JSON.stringify(res.body)).toBe(400);
      expect(res.body.error.code).toBe('bad_upload');
      expect(res.body.error.message).toMatch(/multipart\/form-data/);
      expect(errorsLogged()).toHaveLength(before);
      expect(tmpFiles()).toEqual([]);
    });
  }
});

describe('a client that cancels an upload mid-way', () => {
  it('is logged at info, not as an error, and leaves no temp file', async () => {
    const server = http.createServer(t.app);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
    try {
      const port = (server.address() as AddressInfo).port;
      const boundary = 'cancelb';
      const req = http.request({
        host: '127.0.0.1',
        port,
        method: 'POST',
        path: uploadUrl(),
        headers: {
          'Content-Type': `multipart/form-data; boundary=${boundary}`,
          'Content-Length': String(8 * 1024 * 1024),
          Cookie: [c.cookieHeader(), `XSRF-TOKEN=${encodeURIComponent(await c.xsrf())}`].join('; '),
          'X-XSRF-TOKEN': await c.xsrf(),
        },
      });
      req.on('error', () => undefined);
      req.write(`--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="long.mp4"\r\nContent-Type: video/mp4\r\n\r\n`);
      req.write(Buffer.alloc(512 * 1024, 1));
      for (let i = 0; i < 200 && tmpFiles().length === 0; i++) await new Promise((r) => setTimeout(r, 10));
      expect(tmpFiles()).toHaveLength(1); // the upload was being received
      req.destroy();
      for (let i = 0; i < 200 && (tmpFiles().length > 0 || !logs.some((l) => /cancel/i.test(l.msg))); i++)
        await new Promise((r) => setTimeout(r, 10));
      expect(tmpFiles()).toEqual([]);
      expect(logs.some((l) => l.level === 30 && /upload cancelled/i.test(l.msg))).toBe(true);
      expect(errorsLogged()).toEqual([]);
    } finally {
      server.closeAllConnections();
      await new Promise<void>((r) => server.close(() => r()));
    }
  });
});

/** The value of `filename*` decoded by hand (RFC 8187: charset'lang'percent-encoded UTF-8). */
function extendedName(header: string): string | null {
  const m = /filename\*=UTF-8''([^;]+)/i.exec(header);
  return m ? decodeURIComponent(m[1]!) : null;
}

describe('file names', () => {
  it('a UTF-8 name is stored intact and downloads with filename* (and an ASCII fallback)', async () => {
    const res = await c.agent
      .post(uploadUrl())
      .set('X-XSRF-TOKEN', await c.xsrf())
      .attach('file', good, 'Läufer Æsir 跑步.mp4');
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.originalName).toBe('Läufer Æsir 跑步.mp4');
    const dl = await c.get(`/api/clips/${res.body.id}/original`);
    const header = dl.headers['content-disposition'] as string;
    expect(header).toMatch(/^attachment; /);
    expect(extendedName(header)).toBe('Läufer Æsir 跑步.mp4');
    expect(/filename="([^"]*)"/.exec(header)?.[1]).toMatch(/^Laufer [ -~]*\.mp4$/);
    await t.worker!.idle();
  });

  it('strips C0 and C1 control characters and bidi overrides from a name', async () => {
    const res = await c.agent
      .post(uploadUrl())
      .set('X-XSRF-TOKEN', await c.xsrf())
      .attach('file', good, 'run\u0085\u009b1\u202e4pm.\u2066mp4');
    expect(res.status).toBe(201);
    expect(res.body.originalName).toBe('run14pm.mp4');
    await t.worker!.idle();
  });

  it('a long name keeps its extension when shortened', () => {
    const name = cleanFileName(`${'Ä'.repeat(300)}.mp4`);
    expect(name.endsWith('.mp4')).toBe(true);
    expect([...name].length).toBeLessThanOrEqual(200);
    // A cut never leaves half a surrogate pair.
    const emoji = cleanFileName(`${'🏃'.repeat(150)}.mov`);
    expect(emoji.endsWith('.mov')).toBe(true);
    expect(emoji).not.toMatch(/[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/);
    expect([...emoji].every((ch) => ch === '🏃' || '.mov'.includes(ch))).toBe(true);
  });

  it('names with nothing left fall back to "clip"; NFD input is stored as NFC', () => {
    expect(cleanFileName('\u202e\u0000\u0085')).toBe('clip');
    expect(cleanFileName('La\u0308ufer.mp4')).toBe('Läufer.mp4');
  });

  it('the receipt download says its name with filename*', async () => {
    const o = await signedIn(t.app, owner.email, owner.password);
    const paid = await t.db('invoices').where({ status: 'paid' }).first();
    const res = await o.get(`/api/invoices/${paid.id}/receipt`);
    expect(res.status).toBe(200);
    expect(extendedName(res.headers['content-disposition'] as string)).toBe(`receipt-${paid.number}.pdf`);
  });
});
