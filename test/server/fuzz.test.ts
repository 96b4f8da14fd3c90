/**
 * Fuzz: malformed requests against every mounted API route (read from the app's router, so a new
 * route is fuzzed without being listed here), as anonymous and as signed-in owner, coach and
 * athlete with a valid CSRF token so requests reach validation. Bad JSON, wrong types, 1 MB
 * strings, numbers that parse to Infinity, `__proto__` keys, SQL-shaped strings in ids, sort and
 * filter params, malformed multipart, wrong content types, very long URLs. Every answer must be
 * below 500 with our error shape, and no upload temp file may be left behind.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Express } from 'express';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client, makeTestApp, signedIn, type TestApp } from '../support/test-app';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { loadConfig } from '../../server/config';
import { baselineVisit } from '../support/bodies';

const [owner, coach, , athlete] = DEMO_SIGN_INS;
let t: TestApp;
const callers: { who: string; client: Client }[] = [];
/** Real ids of the demo athlete's records, by the path segment before `:id`, so requests reach validation. */
const ids: Record<string, number> = {};

beforeAll(async () => {
  t = await makeTestApp(
    {
      rateLimit: {
        ...loadConfig({} as NodeJS.ProcessEnv).rateLimit,
        signInAttempts: 100_000,
        accountAttempts: 100_000,
        resetRequests: 100_000,
      },
    },
    // About input handling with hundreds of odd requests, not mail: the in-memory mailer is enough.
    { fakePayments: true, fakeSmtp: false },
  );
  callers.push({ who: 'anonymous', client: new Client(t.app) });
  for (const [who, cred] of [
    ['owner', owner],
    ['coach', coach],
    ['athlete', athlete],
  ] as const) {
    const client = await signedIn(t.app, cred.email, cred.password);
    await client.refreshToken();
    callers.push({ who, client });
  }
  const staff = callers.find((c) => c.who === 'coach')!.client;
  const ada = await t.db('athletes').where({ email: athlete.email }).first();
  ids['athletes'] = ada.id;
  const assessment = await staff.post(`/api/athletes/${ada.id}/assessments`, baselineVisit());
  ids['assessments'] = assessment.body.id;
  const at = new Date().toISOString();
  const [clip] = await t
    .db('clips')
    .insert({
      clinic_id: ada.clinic_id,
      athlete_id: ada.id,
      assessment_id: assessment.body.id,
      uploaded_by: null,
      original_name: 'side.mp4',
      stored_name: 'original.mp4',
      size_bytes: 1,
      container: 'mp4',
      status: 'ready',
      frame_count: 60,
      fps: 30,
      width: 320,
      height: 180,
      thumb_count: 0,
      created_at: at,
      updated_at: at,
    })
    .returning('id');
  ids['clips'] = (clip as { id: number }).id;
  const plan = await t.db('plans').where({ athlete_id: ada.id }).orderBy('id', 'desc').first();
  if (plan) ids['plans'] = plan.id;
  const invoice = await t.db('invoices').where({ athlete_id: ada.id }).orderBy('id').first();
  if (invoice) ids['invoices'] = invoice.id;
  const exercise = await t.db('exercises').where({ clinic_id: ada.clinic_id }).first();
  if (exercise) ids['exercises'] = exercise.id;
  const price = await t.db('prices').where({ clinic_id: ada.clinic_id }).first();
  if (price) ids['prices'] = price.id;
});
afterAll(async () => {
  await t?.close();
});

/** `METHOD /api/path` of every route mounted under the API router. */
function mountedRoutes(app: Express): { method: string; pattern: string }[] {
  type Layer = { route?: { path: string; methods: Record<string, boolean> }; handle?: { stack?: Layer[] } };
  const out = new Map<string, { method: string; pattern: string }>();
  const walk = (stack: Layer[]) => {
    for (const layer of stack) {
      if (layer.route)
        for (const m of Object.keys(layer.route.methods))
          out.set(`${m} ${layer.route.path}`, { method: m, pattern: `/api${layer.route.path}` });
      else if (layer.handle?.stack) walk(layer.handle.stack);
    }
  };
  for (const layer of (app as unknown as { router: { stack: Layer[] } }).router.stack) if (layer.handle?.stack) walk(layer.handle.stack);
  return [...out.values()].filter((r) => !r.pattern.includes('*') && !r.pattern.includes('(?!'));
}

const VALID_PARAM: Record<string, string> = { id: '1', n: '0', token: 'A'.repeat(43), key: 'fuzz-key-0001' };
/** The route with its params filled by real ids where the fixtures have one. */
const goodUrlOf = (pattern: string) =>
  pattern
    .replace(
      /\/(\w[\w-]*)\/:(\w+)/g,
      (_, seg: string, name: string) => `/${seg}/${name === 'id' && ids[seg] ? ids[seg] : (VALID_PARAM[name] ?? '1')}`,
    )
    .replace(/:(\w+)/g, (_, name: string) => VALID_PARAM[name] ?? '1');
const BAD_PARAMS = [
  '-1',
  '0',
  '1.5',
  '1e3',
  'NaN',
  'Infinity',
  '9007199254740993',
  '99999999999999999999999',
  '0x1F',
  '%00',
  '%E0%A4%A',
  '..%2F..%2Fetc%2Fpasswd',
  '__proto__',
  "1'%20OR%20'1'='1",
  '1;DROP%20TABLE%20users',
  'x'.repeat(3000),
];
const fill = (pattern: string, value: (name: string) => string) => pattern.replace(/:(\w+)/g, (_, name: string) => value(name));

/** Query strings with SQL-shaped, repeated, nested and out-of-range sort and filter values. */
const QUERIES = [
  "?q=' OR 1=1--&status=paid;DROP TABLE invoices&athleteId=1 OR 1=1&sort=name;--&order=desc,(select 1)",
  '?from=2026-13-45&to=0000-00-00&keys=__proto__,constructor&baseline=abc&retest=-1&archived=maybe&download=%00',
  '?status=open&status=paid&athleteId[]=1&region[$ne]=x&kind=__proto__&q=' + 'z'.repeat(5000),
  '?q=%F0%9F%8F%83%00%1B[31m&limit=NaN&offset=Infinity&page=-1&sort=1e309',
];

/** JSON text (sent as application/json unless a type is given). */
interface Variant {
  what: string;
  body: string | Buffer;
  type?: string;
}
const KITCHEN = {
  name: 1,
  email: [],
  password: {},
  title: null,
  date: 'NaN',
  kind: 7,
  stages: 'x',
  sets: { a: 1 },
  caption: ['x'],
  frameIndex: '0',
  pain: 11.5,
  currency: 'EURO',
  lines: [{}],
  firstName: true,
  key: "'; DROP TABLE log_entries;--",
  action: '__proto__',
  nearSide: 'middle',
  captureFps: -1,
};
const BODY_VARIANTS: Variant[] = [
  { what: 'truncated JSON', body: '{"name": "a", "sets": [1, 2' },
  { what: 'NaN literal', body: '{"value": NaN, "pain": Infinity}' },
  {
    what: 'number overflowing to Infinity',
    body: '{"pain": 1e999, "frameIndex": -1e999, "captureFps": 1e999, "sets": 1e999, "amount": 1e999, "painDuring": 1e999}',
  },
  { what: 'a JSON array', body: '[1, 2, 3]' },
  { what: 'a JSON string', body: '"hello"' },
  { what: 'JSON null', body: 'null' },
  { what: 'wrong types everywhere', body: JSON.stringify(KITCHEN) },
  {
    what: '__proto__ and constructor keys',
    body: '{"__proto__": {"role": "owner", "isAdmin": true}, "constructor": {"prototype": {"polluted": 1}}, "name": "x"}',
  },
  { what: 'a 1 MB string', body: JSON.stringify({ name: 'x'.repeat(1_000_000), caption: 'y' }) },
  { what: 'deep nesting', body: '['.repeat(5000) + ']'.repeat(5000) },
  { what: 'text/plain', body: 'name=x', type: 'text/plain' },
  { what: 'form-urlencoded', body: 'name=x&__proto__[role]=owner', type: 'application/x-www-form-urlencoded' },
  { what: 'XML', body: '<?xml version="1.0"?><a>1</a>', type: 'application/xml' },
  {
    what: 'multipart without boundary',
    body: '--b\r\nContent-Disposition: form-data; name="file"; filename="a.mp4"\r\n\r\nabc\r\n--b--\r\n',
    type: 'multipart/form-data',
  },
  {
    what: 'truncated multipart',
    body: '--b\r\nContent-Disposition: form-data; name="file"; filename="a.mp4"\r\nContent-Type: video/mp4\r\n\r\n' + 'x'.repeat(5000),
    type: 'multipart/form-data; boundary=b',
  },
  {
    what: 'multipart with a wrong boundary',
    body: '--zz\r\nContent-Disposition: form-data; name="file"; filename="a.mp4"\r\n\r\nabc\r\n--zz--\r\n',
    type: 'multipart/form-data; boundary=b',
  },
  { what: 'empty multipart', body: '', type: 'multipart/form-data; boundary=b' },
  { what: 'binary garbage as JSON', body: Buffer.from([0xff, 0xfe, 0x00, 0x7b, 0x22, 0xc3, 0x28]) },
];

interface Outcome {
  label: string;
  status: number;
  body: unknown;
}
const outcomes: Outcome[] = [];

async function call(client: Client, method: string, url: string, variant?: Variant): Promise<Outcome> {
  const label = `${method.toUpperCase()} ${url.length > 120 ? url.slice(0, 120) + '…' : url}${variant ? ` [${variant.what}]` : ''}`;
  let req = (client.agent as unknown as Record<string, (u: string) => import('supertest').Test>)[method]!(url);
  if (method !== 'get') req = req.set('X-XSRF-TOKEN', await client.xsrf());
  // Bytes go as they are (superagent would send a Buffer as JSON of its bytes).
  if (variant)
    req = req
      .set('Content-Type', variant.type ?? 'application/json')
      .serialize((b: unknown) => b as string)
      .send(variant.body);
  const res = await req.timeout(20_000).catch((err: { status?: number; response?: { status: number; body: unknown }; code?: string }) => {
    if (err.response) return err.response;
    // A connection the server closed on purpose (e.g. an upload refused unread) is not a 5xx.
    return { status: 0, body: { closed: err.code ?? String(err) } };
  });
  const o = { label, status: res.status, body: res.body };
  outcomes.push(o);
  return o;
}

describe('fuzz: malformed requests across every route family', () => {
  it('never answers 5xx, always answers 4xx in our error shape, and leaves nothing in uploads/tmp', { timeout: 600_000 }, async () => {
    const routes = mountedRoutes(t.app);
    expect(routes.length).toBeGreaterThan(60);
    const families = new Set(routes.map((r) => r.pattern.split('/')[2]));
    for (const { who, client } of callers) {
      const signedInCaller = who !== 'anonymous';
      for (const r of routes) {
        // Routes that end the session or open a never-ending stream are called with bad ids only.
        const endsSession = r.pattern === '/api/auth/sign-out';
        const stream = r.pattern.endsWith('-events');
        const destructive = r.method === 'delete';
        const goodUrl = goodUrlOf(r.pattern);
        const hasParams = r.pattern.includes(':');
        const badUrls = hasParams ? BAD_PARAMS.map((bad) => fill(r.pattern, () => bad)) : [];
        if (r.method === 'get') {
          if (!stream)
            for (const q of signedInCaller ? QUERIES : QUERIES.slice(0, 1)) await call(client, 'get', goodUrl + q.replace(/ /g, '%20'));
          for (const url of signedInCaller ? badUrls : badUrls.slice(0, 2)) await call(client, 'get', url);
          continue;
        }
        if (signedInCaller && endsSession) continue;
        if (!destructive)
          for (const v of signedInCaller ? BODY_VARIANTS : BODY_VARIANTS.slice(0, 3)) await call(client, r.method, goodUrl, v);
        for (const url of signedInCaller ? badUrls.slice(0, 8) : badUrls.slice(0, 2)) await call(client, r.method, url, BODY_VARIANTS[6]);
      }
      // Very long URLs and unknown paths.
      await call(client, 'get', `/api/athletes/${'9'.repeat(12_000)}`);
      await call(client, 'get', `/api/${'a/'.repeat(4_000)}`);
      await call(client, 'post', `/api/plans/1/logs?${'x=1&'.repeat(3_000)}`, BODY_VARIANTS[6]);
    }

    const byStatus = outcomes.reduce<Record<number, number>>((m, o) => ({ ...m, [o.status]: (m[o.status] ?? 0) + 1 }), {});
    console.log('fuzz answers by status', JSON.stringify(byStatus), 'requests', outcomes.length);
    const serverErrors = outcomes.filter((o) => o.status >= 500);
    expect(serverErrors.map((o) => `${o.label} → ${o.status} ${JSON.stringify(o.body).slice(0, 200)}`)).toEqual([]);
    const unshaped = outcomes.filter(
      // (A HEAD answer carries no body.)
      (o) =>
        o.status >= 400 &&
        o.status !== 431 &&
        !o.label.startsWith('HEAD ') &&
        !(o.body as { error?: { code?: string; message?: string } })?.error?.message,
    );
    expect(unshaped.map((o) => `${o.label} → ${o.status}`)).toEqual([]);
    expect(outcomes.length).toBeGreaterThanOrEqual(300);
    expect(families.size).toBeGreaterThanOrEqual(15);
    expect(fs.readdirSync(path.join(t.config.uploadsDir, 'tmp'))).toEqual([]);
  });
});

describe('text that is not UTF-8', () => {
  /** The bytes of `{"firstName":"a<bytes>b"}`. */
  const nameWith = (bytes: number[]) => Buffer.concat([Buffer.from('{"firstName":"a'), Buffer.from(bytes), Buffer.from('b"}')]);
  const cases: { what: string; body: Buffer | string }[] = [
    { what: 'a byte that starts no UTF-8 character', body: nameWith([0xff]) },
    { what: 'a cut two-byte character', body: nameWith([0xc3, 0x28]) },
    { what: 'an overlong NUL', body: nameWith([0xc0, 0x80]) },
    { what: 'a surrogate in UTF-8 bytes', body: nameWith([0xed, 0xa0, 0x80]) },
    { what: 'an escaped NUL', body: '{"firstName":"a\\u0000b"}' },
    { what: 'an escaped lone high surrogate', body: '{"firstName":"a\\ud83cb"}' },
    { what: 'an escaped lone low surrogate', body: '{"firstName":"a\\udfc3b"}' },
    { what: 'an escaped NUL in a key', body: '{"firstName":"Ada","x\\u0000":1}' },
  ];
  it('is refused with 400 invalid_text and stores nothing; escaped pairs and other characters still go through', async () => {
    const staff = callers.find((c) => c.who === 'coach')!.client;
    const url = `/api/athletes/${ids['athletes']}`;
    const send = async (body: Buffer | string) =>
      staff.agent
        .patch(url)
        .set('X-XSRF-TOKEN', await staff.xsrf())
        .set('Content-Type', 'application/json')
        // The bytes as they are (superagent would otherwise send a Buffer as JSON of its bytes).
        .serialize((b: unknown) => b as string)
        .send(body);
    const before = await t.db('athletes').where({ id: ids['athletes'] }).first();
    for (const { what, body } of cases) {
      const res = await send(body);
      expect(res.status, `${what}: ${JSON.stringify(res.body)}`).toBe(400);
      expect(res.body.error.code, what).toBe('invalid_text');
    }
    expect(await t.db('athletes').where({ id: ids['athletes'] }).first()).toEqual(before);
    // A pair escaped as two \u escapes is one character (U+1F3C3), as is the same character in UTF-8 bytes.
    const pair = await send('{"firstName":"Ada\\ud83c\\udfc3"}');
    expect(pair.status).toBe(200);
    expect(pair.body.firstName).toBe('Ada\u{1F3C3}');
    const plain = await send(Buffer.from('{"firstName":"Ad\\u00e4 \\"Zo\u00eb\\" \u{1F3C3}"}', 'utf8'));
    expect(plain.status).toBe(200);
    expect(plain.body.firstName).toBe('Ad\u00e4 "Zo\u00eb" \u{1F3C3}');
  });
});
