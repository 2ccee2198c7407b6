/**
 * Runs a fuzz batch in a child process (test/fuzz/fuzz-child.ts) under a watchdog: a case that does
 * not finish within the hang bound is a hang, the child is killed (by its own pid) and a new one
 * carries on from the next case. A child that dies on its own is an uncaught error.
 */
import { fork } from 'node:child_process';
import { copyFileSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { CaseReport } from './properties.ts';
import { ROOT } from './inputs.ts';

const CHILD = fileURLToPath(new URL('./fuzz-child.ts', import.meta.url));

export interface BatchOptions {
  kind: 'run' | 'setup' | 'large';
  seed: number;
  numRuns: number;
  /** Exercise the command line too (in-process `main()`), not only the engine API. */
  withCli: boolean;
  /** A case still running after this long is a hang. */
  hangMs: number;
  /** Where hanging inputs are copied for a person to look at (none kept when undefined). */
  keepDir?: string;
  onProgress?: (done: number) => void;
}

export interface BatchResult {
  kind: 'run' | 'setup' | 'large';
  seed: number;
  cases: number;
  reduced: number;
  rejected: number;
  /** Cases that broke a property (uncaught errors, stack traces, unlocated errors, NaN in results, slow cases...). */
  problems: number;
  uncaught: number;
  stackTraces: number;
  hangs: number;
  /** Cases that ran into each known issue (test/fuzz/known-issues.ts). */
  known: Record<string, number>;
  slowestMs: number;
  /** Time of each built (large) case, by its label. */
  timings: { label: string; ms: number; verdict: string }[];
  /** The first few problem descriptions, with the case index. */
  examples: string[];
  counterexample?: { text: string; detail: string; problems: string[]; path: string | null };
}

interface Message extends Partial<CaseReport> {
  type: 'case' | 'done' | 'counterexample' | 'end';
  index?: number;
  text?: string;
  detail?: string;
  path?: string | null;
  label?: string;
}

export async function runBatch(o: BatchOptions): Promise<BatchResult> {
  const res: BatchResult = { kind: o.kind, seed: o.seed, cases: 0, reduced: 0, rejected: 0, problems: 0, uncaught: 0, stackTraces: 0, hangs: 0, known: {}, slowestMs: 0, timings: [], examples: [] };
  const dir = mkdtempSync(join(tmpdir(), `sweepbook-fuzz-${o.kind}-`));
  let startAt = 0;
  try {
    while (startAt < o.numRuns) {
      startAt = await oneChild(o, res, dir, startAt);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return res;
}

/** Runs one child from `startAt`; returns where the next child must start (numRuns when all done). */
function oneChild(o: BatchOptions, res: BatchResult, dir: string, startAt: number): Promise<number> {
  return new Promise((resolvePromise) => {
    const child = fork(CHILD, [o.kind, String(o.seed), String(o.numRuns), String(startAt), dir, o.withCli ? 'cli' : 'nocli'], {
      cwd: ROOT,
      execArgv: ['--import', 'tsx'],
      stdio: ['ignore', 'pipe', 'pipe', 'ipc'],
    });
    let stderr = '';
    child.stderr!.on('data', (d: Buffer) => (stderr = (stderr + d.toString()).slice(-4000)));
    child.stdout!.resume();
    let current = -1;
    let since = Date.now();
    let ended = false;
    let next = o.numRuns;
    const note = (text: string) => {
      if (res.examples.length < 12) res.examples.push(text);
    };
    const watchdog = setInterval(() => {
      if (current >= 0 && Date.now() - since > o.hangMs) {
        res.hangs++;
        res.problems++;
        res.cases++;
        let kept = '';
        if (o.keepDir) {
          kept = join(o.keepDir, `hang-${o.kind}-${o.seed}-${current}.bin`);
          copyFileSync(join(dir, 'current.bin'), kept);
        }
        note(`${o.kind} case ${current} (seed ${o.seed}) still running after ${o.hangMs} ms: killed${kept ? `; input kept in ${kept}` : ''}`);
        next = current + 1;
        current = -1;
        child.kill('SIGKILL');
      }
    }, 250);
    child.on('message', (m: Message) => {
      if (m.type === 'case') {
        current = m.index!;
        since = Date.now();
      } else if (m.type === 'done') {
        current = -1;
        res.cases++;
        res.slowestMs = Math.max(res.slowestMs, m.ms ?? 0);
        if (m.label) res.timings.push({ label: m.label, ms: m.ms ?? 0, verdict: m.verdict ?? '' });
        res.uncaught += m.uncaught ?? 0;
        res.stackTraces += m.stackTraces ?? 0;
        for (const id of m.known ?? []) res.known[id] = (res.known[id] ?? 0) + 1;
        if (m.verdict === 'reduced') res.reduced++;
        else if (m.verdict === 'rejected') res.rejected++;
        else {
          res.problems++;
          note(`${o.kind} case ${m.index} (seed ${o.seed}): ${(m.problems ?? []).join(' | ')}`);
        }
        o.onProgress?.(res.cases);
      } else if (m.type === 'counterexample') {
        res.counterexample = { text: m.text!, detail: m.detail!, problems: m.problems ?? [], path: m.path ?? null };
      } else if (m.type === 'end') {
        ended = true;
      }
    });
    child.on('exit', (code, signal) => {
      clearInterval(watchdog);
      if (!ended && signal !== 'SIGKILL') {
        // the child died by itself: whatever killed it escaped every handler
        res.uncaught++;
        res.problems++;
        if (current >= 0) res.cases++;
        note(`${o.kind} child exited (code ${code}, signal ${signal}) during case ${current}: ${stderr.trim().split('\n').slice(-6).join(' / ')}`);
        next = current >= 0 ? current + 1 : o.numRuns;
      }
      resolvePromise(ended ? o.numRuns : next);
    });
  });
}
