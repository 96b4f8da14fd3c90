import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import knexFactory, { type Knex } from 'knex';
import { SqliteClient } from './sqlite-client';
import { PG_TYPES, isPostgresUrl } from './dialect';
import { assertNoUnfinishedRestore } from '../backup/backup-manifest';

export type Db = Knex;

const here = path.dirname(fileURLToPath(import.meta.url));
/**
 * Folder of the timestamped migrations: two levels up from this file, which holds both for
 * `server/db/knex.ts` and for the bundle at `dist/server/main.mjs`.
 */
export const MIGRATIONS_DIR = path.resolve(here, '../../migrations');

/**
 * Reads `migrations/*.ts` with our own `import()`, so the same files load under tsx, vitest and
 * the knex CLI (knex's built-in loader cannot import TypeScript under every runner).
 */
class TsMigrationSource implements Knex.MigrationSource<string> {
  constructor(private readonly dir: string) {}

  async getMigrations(): Promise<string[]> {
    return fs
      .readdirSync(this.dir)
      .filter((f) => /^\d{14}_[a-z0-9_]+\.ts$/.test(f))
      .sort();
  }

  getMigrationName(file: string): string {
    return file;
  }

  getMigration(file: string): Promise<Knex.Migration> {
    // A template-literal import, so esbuild also bundles every migration into the server bundle.
    return import(`../../migrations/${file.replace(/\.ts$/, '')}.ts`) as Promise<Knex.Migration>;
  }
}

/** The migrations this version has, by file name, oldest first (what `knex_migrations` names). */
export function knownMigrations(): Promise<string[]> {
  return new TsMigrationSource(MIGRATIONS_DIR).getMigrations();
}

/** Knex options for SQLite through better-sqlite3 (see `sqlite-client.ts`); also used by `knexfile.ts`. */
export function knexOptions(filename: string): Knex.Config {
  return {
    client: SqliteClient as unknown as Knex.Config['client'],
    connection: { filename },
    useNullAsDefault: true,
    // One writer: SQLite takes one at a time, and a second would block the event loop on the lock.
    pool: { min: 1, max: 1 },
    migrations: { migrationSource: new TsMigrationSource(MIGRATIONS_DIR), tableName: 'knex_migrations' },
  };
}

/** Knex options for PostgreSQL at `url` (a pool of connections; see `dialect.ts`). */
export function pgKnexOptions(url: string, poolMax = 10): Knex.Config {
  return {
    client: 'pg',
    connection: { connectionString: url, types: PG_TYPES } as Knex.PgConnectionConfig,
    pool: { min: 0, max: poolMax },
    migrations: { migrationSource: new TsMigrationSource(MIGRATIONS_DIR), tableName: 'knex_migrations' },
  };
}

/**
 * Opens the database: PostgreSQL when `target` is a `postgres://` URL (`DATABASE_URL`), else the
 * SQLite file (creating its folder if needed). `:memory:` works for tests.
 */
export function createDb(target: string): Db {
  if (isPostgresUrl(target)) return knexFactory(pgKnexOptions(target));
  if (target === ':memory:') return knexFactory(knexOptions(target));
  assertNoUnfinishedRestore(target);
  fs.mkdirSync(path.dirname(target), { recursive: true });
  return knexFactory(knexOptions(target));
}

/** Where the configured database is: `DATABASE_URL` when set, else the SQLite file. */
export function dbTarget(config: { databaseUrl: string | null; dbFile: string }): string {
  return config.databaseUrl ?? config.dbFile;
}

/**
 * Brings the schema up to date. Several processes may start at once on one PostgreSQL database
 * (web servers, workers): while another holds knex's migration lock, this one waits and tries again.
 */
export async function migrate(db: Db, waitMs = 120_000): Promise<string[]> {
  const started = Date.now();
  for (;;) {
    try {
      const [, applied] = (await db.migrate.latest()) as [number, string[]];
      return applied;
    } catch (err) {
      const message = (err as Error).message;
      // Locked by another process, or its migration tables were being created at the same moment.
      const locked =
        (err as { name?: string }).name === 'MigrationLocked' ||
        /already locked|knex_migrations\S* .*already exists|duplicate key.*pg_type/i.test(message);
      if (!locked || Date.now() - started > waitMs) throw err;
      await new Promise((r) => setTimeout(r, 250));
    }
  }
}

/** ISO timestamp for `*_at` columns. */
export function nowIso(clock: () => Date = () => new Date()): string {
  return clock().toISOString();
}
