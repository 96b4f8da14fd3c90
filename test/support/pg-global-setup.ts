/**
 * vitest global setup of the server suite: on PostgreSQL (`DATABASE_URL` set) makes the migrated
 * template database that every test database is copied from (see `test-db.ts`); on SQLite nothing.
 */
import PgBoss from 'pg-boss';
import { createDb, migrate } from '../../server/db/knex';
import { BOSS_SCHEMA } from '../../server/processing/item-dispatch';
import { PG_TEMPLATE, pgServerUrl, withDatabase } from './test-db';

export default async function setup(): Promise<void> {
  if (!pgServerUrl) return;
  const admin = createDb(pgServerUrl);
  try {
    await admin.raw(`DROP DATABASE IF EXISTS ${PG_TEMPLATE} WITH (FORCE)`);
    await admin.raw(`CREATE DATABASE ${PG_TEMPLATE}`);
  } finally {
    await admin.destroy();
  }
  const db = createDb(withDatabase(pgServerUrl, PG_TEMPLATE));
  try {
    await migrate(db);
  } finally {
    await db.destroy();
  }
  // pg-boss's schema too, so test apps do not each install it.
  const boss = new PgBoss({
    connectionString: withDatabase(pgServerUrl, PG_TEMPLATE),
    schema: BOSS_SCHEMA,
    max: 1,
    supervise: false,
    schedule: false,
  });
  await boss.start();
  await boss.stop({ graceful: false, wait: true, timeout: 1000 });
}
