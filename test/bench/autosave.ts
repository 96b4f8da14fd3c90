/**
 * Benchmark: annotation autosave (`PUT /api/clips/:id/annotations`) while five uploads run.
 * Targets: ≥ 200 saves/s at saturation (50 annotators saving back to back), p99 ≤ 200 ms at a
 * realistic open-loop 25 saves/s (50 annotators, one save every 2 s each on average), and no
 * acknowledged save lost. Prints figures; not a timed test. Side by side in the same run (uploads
 * running too): a bare Express process that only parses the same bodies and answers, at the same
 * 50 clients back to back, so the saturation rate is also printed as a share of what this
 * machine's Node and loopback can do at that moment.
 *
 *   npx tsx test/bench/autosave.ts [--annotators 50] [--uploads 5] [--seconds 15] [--rate 25] [--keep]
 *                                  [--before <git revision> [--rounds 3]] [--postgres]
 *
 * With `--postgres`, two web servers on a private PostgreSQL server (`scripts/postgres-server.ts`)
 * take their turn too, the annotators and uploads shared out between them; their CPU per save
 * counts both web processes and PostgreSQL's own processes (also shown alone).
 *
 * With `--before`, the server as it was at that revision (bundled from `git archive`) runs beside
 * this build on its own copy of the database, and the saturation is measured in rounds, the two
 * taking turns, each with its own five uploads running: CPU per save printed for both (medians).
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
import { spawnSync } from 'node:child_process';
import { buildServer } from '../../scripts/build-server';
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
    keep: { type: 'boolean', default: false },
    before: { type: 'string' },
    rounds: { type: 'string', default: '3' },
    postgres: { type: 'boolean', default: false },
  },
});
const ANNOTATORS = Number(args.annotators);
const UPLOADS = Number(args.uploads);
const SECONDS = Number(args.seconds);
const RATE = Number(args.rate);
/** A git revision to measure beside this build (saturation rounds taking turns), or none. */
const BEFORE = args.before;
const ROUNDS = Number(args.rounds);

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

/** Keeps `n` uploads going until `stop()`; answers how many finished. */
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

/** A server under test, its annotators on their clips, and where the uploads go. */
interface Subject {
  name: string;
  /** One server, or two on PostgreSQL (the annotators and uploads shared out between them). */
  servers: BenchProcess[];
  /** The SQLite file or PostgreSQL URL. */
  dbTarget: string;
  /** The PostgreSQL server whose CPU counts with the web servers', or null. */
  pg: BenchPostgres | null;
  annotators: Annotator[];
  s0: Session;
  uploadTo: number;
}

/** Signs the annotators in, uploads their clips and waits until the clips are ready. */
async function prepare(
  name: string,
  servers: BenchProcess[],
  dbTarget: string,
  workDir: string,
  pg: BenchPostgres | null = null,
): Promise<Subject> {
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
  process.stdout.write(`${name}: uploading ${ANNOTATORS} clips to annotate (160×90, 120 fps, ${doc.frameCount} frames)… `);
  const small = makeClip(path.join(workDir, 'small.mp4'), { width: 160, height: 90, fps: 120, seconds: doc.frameCount / 120 });
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
  // Warm up (first saves create rows, JIT), uploads not yet running.
  await saturate(annotators, 2);
  return { name, servers, dbTarget, pg, annotators, s0, uploadTo };
}

/** Saturation with the uploads running: the tally and the server's CPU per save. */
async function saturationRound(
  x: Subject,
  big: string,
): Promise<{ sat: { t: Tally; wallS: number }; cpuMs: number; dbCpuMs: number; wallS: number }> {
  const uploads = uploadsRunning(
    x.servers.map((sv) => sv.url),
    x.s0,
    x.uploadTo,
    big,
    UPLOADS,
  );
  await new Promise((r) => setTimeout(r, 3000));
  const serverCpu = () => x.servers.reduce((n, sv) => n + cpuSeconds(sv.pid), 0);
  const cpu0 = serverCpu();
  const db0 = x.pg?.cpuSeconds() ?? 0;
  const satFrom = process.hrtime.bigint();
  const sat = await saturate(x.annotators, SECONDS);
  const dbCpuMs = (((x.pg?.cpuSeconds() ?? 0) - db0) / Math.max(1, sat.t.ok)) * 1000;
  // All server-side CPU: the web processes and, on PostgreSQL, the database's own processes.
  const cpuMs = ((serverCpu() - cpu0) / Math.max(1, sat.t.ok)) * 1000 + dbCpuMs;
  // The saturation window on the monotonic clock a .cpuprofile's timestamps use (µs), to profile it alone.
  if (process.env['BENCH_CPU_PROF'])
    console.log(`${x.name}: saturation window (monotonic µs): ${satFrom / 1000n}–${process.hrtime.bigint() / 1000n}`);
  await uploads.stop();
  return { sat, cpuMs, dbCpuMs, wallS: sat.wallS };
}

/**
 * Bundles the server as it was at git revision `rev` (exported to a temp folder) into
 * `dist/bench-before/`, so it resolves the same node_modules and migrations folder as this tree.
 */
async function buildBefore(rev: string, tmp: string): Promise<string> {
  const src = path.join(tmp, 'before-src');
  fs.mkdirSync(src, { recursive: true });
  const archive = spawnSync('sh', [
    '-c',
    `git archive ${JSON.stringify(rev)} server src migrations seeds | tar -x -C ${JSON.stringify(src)}`,
  ]);
  if (archive.status !== 0) throw new Error(`git archive ${rev}: ${archive.stderr}`);
  const outdir = path.resolve('dist/bench-before');
  await buildServer(src, outdir);
  return path.join(outdir, 'main.mjs');
}

const median = (xs: number[]) => quantile(xs, 0.5);

const { dir, cleanup } = benchDir('autosave');
let server: BenchProcess | null = null;
let before: BenchProcess | null = null;
let bare: BenchProcess | null = null;
let pg: BenchPostgres | null = null;
let pair: BenchProcess[] = [];
try {
  const dbFile = await seedDemo(dir);
  server = await startBundledServer(dir, dbFile);
  const subjects = [await prepare('this build', [server], dbFile, dir)];
  if (BEFORE) {
    const beforeDir = path.join(dir, 'before');
    fs.mkdirSync(beforeDir);
    const beforeDb = await seedDemo(beforeDir);
    before = await startBundledServer(beforeDir, beforeDb, {}, [], await buildBefore(BEFORE, dir));
    subjects.push(await prepare(`before (${BEFORE})`, [before], beforeDb, beforeDir));
  }
  if (args.postgres) {
    process.stdout.write('PostgreSQL: seeding the demo scenario… ');
    pg = await startBenchPostgres(dir);
    pair = await startWebPair(dir, pg);
    console.log(`servers ${pair.map((p) => p.url).join(' and ')}`);
    subjects.push(await prepare('this build on PostgreSQL, two web servers', pair, pg.url, dir, pg));
  }
  const current = subjects[0]!;
  const { annotators } = current;
  const bodyBytes = JSON.stringify({ baseRevision: 0, ...annotators[0]!.doc }).length;
  const big = makeClip(path.join(dir, 'upload.mp4'), { width: 1280, height: 720, fps: 30, seconds: 6 });
  console.log(
    `${ANNOTATORS} annotators, ${annotators[0]!.doc.landmarks.length} landmark frame-sides per save (${Math.round(bodyBytes / 1024)} KiB), ` +
      `${UPLOADS} uploads of a ${fs.statSync(big).size >> 20} MiB 720p clip at 1 MB/s each; ` +
      `${os.cpus().length} cores, Node ${process.version}`,
  );

  // The bare handler, with the uploads running on this build's server as during its saturation.
  const bareUploads = uploadsRunning([current.servers[0]!.url], current.s0, current.uploadTo, big, UPLOADS);
  await new Promise((r) => setTimeout(r, 3000));
  bare = await startBareExpress(dir);
  const bareCpu0 = cpuSeconds(bare.pid);
  const bareSat = await saturateBare(`${bare.url}/api/bare`, annotators, SECONDS / 3);
  const bareCpuMs = ((cpuSeconds(bare.pid) - bareCpu0) / Math.max(1, bareSat.ok)) * 1000;
  await bare.stop();
  bare = null;
  await bareUploads.stop();

  // Saturation rounds, the builds taking turns (with --before), each with its own uploads running.
  const own0 = process.cpuUsage();
  const rounds = new Map(subjects.map((x) => [x, [] as Awaited<ReturnType<typeof saturationRound>>[]]));
  for (let r = 0; r < (BEFORE || args.postgres ? ROUNDS : 1); r++)
    for (const x of subjects) rounds.get(x)!.push(await saturationRound(x, big));
  const own = process.cpuUsage(own0);
  const ownWallS = [...rounds.values()].flat().reduce((n, x) => n + x.wallS + 3, 0);

  const uploads = uploadsRunning([current.servers[0]!.url], current.s0, current.uploadTo, big, UPLOADS);
  await new Promise((r) => setTimeout(r, 3000));
  const open = await openLoop(annotators, RATE, SECONDS + 5);
  const up = await uploads.stop();
  const checks = new Map<Subject, Awaited<ReturnType<typeof lostSaves>>>();
  for (const x of subjects) {
    for (const sv of x.servers) await sv.stop();
    checks.set(x, await lostSaves(x.dbTarget, x.annotators));
  }
  server = null;
  before = null;
  pair = [];

  const mine = rounds.get(current)!;
  const sat = mine.at(-1)!.sat;
  const satRate = sat.t.ok / sat.wallS;
  console.log('');
  console.log(`| autosave with ${UPLOADS} uploads running | saves/s | p50 | p99 | 409 | errors |`);
  console.log('| --- | --- | --- | --- | --- | --- |');
  for (const x of subjects)
    for (const [i, round] of rounds.get(x)!.entries()) {
      const t = round.sat.t;
      console.log(
        `| saturation, ${x.name}${BEFORE || args.postgres ? ` round ${i + 1}` : ''} (${ANNOTATORS} annotators back to back) | ${(t.ok / round.wallS).toFixed(0)} | ${ms(quantile(t.latencies, 0.5))} | ${ms(quantile(t.latencies, 0.99))} | ${t.conflicts} | ${t.errors} |`,
      );
    }
  console.log(
    `| open loop, ${RATE} saves/s due | ${(open.ok / (SECONDS + 5)).toFixed(1)} | ${ms(quantile(open.latencies, 0.5))} | ${ms(quantile(open.latencies, 0.99))} | ${open.conflicts} | ${open.errors} |`,
  );
  console.log(
    `| bare Express: parse the same bodies and answer (same clients, same run) | ${bareSat.rate.toFixed(0)} | | | | ${bareSat.errors} |`,
  );
  console.log(`\nsaturation saves/s ÷ bare Express PUT/s in the same run: ${((satRate / bareSat.rate) * 100).toFixed(1)} %`);
  const saveCpuMs = median(mine.map((x) => x.cpuMs));
  console.log(
    `\nserver CPU per save at saturation ${saveCpuMs.toFixed(2)} ms (the server process: receiving uploads included, its ffmpeg children not); ` +
      `bare Express CPU per PUT ${bareCpuMs.toFixed(2)} ms; bare ÷ save ${((bareCpuMs / saveCpuMs) * 100).toFixed(1)} %; ` +
      `one core's worth of saves at this CPU: ${(1000 / saveCpuMs).toFixed(0)}/s; load average ${os
        .loadavg()
        .map((l) => l.toFixed(1))
        .join(' ')}; ` +
      `this benchmark's own CPU ${(((own.user + own.system) / 1e6 / ownWallS) * 100).toFixed(0)} % of a core; uploads finished ${up.done}, failed ${up.failed}`,
  );
  const onPg = subjects.find((x) => x.pg);
  if (onPg) {
    const pgRounds = rounds.get(onPg)!;
    const pgCpuMs = median(pgRounds.map((x) => x.cpuMs));
    console.log(
      `CPU per save, medians of ${ROUNDS} alternating rounds: SQLite (one server) ${saveCpuMs.toFixed(2)} ms, PostgreSQL with two web servers ` +
        `${pgCpuMs.toFixed(2)} ms (both web processes and PostgreSQL's own; of it PostgreSQL ${median(pgRounds.map((x) => x.dbCpuMs)).toFixed(2)} ms); ` +
        `PostgreSQL ÷ SQLite ${(pgCpuMs / saveCpuMs).toFixed(2)}; one core's worth of saves on PostgreSQL: ${(1000 / pgCpuMs).toFixed(0)}/s`,
    );
  }
  if (BEFORE) {
    const was = median(rounds.get(subjects[1]!)!.map((x) => x.cpuMs));
    console.log(
      `CPU per save, medians of ${ROUNDS} alternating rounds: this build ${saveCpuMs.toFixed(2)} ms, before (${BEFORE}) ${was.toFixed(2)} ms; ` +
        `this ÷ before ${(saveCpuMs / was).toFixed(2)} (rounds: ${mine.map((x) => x.cpuMs.toFixed(2)).join(', ')} against ${rounds
          .get(subjects[1]!)!
          .map((x) => x.cpuMs.toFixed(2))
          .join(', ')})`,
    );
  }
  for (const [name, t] of [
    ['saturation', sat.t],
    ['open loop', open],
  ] as const)
    if (t.errors) console.log(`${name} errors: ${[...t.errorKinds].map(([k, n]) => `${k} × ${n}`).join(', ')}`);
  for (const x of subjects) {
    const check = checks.get(x)!;
    console.log(
      `${x.name}: acknowledged saves checked in the database: ${check.checked}, lost: ${check.lost}${check.problems.length ? `; ${check.problems.length} problems:` : ''}`,
    );
    for (const p of check.problems.slice(0, 10)) console.log(`  ${p}`);
  }
  const check = checks.get(current)!;
  const met = satRate >= 200 && quantile(open.latencies, 0.99) <= 200 && check.lost === 0 && !check.problems.length;
  console.log(`\ntarget (≥ 200 saves/s at saturation, open-loop p99 ≤ 200 ms, 0 lost): ${met ? 'met' : 'NOT met'}`);
} finally {
  await server?.stop();
  await before?.stop();
  await bare?.stop();
  for (const p of pair) await p.stop();
  pg?.stop();
  if (args.keep) console.log(`kept ${dir}`);
  else cleanup();
}
