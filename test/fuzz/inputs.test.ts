import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { jsonErrorOffset } from '../../core/setup/schema.ts';
import { runBatch, type BatchResult } from './batch.ts';

/**
 * The quick fuzz run of `npm test`: a few hundred generated run files and setup files through
 * readRun / readSetup / reduceRun and the command line, each case in a child process under a watchdog.
 * `npm run fuzz` runs the same properties on 10,000 cases of each. Seeds are fixed; a failure prints
 * its seed, the case number and the shrunk input.
 */
const RUN_SEED = 20261202;
const SETUP_SEED = 20261203;
const CASES = 250;

function explain(r: BatchResult): string {
  return [
    `seed ${r.seed}: ${r.problems} problem cases, ${r.uncaught} uncaught, ${r.stackTraces} stack traces, ${r.hangs} hangs`,
    ...r.examples,
    r.counterexample ? `shrunk input ${r.counterexample.text}\n  ${r.counterexample.detail}\n  ${r.counterexample.problems.join('\n  ')}` : '',
  ].join('\n');
}

describe('fuzzed inputs never crash the engine or the command line', () => {
  it(`run files (${CASES} cases, seed ${RUN_SEED}): reduced, or refused naming file and line; never NaN, never a stack trace`, { timeout: 120_000 }, async () => {
    const r = await runBatch({ kind: 'run', seed: RUN_SEED, numRuns: CASES, withCli: true, hangMs: 20_000 });
    expect(r.cases).toBe(CASES);
    expect(r.problems, explain(r)).toBe(0);
    expect(r.uncaught + r.stackTraces + r.hangs, explain(r)).toBe(0);
    // the generator reaches both ends: files that reduce and files that are refused
    expect(r.reduced).toBeGreaterThan(CASES / 10);
    expect(r.rejected).toBeGreaterThan(CASES / 10);
  });

  it(`setup files (${CASES} cases, seed ${SETUP_SEED}): reduced, or refused naming the field or line; bad geometry always refused`, { timeout: 120_000 }, async () => {
    const r = await runBatch({ kind: 'setup', seed: SETUP_SEED, numRuns: CASES, withCli: true, hangMs: 20_000 });
    expect(r.cases).toBe(CASES);
    expect(r.problems, explain(r)).toBe(0);
    expect(r.uncaught + r.stackTraces + r.hangs, explain(r)).toBe(0);
    expect(r.reduced).toBeGreaterThan(CASES / 10);
    expect(r.rejected).toBeGreaterThan(CASES / 10);
  });

  it('locates a JSON syntax error exactly when JSON.parse refuses the text', () => {
    const mutated = fc.jsonValue().chain((v) => {
      const t = JSON.stringify(v, null, 1);
      return fc.tuple(fc.nat(t.length), fc.string({ unit: 'binary-ascii', maxLength: 3 }), fc.nat(3)).map(([at, ins, cut]) => t.slice(0, at) + ins + t.slice(at + cut));
    });
    const valid = (t: string) => {
      try {
        JSON.parse(t);
        return true;
      } catch {
        return false;
      }
    };
    fc.assert(
      fc.property(fc.oneof(fc.jsonValue().map((v) => JSON.stringify(v)), mutated, fc.string({ unit: 'binary' })), (t) => {
        const at = jsonErrorOffset(t);
        return valid(t) ? at === undefined : at !== undefined && at >= 0 && at <= t.length;
      }),
      { seed: 42, numRuns: 20_000 },
    );
    // deep nesting is scanned without recursion
    expect(jsonErrorOffset('['.repeat(200_000))).toBe(200_000);
  });
});
