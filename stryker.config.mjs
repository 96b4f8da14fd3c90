// @ts-check
/**
 * Mutation testing of one module of test/mutation/modules.mjs, named by STRYKER_MODULE.
 * Run all modules with `npm run test:mutation` (scripts/mutation.ts), one with
 * `npm run test:mutation -- kinematics`.
 */
import { selectedModule } from './test/mutation/modules.mjs';

const mod = selectedModule();

/** @type {import('@stryker-mutator/api/core').PartialStrykerOptions} */
export default {
  testRunner: 'vitest',
  vitest: { configFile: 'vitest.mutation.config.ts' },
  mutate: mod.mutate,
  coverageAnalysis: 'perTest',
  // Module-level code (tables, constants) runs once per import: each of its mutants needs every
  // test again (95 % of the run time). They are left out of the score; see README "Mutation testing".
  ignoreStatic: true,
  // The machine's two cores are shared; more test processes only queue.
  concurrency: Number(process.env['STRYKER_CONCURRENCY'] ?? 2),
  incremental: true,
  incrementalFile: `test/mutation/incremental/${mod.name}.json`,
  reporters: ['clear-text', 'html', 'json', 'progress'],
  htmlReporter: { fileName: `reports/mutation/${mod.name}.html` },
  jsonReporter: { fileName: `reports/mutation/${mod.name}.json` },
  clearTextReporter: { allowColor: false, logTests: false, reportMutants: true, reportScoreTable: true },
  thresholds: { high: 90, low: 85, break: null },
  tempDirName: '.stryker-tmp',
  ignorePatterns: ['/dist', '/uploads', '/data', '/test-results', '/reports', '/.angular', '/coverage', '/.tmp'],
  timeoutMS: 10_000,
  cleanTempDir: 'always',
};
