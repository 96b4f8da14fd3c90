import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';
// @ts-expect-error plain ES module without types (shared with stryker.config.mjs)
import { selectedModule } from './test/mutation/modules.mjs';

/** The tests of the one module Stryker mutates now (`STRYKER_MODULE`, see test/mutation/modules.mjs). */
export default defineConfig({
  // Fewer generated cases per property while mutants run (see the file).
  resolve: {
    alias: [{ find: /^fast-check$/, replacement: fileURLToPath(new URL('./test/mutation/fast-check-capped.ts', import.meta.url)) }],
  },
  test: {
    include: (selectedModule() as { tests: string[] }).tests,
    environment: 'node',
    pool: 'forks',
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
