/**
 * One fuzz batch, run in its own process so that the parent's watchdog can kill a case that hangs
 * (a synchronous loop cannot be interrupted from inside). Usage (the parent passes these):
 *   node --import tsx test/fuzz/fuzz-child.ts <run|setup|large> <seed> <numRuns> <startAt> <scratchDir> <cli|nocli>
 * ("large" checks the built cases of gen-large.ts in order; seed and numRuns are then unused.)
 * Reports over IPC: {type:'case', index} before each case (its bytes are in <scratchDir>/current.bin),
 * {type:'done', index, ...report} after it, and at the end the shrunk counterexample of the first failure.
 */
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import fc from 'fast-check';
import { LARGE_CASES } from './gen-large.ts';
import { runCaseArb } from './gen-runfile.ts';
import { setupCaseArb } from './gen-setup.ts';
import { checkRunCase, checkSetupCase, scratch, type CaseReport } from './properties.ts';

const [kind, seedText, numText, startText, dir, cliFlag] = process.argv.slice(2);
const seed = Number(seedText);
const numRuns = Number(numText);
const startAt = Number(startText);
const where = scratch(dir!);
const withCli = cliFlag === 'cli';
const send = (m: object) => new Promise<void>((done) => process.send!(m, () => done()));

async function check(c: unknown): Promise<CaseReport> {
  if (kind === 'run') return checkRunCase(c as never, where, withCli);
  return checkSetupCase(c as never, where, withCli);
}

if (kind === 'large') {
  for (let i = startAt; i < LARGE_CASES.length; i++) {
    const large = LARGE_CASES[i]!;
    const c = large.make();
    writeFileSync(join(where.dir, 'current.bin'), c.bytes);
    await send({ type: 'case', index: i });
    const report = large.kind === 'run' ? await checkRunCase(c as never, where, withCli, large.label) : await checkSetupCase(c as never, where, withCli, large.label);
    await send({ type: 'done', index: i, ...report, label: large.label });
  }
  await send({ type: 'end' });
  process.disconnect();
  process.exit(0);
}

const arb = (kind === 'run' ? runCaseArb : setupCaseArb) as fc.Arbitrary<{ bytes: Uint8Array }>;
let index = 0;
let firstProblem = -1;
await fc.check(
  fc.asyncProperty(arb, async (c) => {
    const i = index++;
    if (i < startAt) return true;
    writeFileSync(join(where.dir, 'current.bin'), c.bytes);
    await send({ type: 'case', index: i });
    const report = await check(c);
    if (report.verdict === 'problem' && firstProblem < 0) firstProblem = i;
    await send({ type: 'done', index: i, ...report });
    return true;
  }),
  { seed, numRuns },
);

// Shrink the first failure to a small input a person can read (same seed, so the same cases come first).
if (firstProblem >= 0) {
  const details = await fc.check(
    fc.asyncProperty(arb, async (c) => (await check(c)).verdict !== 'problem'),
    { seed, numRuns: firstProblem + 1, interruptAfterTimeLimit: 120_000 },
  );
  if (details.failed && details.counterexample) {
    const [c] = details.counterexample;
    const report = await check(c);
    const text = Buffer.from(c.bytes).toString('utf8');
    await send({
      type: 'counterexample',
      seed,
      path: details.counterexample ? details.counterexamplePath : null,
      text: JSON.stringify(text),
      bytes: Buffer.from(c.bytes).toString('base64'),
      detail: fc.stringify({ ...c, bytes: undefined }),
      problems: report.problems,
    });
  }
}
await send({ type: 'end' });
process.disconnect();
