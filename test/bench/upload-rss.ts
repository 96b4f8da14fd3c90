/**
 * Benchmark: peak resident memory of the server while it receives a 1 GB clip, as a resumable
 * upload (tus PATCH, streamed to its partial file) and as a one-request multipart upload (multer,
 * streamed to a temp file). Target: peak RSS ≤ 150 MB for each; nothing is buffered in memory.
 * Prints the idle RSS and each path's peak RSS measured side by side in one run (the kernel's
 * peak is reset between them), with the server's CPU time per path.
 * Run: npx tsx test/bench/upload-rss.ts [sizeMB]
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { createDb, migrate } from '../../server/db/knex';
import { DEMO_SIGN_INS, seed } from '../../seeds/demo-scenario';
import { buildServer, SERVER_BUNDLE } from '../../scripts/build-server';
import { cpuSeconds } from './support/bench-server';

const sizeMb = Number(process.argv[2] ?? 1024);
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'tf-bench-rss-'));
const [, coach] = DEMO_SIGN_INS;

function rssKb(pid: number, field: 'VmRSS' | 'VmHWM'): number {
  const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
  return Number(new RegExp(`${field}:\\s+(\\d+)`).exec(status)?.[1] ?? 0);
}

const port = await new Promise<number>((resolve) => {
  const s = net.createServer().listen(0, '127.0.0.1', () => {
    const p = (s.address() as net.AddressInfo).port;
    s.close(() => resolve(p));
  });
});
const db = createDb(path.join(dir, 'db.sqlite'));
await migrate(db);
await seed(db);
await db.destroy();

// Measure what `npm start` runs: the bundled server on plain Node.
await buildServer();
const server = spawn(process.execPath, [SERVER_BUNDLE], {
  stdio: 'inherit',
  env: {
    ...process.env,
    PORT: String(port),
    DB_FILE: path.join(dir, 'db.sqlite'),
    UPLOADS_DIR: path.join(dir, 'uploads'),
    CLIENT_DIR: '',
    FAKE_SMTP_PORT: '0',
    DEMO_INBOX_PORT: '0',
    LOG_LEVEL: 'warn',
  },
});
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
      body: JSON.stringify({
        date: '2026-11-30',
        kind: 'baseline',
        surface: 'treadmill',
        speed: null,
        inclinePercent: null,
        shoes: null,
        cameraNotes: null,
        notes: null,
      }),
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

  const mb = (kb: number) => `${(kb / 1024).toFixed(1)} MB`;
  console.log(`server RSS idle: ${mb(idle)}`);
  for (const [name, r] of [
    ['resumable (tus PATCH)', tus],
    ['one request (multipart)', multipart],
  ] as const) {
    console.log(
      `${name}: ${sizeMb} MB → HTTP ${r.status} (refused after arrival: not a real video) in ${r.seconds.toFixed(1)} s, ` +
        `server CPU ${r.cpu.toFixed(2)} s (${((r.cpu / sizeMb) * 1000).toFixed(1)} ms per MB); ` +
        `peak RSS ${mb(r.peakKb)} (target ≤ 150 MB: ${r.peakKb / 1024 <= 150 ? 'met' : 'NOT met'}; peak/idle ${(r.peakKb / idle).toFixed(2)}, peak/target ${(r.peakKb / 1024 / 150).toFixed(2)})`,
    );
  }
} finally {
  server.kill('SIGTERM');
  fs.rmSync(dir, { recursive: true, force: true });
}
