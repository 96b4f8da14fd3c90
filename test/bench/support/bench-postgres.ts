/**
 * The PostgreSQL side of a benchmark (`--postgres`): a private PostgreSQL server
 * (`scripts/postgres-server.ts`: Debian's binaries, a data folder in the bench folder, a free
 * port) holding the demo scenario, two web servers (the `npm start` bundle) on it, load spread
 * over both, and the CPU PostgreSQL itself spent (its server processes, those gone included).
 */
import fs from 'node:fs';
import path from 'node:path';
import { startPostgres } from '../../../scripts/postgres-server';
import { createDb, migrate } from '../../../server/db/knex';
import { seed } from '../../../seeds/demo-scenario';
import { SERVER_BUNDLE } from '../../../scripts/build-server';
import { startBundledServer, type BenchProcess } from './bench-server';

/** A running private PostgreSQL server with the demo scenario. */
export interface BenchPostgres {
  url: string;
  /** CPU seconds (user + system) PostgreSQL's processes have used so far, exited backends included. */
  cpuSeconds(): number;
  stop(): void;
}

/** utime, stime, cutime, cstime of a process (clock ticks), and its parent. */
function procTimes(pid: number): { ppid: number; own: number; children: number } | null {
  try {
    const fields = fs.readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ');
    return { ppid: Number(fields[1]), own: Number(fields[11]) + Number(fields[12]), children: Number(fields[13]) + Number(fields[14]) };
  } catch {
    return null;
  }
}

/** CPU seconds of `root` and all its children, live and exited (Linux /proc; 100 ticks a second). */
export function treeCpuSeconds(root: number): number {
  const r = procTimes(root);
  if (!r) return NaN;
  let ticks = r.own + r.children;
  for (const name of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    const t = procTimes(Number(name));
    if (t?.ppid === root) ticks += t.own + t.children;
  }
  return ticks / 100;
}

/** Starts PostgreSQL under `dir/postgres`, migrates its `postgres` database and seeds the demo scenario. */
export async function startBenchPostgres(dir: string): Promise<BenchPostgres> {
  const server = await startPostgres(path.join(dir, 'postgres'));
  try {
    const db = createDb(server.url);
    await migrate(db);
    await seed(db);
    await db.destroy();
  } catch (err) {
    server.stop();
    throw err;
  }
  return { url: server.url, cpuSeconds: () => treeCpuSeconds(server.pid), stop: () => server.stop() };
}

/**
 * Two web servers (A and B, each as `npm start` runs it, with its in-process worker) on the
 * PostgreSQL database, sharing one uploads folder as they would share a bucket; their logs are
 * `server-a.log` and `server-b.log`.
 */
export async function startWebPair(dir: string, pg: BenchPostgres, env: Record<string, string> = {}): Promise<BenchProcess[]> {
  const on = { DATABASE_URL: pg.url, UPLOADS_DIR: path.join(dir, 'uploads-pg'), ...env };
  const unused = path.join(dir, 'unused.sqlite');
  const a = await startBundledServer(dir, unused, on, [], SERVER_BUNDLE, 'server-a.log');
  const b = await startBundledServer(dir, unused, on, [], SERVER_BUNDLE, 'server-b.log').catch(async (err: unknown) => {
    await a.stop();
    throw err;
  });
  return [a, b];
}
