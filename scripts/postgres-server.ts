/**
 * A private PostgreSQL server for tests: Debian's binaries, a data folder of its own under `.tmp`,
 * a free port on 127.0.0.1, no Unix socket, trust authentication for the local user `postgres`.
 * Tuned for throw-away data (no fsync). Run as root, the server runs as the `postgres` system user
 * (PostgreSQL refuses to run as root).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';

/** A running private server. */
export interface PostgresServer {
  /** `postgres://postgres@127.0.0.1:PORT/postgres` */
  url: string;
  port: number;
  /** The postmaster's process id (its backends are its children). */
  pid: number;
  stop(): void;
}

/** The folder of Debian's PostgreSQL binaries (newest version), or null when not installed. */
export function postgresBinDir(): string | null {
  const root = '/usr/lib/postgresql';
  if (!fs.existsSync(root)) return null;
  const versions = fs
    .readdirSync(root)
    .filter((v) => fs.existsSync(path.join(root, v, 'bin', 'pg_ctl')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(root, versions[0]!, 'bin') : null;
}

function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = net.createServer().listen(0, '127.0.0.1', () => {
      const p = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(p));
    });
  });
}

/** Initialises `wantedDir` (anew; a folder under /tmp when the postgres user cannot reach it) and starts a server on a free port; resolves when it accepts connections. */
export async function startPostgres(wantedDir: string): Promise<PostgresServer> {
  const bin = postgresBinDir();
  if (!bin) throw new Error('PostgreSQL binaries not found under /usr/lib/postgresql (apt-get install postgresql)');
  const isRoot = process.getuid?.() === 0;
  const as = (cmd: string, args: string[]) =>
    (isRoot ? ['runuser', ['-u', 'postgres', '--', cmd, ...args]] : [cmd, args]) as [string, string[]];
  let dataDir = wantedDir;
  fs.rmSync(dataDir, { recursive: true, force: true });
  fs.mkdirSync(dataDir, { recursive: true });
  if (isRoot) {
    execFileSync('chown', ['-R', 'postgres:postgres', dataDir]);
    // The checkout may sit where the postgres user cannot reach (a private home folder): use /tmp then.
    const [c, a] = as('test', ['-w', dataDir]);
    if (spawnSync(c, a).status !== 0) {
      dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'trailframe-postgres-'));
      execFileSync('chown', ['-R', 'postgres:postgres', dataDir]);
    }
  }
  const run = (cmd: string, args: string[]) => {
    const [c, a] = as(path.join(bin, cmd), args);
    const r = spawnSync(c, a, { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`${cmd} failed: ${r.stderr || r.stdout}`);
  };
  run('initdb', ['-D', dataDir, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--no-sync', '--locale=C']);
  const port = await freePort();
  const options = [
    `-p ${port}`,
    "-k ''",
    '-c listen_addresses=127.0.0.1',
    '-c fsync=off',
    '-c synchronous_commit=off',
    '-c full_page_writes=off',
    '-c max_connections=400',
    '-c shared_buffers=64MB',
  ].join(' ');
  run('pg_ctl', ['-D', dataDir, '-o', options, '-l', path.join(dataDir, 'server.log'), '-w', '-t', '60', 'start']);
  return {
    port,
    pid: Number(fs.readFileSync(path.join(dataDir, 'postmaster.pid'), 'utf8').split('\n')[0]),
    url: `postgres://postgres@127.0.0.1:${port}/postgres`,
    stop() {
      const [c, a] = as(path.join(bin, 'pg_ctl'), ['-D', dataDir, '-m', 'fast', '-w', 'stop']);
      spawnSync(c, a, { stdio: 'ignore' });
      if (dataDir !== wantedDir) fs.rmSync(dataDir, { recursive: true, force: true });
    },
  };
}
