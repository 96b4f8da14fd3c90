/**
 * The server suite on PostgreSQL: starts a private server (Debian's binaries, data folder
 * `.tmp/postgres`, a free local port; see `postgres-server.ts`), runs vitest's server suite with
 * `DATABASE_URL` pointing at it (each test file then gets databases of its own: test/support/test-db.ts),
 * and stops the server. Media is in the object-storage fake: one s3rver (files under `.tmp/s3rver`)
 * whose endpoint goes to vitest as `TEST_S3_ENDPOINT`; every test app makes a bucket of its own there
 * (test/support/test-app.ts). `TEST_S3=0` keeps media in local folders.
 *
 *   npx tsx scripts/test-postgres.ts [vitest args…]
 */
import { spawn } from 'node:child_process';
import path from 'node:path';
import fs from 'node:fs';
import { startPostgres } from './postgres-server';
import { startS3rver, type S3rverProcess } from '../test/support/s3-bucket';

const server = await startPostgres(path.resolve('.tmp/postgres'));
console.log(`[test-postgres] PostgreSQL on 127.0.0.1:${server.port}`);
let s3: S3rverProcess | null = null;
let code = 1;
try {
  if (process.env['TEST_S3'] !== '0') {
    const s3Dir = path.resolve('.tmp/s3rver');
    fs.rmSync(s3Dir, { recursive: true, force: true });
    fs.mkdirSync(s3Dir, { recursive: true });
    s3 = await startS3rver(s3Dir);
    console.log(`[test-postgres] media in the object-storage fake at ${s3.endpoint}`);
  }
  code = await new Promise<number>((resolve) => {
    const child = spawn('npx', ['vitest', 'run', '--config', 'vitest.server.config.ts', ...process.argv.slice(2)], {
      stdio: 'inherit',
      // The SDK's notice that its 2027 releases need Node 22 would repeat once per test file (the stack is fixed at Node 20).
      env: {
        ...process.env,
        DATABASE_URL: server.url,
        TEST_S3_ENDPOINT: s3?.endpoint ?? '',
        AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED: 'true',
      },
    });
    child.on('close', (c) => resolve(c ?? 1));
  });
} finally {
  await s3?.stop();
  server.stop();
}
process.exit(code);
