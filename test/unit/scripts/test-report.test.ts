import { describe, expect, it } from 'vitest';
import { skipReason, skippedTests, unexplainedSkips, vitestCounts } from '../../../scripts/test-report';

// Lines as vitest 4 prints them (copied from real runs of this repository's suites).
describe('the test runner reads vitest', () => {
  it('counts passed, failed and skipped (todo counts as skipped) from the closing "Tests" line', () => {
    expect(vitestCounts(' Test Files  2 passed (2)\n      Tests  40 passed (40)\n')).toEqual({ passed: 40, failed: 0, skipped: 0 });
    expect(vitestCounts('      Tests  3 failed | 40 passed | 2 skipped | 1 todo (46)')).toEqual({ passed: 40, failed: 3, skipped: 3 });
    expect(vitestCounts('\x1b[2m      Tests \x1b[22m \x1b[1m\x1b[32m9 passed\x1b[39m\x1b[22m\x1b[90m (9)\x1b[39m')).toEqual({
      passed: 9,
      failed: 0,
      skipped: 0,
    });
    expect(vitestCounts('Error: the config could not be loaded')).toBeNull();
  });

  it('names the skipped and todo tests of the JSON report, and nothing of a broken report', () => {
    const report = JSON.stringify({
      testResults: [
        {
          assertionResults: [
            { fullName: 'a passes', status: 'passed' },
            { fullName: 'b is skipped [skip: no chromium]', status: 'skipped' },
            { fullName: 'c is pending', status: 'pending' },
            { title: 'd todo', status: 'todo' },
          ],
        },
      ],
    });
    expect(skippedTests(report)).toEqual(['b is skipped [skip: no chromium]', 'c is pending', 'd todo']);
    expect(skippedTests('{ not json')).toEqual([]);
  });

  it('reads the reason of "[skip: reason]" and nothing from an empty one', () => {
    expect(skipReason('draws the page [skip: no Debian chromium here]')).toBe('no Debian chromium here');
    expect(skipReason('draws the page [skip:   ]')).toBeNull();
    expect(skipReason('draws the page (skip: no brackets)')).toBeNull();
  });

  it('in CI refuses skips without a reason and skips it cannot name; outside CI refuses none', () => {
    const names = ['x [skip: needs a GPU]', 'y without a reason'];
    expect(unexplainedSkips(names, 2, true)).toEqual(['y without a reason']);
    expect(unexplainedSkips(names, 3, true)).toHaveLength(2);
    expect(unexplainedSkips(names, 2, false)).toEqual([]);
  });
});
