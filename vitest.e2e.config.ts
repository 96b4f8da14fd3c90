import { defineConfig } from 'vitest/config';

/** Browser tests: Debian chromium driven by playwright-core against the built app. */
export default defineConfig({
  test: {
    include: ['test/e2e/**/*.e2e.ts'],
    environment: 'node',
    pool: 'forks',
    fileParallelism: false,
    testTimeout: 120_000,
    hookTimeout: 240_000,
  },
});
