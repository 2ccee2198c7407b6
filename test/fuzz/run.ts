/**
 * `npm run fuzz`: 10,000 generated run files and 10,000 generated setup files through the
 * engine API and the command line, then at least 200 kills of a process saving a campaign. Prints the
 * counts and exits non-zero on any uncaught error, stack trace, hang, other broken property, or
 * unreadable campaign or backup. Known issues (test/fuzz/known-issues.ts) are counted and listed.
 *
 *   npm run fuzz -- [--cases N] [--kills K] [--seed S]
 *
 * The same seed gives the same cases; a failure prints its seed, case number and shrunk input, and
 * inputs of hanging cases are kept under test-artifacts/fuzz/.
 */
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { runBatch, type BatchResult } from './batch.ts';
import { ROOT } from './inputs.ts';
import { killTest, type KillResult } from './kill.ts';
import { LARGE_CASES } from './gen-large.ts';
import { KNOWN_ISSUES } from './known-issues.ts';

const { values } = parseArgs({
  options: {
    cases: { type: 'string', default: '10000' },
    kills: { type: 'string', default: '200' },
    seed: { type: 'string', default: '20261202' },
  },
});
const cases = Number(values.cases);
const kills = Number(values.kills);
const seed = Number(values.seed);
const keepDir = join(ROOT, 'test-artifacts', 'fuzz');
mkdirSync(keepDir, { recursive: true });

const log = (s: string) => process.stderr.write(s + '\n');
const t0 = Date.now();
log(`sweepbook fuzz: ${cases} run-file cases (seed ${seed}), ${cases} setup cases (seed ${seed + 1}), ${kills} kills (seed ${seed + 2})`);

const progress = (label: string) => (done: number) => {
  if (done % 1000 === 0) log(`  ${label}: ${done} cases, ${((Date.now() - t0) / 1000).toFixed(0)} s`);
};
// the two batches run side by side, each in its own child process under a watchdog
const [runs, setups] = await Promise.all([
  runBatch({ kind: 'run', seed, numRuns: cases, withCli: true, hangMs: 30_000, keepDir, onProgress: progress('run files') }),
  runBatch({ kind: 'setup', seed: seed + 1, numRuns: cases, withCli: true, hangMs: 30_000, keepDir, onProgress: progress('setup files') }),
]);
const large = await runBatch({ kind: 'large', seed: 0, numRuns: LARGE_CASES.length, withCli: true, hangMs: 180_000, keepDir });
const saves = await killTest({ kills, seed: seed + 2, maxDelayMs: 40 }, (k) => {
  if (k % 50 === 0) log(`  campaign saves: ${k} kills, ${((Date.now() - t0) / 1000).toFixed(0)} s`);
});

function batchLines(title: string, r: BatchResult): string[] {
  const known = Object.entries(r.known);
  return [
    `${title} (seed ${r.seed})`,
    `  cases                          ${r.cases}`,
    `  reduced                        ${r.reduced}`,
    `  rejected with a located error  ${r.rejected}`,
    `  uncaught errors                ${r.uncaught}`,
    `  stack traces                   ${r.stackTraces}`,
    `  hangs                          ${r.hangs}`,
    `  cases breaking any property    ${r.problems}`,
    `  slowest case                   ${r.slowestMs.toFixed(0)} ms`,
    ...known.map(([id, n]) => `  known issue ${id}: ${n} cases`),
    ...r.examples.map((e) => `  ! ${e}`),
    ...(r.counterexample ? [`  ! shrunk input: ${r.counterexample.text}`, `    ${r.counterexample.detail}`, ...r.counterexample.problems.map((p) => `    ${p}`)] : []),
  ];
}

function saveLines(r: KillResult): string[] {
  return [
    `campaign saves killed at random moments (seed ${r.seed})`,
    `  kills                          ${r.kills}`,
    `  kills inside a save            ${r.midSave}`,
    `  saves completed before kills   ${r.savesCompleted}`,
    `  campaign old / new version     ${r.campaignOld} / ${r.campaignNew}`,
    `  unreadable campaign files      ${r.unreadable}`,
    `  unreadable backups             ${r.backupUnreadable}`,
    `  most temp files left           ${r.maxTempFiles} (after a clean save: ${r.tempFilesAtEnd})`,
    ...r.failures.slice(0, 10).map((f) => `  ! ${f}`),
  ];
}

function largeLines(r: BatchResult): string[] {
  return [
    'large inputs (engine and command line, each within the time bound unless a known issue)',
    ...r.timings.map((t) => `  ${(t.ms / 1000).toFixed(1).padStart(6)} s  ${t.verdict.padEnd(8)}  ${t.label}`),
    `  uncaught errors ${r.uncaught}, stack traces ${r.stackTraces}, hangs ${r.hangs}, cases breaking any property ${r.problems}`,
    ...Object.entries(r.known).map(([id, n]) => `  known issue ${id}: ${n} cases`),
    ...r.examples.map((e) => `  ! ${e}`),
  ];
}

const report = [...batchLines('run files', runs), '', ...batchLines('setup files', setups), '', ...largeLines(large), '', ...saveLines(saves)];
const knownSeen = KNOWN_ISSUES.filter((k) => (runs.known[k.id] ?? 0) + (setups.known[k.id] ?? 0) + (large.known[k.id] ?? 0) > 0);
if (knownSeen.length > 0) {
  report.push('', 'known issues (reported, not failing; see test/fuzz/known-issues.ts):');
  for (const k of knownSeen) report.push(`  ${k.id}: ${k.summary}`);
}
const failed =
  [runs, setups, large].some((r) => r.problems + r.uncaught + r.stackTraces + r.hangs > 0) ||
  saves.unreadable + saves.backupUnreadable > 0 ||
  saves.failures.length > 0 ||
  runs.cases !== cases ||
  setups.cases !== cases ||
  large.cases !== LARGE_CASES.length ||
  saves.kills !== kills;
report.push('', `${failed ? 'FAILED' : 'passed'} in ${((Date.now() - t0) / 1000).toFixed(0)} s`);
process.stdout.write(report.join('\n') + '\n');
process.exitCode = failed ? 1 : 0;
