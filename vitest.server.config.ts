import { defineConfig } from 'vitest/config';

/** Server, kinematics and script tests (Node). Client specs run through `ng test`. */
export default defineConfig({
  test: {
    include: ['test/server/**/*.test.ts', 'test/unit/**/*.test.ts'],
    environment: 'node',
    // On PostgreSQL (DATABASE_URL set): the migrated template each test database is copied from.
    globalSetup: ['test/support/pg-global-setup.ts'],
    pool: 'forks',
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
