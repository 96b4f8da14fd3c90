/**
 * `npm test` after bootstrap: lint, format check, type-checks, the app build, server tests (on SQLite, then on
 * PostgreSQL), client unit tests and
 * browser tests, one after another; prints each suite's count and ends with the line
 * `N passed, N failed` (the skipped count on the line before). Exits non-zero when anything failed. In CI (`CI=true`, the
 * default here) a skipped test counts as failed unless its title carries `[skip: reason]`
 * (see `scripts/test-report.ts`).
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { skippedTests, unexplainedSkips, vitestCounts } from './test-report';

interface Step {
  name: string;
  cmd: string[];
  /** Whether the step reports a vitest summary (else it counts as one check). */
  vitest: boolean;
  /** The arguments that add vitest's JSON report (read for the names of skipped tests) at `file`. */
  jsonReport?: (file: string) => string[];
  /** Environment the step runs with besides this process's. */
  env?: Record<string, string>;
}

const vitestJson = (file: string) => ['--reporter=default', '--reporter=json', `--outputFile.json=${file}`];
// The Angular builder gives its output file to the first reporter.
const ngJson = (file: string) => ['--reporters=json', '--reporters=default', `--output-file=${file}`];

const STEPS: Step[] = [
  { name: 'lint (eslint)', cmd: ['npx', 'eslint', '.'], vitest: false },
  { name: 'format check (prettier)', cmd: ['npx', 'prettier', '--check', '.'], vitest: false },
  { name: 'type-check (server, scripts, tests)', cmd: ['npx', 'tsc', '-p', 'tsconfig.server.json'], vitest: false },
  { name: 'app build (strict templates, budgets)', cmd: ['npx', 'ng', 'build'], vitest: false },
  // On SQLite whatever the shell's DATABASE_URL says.
  {
    name: 'server tests',
    cmd: ['npx', 'vitest', 'run', '--config', 'vitest.server.config.ts'],
    vitest: true,
    jsonReport: vitestJson,
    env: { DATABASE_URL: '', TEST_S3_ENDPOINT: '' },
  },
  // The same suite on a private PostgreSQL server (DATABASE_URL set; scripts/test-postgres.ts).
  { name: 'server tests (PostgreSQL)', cmd: ['npx', 'tsx', 'scripts/test-postgres.ts'], vitest: true, jsonReport: vitestJson },
  { name: 'client unit tests', cmd: ['npx', 'ng', 'test', '--watch=false'], vitest: true, jsonReport: ngJson },
  { name: 'browser tests', cmd: ['npx', 'vitest', 'run', '--config', 'vitest.e2e.config.ts'], vitest: true, jsonReport: vitestJson },
];

const only = process.argv.slice(2);
/** Whether this run is CI's (`CI=true`): then a skipped test needs its reason. */
const ci = process.env['CI'] === 'true' || process.env['CI'] === '1';
const reportDir = path.resolve('.tmp/test-reports');

function run(step: Step, args: string[]): Promise<{ code: number; output: string }> {
  return new Promise((resolve) => {
    const child = spawn(step.cmd[0]!, [...step.cmd.slice(1), ...args], {
      env: { ...process.env, NG_CLI_ANALYTICS: 'false', FORCE_COLOR: '0', NO_COLOR: '1', CI: process.env['CI'] ?? 'true', ...step.env },
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

let passed = 0;
let failed = 0;
let skipped = 0;
const summary: string[] = [];
const refusedSkips: string[] = [];
fs.mkdirSync(reportDir, { recursive: true });
for (const [index, step] of STEPS.entries()) {
  if (only.length && !only.some((o) => step.name.includes(o))) continue;
  const reportFile = path.join(reportDir, `step-${index}.json`);
  fs.rmSync(reportFile, { force: true });
  const args = step.jsonReport?.(reportFile) ?? [];
  console.log(`\n=== ${step.name}: ${[...step.cmd, ...args].join(' ')}`);
  const { code, output } = await run(step, args);
  let p = 0;
  let f = 0;
  let s = 0;
  if (step.vitest) {
    const counts = vitestCounts(output);
    if (counts) {
      p = counts.passed;
      f = counts.failed;
      s = counts.skipped;
      if (code !== 0 && f === 0) f = 1; // crashed after counting (e.g. unhandled error)
      if (s > 0) {
        const names = fs.existsSync(reportFile) ? skippedTests(fs.readFileSync(reportFile, 'utf8')) : [];
        for (const name of names) console.log(`  skipped: ${name}`);
        const refused = unexplainedSkips(names, s, ci);
        refusedSkips.push(...refused.map((name) => `${step.name}: ${name}`));
        f += refused.length;
      }
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
  skipped += s;
  summary.push(`  ${step.name.padEnd(40)} ${p} passed, ${f} failed, ${s} skipped`);
}
console.log(`\n=== summary\n${summary.join('\n')}\n`);
if (refusedSkips.length) {
  console.log('Skipped in CI without a reason (title needs "[skip: why]"), counted as failed:');
  for (const name of refusedSkips) console.log(`  ${name}`);
  console.log('');
}
console.log(`${skipped} skipped`);
console.log(`${passed} passed, ${failed} failed`);
process.exit(failed ? 1 : 0);
