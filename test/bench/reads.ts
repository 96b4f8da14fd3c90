/**
 * Benchmark: authenticated reads (`GET /api/athletes`, `GET /api/assessments/:id`) at 50
 * connections against a bare Express JSON handler, measured side by side in one run with `wrk`.
 * Target: ≥ 30 % of bare Express req/s, p99 ≤ 50 ms, 0 errors. Prints figures; not a timed test.
 *
 *   npx tsx test/bench/reads.ts [--seconds 10] [--rounds 3] [--connections 50] [--sessions 50] [--keep] [--baseline dist/baseline/main.mjs]
 *
 * The server is the `npm start` bundle on plain Node (default log level, its log to a file) over a
 * temp database with the demo scenario; the assessment read gets three uploaded clips first.
 * Every round runs bare → athletes → assessment; the median round is reported. Requests rotate
 * over `--sessions` signed-in sessions of the demo's owner and coaches. `--baseline` runs another
 * build of the server (e.g. main's `dist/server` copied aside) beside this one, each of its reads
 * right after this build's in every round, over its own copy of the demo. wrk comes from Debian: it
 * is installed with apt-get when missing (as root).
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
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
    keep: { type: 'boolean', default: false },
    baseline: { type: 'string' },
  },
});
const SECONDS = Number(args.seconds);
const ROUNDS = Math.max(1, Number(args.rounds));
const CONNECTIONS = Number(args.connections);
const SESSIONS = Math.max(1, Number(args.sessions));

/** wrk from Debian; installed when missing and we are root. */
function ensureWrk(): void {
  if (spawnSync('wrk', ['--version']).error === undefined) return;
  if (process.getuid?.() !== 0) throw new Error('wrk is missing: apt-get install wrk (as root)');
  console.log('installing wrk (apt-get)…');
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  let r = spawnSync('apt-get', ['install', '-y', '-q', 'wrk'], { stdio: 'ignore', env });
  if (r.status !== 0) {
    spawnSync('apt-get', ['update', '-q'], { stdio: 'ignore', env });
    r = spawnSync('apt-get', ['install', '-y', '-q', 'wrk'], { stdio: 'ignore', env });
  }
  if (r.status !== 0) throw new Error('apt-get install wrk failed');
}

interface WrkResult {
  rps: number;
  p50: number;
  p99: number;
  requests: number;
  errors: number;
  /** What the errors were: non-2xx answers and wrk's socket errors by kind (timeouts are answers over 2 s). */
  errorKinds: string;
  serverCpuS: number;
}

const toMs = (value: string, unit: string) => Number(value) * ({ us: 0.001, ms: 1, s: 1000, m: 60_000 } as Record<string, number>)[unit]!;

/** Runs wrk against `url`, rotating the session cookies (Lua), and parses its report. */
function wrk(url: string, cookies: string[], dir: string, target: BenchProcess): WrkResult {
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
  const cpu0 = cpuSeconds(target.pid);
  const r = spawnSync('wrk', ['-t2', `-c${CONNECTIONS}`, `-d${SECONDS}s`, '--latency', '-s', script, url], { encoding: 'utf8' });
  const cpu = cpuSeconds(target.pid) - cpu0;
  if (r.status !== 0) throw new Error(`wrk failed: ${r.stderr}`);
  const out = r.stdout;
  const lat = (pct: string) => {
    const m = new RegExp(`^\\s*${pct}%\\s+([\\d.]+)(us|ms|s|m)\\s*$`, 'm').exec(out);
    return m ? toMs(m[1]!, m[2]!) : NaN;
  };
  const socket = /Socket errors: connect (\d+), read (\d+), write (\d+), timeout (\d+)/.exec(out);
  const non2xx = Number(/Non-2xx or 3xx responses: (\d+)/.exec(out)?.[1] ?? 0);
  return {
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
    serverCpuS: cpu,
  };
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const f = (n: number, d = 0) => n.toFixed(d);

/** A server under test, signed in and ready: the URLs of its two reads and the cookies of its sessions. */
interface Prepared {
  server: BenchProcess;
  cookies: string[];
  athletesUrl: string;
  assessmentUrl: string;
}

/** Seeds a demo in `where`, starts `bundle` (default: this build) over it, signs in and uploads the assessment's clips. */
async function prepare(where: string, bundle?: string): Promise<Prepared> {
  fs.mkdirSync(where, { recursive: true });
  const dbFile = await seedDemo(where);
  const server = await startBundledServer(where, dbFile, {}, [], bundle);
  started.push(server);
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
  const clip = makeClip(path.join(where, 'clip.mp4'), { width: 320, height: 180, fps: 30, seconds: 1 });
  const clipIds = [];
  for (let i = 0; i < 3; i++) clipIds.push(await uploadClip(server.url, s0, assessmentId, clip));
  await waitReady(server.url, s0, clipIds);
  const sizes = {
    athletes: (await sessionJson(server.url, s0, 'GET', '/api/athletes')).body,
    assessment: (await sessionJson(server.url, s0, 'GET', `/api/assessments/${assessmentId}`)).body,
  };
  console.log(
    `${bundle ?? 'this build'}: ${roster.body.athletes.length} athletes (${JSON.stringify(sizes.athletes).length} B), assessment with ${clipIds.length} clips ` +
      `(${JSON.stringify(sizes.assessment).length} B)`,
  );
  return {
    server,
    cookies: sessions.map((s) => s.cookie),
    athletesUrl: `${server.url}/api/athletes`,
    assessmentUrl: `${server.url}/api/assessments/${assessmentId}`,
  };
}

ensureWrk();
const { dir, cleanup } = benchDir('reads');
const started: BenchProcess[] = [];
try {
  process.stdout.write('seeding the demo scenario… ');
  const current = await prepare(dir);
  const base = args.baseline ? await prepare(path.join(dir, 'baseline'), args.baseline) : null;
  const bare = await startBareExpress(dir);
  started.push(bare);
  console.log(
    `server ${current.server.url}, bare Express ${bare.url}; ${SESSIONS} sessions; wrk -c${CONNECTIONS} ${SECONDS} s × ${ROUNDS} rounds; ${process.platform} ${process.arch}, ` +
      `${(await import('node:os')).cpus().length} cores, Node ${process.version}`,
  );
  const cookies = current.cookies;
  type Kind = 'bare' | 'athletes' | 'assessment' | 'athletesBase' | 'assessmentBase';
  const runs: Record<Kind, WrkResult[]> = { bare: [], athletes: [], assessment: [], athletesBase: [], assessmentBase: [] };
  const kinds: Kind[] = base ? ['bare', 'athletes', 'athletesBase', 'assessment', 'assessmentBase'] : ['bare', 'athletes', 'assessment'];
  const target: Record<Kind, [string, string[], BenchProcess]> = {
    bare: [`${bare.url}/api/bare`, cookies, bare],
    athletes: [current.athletesUrl, cookies, current.server],
    assessment: [current.assessmentUrl, cookies, current.server],
    athletesBase: base ? [base.athletesUrl, base.cookies, base.server] : ['', [], bare],
    assessmentBase: base ? [base.assessmentUrl, base.cookies, base.server] : ['', [], bare],
  };
  for (let round = 1; round <= ROUNDS; round++) {
    for (const k of kinds) runs[k].push(wrk(target[k][0], target[k][1], dir, target[k][2]));
    const line = (k: Kind) => {
      const r = runs[k].at(-1)!;
      return `${k} ${f(r.rps)} req/s p50 ${f(r.p50, 1)} p99 ${f(r.p99, 1)} ms err ${r.errors}${r.errors ? ` (${r.errorKinds})` : ''}`;
    };
    console.log(`round ${round}: ${kinds.map(line).join(' | ')}`);
  }

  const summary = (k: Kind) => {
    const rs = runs[k];
    const mid = [...rs].sort((a, b) => a.rps - b.rps)[Math.floor(rs.length / 2)]!;
    return { ...mid, p99: median(rs.map((r) => r.p99)), errors: rs.reduce((a, r) => a + r.errors, 0) };
  };
  const b = summary('bare');
  /** Server CPU per request (µs) of a kind, over all its rounds (steadier than one round's). */
  const cpuUs = (k: Kind) =>
    (runs[k].reduce((a, r) => a + r.serverCpuS, 0) /
      Math.max(
        1,
        runs[k].reduce((a, r) => a + r.requests, 0),
      )) *
    1e6;
  console.log('');
  console.log(
    `| read (${CONNECTIONS} connections) | req/s | of bare Express | median | p99 | errors | server CPU per request | bare CPU ÷ this CPU |`,
  );
  console.log('| --- | --- | --- | --- | --- | --- | --- | --- |');
  const row = (name: string, k: Kind) => {
    const r = summary(k);
    console.log(
      `| ${name} | ${f(r.rps)} | ${k === 'bare' ? '100 %' : `${f((r.rps / b.rps) * 100, 1)} %`} | ${f(r.p50, 1)} ms | ${f(r.p99, 1)} ms | ${r.errors} | ${f(cpuUs(k))} µs | ${f((cpuUs('bare') / cpuUs(k)) * 100, 1)} % |`,
    );
  };
  row('bare Express `res.json`', 'bare');
  row('`GET /api/athletes`', 'athletes');
  if (base) row('`GET /api/athletes` (baseline build)', 'athletesBase');
  row('`GET /api/assessments/:id`', 'assessment');
  if (base) row('`GET /api/assessments/:id` (baseline build)', 'assessmentBase');
  const ok = (['athletes', 'assessment'] as const).every((k) => {
    const r = summary(k);
    return r.rps / b.rps >= 0.3 && r.p99 <= 50 && r.errors === 0;
  });
  console.log(
    `\nCPU per request (all rounds): bare ${f(cpuUs('bare'))} µs, roster ${f(cpuUs('athletes'))} µs, assessment ${f(cpuUs('assessment'))} µs` +
      (base ? ` (baseline build: roster ${f(cpuUs('athletesBase'))} µs, assessment ${f(cpuUs('assessmentBase'))} µs)` : '') +
      ` — the rate these imply where the server has a core to itself: ${f((cpuUs('bare') / cpuUs('athletes')) * 100, 1)} % and ` +
      `${f((cpuUs('bare') / cpuUs('assessment')) * 100, 1)} % of bare (load average ${(await import('node:os'))
        .loadavg()
        .map((l) => l.toFixed(1))
        .join(' ')})`,
  );
  console.log(`\ntarget (≥ 30 % of bare, p99 ≤ 50 ms, 0 errors): ${ok ? 'met' : 'NOT met'}`);
} finally {
  for (const p of started) await p.stop();
  if (args.keep) console.log(`kept ${dir}`);
  else cleanup();
}
