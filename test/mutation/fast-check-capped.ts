/**
 * fast-check as the tests see it under mutation testing (vitest.mutation.config.ts aliases
 * `fast-check` here): every property runs at most `STRYKER_FC_RUNS` (default 25) generated cases.
 * Each surviving mutant re-runs its tests and the generated cases dominate that time; a mutant that
 * changes a formula fails on nearly every case, so a few suffice. `npm test` keeps the full counts.
 */
// The package's own file, past the alias.
import * as fc from '../../node_modules/fast-check/lib/fast-check.js';
import type * as Fc from 'fast-check';

const cap = Number(process.env['STRYKER_FC_RUNS'] ?? 25);

const assert: typeof Fc.assert = ((property: Parameters<typeof Fc.assert>[0], params?: Parameters<typeof Fc.assert>[1]) =>
  fc.assert(property, { ...params, numRuns: Math.min(params?.numRuns ?? 100, cap) })) as typeof Fc.assert;

export default { ...fc, assert };
