/**
 * `npm run test:mutation [module …]`: StrykerJS over each module of test/mutation/modules.mjs (or
 * the ones named), one after another, with the incremental files in test/mutation/incremental/
 * (only mutants whose code or tests changed run again). Prints the mutation score per module and
 * exits non-zero when a module is under 85 %. Reports: reports/mutation/<module>.html.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
// @ts-expect-error plain ES module without types (shared with stryker.config.mjs)
import { MUTATION_MODULES } from '../test/mutation/modules.mjs';

const TARGET = 85;
const names = process.argv.slice(2).length ? process.argv.slice(2) : Object.keys(MUTATION_MODULES as Record<string, unknown>);

interface JsonReport {
  files: Record<string, { mutants: { status: string }[] }>;
}

/** Score as Stryker counts it: detected (killed, timeout) over valid mutants (ignored and errors left out). */
export function mutationScore(report: JsonReport): { score: number; killed: number; survived: number; noCoverage: number; total: number } {
  let detected = 0;
  let survived = 0;
  let noCoverage = 0;
  for (const file of Object.values(report.files)) {
    for (const m of file.mutants) {
      if (m.status === 'Killed' || m.status === 'Timeout') detected++;
      else if (m.status === 'Survived') survived++;
      else if (m.status === 'NoCoverage') noCoverage++;
    }
  }
  const total = detected + survived + noCoverage;
  return { score: total ? (100 * detected) / total : 100, killed: detected, survived, noCoverage, total };
}

const lines: string[] = [];
let low = false;
for (const name of names) {
  if (!(name in MUTATION_MODULES)) {
    console.error(`unknown module "${name}"; known: ${Object.keys(MUTATION_MODULES).join(', ')}`);
    process.exit(2);
  }
  console.log(`\n=== mutation testing: ${name}`);
  const run = spawnSync('npx', ['stryker', 'run', 'stryker.config.mjs'], {
    stdio: 'inherit',
    env: { ...process.env, STRYKER_MODULE: name },
  });
  const reportFile = `reports/mutation/${name}.json`;
  if (run.status !== 0 || !fs.existsSync(reportFile)) {
    lines.push(`  ${name.padEnd(14)} did not finish (exit ${run.status})`);
    low = true;
    continue;
  }
  const s = mutationScore(JSON.parse(fs.readFileSync(reportFile, 'utf8')) as JsonReport);
  if (s.score < TARGET) low = true;
  lines.push(
    `  ${name.padEnd(14)} ${s.score.toFixed(2).padStart(6)} %  (${s.killed} detected, ${s.survived} survived, ${s.noCoverage} without coverage, of ${s.total})`,
  );
}
console.log(`\n=== mutation score per module (target ≥ ${TARGET} %)\n${lines.join('\n')}`);
process.exit(low ? 1 : 0);
