/**
 * `npm test` after bootstrap: lint, format check, type-checks, the app build, server tests, client unit tests and
 * browser tests, one after another; prints each suite's count and ends with the line
 * `N passed, N failed`. Exits non-zero when anything failed.
 */
import { spawn } from 'node:child_process';
import { stripVTControlCharacters } from 'node:util';

interface Step {
  name: string;
  cmd: string[];
  /** Whether the step reports a vitest summary (else it counts as one check). */
  vitest: boolean;
}

const STEPS: Step[] = [
  { name: 'lint (eslint)', cmd: ['npx', 'eslint', '.'], vitest: false },
  { name: 'format check (prettier)', cmd: ['npx', 'prettier', '--check', '.'], vitest: false },
  { name: 'type-check (server, scripts, tests)', cmd: ['npx', 'tsc', '-p', 'tsconfig.server.json'], vitest: false },
  { name: 'app build (strict templates, budgets)', cmd: ['npx', 'ng', 'build'], vitest: false },
  { name: 'server tests', cmd: ['npx', 'vitest', 'run', '--config', 'vitest.server.config.ts'], vitest: true },
  { name: 'client unit tests', cmd: ['npx', 'ng', 'test', '--watch=false'], vitest: true },
  { name: 'browser tests', cmd: ['npx', 'vitest', 'run', '--config', 'vitest.e2e.config.ts'], vitest: true },
];

const only = process.argv.slice(2);

function run(step: Step): Promise<{ code: number; output: string }> {
  return new Promise((resolve) => {
    const child = spawn(step.cmd[0]!, step.cmd.slice(1), {
      env: { ...process.env, NG_CLI_ANALYTICS: 'false', FORCE_COLOR: '0', NO_COLOR: '1', CI: process.env['CI'] ?? 'true' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    const take = (chunk: Buffer, to: NodeJS.WriteStream) => {
      output += chunk.toString();
      to.write(chunk);
    };
    child.stdout.on('data', (c: Buffer) => take(c, process.stdout));
    child.stderr.on('data', (c: Buffer) => take(c, process.stderr));
    child.on('close', (code) => resolve({ code: code ?? 1, output }));
  });
}

/** Reads vitest's "Tests  3 failed | 40 passed (43)" line. */
export function vitestCounts(output: string): { passed: number; failed: number } | null {
  const plain = stripVTControlCharacters(output);
  const line = plain
    .split('\n')
    .reverse()
    .find((l) => /^\s*Tests\s+\d/.test(l));
  if (!line) return null;
  const n = (word: string) => Number(new RegExp(`(\\d+) ${word}`).exec(line)?.[1] ?? 0);
  return { passed: n('passed'), failed: n('failed') };
}

let passed = 0;
let failed = 0;
const summary: string[] = [];
for (const step of STEPS) {
  if (only.length && !only.some((o) => step.name.includes(o))) continue;
  console.log(`\n=== ${step.name}: ${step.cmd.join(' ')}`);
  const { code, output } = await run(step);
  let p = 0;
  let f = 0;
  if (step.vitest) {
    const counts = vitestCounts(output);
    if (counts) {
      p = counts.passed;
      f = counts.failed;
      if (code !== 0 && f === 0) f = 1; // crashed after counting (e.g. unhandled error)
    } else {
      f = 1; // the suite did not run to a summary
    }
  } else if (code === 0) {
    p = 1;
  } else {
    f = 1;
  }
  passed += p;
  failed += f;
  summary.push(`  ${step.name.padEnd(40)} ${p} passed, ${f} failed`);
}
console.log(`\n=== summary\n${summary.join('\n')}\n`);
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed ? 1 : 0);
