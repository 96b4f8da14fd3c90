/**
 * A real server process for durability tests: `server/main.ts` in its own process group (so a
 * SIGKILL takes its ffmpeg down with it), on a free port, over a database and uploads folder of
 * the test's own.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';
import { createDb, type Db } from '../../server/db/knex';
import { seed } from '../../seeds/demo-scenario';
import { tempDir } from '../server/media/fixtures';
import { dropFolderDatabase, folderDatabase, openTestDb, rememberDatabase } from './test-db';

/**
 * A temp folder with a migrated database holding the demo scenario (`db.sqlite`, or on PostgreSQL
 * a database of its own that the folder names; see `test-db.ts`), for server and worker processes.
 */
export async function seededDir(prefix: string): Promise<{ dir: string; cleanup: () => Promise<void> }> {
  const folder = await tempDir(prefix);
  const { db, target } = await openTestDb({ file: path.join(folder.dir, 'db.sqlite') });
  await seed(db);
  await db.destroy();
  rememberDatabase(folder.dir, target);
  return {
    dir: folder.dir,
    async cleanup() {
      await dropFolderDatabase(folder.dir);
      await folder.cleanup();
    },
  };
}

/** Opens the database of a {@link seededDir} folder (as its processes see it). */
export function folderDb(dir: string): Db {
  return createDb(folderDatabase(dir));
}

/** The environment that points a process at the folder's database. */
function databaseEnv(dir: string): Record<string, string> {
  const target = folderDatabase(dir);
  return target.startsWith('postgres') ? { DATABASE_URL: target } : { DATABASE_URL: '', DB_FILE: target };
}

export async function freePort(): Promise<number> {
  // Below Linux's ephemeral range (32768–60999): a port chosen there could be taken, before the server
  // binds it, by any outgoing connection (to PostgreSQL, the fake bucket) of the tests running beside.
  for (let attempt = 0; ; attempt++) {
    const port = 20_000 + Math.floor(Math.random() * 12_000);
    const free = await new Promise<boolean>((resolve) => {
      const s = net.createServer();
      s.once('error', () => resolve(false));
      s.listen(port, '127.0.0.1', () => s.close(() => resolve(true)));
    });
    if (free || attempt > 50) return port;
  }
}

export interface ServerProcess {
  /** Starts the server and resolves when `/api/health` answers. */
  start(): Promise<void>;
  /** SIGKILL to the whole process group (the server and its ffmpeg). */
  killHard(): void;
  readonly url: string;
  /** The server's process id (null before start). */
  readonly pid: number | null;
}

export function serverProcess(dir: string, port: number, env: Record<string, string> = {}): ServerProcess {
  let child: ChildProcess | null = null;
  const url = `http://127.0.0.1:${port}`;
  return {
    url,
    get pid() {
      return child?.pid ?? null;
    },
    async start() {
      child = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
        detached: true,
        stdio: ['ignore', 'ignore', 'pipe'],
        env: {
          ...process.env,
          PORT: String(port),
          ...databaseEnv(dir),
          UPLOADS_DIR: path.join(dir, 'uploads'),
          CLIENT_DIR: '',
          FAKE_SMTP_PORT: '0',
          DEMO_INBOX_PORT: '0',
          FAKE_PAYMENTS_PORT: '0',
          LOG_LEVEL: 'warn',
          JOB_LEASE_SECONDS: '2',
          ...env,
        },
      });
      // What it writes to stderr (warnings and a crash's reason) is kept for the error below.
      let stderr = '';
      child.stderr!.on('data', (chunk: Buffer) => (stderr = (stderr + chunk.toString()).slice(-4000)));
      const started = Date.now();
      for (;;) {
        const ok = await fetch(`${url}/api/health`)
          .then((r) => r.ok)
          .catch(() => false);
        if (ok) return;
        // Transpiling the whole server with tsx takes long when several process tests start at once.
        if (child.exitCode !== null || Date.now() - started > 120_000) {
          throw new Error(`server did not start${child.exitCode !== null ? ` (exited with ${child.exitCode})` : ''}:\n${stderr}`);
        }
        await new Promise((r) => setTimeout(r, 200));
      }
    },
    killHard() {
      if (child?.pid) {
        try {
          process.kill(-child.pid, 'SIGKILL');
        } catch {
          // already gone
        }
      }
      child = null;
    },
  };
}

export interface WorkerProcess {
  /** Starts `server/worker.ts` and resolves once it says it runs. */
  start(): Promise<void>;
  /** SIGKILL to the whole process group (the worker and its ffmpeg). */
  killHard(): void;
  /** The worker's process id (its items carry it in `claimed_by`). */
  readonly pid: number | null;
}

/** A worker process (`npm run worker`) over the same database and uploads folder as {@link serverProcess}. */
export function workerProcess(dir: string, env: Record<string, string> = {}): WorkerProcess {
  let child: ChildProcess | null = null;
  return {
    get pid() {
      return child?.pid ?? null;
    },
    start() {
      child = spawn(process.execPath, ['--import', 'tsx', 'server/worker.ts'], {
        detached: true,
        stdio: ['ignore', 'pipe', 'ignore'],
        env: {
          ...process.env,
          ...databaseEnv(dir),
          UPLOADS_DIR: path.join(dir, 'uploads'),
          LOG_LEVEL: 'warn',
          JOB_LEASE_SECONDS: '2',
          WORKER_POLL_MS: '100',
          ...env,
        },
      });
      const started = child;
      return new Promise((resolve, reject) => {
        const timer = setTimeout(() => reject(new Error('worker did not start')), 60_000);
        let out = '';
        started.stdout!.on('data', (chunk: Buffer) => {
          out += chunk.toString();
          if (out.includes('worker running')) {
            clearTimeout(timer);
            started.stdout!.resume();
            resolve();
          }
        });
        started.on('exit', (code) => reject(new Error(`worker exited with ${code}`)));
      });
    },
    killHard() {
      if (child?.pid) {
        try {
          process.kill(-child.pid, 'SIGKILL');
        } catch {
          // already gone
        }
      }
      child = null;
    },
  };
}
