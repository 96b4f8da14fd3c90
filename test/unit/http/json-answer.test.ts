/**
 * The app's `res.json` (server/http/json-answer.ts) against Express's own, on two apps side by side:
 * the same status, headers (Date aside) and bytes for small and large bodies, HEAD, 204, a
 * Content-Type set before, and an answer with an ETag (Express's, which may answer 304).
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type Express } from 'express';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { useJsonAnswer } from '../../../server/http/json-answer';

const big = { clips: Array.from({ length: 40 }, (_, i) => ({ id: i, name: `clip ${i} — ünïcödé ✓`, fps: 119.88 })) };

function app(lean: boolean): Express {
  const a = express();
  a.set('etag', false);
  if (lean) useJsonAnswer(a);
  a.get('/small', (_req, res) => void res.json({ ok: true }));
  a.get('/big', (_req, res) => void res.json(big));
  a.get('/none', (_req, res) => void res.json(undefined));
  a.get('/created', (_req, res) => void res.status(201).json({ id: 7 }));
  a.get('/empty', (_req, res) => void res.status(204).json({ ignored: true }));
  a.get('/typed', (_req, res) => void res.type('application/problem+json').json({ title: 'x' }));
  a.get('/tagged', (_req, res) => void res.setHeader('ETag', '"v1"').json(big));
  a.get('/value', (req, res) => void res.json(JSON.parse(String(req.query['v']))));
  return a;
}

interface Answer {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: string;
}

let servers: http.Server[] = [];
let bases: [string, string];

beforeAll(async () => {
  servers = [http.createServer(app(false)), http.createServer(app(true))];
  await Promise.all(servers.map((s) => new Promise<void>((r) => s.listen(0, '127.0.0.1', r))));
  bases = servers.map((s) => `http://127.0.0.1:${(s.address() as AddressInfo).port}`) as [string, string];
});
afterAll(() => servers.forEach((s) => s.close()));

function get(base: string, path: string, method = 'GET', headers: Record<string, string> = {}): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const req = http.request(`${base}${path}`, { method, headers }, (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => (body += c));
      res.on('end', () => {
        const { date: _date, ...rest } = res.headers;
        resolve({ status: res.statusCode!, headers: rest, body });
      });
    });
    req.on('error', reject);
    req.end();
  });
}

async function same(path: string, method = 'GET', headers: Record<string, string> = {}) {
  const [theirs, ours] = await Promise.all(bases.map((b) => get(b, path, method, headers)));
  expect(ours).toEqual(theirs);
  return ours!;
}

describe("the app's res.json", () => {
  it("answers what Express's answers: small and large bodies, no body, another status, HEAD", async () => {
    expect((await same('/small')).body).toBe('{"ok":true}');
    const large = await same('/big');
    expect(large.body.length).toBeGreaterThan(1000);
    expect(large.headers['content-length']).toBe(String(Buffer.byteLength(large.body)));
    await same('/none');
    expect((await same('/created')).status).toBe(201);
    const head = await same('/big', 'HEAD');
    expect(head.body).toBe('');
    expect(head.headers['content-length']).toBe(large.headers['content-length']);
  });

  it('sends no body with 204, and keeps a Content-Type set before', async () => {
    expect((await same('/empty')).body).toBe('');
    const typed = await get(bases[1], '/typed');
    expect(typed.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(JSON.parse(typed.body)).toEqual({ title: 'x' });
  });

  it('leaves an answer with an ETag to Express (a matching If-None-Match gets 304)', async () => {
    expect((await same('/tagged', 'GET', { 'if-none-match': '"v1"' })).status).toBe(304);
    expect((await same('/tagged')).status).toBe(200);
  });

  it('sends the same bytes as Express for any JSON value (property check)', async () => {
    await fc.assert(
      fc.asyncProperty(fc.jsonValue(), async (value) => {
        await same(`/value?v=${encodeURIComponent(JSON.stringify(value))}`);
      }),
      { numRuns: 60 },
    );
  });
});
