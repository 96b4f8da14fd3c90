/**
 * Benchmark: authenticated reads (`GET /api/athletes`, `GET /api/assessments/:id`) at 50
 * connections against a bare Express JSON handler, measured side by side in one run with `wrk`
 * (rate, server CPU per request) and `h2load` (latency: every request's time from its log).
 * Target: ≥ 30 % of bare Express req/s, p99 ≤ 50 ms, 0 errors. Prints figures; not a timed test.
 *
 * Why two tools: wrk 4.1's latency figures do not add up on this server. At 50 connections, one
 * request in flight on each, the mean latency times the rate can be at most 50 (Little's law), yet
 * wrk's comes to 60–70, and its p99 (100–300 ms) is far above anything the server's own per-socket
 * timing shows (a request arrives within about 30 ms of the last answer on its socket at the p99).
 * h2load (Debian's nghttp2-client, HTTP/1.1, the same 50 connections) logs each request's start and
 * duration; its figures do add up (mean × rate ≈ 50), so the p50 and p99 are computed from that
 * log. Both tools' "in flight" figures are printed beside each other as the check.
 *
 *   npx tsx test/bench/reads.ts [--seconds 10] [--rounds 3] [--connections 50] [--sessions 50] [--postgres] [--baseline dist/baseline/main.mjs] [--keep]
 *
 * `--postgres`: besides the one server on SQLite, two servers on a private PostgreSQL server
 * (`scripts/postgres-server.ts`) read the same scenario in the same rounds, the connections split
 * between two wrk processes, one per server; their CPU per request counts both web processes and
 * PostgreSQL's own processes (also shown alone). `--baseline`: another build of the server (e.g.
 * main's `dist/server` copied aside) reads its own copy of the demo on SQLite in the same rounds,
 * right after this build's reads.
 *
 * The server is the `npm start` bundle on plain Node (default log level, its log to a file) over a
 * temp database with the demo scenario; the assessment read gets three uploaded clips first.
 * Every round runs bare → athletes → assessment; the median round is reported. Requests rotate
 * over `--sessions` signed-in sessions of the demo's owner and coaches. wrk comes from Debian: it
 * is installed with apt-get when missing (as root).
 */
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { startBenchPostgres, startWebPair, type BenchPostgres } from './support/bench-postgres';
import {
  benchDir,
  cpuSeconds,
  makeClip,
  seedDemo,
  sessionJson,
  signIn,
  startBareExpress,
  startBundledServer,
  uploadClip,
  waitReady,
  type BenchProcess,
  type Session,
} from './support/bench-server';

const { values: args } = parseArgs({
  options: {
    seconds: { type: 'string', default: '10' },
    rounds: { type: 'string', default: '3' },
    connections: { type: 'string', default: '50' },
    sessions: { type: 'string', default: '50' },
    postgres: { type: 'boolean', default: false },
    baseline: { type: 'string' },
    keep: { type: 'boolean', default: false },
  },
});
const SECONDS = Number(args.seconds);
const ROUNDS = Math.max(1, Number(args.rounds));
const CONNECTIONS = Number(args.connections);
const SESSIONS = Math.max(1, Number(args.sessions));

/** A load tool from Debian (`command` of `pkg`); installed when missing and we are root. */
function ensureTool(command: string, pkg: string): void {
  if (spawnSync(command, ['--version']).error === undefined) return;
  if (process.getuid?.() !== 0) throw new Error(`${command} is missing: apt-get install ${pkg} (as root)`);
  console.log(`installing ${pkg} (apt-get)…`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  let r = spawnSync('apt-get', ['install', '-y', '-q', pkg], { stdio: 'ignore', env });
  if (r.status !== 0) {
    spawnSync('apt-get', ['update', '-q'], { stdio: 'ignore', env });
    r = spawnSync('apt-get', ['install', '-y', '-q', pkg], { stdio: 'ignore', env });
  }
  if (r.status !== 0) throw new Error(`apt-get install ${pkg} failed`);
}

interface WrkResult {
  rps: number;
  p50: number;
  p99: number;
  requests: number;
  errors: number;
  /** What the errors were: non-2xx answers and wrk's socket errors by kind (timeouts are answers over 2 s). */
  errorKinds: string;
  /** wrk's own mean latency (ms), for the Little's-law check. */
  mean: number;
  /** The latency pass (h2load) right after this rate pass. */
  latency?: LatencyResult;
  serverCpuS: number;
  /** CPU seconds PostgreSQL's processes used meanwhile (0 on SQLite: the server process holds the database). */
  dbCpuS: number;
}

/** Latency from h2load's per-request log. */
interface LatencyResult {
  p50: number;
  p99: number;
  mean: number;
  rps: number;
  requests: number;
  /** Answers other than 2xx, and requests h2load counts as failed or errored. */
  errors: number;
}

const toMs = (value: string, unit: string) => Number(value) * ({ us: 0.001, ms: 1, s: 1000, m: 60_000 } as Record<string, number>)[unit]!;

/** One wrk process against `url` with `connections` and `threads`, rotating the session cookies (Lua); answers its report. */
function wrkProcess(url: string, script: string, connections: number, threads: number): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn('wrk', [`-t${threads}`, `-c${connections}`, `-d${SECONDS}s`, '--latency', '-s', script, url]);
    let out = '';
    let err = '';
    child.stdout.on('data', (c: Buffer) => (out += c.toString()));
    child.stderr.on('data', (c: Buffer) => (err += c.toString()));
    child.on('close', (code) => (code === 0 ? resolve(out) : reject(new Error(`wrk failed: ${err}`))));
  });
}

/** The figures of one wrk report. */
function parseWrk(out: string): Omit<WrkResult, 'serverCpuS' | 'dbCpuS' | 'latency'> {
  const lat = (pct: string) => {
    const m = new RegExp(`^\\s*${pct}%\\s+([\\d.]+)(us|ms|s|m)\\s*$`, 'm').exec(out);
    return m ? toMs(m[1]!, m[2]!) : NaN;
  };
  const socket = /Socket errors: connect (\d+), read (\d+), write (\d+), timeout (\d+)/.exec(out);
  const non2xx = Number(/Non-2xx or 3xx responses: (\d+)/.exec(out)?.[1] ?? 0);
  const avg = /^\s*Latency\s+([\d.]+)(us|ms|s|m)\s/m.exec(out);
  return {
    mean: avg ? toMs(avg[1]!, avg[2]!) : NaN,
    rps: Number(/Requests\/sec:\s+([\d.]+)/.exec(out)?.[1] ?? NaN),
    p50: lat('50'),
    p99: lat('99'),
    requests: Number(/(\d+) requests in/.exec(out)?.[1] ?? 0),
    errors: non2xx + (socket ? socket.slice(1).reduce((a, b) => a + Number(b), 0) : 0),
    errorKinds: [
      non2xx ? `non-2xx ${non2xx}` : '',
      ...(socket ? ['connect', 'read', 'write', 'timeout'].map((k, i) => (Number(socket[i + 1]) ? `${k} ${socket[i + 1]}` : '')) : []),
    ]
      .filter(Boolean)
      .join(', '),
  };
}

/**
 * Runs wrk against `path` on every target at once, the connections split evenly (one wrk process
 * each, the two threads shared out), rotating the session cookies. Rates and counts add up; the
 * median is the requests-weighted mean of the processes' medians, the p99 the worst of theirs.
 */
async function wrk(
  targets: BenchProcess[],
  p: string,
  cookies: string[],
  dir: string,
  pg: BenchPostgres | null = null,
): Promise<WrkResult> {
  const script = path.join(dir, 'rotate.lua');
  fs.writeFileSync(
    script,
    [
      `local cookies = { ${cookies.map((c) => JSON.stringify(c)).join(', ')} }`,
      'local i = 0',
      'request = function()',
      '  i = i + 1',
      `  return wrk.format(nil, nil, { ["Cookie"] = cookies[(i % #cookies) + 1] })`,
      'end',
    ].join('\n'),
  );
  const cpu = () => targets.reduce((a, t) => a + cpuSeconds(t.pid), 0);
  const cpu0 = cpu();
  const db0 = pg?.cpuSeconds() ?? 0;
  const threads = Math.max(1, Math.floor(2 / targets.length));
  const outs = await Promise.all(targets.map((t) => wrkProcess(`${t.url}${p}`, script, Math.round(CONNECTIONS / targets.length), threads)));
  const serverCpuS = cpu() - cpu0;
  const dbCpuS = (pg?.cpuSeconds() ?? 0) - db0;
  const parts = outs.map(parseWrk);
  const requests = parts.reduce((a, r) => a + r.requests, 0);
  const latency = await latencyPass(targets, p, cookies, dir);
  return {
    latency,
    mean: parts.reduce((a, r) => a + r.mean * r.requests, 0) / Math.max(1, requests),
    rps: parts.reduce((a, r) => a + r.rps, 0),
    p50: parts.reduce((a, r) => a + r.p50 * r.requests, 0) / Math.max(1, requests),
    p99: Math.max(...parts.map((r) => r.p99)),
    requests,
    errors: parts.reduce((a, r) => a + r.errors, 0),
    errorKinds: parts
      .map((r) => r.errorKinds)
      .filter(Boolean)
      .join('; '),
    serverCpuS,
    dbCpuS,
  };
}

/**
 * The latency pass: h2load (HTTP/1.1) against `path` on the targets for {@link SECONDS}, the
 * connections split over two processes (or one per target), each with its own session cookie, every
 * request's start and duration written to a log; the percentiles come from those logs.
 */
async function latencyPass(targets: BenchProcess[], p: string, cookies: string[], dir: string): Promise<LatencyResult> {
  const processes = Math.max(2, targets.length);
  const runs = Array.from({ length: processes }, (_, i) => {
    const log = path.join(dir, `h2load-${i}.log`);
    const target = targets[i % targets.length]!;
    const connections = Math.round(CONNECTIONS / processes) + (i < CONNECTIONS % processes ? 1 : 0);
    return new Promise<{ log: string; out: string }>((resolve, reject) => {
      const child = spawn('h2load', [
        '--h1',
        '-t1',
        `-c${connections}`,
        `-D${SECONDS}`,
        '-H',
        `Cookie: ${cookies[i % cookies.length]}`,
        `--log-file=${log}`,
        `${target.url}${p}`,
      ]);
      let out = '';
      child.stdout.on('data', (c: Buffer) => (out += c.toString()));
      child.stderr.on('data', (c: Buffer) => (out += c.toString()));
      child.on('close', (code) => (code === 0 ? resolve({ log, out }) : reject(new Error(`h2load failed: ${out}`))));
    });
  });
  const done = await Promise.all(runs);
  const times: number[] = [];
  let errors = 0;
  for (const { log, out } of done) {
    for (const line of fs.readFileSync(log, 'utf8').split('\n')) {
      const [, status, us] = line.split('\t');
      if (us === undefined) continue;
      if (!status!.startsWith('2')) errors++;
      times.push(Number(us) / 1000);
    }
    const failed = /requests: \d+ total, \d+ started, \d+ done, \d+ succeeded, (\d+) failed, (\d+) errored/.exec(out);
    if (failed) errors += Number(failed[1]) + Number(failed[2]);
    fs.rmSync(log, { force: true });
  }
  times.sort((a, b) => a - b);
  const at = (q: number) => times[Math.min(times.length - 1, Math.floor(times.length * q))] ?? NaN;
  return {
    p50: at(0.5),
    p99: at(0.99),
    mean: times.reduce((a, b) => a + b, 0) / Math.max(1, times.length),
    rps: times.length / SECONDS,
    requests: times.length,
    errors,
  };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const f = (n: number, d = 0) => n.toFixed(d);

/** What a database's servers read: signed-in cookies, the demo assessment with three ready clips, the roster's size. */
interface Prepared {
  cookies: string[];
  assessmentId: number;
  athletes: number;
  sizes: { athletes: number; assessment: number };
}

/** Signs `SESSIONS` sessions in on the first server (sessions live in the database), uploads three clips and waits for them. */
async function prepare(server: BenchProcess, dir: string): Promise<Prepared> {
  const staff = DEMO_SIGN_INS.filter((s) => s.role !== 'athlete');
  const sessions: Session[] = [];
  for (let i = 0; i < SESSIONS; i++) {
    const who = staff[i % staff.length]!;
    sessions.push(await signIn(server.url, who.email, who.password));
  }
  const s0 = sessions[0]!;
  const roster = await sessionJson<{ athletes: { id: number; lastName: string }[] }>(server.url, s0, 'GET', '/api/athletes');
  const ada = roster.body.athletes.find((a) => a.lastName === 'Kestrel')!;
  const visits = await sessionJson<{ assessments: { id: number; kind: string }[] }>(
    server.url,
    s0,
    'GET',
    `/api/athletes/${ada.id}/assessments`,
  );
  const assessmentId = visits.body.assessments.find((a) => a.kind === 'baseline')!.id;
  const clip = path.join(dir, 'clip.mp4');
  if (!fs.existsSync(clip)) makeClip(clip, { width: 320, height: 180, fps: 30, seconds: 1 });
  const clipIds = [];
  for (let i = 0; i < 3; i++) clipIds.push(await uploadClip(server.url, s0, assessmentId, clip));
  await waitReady(server.url, s0, clipIds);
  const size = async (p: string) => JSON.stringify((await sessionJson(server.url, s0, 'GET', p)).body).length;
  return {
    cookies: sessions.map((s) => s.cookie),
    assessmentId,
    athletes: roster.body.athletes.length,
    sizes: { athletes: await size('/api/athletes'), assessment: await size(`/api/assessments/${assessmentId}`) },
  };
}

const IDLE_SECONDS = 5;

/** CPU the servers use over {@link IDLE_SECONDS} with no request, in % of one core. */
async function idleCpu(server: BenchProcess, pair: BenchProcess[], pg: BenchPostgres | null) {
  const pairCpu = () => pair.reduce((a, p) => a + cpuSeconds(p.pid), 0);
  const [s0, p0, g0] = [cpuSeconds(server.pid), pairCpu(), pg?.cpuSeconds() ?? 0];
  await new Promise((r) => setTimeout(r, IDLE_SECONDS * 1000));
  const pct = (d: number) => (d / IDLE_SECONDS) * 100;
  return { sqlite: pct(cpuSeconds(server.pid) - s0), pair: pct(pairCpu() - p0), pg: pct((pg?.cpuSeconds() ?? 0) - g0) };
}

type Kind = 'bare' | 'athletes' | 'assessment' | 'athletesBase' | 'assessmentBase' | 'athletesPg' | 'assessmentPg';

ensureTool('wrk', 'wrk');
ensureTool('h2load', 'nghttp2-client');
const { dir, cleanup } = benchDir('reads');
let server: BenchProcess | null = null;
let bare: BenchProcess | null = null;
let pg: BenchPostgres | null = null;
let pair: BenchProcess[] = [];
let baseline: BenchProcess | null = null;
try {
  process.stdout.write('seeding the demo scenario… ');
  const dbFile = await seedDemo(dir);
  server = await startBundledServer(dir, dbFile);
  bare = await startBareExpress(dir);
  console.log(`server ${server.url}, bare Express ${bare.url}`);
  const lite = await prepare(server, dir);
  let onBase: Prepared | null = null;
  if (args.baseline) {
    const where = path.join(dir, 'baseline');
    fs.mkdirSync(where, { recursive: true });
    process.stdout.write(`${args.baseline}: seeding the demo scenario… `);
    baseline = await startBundledServer(where, await seedDemo(where), {}, [], args.baseline);
    console.log(`server ${baseline.url}`);
    onBase = await prepare(baseline, where);
  }
  let onPg: Prepared | null = null;
  if (args.postgres) {
    process.stdout.write('PostgreSQL: seeding the demo scenario… ');
    pg = await startBenchPostgres(dir);
    pair = await startWebPair(dir, pg);
    console.log(`servers ${pair.map((p) => p.url).join(' and ')}`);
    onPg = await prepare(pair[0]!, dir);
  }
  console.log(
    `${lite.athletes} athletes (${lite.sizes.athletes} B), assessment with 3 clips ` +
      `(${lite.sizes.assessment} B); ${SESSIONS} sessions; wrk -c${CONNECTIONS} ${SECONDS} s × ${ROUNDS} rounds; ${process.platform} ${process.arch}, ` +
      `${os.cpus().length} cores, Node ${process.version}` +
      (onPg ? `; on PostgreSQL ${onPg.sizes.athletes} B and ${onPg.sizes.assessment} B` : ''),
  );

  // What the servers spend with no request at all (timers, the worker's queue polling, PostgreSQL's own), in % of a core.
  const idle = await idleCpu(server, pair, pg);
  console.log(
    `idle CPU over ${IDLE_SECONDS} s: SQLite server ${f(idle.sqlite, 1)} % of a core` +
      (onPg ? `; PostgreSQL web servers ${f(idle.pair, 1)} %, PostgreSQL itself ${f(idle.pg, 1)} %` : ''),
  );

  const runs: Record<Kind, WrkResult[]> = {
    bare: [],
    athletes: [],
    assessment: [],
    athletesBase: [],
    assessmentBase: [],
    athletesPg: [],
    assessmentPg: [],
  };
  const kinds: Kind[] = [
    'bare',
    'athletes',
    ...(onBase ? (['athletesBase'] as const) : []),
    'assessment',
    ...(onBase ? (['assessmentBase'] as const) : []),
    ...(onPg ? (['athletesPg', 'assessmentPg'] as const) : []),
  ];
  for (let round = 1; round <= ROUNDS; round++) {
    runs.bare.push(await wrk([bare], '/api/bare', lite.cookies, dir));
    runs.athletes.push(await wrk([server], '/api/athletes', lite.cookies, dir));
    if (onBase) runs.athletesBase.push(await wrk([baseline!], '/api/athletes', onBase.cookies, dir));
    runs.assessment.push(await wrk([server], `/api/assessments/${lite.assessmentId}`, lite.cookies, dir));
    if (onBase) runs.assessmentBase.push(await wrk([baseline!], `/api/assessments/${onBase.assessmentId}`, onBase.cookies, dir));
    if (onPg) {
      runs.athletesPg.push(await wrk(pair, '/api/athletes', onPg.cookies, dir, pg));
      runs.assessmentPg.push(await wrk(pair, `/api/assessments/${onPg.assessmentId}`, onPg.cookies, dir, pg));
    }
    const line = (k: Kind) => {
      const r = runs[k].at(-1)!;
      const l = r.latency!;
      return (
        `${k} ${f(r.rps)} req/s (wrk) p50 ${f(l.p50, 1)} p99 ${f(l.p99, 1)} ms (h2load; wrk's p99 ${f(r.p99, 1)}) ` +
        `err ${r.errors + l.errors}${r.errors ? ` (${r.errorKinds})` : ''}`
      );
    };
    console.log(`round ${round}: ${kinds.map(line).join(' | ')}`);
  }

  const summary = (k: Kind) => {
    const rs = runs[k];
    const mid = [...rs].sort((a, b) => a.rps - b.rps)[Math.floor(rs.length / 2)]!;
    const lat = (pick: (l: LatencyResult) => number) => median(rs.map((r) => pick(r.latency!)));
    /** Requests in flight by Little's law (mean latency × rate), per connection: at most 1 when the latencies add up. */
    const inFlight = (mean: number, rps: number) => ((mean / 1000) * rps) / CONNECTIONS;
    return {
      ...mid,
      p50: lat((l) => l.p50),
      p99: lat((l) => l.p99),
      wrkP99: median(rs.map((r) => r.p99)),
      h2loadInFlight: median(rs.map((r) => inFlight(r.latency!.mean, r.latency!.rps))),
      wrkInFlight: median(rs.map((r) => inFlight(r.mean, r.rps))),
      errors: rs.reduce((a, r) => a + r.errors + r.latency!.errors, 0),
    };
  };
  const b = summary('bare');
  const allRequests = (k: Kind) =>
    Math.max(
      1,
      runs[k].reduce((a, r) => a + r.requests, 0),
    );
  /** Server-side CPU per request (µs) of a kind over all its rounds (steadier than one round's): web processes and PostgreSQL. */
  const cpuUs = (k: Kind) => (runs[k].reduce((a, r) => a + r.serverCpuS + r.dbCpuS, 0) / allRequests(k)) * 1e6;
  /** PostgreSQL's share of it (µs). */
  const dbUs = (k: Kind) => (runs[k].reduce((a, r) => a + r.dbCpuS, 0) / allRequests(k)) * 1e6;
  console.log('');
  console.log(
    `| read (${CONNECTIONS} connections) | req/s | of bare Express | median | p99 | wrk's p99 | in flight per connection, h2load / wrk | errors | server CPU per request | of it PostgreSQL | bare CPU ÷ this CPU |`,
  );
  console.log('| --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- |');
  const row = (name: string, k: Kind) => {
    const r = summary(k);
    console.log(
      `| ${name} | ${f(r.rps)} | ${k === 'bare' ? '100 %' : `${f((r.rps / b.rps) * 100, 1)} %`} | ${f(r.p50, 1)} ms | ${f(r.p99, 1)} ms | ${f(r.wrkP99, 1)} ms | ${f(r.h2loadInFlight, 2)} / ${f(r.wrkInFlight, 2)} | ${r.errors} | ${f(cpuUs(k))} µs | ${k.endsWith('Pg') ? `${f(dbUs(k))} µs` : '–'} | ${f((cpuUs('bare') / cpuUs(k)) * 100, 1)} % |`,
    );
  };
  row('bare Express `res.json`', 'bare');
  row('`GET /api/athletes` (SQLite, one server)', 'athletes');
  if (onBase) row('`GET /api/athletes` (SQLite, baseline build)', 'athletesBase');
  row('`GET /api/assessments/:id` (SQLite, one server)', 'assessment');
  if (onBase) row('`GET /api/assessments/:id` (SQLite, baseline build)', 'assessmentBase');
  if (onPg) {
    row('`GET /api/athletes` (PostgreSQL, two servers)', 'athletesPg');
    row('`GET /api/assessments/:id` (PostgreSQL, two servers)', 'assessmentPg');
  }
  /** Whether these reads meet the target: ≥ 30 % of bare Express, p99 ≤ 50 ms, no errors. */
  const meets = (ks: Kind[]) =>
    ks.every((k) => {
      const r = summary(k);
      return r.rps / b.rps >= 0.3 && r.p99 <= 50 && r.errors === 0;
    });
  const ratio = (k: Kind) => `${f((cpuUs('bare') / cpuUs(k)) * 100, 1)} %`;
  console.log(
    `\nCPU per request (all rounds): bare ${f(cpuUs('bare'))} µs, roster ${f(cpuUs('athletes'))} µs, assessment ${f(cpuUs('assessment'))} µs` +
      (onBase ? ` (baseline build: roster ${f(cpuUs('athletesBase'))} µs, assessment ${f(cpuUs('assessmentBase'))} µs)` : '') +
      (onPg ? `; on PostgreSQL roster ${f(cpuUs('athletesPg'))} µs, assessment ${f(cpuUs('assessmentPg'))} µs` : '') +
      ` — the rate these imply where the server has a core to itself: ${kinds
        .filter((k) => k !== 'bare' && !k.endsWith('Base'))
        .map(ratio)
        .join(', ')} of bare (load average ${os
        .loadavg()
        .map((l) => l.toFixed(1))
        .join(' ')})`,
  );
  console.log(
    "\nmedian and p99 from h2load's per-request log; rates and CPU from wrk. In flight per connection is the mean latency × rate ÷ connections: " +
      'with one request at a time on each connection it cannot exceed 1, so a tool whose figure does exceed it reports latencies longer than the requests took.',
  );
  const verdict = (ks: Kind[]) => (meets(ks) ? 'met' : 'NOT met');
  // The target is the product as `npm start` runs it (one server on SQLite); PostgreSQL's two servers
  // share these 2 cores with PostgreSQL itself and are printed as a reference, with their own verdict.
  console.log(
    `\ntarget (≥ 30 % of bare, p99 ≤ 50 ms, 0 errors), one server on SQLite: ${verdict(['athletes', 'assessment'])}` +
      (onPg ? `; two servers on PostgreSQL on the same cores (reference): ${verdict(['athletesPg', 'assessmentPg'])}` : ''),
  );
} finally {
  await server?.stop();
  await bare?.stop();
  await baseline?.stop();
  for (const p of pair) await p.stop();
  pg?.stop();
  if (args.keep) console.log(`kept ${dir}`);
  else cleanup();
}
