/**
 * The modules `npm run test:mutation` mutates, one line each: `mutate` are the files (or
 * `file:startLine-endLine` ranges) Stryker changes, `tests` the test files that must catch the
 * changes. Add a module by adding a line; `scripts/mutation.ts` runs them one after another.
 *
 * @type {Record<string, { mutate: string[]; tests: string[] }>}
 */
export const MUTATION_MODULES = {
  // The measurement core: geometry, joint angles per frame and at events, step timing, cadence and
  // spring-mass figures. The rest of src/kinematics (events, bands, comparison, gait cycle, overlay
  // drawing …) is not in the run yet: see README "Testing".
  kinematics: {
    mutate: ['src/kinematics/{geometry,angles,angle-measures,frame-angles,step-timing,stats,spring-mass}.ts'],
    tests: ['test/unit/kinematics/**/*.test.ts'],
  },
  'plans-rules': { mutate: ['src/plans-rules/**/*.ts', '!src/plans-rules/index.ts'], tests: ['test/unit/plans/**/*.test.ts'] },
  billing: {
    mutate: [
      'src/contracts/billing.ts:184-221',
      'src/app/shared/billing-words.ts:19-48',
      'src/app/features/billing/invoice-form/invoice-lines.ts:24-37',
      'server/billing/payment-webhook.ts:16-19',
    ],
    tests: ['test/unit/billing/**/*.test.ts'],
  },
  // The processed items' moves (claim, lease per attempt, progress, ready, retry, last attempt, cancel, release) and the worker loop;
  // of the repository the rows and moves (toItem … unfinishedFor), not the relay's and the views' queries below them.
  processing: {
    mutate: ['server/processing/processing.ts', 'server/processing/processed-items-repository.ts:34-140', 'server/processing/worker.ts'],
    tests: ['test/server/processing/processed-item-transitions.test.ts', 'test/server/processing/worker-loop.test.ts'],
  },
  policy: { mutate: ['server/policy/decide.ts', 'server/policy/access-table.ts'], tests: ['test/server/policy/access-policy.test.ts'] },
};

/** The module named by `STRYKER_MODULE` (Stryker and its Vitest config read it). */
export function selectedModule() {
  const name = process.env['STRYKER_MODULE'] ?? '';
  const mod = MUTATION_MODULES[name];
  if (!mod) throw new Error(`STRYKER_MODULE must be one of ${Object.keys(MUTATION_MODULES).join(', ')} (got "${name}")`);
  return { name, ...mod };
}
