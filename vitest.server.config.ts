import { defineConfig } from 'vitest/config';

/** Server, kinematics and script tests (Node). Client specs run through `ng test`. */
export default defineConfig({
  test: {
    include: ['test/server/**/*.test.ts', 'test/unit/**/*.test.ts'],
    environment: 'node',
    pool: 'forks',
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
