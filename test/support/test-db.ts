/**
 * Databases for server tests. By default SQLite (in memory, or a file in the test's folder). When
 * the suite runs with `DATABASE_URL` set to a PostgreSQL server (`scripts/test-postgres.ts` does
 * that), every test database is a database of its own on that server: copied from a migrated
 * template (made once per run by `pg-global-setup.ts`), or empty for migration tests, and dropped
 * when the test closes it. Test files never share a database, on either engine.
 */
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { createDb, migrate, type Db } from '../../server/db/knex';

/** The PostgreSQL server the suite runs on (its maintenance database's URL), or null on SQLite. */
export const pgServerUrl: string | null = process.env['DATABASE_URL'] || null;
/** Whether this run of the suite is on PostgreSQL. */
export const onPostgres = pgServerUrl !== null;
/**
 * The object-storage fake (s3rver) the suite keeps media in, or null: local folders. The PostgreSQL
 * pass (`scripts/test-postgres.ts`) starts one and sets `TEST_S3_ENDPOINT`; every test app then gets
 * a bucket of its own on it (test/support/test-app.ts).
 */
export const s3Endpoint: string | null = process.env['TEST_S3_ENDPOINT'] || null;
/** Whether this run of the suite keeps the test apps' media in the object-storage fake. */
export const onS3 = s3Endpoint !== null;
/** The migrated database every test database is copied from. */
export const PG_TEMPLATE = 'tf_test_template';

/** `url` with another database name. */
export function withDatabase(url: string, name: string): string {
  const u = new URL(url);
  u.pathname = `/${name}`;
  return u.toString();
}

/** Runs `sql` on the server's maintenance database. */
async function onServer(sql: string): Promise<void> {
  const admin = createDb(pgServerUrl!);
  try {
    await admin.raw(sql);
  } finally {
    await admin.destroy();
  }
}

/** A database of the test's own. */
export interface TestDb {
  db: Db;
  /** What `createDb` opened: a SQLite file name or a `postgres://` URL (for child processes). */
  target: string;
  /** Closes it (and drops it on PostgreSQL). */
  close(): Promise<void>;
}

/**
 * Opens a database for one test: `migrated` (default) brings the schema up to date, else it is
 * empty (for migration tests that step through versions). On SQLite `file` (else memory) holds it.
 */
export async function openTestDb(options: { migrated?: boolean; file?: string } = {}): Promise<TestDb> {
  const migrated = options.migrated ?? true;
  if (!pgServerUrl) {
    const target = options.file ?? ':memory:';
    const db = createDb(target);
    if (migrated) await migrate(db);
    return { db, target, close: () => db.destroy() };
  }
  const name = `tf_t_${process.pid}_${crypto.randomBytes(4).toString('hex')}`;
  await onServer(`CREATE DATABASE ${name} TEMPLATE ${migrated ? PG_TEMPLATE : 'template0'}`);
  const target = withDatabase(pgServerUrl, name);
  const db = createDb(target);
  return {
    db,
    target,
    async close() {
      await db.destroy();
      await onServer(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    },
  };
}

/** File in a test folder that names its PostgreSQL database (read by `server-process.ts`). */
const URL_FILE = 'database-url';

/** Notes in `dir` which database its processes use (PostgreSQL only). */
export function rememberDatabase(dir: string, target: string): void {
  if (onPostgres) fs.writeFileSync(path.join(dir, URL_FILE), target);
}

/** The database of a test folder: its PostgreSQL URL, else its `db.sqlite`. */
export function folderDatabase(dir: string): string {
  const file = path.join(dir, URL_FILE);
  return fs.existsSync(file) ? fs.readFileSync(file, 'utf8') : path.join(dir, 'db.sqlite');
}

/** Drops the folder's PostgreSQL database, if it has one. */
export async function dropFolderDatabase(dir: string): Promise<void> {
  const target = folderDatabase(dir);
  if (!target.startsWith('postgres')) return;
  await onServer(`DROP DATABASE IF EXISTS ${new URL(target).pathname.slice(1)} WITH (FORCE)`);
}

/** A test title that says why the test is skipped when `skipped` (see scripts/test-report.ts). */
export function titleSkippedWhen(skipped: boolean, title: string, reason: string): string {
  return skipped ? `${title} [skip: ${reason}]` : title;
}
