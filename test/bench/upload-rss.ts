/**
 * Benchmark: peak resident memory of the server while it receives a 1 GB clip, as a resumable
 * upload (tus PATCH, streamed to its partial file) and as a one-request multipart upload (multer,
 * streamed to a temp file). Target: peak RSS ≤ 150 MB for each; nothing is buffered in memory.
 * The server runs as `npm start` runs it on a fresh install: the bundle on plain Node with
 * `SERVER_NODE_ARGS` and `SERVER_ENV`, demo mode, the demo clips seeded, and measured once their
 * start-up work (frames, stills, summary) is done. Prints the start-up peak, the idle RSS and each
 * path's peak RSS (the kernel's peak is reset between them), with the server's CPU time per MB.
 * `--compare` runs the same on a second server started as `npm start` did before (only
 * `--enable-source-maps`, the allocator's defaults), side by side in one run.
 * `--no-demo-clips` seeds the demo without its clips: a server that has drawn nothing yet.
 * As `npm start` (`DRAW_APART` on), a drawing worker process runs beside the server and draws the
 * stills and summary; the figures are the web process's (the worker's peak is printed beside them).
 * `--compare-in-process` adds a server that draws in its own worker (`DRAW_APART=false`), side by side.
 * Run: npx tsx test/bench/upload-rss.ts [sizeMB] [--compare] [--compare-in-process] [--no-demo-clips]
 */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { createDb, migrate } from '../../server/db/knex';
import { DEMO_SIGN_INS, seed } from '../../seeds/demo-scenario';
import { buildServer, SERVER_BUNDLE, SERVER_ENV, SERVER_NODE_ARGS, WORKER_BUNDLE } from '../../scripts/build-server';
import { cpuSeconds } from './support/bench-server';
import { baselineVisit } from '../support/bodies';

const sizeMb = Number(process.argv.slice(2).find((a) => /^\d+$/.test(a)) ?? 1024);
const compare = process.argv.includes('--compare');
const compareInProcess = process.argv.includes('--compare-in-process');
const root = fs.mkdtempSync(path.join(os.tmpdir(), 'tf-bench-rss-'));
const [, coach] = DEMO_SIGN_INS;

function rssKb(pid: number, field: 'VmRSS' | 'VmHWM'): number {
  const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
  return Number(new RegExp(`${field}:\\s+(\\d+)`).exec(status)?.[1] ?? 0);
}

// As `npm start` seeds a fresh install: with the demo clips, whose frames, stills and summary the server makes when it starts.
const template = path.join(root, 'template');
fs.mkdirSync(template);
const seeded = createDb(path.join(template, 'db.sqlite'));
await migrate(seeded);
// `--no-demo-clips`: the demo without its clips, as a server that has drawn nothing yet (or a restart: the start-up work is done once).
await seed(seeded, process.argv.includes('--no-demo-clips') ? {} : { uploadsDir: path.join(template, 'uploads'), log: () => {} });
await seeded.destroy();
await buildServer();

/** What one server measured. */
interface Measured {
  startupPeakKb: number;
  idleKb: number;
  /** The drawing worker's peak RSS (null: the server drew in its own process). */
  workerPeakKb: number | null;
  paths: [string, { status: number; peakKb: number; cpu: number; seconds: number }][];
}

/**
 * Starts the bundled server with `nodeArgs` and `env` on a copy of the seeded install (with `drawApart`, and a drawing
 * worker process beside it, as `npm start` runs them) and measures both upload paths.
 */
async function measureServer(
  nodeArgs: readonly string[],
  extraEnv: Readonly<Record<string, string>>,
  drawApart = false,
): Promise<Measured> {
  const dir = fs.mkdtempSync(path.join(root, 'run-'));
  fs.cpSync(template, dir, { recursive: true });
  const port = await new Promise<number>((resolve) => {
    const s = net.createServer().listen(0, '127.0.0.1', () => {
      const p = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(p));
    });
  });
  const env = {
    ...extraEnv,
    ...process.env,
    PORT: String(port),
    DB_FILE: path.join(dir, 'db.sqlite'),
    UPLOADS_DIR: path.join(dir, 'uploads'),
    CLIENT_DIR: '',
    FAKE_SMTP_PORT: '0',
    DEMO_INBOX_PORT: '0',
    FAKE_PAYMENTS_PORT: '0',
    LOG_LEVEL: 'warn',
    DRAW_APART: String(drawApart),
  };
  const server = spawn(process.execPath, [...nodeArgs, SERVER_BUNDLE], { stdio: 'inherit', env });
  const worker: ChildProcess | null = drawApart
    ? spawn(process.execPath, [...nodeArgs, WORKER_BUNDLE], {
        stdio: ['ignore', 'ignore', 'inherit'],
        env: { ...env, WORKER_KINDS: 'drawing' },
      })
    : null;
  const base = `http://127.0.0.1:${port}`;
  try {
    for (let i = 0; ; i++) {
      if (
        await fetch(`${base}/api/health`)
          .then((r) => r.ok)
          .catch(() => false)
      )
        break;
      if (i > 150) throw new Error('server did not start');
      await new Promise((r) => setTimeout(r, 200));
    }
    // Idle means after the start-up work: every queued item (frames, stills, summary) done.
    const watch = createDb(path.join(dir, 'db.sqlite'));
    for (let i = 0; ; i++) {
      const [open] = await watch('processed_items').whereIn('state', ['queued', 'running']).count<{ n: number }[]>({ n: '*' });
      if (Number(open!.n) === 0) break;
      if (i > 1800) throw new Error('the start-up work did not finish within 6 minutes');
      await new Promise((r) => setTimeout(r, 200));
    }
    const startupPeakKb = rssKb(server.pid!, 'VmHWM');
    const workerPeakKb = worker ? rssKb(worker.pid!, 'VmHWM') : null;
    await watch.destroy();
    await new Promise((r) => setTimeout(r, 2000));
    // Sign in (session + CSRF cookies by hand).
    const jar = new Map<string, string>();
    const keep = (res: Response) => {
      for (const c of res.headers.getSetCookie()) {
        const [pair] = c.split(';');
        const [k, v] = pair!.split('=');
        jar.set(k!, v!);
      }
    };
    const cookie = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
    keep(await fetch(`${base}/api/auth/csrf`));
    const signIn = await fetch(`${base}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', cookie: cookie(), 'x-xsrf-token': decodeURIComponent(jar.get('XSRF-TOKEN')!) },
      body: JSON.stringify({ email: coach.email, password: coach.password }),
    });
    keep(signIn);
    const headers = () => ({ cookie: cookie(), 'x-xsrf-token': decodeURIComponent(jar.get('XSRF-TOKEN')!) });
    const athletes = (await (await fetch(`${base}/api/athletes`, { headers: headers() })).json()) as {
      athletes: { id: number; lastName: string }[];
    };
    const ada = athletes.athletes.find((a) => a.lastName === 'Kestrel')!;
    const assessment = (await (
      await fetch(`${base}/api/athletes/${ada.id}/assessments`, {
        method: 'POST',
        headers: { ...headers(), 'content-type': 'application/json' },
        body: JSON.stringify(baselineVisit()),
      })
    ).json()) as { id: number };

    // A sparse file that starts like an MP4 (it is refused after it arrives: the receive is what is measured).
    const file = path.join(dir, 'big.mp4');
    const fd = fs.openSync(file, 'w');
    fs.writeSync(fd, Buffer.from('000000186674797069736f6d0000020069736f6d69736f32', 'hex'));
    fs.ftruncateSync(fd, sizeMb * 1024 * 1024);
    fs.closeSync(fd);
    const size = fs.statSync(file).size;

    const idle = rssKb(server.pid!, 'VmRSS');
    /** Peak RSS (kB), CPU seconds and wall seconds of the server while `send` runs. */
    async function measure(send: () => Promise<number>): Promise<{ status: number; peakKb: number; cpu: number; seconds: number }> {
      // Resets the kernel's high-water mark, so each path's peak is its own.
      fs.writeFileSync(`/proc/${server.pid}/clear_refs`, '5');
      let peak = rssKb(server.pid!, 'VmRSS');
      const sampler = setInterval(() => {
        try {
          peak = Math.max(peak, rssKb(server.pid!, 'VmRSS'));
        } catch {
          /* exited */
        }
      }, 20);
      const cpu0 = cpuSeconds(server.pid!);
      const t0 = performance.now();
      const status = await send();
      const seconds = (performance.now() - t0) / 1000;
      clearInterval(sampler);
      return { status, peakKb: Math.max(peak, rssKb(server.pid!, 'VmHWM')), cpu: cpuSeconds(server.pid!) - cpu0, seconds };
    }

    // Resumable: create, then one PATCH streaming the file from disk.
    const tus = await measure(async () => {
      const created = await fetch(`${base}/api/assessments/${assessment.id}/clip-uploads`, {
        method: 'POST',
        headers: { ...headers(), 'tus-resumable': '1.0.0', 'upload-length': String(size) },
      });
      if (created.status !== 201) throw new Error(`tus create: ${created.status} ${await created.text()}`);
      const url = new URL(created.headers.get('location')!, base);
      return new Promise<number>((resolve, reject) => {
        const req = http.request(url, {
          method: 'PATCH',
          headers: {
            ...headers(),
            'tus-resumable': '1.0.0',
            'upload-offset': '0',
            'content-type': 'application/offset+octet-stream',
            'content-length': String(size),
          },
        });
        req.on('response', (res) => {
          res.resume();
          res.on('end', () => resolve(res.statusCode ?? 0));
        });
        req.on('error', reject);
        fs.createReadStream(file).pipe(req);
      });
    });

    const multipart = await measure(async () => {
      const form = new FormData();
      form.append('file', await fs.openAsBlob(file), 'big.mp4');
      const res = await fetch(`${base}/api/assessments/${assessment.id}/clips`, { method: 'POST', headers: headers(), body: form });
      return res.status;
    });

    return {
      startupPeakKb,
      idleKb: idle,
      workerPeakKb,
      paths: [
        ['resumable (tus PATCH)', tus],
        ['one request (multipart)', multipart],
      ],
    };
  } finally {
    if (worker) {
      worker.kill('SIGTERM');
      await new Promise((r) => worker.once('exit', r));
    }
    server.kill('SIGTERM');
    await new Promise((r) => server.once('exit', r));
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

const mb = (kb: number) => `${(kb / 1024).toFixed(1)} MB`;
const runs: [string, Measured][] = [];
try {
  runs.push(['npm start (drawing apart)', await measureServer(SERVER_NODE_ARGS, SERVER_ENV, true)]);
  if (compareInProcess) runs.push(['drawing in the web process (DRAW_APART=false)', await measureServer(SERVER_NODE_ARGS, SERVER_ENV)]);
  if (compare) runs.push(['before (only --enable-source-maps, allocator defaults)', await measureServer(['--enable-source-maps'], {})]);
} finally {
  fs.rmSync(root, { recursive: true, force: true });
}
for (const [label, r] of runs) {
  console.log(
    `[${label}] server RSS during the start-up work (demo frames, stills, summary): peak ${mb(r.startupPeakKb)}; idle after it: ${mb(r.idleKb)}` +
      (r.workerPeakKb !== null ? `; the drawing worker's peak: ${mb(r.workerPeakKb)}` : ''),
  );
  for (const [name, p] of r.paths)
    console.log(
      `[${label}] ${name}: ${sizeMb} MB → HTTP ${p.status} (refused after arrival: not a real video) in ${p.seconds.toFixed(1)} s, ` +
        `server CPU ${p.cpu.toFixed(2)} s (${((p.cpu / sizeMb) * 1000).toFixed(1)} ms per MB); ` +
        `peak RSS ${mb(p.peakKb)} (+${mb(p.peakKb - r.idleKb)} over idle; target ≤ 150 MB: ${p.peakKb / 1024 <= 150 ? 'met' : 'NOT met'}; peak/target ${(p.peakKb / 1024 / 150).toFixed(2)})`,
    );
}
console.log(
  `load ${os
    .loadavg()
    .map((l) => l.toFixed(1))
    .join(' ')}`,
);
if (runs.length === 2) {
  const [[, now], [, before]] = runs as [[string, Measured], [string, Measured]];
  for (let i = 0; i < now.paths.length; i++) {
    const [name, a] = now.paths[i]!;
    const b = before.paths[i]![1];
    console.log(
      `${name}: peak RSS now/before ${(a.peakKb / b.peakKb).toFixed(2)}, server CPU per MB now/before ${(a.cpu / b.cpu).toFixed(2)}`,
    );
  }
  console.log(
    `idle RSS now/before ${(now.idleKb / before.idleKb).toFixed(2)}; load ${os
      .loadavg()
      .map((l) => l.toFixed(1))
      .join(' ')}`,
  );
}
