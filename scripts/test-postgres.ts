/**
 * The server suite on PostgreSQL: starts a private server (Debian's binaries, data folder
 * `.tmp/postgres`, a free local port; see `postgres-server.ts`), runs vitest's server suite with
 * `DATABASE_URL` pointing at it (each test file then gets databases of its own: test/support/test-db.ts),
 * and stops the server. Extra arguments go to vitest (a file, `-t name`, reporters).
 *
 *   npx tsx scripts/test-postgres.ts [vitest args…]
 */
import { spawn } from 'node:child_process';
import path from 'node:path';
import { startPostgres } from './postgres-server';

const server = await startPostgres(path.resolve('.tmp/postgres'));
console.log(`[test-postgres] PostgreSQL on 127.0.0.1:${server.port}`);
let code = 1;
try {
  code = await new Promise<number>((resolve) => {
    const child = spawn('npx', ['vitest', 'run', '--config', 'vitest.server.config.ts', ...process.argv.slice(2)], {
      stdio: 'inherit',
      env: { ...process.env, DATABASE_URL: server.url },
    });
    child.on('close', (c) => resolve(c ?? 1));
  });
} finally {
  server.stop();
}
process.exit(code);
