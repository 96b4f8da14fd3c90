/**
 * Benchmark: annotation autosave (`PUT /api/clips/:id/annotations`) while five uploads run.
 * Targets: ≥ 200 saves/s at saturation (50 annotators saving back to back), p99 ≤ 200 ms at a
 * realistic open-loop 25 saves/s (50 annotators, one save every 2 s each on average), and no
 * acknowledged save lost. Prints figures; not a timed test. Side by side in the same run (uploads
 * running too): a bare Express process that only parses the same bodies and answers, at the same
 * 50 clients back to back, so the saturation rate is also printed as a share of what this
 * machine's Node and loopback can do at that moment.
 *
 *   npx tsx test/bench/autosave.ts [--annotators 50] [--uploads 5] [--seconds 15] [--rate 25] [--postgres] [--keep]
 *
 * `--postgres`: after the server on SQLite, the same measurement on two web servers over a private
 * PostgreSQL server (`scripts/postgres-server.ts`), the annotators and uploads shared out between
 * the two; printed side by side. CPU per save then counts both web processes and PostgreSQL's own.
 *
 * The server is the `npm start` bundle on plain Node over a temp database with the demo scenario.
 * Each annotator edits its own clip (uploaded first through the API) like the review workspace
 * does: the whole document (landmarks on about 60 frame-sides of the synthetic runner, its gait
 * events, a scale bar) with one point moved, based on the revision its last save answered. The
 * uploads are 1280×720 clips sent at 1 MB/s each (a phone, not loopback speed), one after another,
 * so frame extraction runs all along. Open-loop latency counts from when a save was due, so a slow
 * server cannot hide its queue. At the end the server stops and the database is read directly: every
 * revision a 200 answered must be in the audit log, each clip's revision must be its last answered
 * one, and its stored landmarks must be those of that save.
 */
import fs from 'node:fs';
import path from 'node:path';
import os from 'node:os';
import { parseArgs } from 'node:util';
import { createDb } from '../../server/db/knex';
import { jsonTextEquals } from '../../server/db/dialect';
import { DEMO_SIGN_INS } from '../../seeds/demo-scenario';
import { buildGroundTruth } from '../../scripts/demo-clip/ground-truth';
import type { ClipAnnotationsWrite, FrameLandmarks, GaitEventMark } from '../../src/contracts/annotations';
import { startBenchPostgres, startWebPair, type BenchPostgres } from './support/bench-postgres';
import {
  benchDir,
  cpuSeconds,
  httpRequest,
  makeClip,
  ms,
  quantile,
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
    annotators: { type: 'string', default: '50' },
    uploads: { type: 'string', default: '5' },
    seconds: { type: 'string', default: '15' },
    rate: { type: 'string', default: '25' },
    postgres: { type: 'boolean', default: false },
    keep: { type: 'boolean', default: false },
  },
});
const ANNOTATORS = Number(args.annotators);
const UPLOADS = Number(args.uploads);
const SECONDS = Number(args.seconds);
const RATE = Number(args.rate);

/** The synthetic runner's marks as a coach would place them: event frames and every sixth frame. */
function runnerDocument(): Omit<ClipAnnotationsWrite, 'baseRevision'> & { frameCount: number } {
  const truth = buildGroundTruth({ fps: 120, width: 160, height: 90, seconds: 1.5, hipExtensionDeg: 8, facing: 'right', beltSpeedMps: 3 });
  const sides = { near: truth.nearSide, far: truth.nearSide === 'right' ? 'left' : 'right' } as const;
  const events: GaitEventMark[] = [];
  const marked = new Set<number>();
  for (const key of ['near', 'far'] as const) {
    for (const f of truth.events[key].initialContact) events.push({ frame: f, side: sides[key], kind: 'initial_contact' });
    for (const f of truth.events[key].toeOff) events.push({ frame: f, side: sides[key], kind: 'toe_off' });
  }
  for (const e of events) marked.add(e.frame);
  for (let f = 0; f < truth.frameCount; f += 6) marked.add(f);
  const landmarks: FrameLandmarks[] = [];
  for (const f of [...marked].sort((a, b) => a - b)) {
    const frame = truth.frames[f]!;
    for (const key of ['near', 'far'] as const)
      landmarks.push({ frame: f, side: sides[key], points: { ...frame.landmarksNormalised[key] } });
  }
  return {
    frameCount: truth.frameCount,
    landmarks,
    events: events.sort((a, b) => a.frame - b.frame),
    scale: { frame: 0, a: { x: 0.1, y: 0.95 }, b: { x: 0.6, y: 0.95 }, lengthM: 1 },
    gauges: [],
  };
}

interface Annotator {
  /** The web server this annotator's browser talks to. */
  base: string;
  session: Session;
  clipId: number;
  revision: number;
  doc: Omit<ClipAnnotationsWrite, 'baseRevision'>;
  /** Revisions the server answered 200 for. */
  acked: number[];
  /** The body of the last answered save. */
  lastSavedBody: string | null;
  busy: Promise<void>;
}

interface Tally {
  latencies: number[];
  ok: number;
  conflicts: number;
  errors: number;
  /** Error answers by status or failure code. */
  errorKinds: Map<string, number>;
}

const tally = (): Tally => ({ latencies: [], ok: 0, conflicts: 0, errors: 0, errorKinds: new Map() });

/** Moves one point a little, as a drag would, and saves the whole document. */
async function save(a: Annotator, t: Tally, dueAt: number): Promise<void> {
  const lm = a.doc.landmarks[Math.floor(Math.random() * a.doc.landmarks.length)]!;
  const name = (Object.keys(lm.points) as (keyof typeof lm.points)[])[Math.floor(Math.random() * 6)]!;
  const p = lm.points[name]!;
  lm.points[name] = { x: Math.min(0.99, Math.max(0.01, p.x + (Math.random() - 0.5) * 0.004)), y: p.y };
  // Serialised once: sent, and kept as the record of what an acknowledged save held.
  const body = JSON.stringify({ baseRevision: a.revision, ...a.doc } satisfies ClipAnnotationsWrite);
  try {
    const r = await httpRequest(`${a.base}/api/clips/${a.clipId}/annotations`, {
      method: 'PUT',
      headers: { cookie: a.session.cookie, 'x-xsrf-token': a.session.xsrf, 'content-type': 'application/json' },
      body,
    });
    t.latencies.push(performance.now() - dueAt);
    // The revision is the answer's second field; no need to parse 20 KiB for it.
    const revision = Number(/"revision":(\d+)/.exec(r.body)?.[1]);
    if (r.status === 200) {
      t.ok++;
      a.revision = revision;
      a.acked.push(revision);
      a.lastSavedBody = body;
    } else if (r.status === 409) {
      t.conflicts++;
      if (Number.isInteger(revision)) a.revision = revision;
    } else {
      t.errors++;
      t.errorKinds.set(`${r.status}`, (t.errorKinds.get(`${r.status}`) ?? 0) + 1);
    }
  } catch (err) {
    t.errors++;
    const kind = (err as NodeJS.ErrnoException).code ?? String(err);
    t.errorKinds.set(kind, (t.errorKinds.get(kind) ?? 0) + 1);
  }
}

/** Closed loop: every annotator saves again as soon as its last save is answered. */
async function saturate(annotators: Annotator[], seconds: number): Promise<{ t: Tally; wallS: number }> {
  const t = tally();
  const started = performance.now();
  const until = started + seconds * 1000;
  await Promise.all(
    annotators.map(async (a) => {
      while (performance.now() < until) await save(a, t, performance.now());
    }),
  );
  return { t, wallS: (performance.now() - started) / 1000 };
}

/**
 * Open loop at `rate` saves/s in all: each annotator's saves come due at random (Poisson) times;
 * one whose last save is still out sends when it is answered, as the app's autosave does, and
 * the wait counts in the latency.
 */
async function openLoop(annotators: Annotator[], rate: number, seconds: number): Promise<Tally> {
  const t = tally();
  const perAnnotator = rate / annotators.length;
  const started = performance.now();
  const until = started + seconds * 1000;
  await Promise.all(
    annotators.map(async (a) => {
      let due = started + (-Math.log(1 - Math.random()) / perAnnotator) * 1000;
      const pending: Promise<void>[] = [];
      while (due < until) {
        const dueAt = due;
        const wait = dueAt - performance.now();
        if (wait > 0) await new Promise((r) => setTimeout(r, wait));
        const previous = a.busy;
        a.busy = previous.then(() => save(a, t, dueAt));
        pending.push(a.busy);
        due += (-Math.log(1 - Math.random()) / perAnnotator) * 1000;
      }
      await Promise.all(pending);
    }),
  );
  return t;
}

/** Closed loop against the bare Express PUT: the same bodies, the same clients; answers answers/s. */
async function saturateBare(url: string, annotators: Annotator[], seconds: number): Promise<{ rate: number; ok: number; errors: number }> {
  const bodies = annotators.map((a) => JSON.stringify({ baseRevision: a.revision, ...a.doc }));
  let ok = 0;
  let errors = 0;
  const started = performance.now();
  const until = started + seconds * 1000;
  await Promise.all(
    bodies.map(async (body) => {
      while (performance.now() < until) {
        const r = await httpRequest(url, { method: 'PUT', headers: { 'content-type': 'application/json' }, body }).catch(() => null);
        if (r?.status === 200) ok++;
        else errors++;
      }
    }),
  );
  return { rate: ok / ((performance.now() - started) / 1000), ok, errors };
}

/** Keeps `n` uploads going until `stop()`, shared out over the servers at `bases`; answers how many finished. */
function uploadsRunning(bases: string[], s: Session, assessmentId: number, file: string, n: number) {
  let running = true;
  let done = 0;
  let failed = 0;
  const loops = Array.from({ length: n }, async (_, i) => {
    while (running) {
      await uploadClip(bases[i % bases.length]!, s, assessmentId, file, 1_000_000).then(
        () => done++,
        () => failed++,
      );
    }
  });
  return {
    async stop() {
      running = false;
      await Promise.all(loops);
      return { done, failed };
    },
  };
}

/** Reads the database after the run: acknowledged saves missing from it. */
async function lostSaves(dbTarget: string, annotators: Annotator[]): Promise<{ lost: number; checked: number; problems: string[] }> {
  const db = createDb(dbTarget);
  const problems: string[] = [];
  let lost = 0;
  let checked = 0;
  for (const a of annotators) {
    const audited = await db('audit_log')
      .where({ action: 'clip.annotated' })
      .where(jsonTextEquals(db, 'detail', ['clipId'], a.clipId))
      .select<{ detail: string }[]>('detail');
    const revisions = new Set(audited.map((r) => (JSON.parse(r.detail) as { revision: number }).revision));
    for (const r of a.acked) {
      checked++;
      if (!revisions.has(r)) lost++;
    }
    const last = a.acked.at(-1);
    if (last === undefined) continue;
    const current = (await db('clips').where({ id: a.clipId }).first<{ annotation_revision: number }>('annotation_revision'))!
      .annotation_revision;
    if (current !== last) problems.push(`clip ${a.clipId}: revision ${current} in the database, ${last} answered last`);
    const rows = await db('clip_landmarks')
      .where({ clip_id: a.clipId })
      .select<{ frame: number; side: string; landmark: string; x: number; y: number }[]>('frame', 'side', 'landmark', 'x', 'y');
    const stored = new Map(rows.map((p) => [`${p.frame}:${p.side}:${p.landmark}`, p]));
    const lastSaved = a.lastSavedBody ? (JSON.parse(a.lastSavedBody) as ClipAnnotationsWrite).landmarks : [];
    const differs = lastSaved.some((l) =>
      Object.entries(l.points).some(([name, p]) => {
        const s = stored.get(`${l.frame}:${l.side}:${name}`);
        return !s || s.x !== p!.x || s.y !== p!.y;
      }),
    );
    if (differs) problems.push(`clip ${a.clipId}: the stored landmarks are not those of the last answered save`);
  }
  await db.destroy();
  return { lost, checked, problems };
}

/** What one database's run measured. */
interface Measured {
  satRate: number;
  sat: Tally;
  open: Tally;
  bare: { rate: number; errors: number };
  bareCpuMs: number;
  /** Server-side CPU per save at saturation (ms): web processes, and PostgreSQL's when it runs apart. */
  saveCpuMs: number;
  /** PostgreSQL's share of it (ms), or null on SQLite. */
  dbCpuMs: number | null;
  ownCpuPct: number;
  uploads: { done: number; failed: number };
  check: Awaited<ReturnType<typeof lostSaves>>;
}

/**
 * The whole measurement on `servers` (one on SQLite; two on PostgreSQL, the annotators and uploads
 * shared out between them) over `dbTarget`; stops the servers before reading the database.
 */
async function measure(servers: BenchProcess[], dbTarget: string, dir: string, pg: BenchPostgres | null): Promise<Measured> {
  const bases = servers.map((sv) => sv.url);
  const base = bases[0]!;
  const staff = DEMO_SIGN_INS.filter((s) => s.role !== 'athlete');
  const sessions: Session[] = [];
  for (let i = 0; i < ANNOTATORS; i++) sessions.push(await signIn(base, staff[i % staff.length]!.email, staff[i % staff.length]!.password));
  const s0 = sessions[0]!;
  const roster = await sessionJson<{ athletes: { id: number; lastName: string }[] }>(base, s0, 'GET', '/api/athletes');
  const ada = roster.body.athletes.find((a) => a.lastName === 'Kestrel')!;
  const visits = await sessionJson<{ assessments: { id: number; kind: string }[] }>(base, s0, 'GET', `/api/athletes/${ada.id}/assessments`);
  const [annotateIn, uploadTo] = [
    visits.body.assessments.find((a) => a.kind === 'baseline')!.id,
    visits.body.assessments.find((a) => a.kind === 'retest')!.id,
  ];

  const doc = runnerDocument();
  process.stdout.write(`uploading ${ANNOTATORS} clips to annotate (160×90, 120 fps, ${doc.frameCount} frames)… `);
  const small = path.join(dir, 'small.mp4');
  if (!fs.existsSync(small)) makeClip(small, { width: 160, height: 90, fps: 120, seconds: doc.frameCount / 120 });
  const clipIds: number[] = [];
  for (let i = 0; i < ANNOTATORS; i += 5) {
    clipIds.push(
      ...(await Promise.all(
        Array.from({ length: Math.min(5, ANNOTATORS - i) }, (_, j) => uploadClip(bases[(i + j) % bases.length]!, s0, annotateIn, small)),
      )),
    );
  }
  await waitReady(base, s0, clipIds);
  console.log('ready');
  const annotators: Annotator[] = clipIds.map((clipId, i) => ({
    base: bases[i % bases.length]!,
    session: sessions[i]!,
    clipId,
    revision: 0,
    doc: structuredClone({ landmarks: doc.landmarks, events: doc.events, scale: doc.scale, gauges: doc.gauges }),
    acked: [],
    lastSavedBody: null,
    busy: Promise.resolve(),
  }));
  const bodyBytes = JSON.stringify({ baseRevision: 0, ...annotators[0]!.doc }).length;
  const big = path.join(dir, 'upload.mp4');
  if (!fs.existsSync(big)) makeClip(big, { width: 1280, height: 720, fps: 30, seconds: 6 });
  console.log(
    `${ANNOTATORS} annotators over ${servers.length} server(s), ${annotators[0]!.doc.landmarks.length} landmark frame-sides per save (${Math.round(bodyBytes / 1024)} KiB), ` +
      `${UPLOADS} uploads of a ${fs.statSync(big).size >> 20} MiB 720p clip at 1 MB/s each; ` +
      `${os.cpus().length} cores, Node ${process.version}`,
  );

  // Warm up (first saves create rows, JIT), uploads not yet running.
  await saturate(annotators, 2);

  const uploads = uploadsRunning(bases, s0, uploadTo, big, UPLOADS);
  await new Promise((r) => setTimeout(r, 3000));
  const bareServer = await startBareExpress(dir);
  let bareSat: { rate: number; ok: number; errors: number };
  let bareCpuMs: number;
  try {
    const bareCpu0 = cpuSeconds(bareServer.pid);
    bareSat = await saturateBare(`${bareServer.url}/api/bare`, annotators, SECONDS / 3);
    bareCpuMs = ((cpuSeconds(bareServer.pid) - bareCpu0) / Math.max(1, bareSat.ok)) * 1000;
  } finally {
    await bareServer.stop();
  }
  const serverCpu = () => servers.reduce((a, sv) => a + cpuSeconds(sv.pid), 0);
  const cpu0 = serverCpu();
  const db0 = pg?.cpuSeconds() ?? 0;
  const own0 = process.cpuUsage();
  const sat = await saturate(annotators, SECONDS);
  const satCpu = serverCpu() - cpu0;
  const dbCpu = (pg?.cpuSeconds() ?? 0) - db0;
  const own = process.cpuUsage(own0);
  const open = await openLoop(annotators, RATE, SECONDS + 5);
  const up = await uploads.stop();
  for (const sv of servers) await sv.stop();
  const check = await lostSaves(dbTarget, annotators);
  const saves = Math.max(1, sat.t.ok);
  return {
    satRate: sat.t.ok / sat.wallS,
    sat: sat.t,
    open,
    bare: bareSat,
    bareCpuMs,
    saveCpuMs: ((satCpu + dbCpu) / saves) * 1000,
    dbCpuMs: pg ? (dbCpu / saves) * 1000 : null,
    ownCpuPct: ((own.user + own.system) / 1e6 / sat.wallS) * 100,
    uploads: up,
    check,
  };
}

const { dir, cleanup } = benchDir('autosave');
let server: BenchProcess | null = null;
let pg: BenchPostgres | null = null;
let pair: BenchProcess[] = [];
try {
  const dbFile = await seedDemo(dir);
  server = await startBundledServer(dir, dbFile);
  const results: [string, Measured][] = [['SQLite, one server', await measure([server], dbFile, dir, null)]];
  server = null;
  if (args.postgres) {
    process.stdout.write('PostgreSQL: seeding the demo scenario… ');
    pg = await startBenchPostgres(dir);
    pair = await startWebPair(dir, pg);
    console.log(`servers ${pair.map((p) => p.url).join(' and ')}`);
    results.push(['PostgreSQL, two servers', await measure(pair, pg.url, dir, pg)]);
    pair = [];
  }

  console.log('');
  console.log(
    `| autosave with ${UPLOADS} uploads running | saturation saves/s (${ANNOTATORS} back to back) | p50 | p99 | of bare PUT/s | open loop ${RATE}/s due: p50 | p99 | 409 | errors | server CPU per save | of it PostgreSQL | acknowledged saves lost |`,
  );
  console.log('| --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- |');
  for (const [name, m] of results) {
    console.log(
      `| ${name} | ${m.satRate.toFixed(0)} | ${ms(quantile(m.sat.latencies, 0.5))} | ${ms(quantile(m.sat.latencies, 0.99))} | ` +
        `${((m.satRate / m.bare.rate) * 100).toFixed(1)} % of ${m.bare.rate.toFixed(0)} | ${ms(quantile(m.open.latencies, 0.5))} | ${ms(quantile(m.open.latencies, 0.99))} | ` +
        `${m.sat.conflicts + m.open.conflicts} | ${m.sat.errors + m.open.errors} | ${m.saveCpuMs.toFixed(2)} ms | ${m.dbCpuMs === null ? '–' : `${m.dbCpuMs.toFixed(2)} ms`} | ` +
        `${m.check.lost} of ${m.check.checked} |`,
    );
  }
  for (const [name, m] of results) {
    console.log(
      `\n${name}: server CPU per save at saturation ${m.saveCpuMs.toFixed(2)} ms (the server processes: receiving uploads included, their ffmpeg children not` +
        `${m.dbCpuMs === null ? '' : '; PostgreSQL included'}); bare Express CPU per PUT ${m.bareCpuMs.toFixed(2)} ms; bare ÷ save ${((m.bareCpuMs / m.saveCpuMs) * 100).toFixed(1)} %; ` +
        `one core's worth of saves at this CPU: ${(1000 / m.saveCpuMs).toFixed(0)}/s; ` +
        `this benchmark's own CPU ${m.ownCpuPct.toFixed(0)} % of a core; uploads finished ${m.uploads.done}, failed ${m.uploads.failed}`,
    );
    for (const [phase, t] of [
      ['saturation', m.sat],
      ['open loop', m.open],
    ] as const)
      if (t.errors) console.log(`${phase} errors: ${[...t.errorKinds].map(([k, n]) => `${k} × ${n}`).join(', ')}`);
    if (m.check.problems.length) console.log(`${m.check.problems.length} problems:`);
    for (const p of m.check.problems.slice(0, 10)) console.log(`  ${p}`);
  }
  console.log(
    `\nload average ${os
      .loadavg()
      .map((l) => l.toFixed(1))
      .join(' ')}`,
  );
  const met = results.every(
    ([, m]) => m.satRate >= 200 && quantile(m.open.latencies, 0.99) <= 200 && m.check.lost === 0 && !m.check.problems.length,
  );
  console.log(`\ntarget (≥ 200 saves/s at saturation, open-loop p99 ≤ 200 ms, 0 lost): ${met ? 'met' : 'NOT met'}`);
} finally {
  await server?.stop();
  for (const p of pair) await p.stop();
  pg?.stop();
  if (args.keep) console.log(`kept ${dir}`);
  else cleanup();
}
