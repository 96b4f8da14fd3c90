/**
 * Reading what a vitest run reports, for the test runner (`scripts/test-all.ts`): the counts of its
 * summary line and the skipped tests of its JSON report, and whether a skip is allowed.
 *
 * Convention: a test may be skipped only with its reason in its title, `[skip: why]`, e.g.
 * `it.skipIf(!hasChromium)('draws the page [skip: no Debian chromium on this machine]', …)`.
 * In CI (`CI=true`) a skipped test without such a reason counts as a failure.
 */
import { stripVTControlCharacters } from 'node:util';

/** Counts read from vitest's "Tests  3 failed | 40 passed | 2 skipped (45)" line. */
export interface VitestCounts {
  passed: number;
  failed: number;
  /** Skipped and todo tests. */
  skipped: number;
}

/** Reads vitest's closing "Tests …" line; null when the run never got there. */
export function vitestCounts(output: string): VitestCounts | null {
  const plain = stripVTControlCharacters(output);
  const line = plain
    .split('\n')
    .reverse()
    .find((l) => /^\s*Tests\s+\d/.test(l));
  if (!line) return null;
  const n = (word: string) => Number(new RegExp(`(\\d+) ${word}`).exec(line)?.[1] ?? 0);
  return { passed: n('passed'), failed: n('failed'), skipped: n('skipped') + n('todo') };
}

/** The `[skip: reason]` a test title carries, or null. */
export function skipReason(title: string): string | null {
  const m = /\[skip:\s*([^\]]*\S)\s*\]/.exec(title);
  return m ? m[1]! : null;
}

/** One test of vitest's JSON report (jest-compatible shape; only what we read). */
interface JsonAssertion {
  fullName?: string;
  title?: string;
  status?: string;
}

/** Full names of the skipped (or todo) tests in vitest's JSON report text; [] when it cannot be read. */
export function skippedTests(jsonReport: string): string[] {
  let report: { testResults?: { assertionResults?: JsonAssertion[] }[] };
  try {
    report = JSON.parse(jsonReport) as typeof report;
  } catch {
    return [];
  }
  const names: string[] = [];
  for (const file of report.testResults ?? []) {
    for (const a of file.assertionResults ?? []) {
      if (a.status === 'skipped' || a.status === 'pending' || a.status === 'todo') names.push(a.fullName ?? a.title ?? '(unnamed test)');
    }
  }
  return names;
}

/**
 * Skipped tests that count as failures: in CI every skip without a `[skip: reason]` in its title;
 * outside CI none. `unnamed` skips (counted in the summary line, missing from the JSON report) are
 * failures in CI too, since their reason cannot be read.
 */
export function unexplainedSkips(skipped: string[], counted: number, ci: boolean): string[] {
  if (!ci) return [];
  const bad = skipped.filter((name) => skipReason(name) === null);
  const missing = Math.max(0, counted - skipped.length);
  for (let i = 0; i < missing; i++) bad.push('(a skipped test the JSON report does not name)');
  return bad;
}
