/**
 * What the server benchmarks share: the real server as `npm start` runs it (the esbuild bundle on
 * plain Node) over a temp database holding the demo scenario and a temp uploads folder, a bare
 * Express process beside it, signed-in sessions, small clips made with ffmpeg and uploaded
 * through the API, and latency statistics.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { buildServer, SERVER_BUNDLE, SERVER_ENV, SERVER_NODE_ARGS } from '../../../scripts/build-server';
import { createDb, migrate } from '../../../server/db/knex';
import { seed } from '../../../seeds/demo-scenario';

/** A process the benchmark started, listening at `url`. */
export interface BenchProcess {
  url: string;
  pid: number;
  stop(): Promise<void>;
}

/** A temp folder for one run, removed by `cleanup` (also on Ctrl+C). */
export function benchDir(prefix: string): { dir: string; cleanup: () => void } {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), `tf-bench-${prefix}-`));
  const cleanup = () => fs.rmSync(dir, { recursive: true, force: true, maxRetries: 5 });
  for (const signal of ['SIGINT', 'SIGTERM'] as const) {
    process.once(signal, () => {
      cleanup();
      process.exit(130);
    });
  }
  return { dir, cleanup };
}

/**
 * Migrates `dir/db.sqlite` and seeds the demo scenario (clinic, staff, athletes, assessments,
 * plans, invoices) without rendering the demo clips; benchmarks upload their own clips.
 */
export async function seedDemo(dir: string): Promise<string> {
  const dbFile = path.join(dir, 'db.sqlite');
  const db = createDb(dbFile);
  await migrate(db);
  await seed(db);
  await db.destroy();
  return dbFile;
}

async function waitForLine(file: string, pattern: RegExp, child: ChildProcess, what: string): Promise<RegExpExecArray> {
  const started = Date.now();
  for (;;) {
    const text = fs.existsSync(file) ? fs.readFileSync(file, 'utf8') : '';
    const m = pattern.exec(text);
    if (m) return m;
    if (child.exitCode !== null) throw new Error(`${what} exited (${child.exitCode}):\n${text.slice(-2000)}`);
    if (Date.now() - started > 60_000) throw new Error(`${what} did not start within a minute:\n${text.slice(-2000)}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

function stopper(child: ChildProcess): () => Promise<void> {
  return () =>
    new Promise<void>((resolve) => {
      if (child.exitCode !== null) return resolve();
      child.once('exit', () => resolve());
      child.kill('SIGTERM');
      setTimeout(() => child.exitCode === null && child.kill('SIGKILL'), 10_000).unref();
    });
}

/**
 * Builds the server bundle (unless another `bundle` is given) and runs it with plain Node, as `npm start` does, on a free port with
 * the default log level (its log goes to `dir/server.log`, written by the server itself, so
 * reading it costs the benchmark nothing; `logName` when several run in one folder). Demo mode,
 * with the fake mail and payment services on free ports. `bundle`: another build of the server to
 * run instead (e.g. an earlier one, side by side).
 */
export async function startBundledServer(
  dir: string,
  dbFile: string,
  env: Record<string, string> = {},
  nodeArgs: string[] = [],
  bundle = SERVER_BUNDLE,
  logName = 'server.log',
): Promise<BenchProcess> {
  if (bundle === SERVER_BUNDLE) await buildServer();
  const log = path.join(dir, logName);
  const fd = fs.openSync(log, 'a');
  // BENCH_CPU_PROF=dir writes the server's CPU profile there when it stops (node --cpu-prof).
  const prof = process.env['BENCH_CPU_PROF'];
  if (prof)
    nodeArgs = [
      ...nodeArgs,
      '--import=data:text/javascript,process.on("SIGTERM",()=>process.exit(0))',
      '--cpu-prof',
      `--cpu-prof-dir=${prof}`,
    ];
  if (process.env['BENCH_NODE_ARGS']) nodeArgs = [...nodeArgs, ...process.env['BENCH_NODE_ARGS'].split(' ')];
  if (process.env['BENCH_NODE_IMPORT']) nodeArgs = [...nodeArgs, `--import=${process.env['BENCH_NODE_IMPORT']}`];
  // As `npm start` runs it: the same Node flags and allocator settings.
  const child = spawn(process.execPath, [...SERVER_NODE_ARGS, ...nodeArgs, bundle], {
    stdio: ['ignore', fd, fd],
    env: {
      ...SERVER_ENV,
      ...process.env,
      PORT: '0',
      DB_FILE: dbFile,
      UPLOADS_DIR: path.join(dir, 'uploads'),
      CLIENT_DIR: '',
      FAKE_SMTP_PORT: '0',
      DEMO_INBOX_PORT: '0',
      FAKE_PAYMENTS_PORT: '0',
      ...env,
    },
  });
  fs.closeSync(fd);
  const m = await waitForLine(log, /Trailframe API listening on (http:\/\/\S+)/, child, 'the server');
  return { url: m[1]!.replace('localhost', '127.0.0.1'), pid: child.pid!, stop: stopper(child) };
}

/**
 * A bare Express app in its own Node process: a JSON read (`GET /api/bare`) and a JSON write that
 * parses the body and answers a revision (`PUT /api/bare`, bodies up to 8 MB as the app allows
 * for annotations), nothing else.
 */
export async function startBareExpress(dir: string): Promise<BenchProcess> {
  const log = path.join(dir, 'bare.log');
  // Anew: a run that starts it again must not read the last one's address.
  const fd = fs.openSync(log, 'w');
  const code = `
    import express from 'express';
    const app = express();
    app.get('/api/bare', (_req, res) => { res.json({ ok: true }); });
    let revision = 0;
    app.put('/api/bare', express.json({ limit: '8mb' }), (req, res) => { res.json({ revision: ++revision, landmarks: req.body.landmarks?.length ?? 0 }); });
    const s = app.listen(0, '127.0.0.1', () => console.log('bare listening on http://127.0.0.1:' + s.address().port));`;
  const child = spawn(process.execPath, ['--input-type=module', '-e', code], { stdio: ['ignore', fd, fd], cwd: process.cwd() });
  fs.closeSync(fd);
  const m = await waitForLine(log, /bare listening on (http:\/\/\S+)/, child, 'bare Express');
  return { url: m[1]!, pid: child.pid!, stop: stopper(child) };
}

/** CPU seconds (user + system) a process has used so far, from /proc (Linux). */
export function cpuSeconds(pid: number): number {
  try {
    const fields = fs.readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ');
    return (Number(fields[11]) + Number(fields[12])) / 100;
  } catch {
    return NaN;
  }
}

/**
 * Keep-alive agent for the benchmark's own HTTP calls. An idle socket is dropped after 4 s, before
 * the server's 5 s keep-alive timeout closes it, so a request never goes out on a socket the server
 * is closing (an ECONNRESET that says nothing about the server).
 */
export const agent = new http.Agent({ keepAlive: true, maxSockets: 256, timeout: 4000 });

export interface Answer {
  status: number;
  headers: http.IncomingHttpHeaders;
  body: string;
}

/** One HTTP request; `body` is a string or Buffer (JSON callers stringify). */
export function httpRequest(
  url: string,
  opts: { method?: string; headers?: Record<string, string>; body?: string | Buffer } = {},
): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const req = http.request(url, { method: opts.method ?? 'GET', headers: opts.headers, agent }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks).toString('utf8') }));
      res.on('error', reject);
    });
    req.on('error', reject);
    req.end(opts.body);
  });
}

/** A signed-in session: its cookies and CSRF token, as the Angular app would send them. */
export interface Session {
  cookie: string;
  xsrf: string;
}

const cookieValue = (headers: http.IncomingHttpHeaders, name: string): string | undefined =>
  ([] as string[])
    .concat(headers['set-cookie'] ?? [])
    .find((c) => c.startsWith(`${name}=`))
    ?.split(';')[0]!
    .slice(name.length + 1);

/** Signs in through the API (CSRF cookie first, as the browser does). */
export async function signIn(base: string, email: string, password: string): Promise<Session> {
  const csrf = await httpRequest(`${base}/api/auth/csrf`);
  let xsrf = cookieValue(csrf.headers, 'XSRF-TOKEN')!;
  const res = await httpRequest(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-xsrf-token': decodeURIComponent(xsrf), cookie: `XSRF-TOKEN=${xsrf}` },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in as ${email}: ${res.status} ${res.body}`);
  const sid = cookieValue(res.headers, 'tf.sid')!;
  xsrf = cookieValue(res.headers, 'XSRF-TOKEN') ?? xsrf;
  return { cookie: `tf.sid=${sid}; XSRF-TOKEN=${xsrf}`, xsrf: decodeURIComponent(xsrf) };
}

/** JSON request in a session; answers status, parsed body and the round-trip time (ms). */
export async function sessionJson<T = unknown>(
  base: string,
  s: Session,
  method: string,
  p: string,
  body?: unknown,
): Promise<{ status: number; body: T; ms: number }> {
  const t0 = performance.now();
  const res = await httpRequest(`${base}${p}`, {
    method,
    headers: {
      cookie: s.cookie,
      'x-xsrf-token': s.xsrf,
      ...(body === undefined ? {} : { 'content-type': 'application/json' }),
    },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  const ms = performance.now() - t0;
  return { status: res.status, body: (res.body ? JSON.parse(res.body) : null) as T, ms };
}

/** An H.264 clip from ffmpeg's test source (ultrafast preset). */
export function makeClip(file: string, spec: { width: number; height: number; fps: number; seconds: number }): string {
  const r = spawnSync(
    'ffmpeg',
    [
      ...['-hide_banner', '-v', 'error', '-y', '-f', 'lavfi'],
      ...['-i', `testsrc2=size=${spec.width}x${spec.height}:rate=${spec.fps}`, '-t', String(spec.seconds)],
      ...['-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p', file],
    ],
    { stdio: ['ignore', 'ignore', 'inherit'] },
  );
  if (r.status !== 0) throw new Error('ffmpeg could not make the benchmark clip');
  return file;
}

/**
 * Uploads `file` to an assessment as a multipart body, sent at most `bytesPerSecond` (a phone on
 * a real network, not loopback speed); answers the new clip's id.
 */
export function uploadClip(base: string, s: Session, assessmentId: number, file: string, bytesPerSecond = Infinity): Promise<number> {
  const boundary = `----tfbench${Math.random().toString(16).slice(2)}`;
  const head = Buffer.from(
    `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${path.basename(file)}"\r\nContent-Type: video/mp4\r\n\r\n`,
  );
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
  const data = fs.readFileSync(file);
  return new Promise((resolve, reject) => {
    const req = http.request(
      `${base}/api/assessments/${assessmentId}/clips`,
      {
        method: 'POST',
        agent,
        headers: {
          cookie: s.cookie,
          'x-xsrf-token': s.xsrf,
          'content-type': `multipart/form-data; boundary=${boundary}`,
          'content-length': String(head.length + data.length + tail.length),
        },
      },
      (res) => {
        let text = '';
        res.on('data', (c: Buffer) => (text += c.toString()));
        res.on('end', () =>
          res.statusCode === 201
            ? resolve((JSON.parse(text) as { id: number }).id)
            : reject(new Error(`upload: ${res.statusCode} ${text}`)),
        );
      },
    );
    req.on('error', reject);
    req.write(head);
    const chunk = 64 * 1024;
    let at = 0;
    const started = performance.now();
    const pump = () => {
      while (at < data.length) {
        const due = started + (at / bytesPerSecond) * 1000;
        if (due > performance.now() + 1) return void setTimeout(pump, due - performance.now());
        const part = data.subarray(at, at + chunk);
        at += part.length;
        if (!req.write(part)) return void req.once('drain', pump);
      }
      req.end(tail);
    };
    pump();
  });
}

/** Waits until every clip is `ready` (fails on `failed`). */
export async function waitReady(base: string, s: Session, clipIds: number[], timeoutMs = 600_000): Promise<void> {
  const started = Date.now();
  const pending = new Set(clipIds);
  while (pending.size) {
    for (const id of [...pending]) {
      const r = await sessionJson<{ status: string }>(base, s, 'GET', `/api/clips/${id}`);
      if (r.body.status === 'ready') pending.delete(id);
      else if (r.body.status === 'failed') throw new Error(`clip ${id} failed to process`);
    }
    if (Date.now() - started > timeoutMs) throw new Error(`${pending.size} clips not ready in time`);
    if (pending.size) await new Promise((r) => setTimeout(r, 500));
  }
}

/** The q-quantile (0–1) of `xs` (nearest rank). */
export function quantile(xs: number[], q: number): number {
  if (!xs.length) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil(q * s.length) - 1))]!;
}

export const ms = (n: number) => (Number.isFinite(n) ? `${n < 10 ? n.toFixed(1) : Math.round(n)} ms` : '–');
