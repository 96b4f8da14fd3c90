/**
 * The modules `npm run test:mutation` mutates, one line each: `mutate` are the files (or
 * `file:startLine-endLine` ranges) Stryker changes, `tests` the test files that must catch the
 * changes. Add a module by adding a line; `scripts/mutation.ts` runs them one after another.
 *
 * @type {Record<string, { mutate: string[]; tests: string[] }>}
 */
export const MUTATION_MODULES = {
  kinematics: { mutate: ['src/kinematics/**/*.ts', '!src/kinematics/index.ts'], tests: ['test/unit/kinematics/**/*.test.ts'] },
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
  // processing: { mutate: ['server/processing/processing.ts', 'server/processing/processed-items-repository.ts'], tests: […] } — next: transition tests for processed items
  // policy: { mutate: ['server/policy/**/*.ts'], tests: ['test/server/policy*.test.ts'] },
};

/** The module named by `STRYKER_MODULE` (Stryker and its Vitest config read it). */
export function selectedModule() {
  const name = process.env['STRYKER_MODULE'] ?? '';
  const mod = MUTATION_MODULES[name];
  if (!mod) throw new Error(`STRYKER_MODULE must be one of ${Object.keys(MUTATION_MODULES).join(', ')} (got "${name}")`);
  return { name, ...mod };
}
