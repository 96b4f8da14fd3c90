/**
 * Benchmark: peak resident memory of the server while it receives a 500 MB upload.
 * Target: peak RSS ≤ 150 MB (multer streams to disk; nothing is buffered in memory).
 * Prints the idle RSS and the peak RSS measured side by side in one run, and their ratio.
 * Run: npx tsx test/bench/upload-rss.ts [sizeMB]
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { createDb, migrate } from '../../server/db/knex';
import { DEMO_SIGN_INS, seed } from '../../seeds/demo-scenario';
import { buildServer, SERVER_BUNDLE } from '../../scripts/build-server';

const sizeMb = Number(process.argv[2] ?? 500);
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

  // A sparse 500 MB file that starts like an MP4 (it is refused after it arrives: the receive is what is measured).
  const file = path.join(dir, 'big.mp4');
  const fd = fs.openSync(file, 'w');
  fs.writeSync(fd, Buffer.from('000000186674797069736f6d0000020069736f6d69736f32', 'hex'));
  fs.ftruncateSync(fd, sizeMb * 1024 * 1024);
  fs.closeSync(fd);

  const idle = rssKb(server.pid!, 'VmRSS');
  let peak = idle;
  const sampler = setInterval(() => {
    try {
      peak = Math.max(peak, rssKb(server.pid!, 'VmRSS'));
    } catch {
      /* exited */
    }
  }, 20);
  const form = new FormData();
  form.append('file', await fs.openAsBlob(file), 'big.mp4');
  const t0 = performance.now();
  const res = await fetch(`${base}/api/assessments/${assessment.id}/clips`, { method: 'POST', headers: headers(), body: form });
  const seconds = (performance.now() - t0) / 1000;
  clearInterval(sampler);
  peak = Math.max(peak, rssKb(server.pid!, 'VmHWM'));
  console.log(`upload of ${sizeMb} MB: HTTP ${res.status} in ${seconds.toFixed(1)} s (${(sizeMb / seconds).toFixed(0)} MB/s)`);
  console.log(`server RSS idle: ${(idle / 1024).toFixed(1)} MB`);
  console.log(
    `server RSS peak while receiving: ${(peak / 1024).toFixed(1)} MB (target ≤ 150 MB: ${peak / 1024 <= 150 ? 'met' : 'NOT met'})`,
  );
  console.log(`ratio peak / idle: ${(peak / idle).toFixed(2)}; ratio peak / target: ${(peak / 1024 / 150).toFixed(2)}`);
} finally {
  server.kill('SIGTERM');
  fs.rmSync(dir, { recursive: true, force: true });
}
