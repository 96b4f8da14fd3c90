/**
 * `npm start`: migrate, seed the demo once, build the app when its sources changed, serve app +
 * API on PORT (3000) from the server bundle, print the URL and the demo sign-ins. Runs after
 * scripts/bootstrap.mjs. With `DRAW_APART` (on unless set to false; SQLite) a worker process from
 * the worker bundle draws stills, summaries, annotated clips and exports beside the server, so the
 * web process never loads Skia or pdfkit; it is restarted when it exits unexpectedly and stopped
 * with the server.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { loadConfig } from '../server/config';
import { createDb, dbTarget, migrate } from '../server/db/knex';
import { drawsApart } from '../server/processing/drawing-kinds';
import { buildServer, SERVER_BUNDLE, SERVER_ENV, SERVER_NODE_ARGS, WORKER_BUNDLE } from './build-server';
import { DEMO_SIGN_INS, seed } from '../seeds/demo-scenario';

const root = process.cwd();

function newestMtime(dir: string): number {
  let newest = 0;
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(p) : fs.statSync(p).mtimeMs);
  }
  return newest;
}

function buildIfStale(clientDir: string): void {
  const index = path.join(clientDir, 'index.html');
  const inputs = ['src', 'public', 'angular.json', 'package-lock.json'].map((p) => path.join(root, p));
  const newestInput = Math.max(
    ...inputs.filter(fs.existsSync).map((p) => (fs.statSync(p).isDirectory() ? newestMtime(p) : fs.statSync(p).mtimeMs)),
  );
  if (fs.existsSync(index) && fs.statSync(index).mtimeMs >= newestInput) {
    console.log('[start] app build is up to date');
    return;
  }
  console.log('[start] building the app (ng build)…');
  const r = spawnSync('npx', ['ng', 'build'], { stdio: 'inherit', cwd: root, env: { ...process.env, NG_CLI_ANALYTICS: 'false' } });
  if (r.status !== 0) {
    console.error('[start] the app build failed');
    process.exit(1);
  }
}

/** The drawing worker: started, restarted after an unexpected exit (sooner when it had run a while), stopped with the server. */
function drawingWorker(): { start(): void; stop(): Promise<void> } {
  let child: ChildProcess | null = null;
  let stopping = false;
  let retryMs = 1_000;
  let retry: NodeJS.Timeout | undefined;
  const start = () => {
    const startedAt = Date.now();
    const worker = spawn(process.execPath, [...SERVER_NODE_ARGS, WORKER_BUNDLE], {
      stdio: 'inherit',
      env: { ...SERVER_ENV, ...process.env, WORKER_KINDS: 'drawing' },
    });
    child = worker;
    worker.on('exit', (code, signal) => {
      if (child === worker) child = null;
      if (stopping) return;
      retryMs = Date.now() - startedAt > 60_000 ? 1_000 : Math.min(30_000, retryMs * 2);
      console.error(`[start] the drawing worker exited (${signal ?? code}); starting it again in ${retryMs / 1000} s`);
      retry = setTimeout(start, retryMs);
    });
  };
  return {
    start,
    async stop() {
      stopping = true;
      clearTimeout(retry);
      const worker = child;
      if (!worker || worker.exitCode !== null || worker.signalCode !== null) return;
      const exited = new Promise<void>((resolve) => worker.once('exit', () => resolve()));
      worker.kill('SIGTERM');
      // It hands running items back to the queue; after 10 s it is killed (their leases run out).
      const killer = setTimeout(() => worker.kill('SIGKILL'), 10_000);
      await exited;
      clearTimeout(killer);
    },
  };
}

async function main(): Promise<void> {
  // `npm start` leaves drawing to a worker process of its own unless told otherwise.
  process.env['DRAW_APART'] ??= 'true';
  const config = loadConfig();
  const db = createDb(dbTarget(config));
  const applied = await migrate(db);
  console.log(
    `[start] database ${config.databaseUrl ? 'PostgreSQL (DATABASE_URL)' : path.relative(root, config.dbFile)}: ${applied.length ? `applied ${applied.length} migration(s)` : 'up to date'}`,
  );
  if (config.demoMode) {
    const seeded = await seed(db, { uploadsDir: config.uploadsDir, log: (m) => console.log(`[start] ${m}`) });
    console.log(seeded ? '[start] demo scenario seeded' : '[start] demo data already present (not seeded again)');
  }
  await db.destroy();
  if (config.clientDir) buildIfStale(config.clientDir);
  await buildServer();

  // The server runs as plain Node on the bundle (no TypeScript loader in memory).
  const server = spawn(process.execPath, [...SERVER_NODE_ARGS, SERVER_BUNDLE], {
    stdio: ['inherit', 'pipe', 'inherit'],
    env: { ...SERVER_ENV, ...process.env },
  });
  // The server's own lines pass through; the one naming its address gives the port (PORT=0: any free port).
  const listening = new Promise<string>((resolve) => {
    let seen: string | null = '';
    server.stdout.on('data', (chunk: Buffer) => {
      process.stdout.write(chunk);
      if (seen === null) return;
      seen += chunk.toString();
      const m = /listening on (http:\/\/\S+)/.exec(seen);
      if (m) {
        resolve(m[1]!);
        seen = null;
      }
    });
  });
  const drawing = drawsApart(config) ? drawingWorker() : null;
  const stop = (signal: NodeJS.Signals) => server.kill(signal);
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
  server.on('exit', (code) => {
    void (drawing?.stop() ?? Promise.resolve()).then(() => process.exit(code ?? 0));
  });

  // The drawing worker needs no HTTP server: it starts now, and items it draws wait queued until it runs.
  if (drawing) {
    drawing.start();
    console.log(
      '[start] stills, summaries, annotated clips, exports and marker following run in a worker process beside the server (DRAW_APART)',
    );
  }
  const url = config.port ? `http://localhost:${config.port}` : await listening;
  for (let i = 0; ; i++) {
    if (
      await fetch(`${url}/api/health`)
        .then((r) => r.ok)
        .catch(() => false)
    )
      break;
    if (i > 300) {
      console.error('[start] the server did not answer within a minute');
      server.kill('SIGTERM');
      return;
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  const lines = ['', `Trailframe is running at ${config.port || process.env['PUBLIC_URL'] ? config.publicUrl : url}`];
  if (config.demoMode) {
    lines.push('', 'Demo sign-ins (invented people):');
    for (const s of DEMO_SIGN_INS) lines.push(`  ${s.role.padEnd(8)} ${s.email.padEnd(32)} ${s.password}`);
    if (config.demoInboxPort !== null) {
      const inbox = config.demoInboxPort ? `http://127.0.0.1:${config.demoInboxPort}` : 'the address the server printed above';
      lines.push(
        '',
        `Demo inbox (every e-mail the demo sends: invitations, reset links): ${inbox}`,
        '  It opens only on this machine and is not part of the app.',
      );
    }
    if (config.fakePaymentsPort !== null) lines.push('Card payments go to a local fake payment service (no real money moves).');
  }
  lines.push('Press Ctrl+C to stop.', '');
  console.log(lines.join('\n'));
}

main().catch((err: Error) => {
  console.error(`[start] ${err.message}`);
  process.exit(1);
});
