/**
 * What every fuzz case must satisfy (docs/architecture.md §8, "errors are values, not crashes"):
 * - readRun / readSetup / reduceRun return an Outcome and never throw;
 * - a refusal names the file with a line (and column), or the setup field;
 * - a result holds no NaN or ±Infinity anywhere, and every field the contract makes a number is one;
 * - streaming the same text in other chunk sizes gives the same outcome;
 * - the command line exits 0, 1 or 2, never prints a stack trace, and on exit 0 prints a clean document;
 * - each case finishes within a time bound.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import Papa from 'papaparse';
import { join } from 'node:path';
import { main } from '../../app/cli/main.ts';
import { chunkDecoder } from '../../app/files/textDecoding.ts';
import { pointsCsv, readRun, readSetup, reduceRun, type ReductionResult } from '../../core/reduction/engine.ts';
import type { Notice, Outcome } from '../../core/contract/messages.ts';
import type { RunData } from '../../core/formats/runFile.ts';
import { chunksOf, type RunCase } from './gen-runfile.ts';
import type { SetupCase } from './gen-setup.ts';
import { knownIssueOf } from './known-issues.ts';
import { RUN_3D, RUN_SETUPS, runForSetup, sample, TARE_3D } from './inputs.ts';

/** How one case ended. "problem" means a property was broken; `problems` says which. */
export type Verdict = 'reduced' | 'rejected' | 'problem';

export interface CaseReport {
  /** What the engine did with the inputs, whatever the checks found. */
  outcome: 'reduced' | 'rejected' | 'crashed';
  verdict: Verdict;
  problems: string[];
  /** The reader's outcome depended on how the text was cut into chunks. */
  chunkDependent?: boolean;
  /** Ids of known issues (test/fuzz/known-issues.ts) the case ran into; they do not make it a problem. */
  known: string[];
  /** Problems that are uncaught exceptions (their message and first stack frame). */
  uncaught: number;
  stackTraces: number;
  ms: number;
}

/** A single case longer than this breaks the "never hangs" property (the child's watchdog kills far longer ones). */
export const CASE_TIME_BOUND_MS = 5_000;

/** Point fields the contract makes numbers whatever the input (docs/data-format.md §8; core/reduction/result.ts PointResult). */
export const MANDATORY_POINT_NUMBERS = [
  'line', 'samples', 'alpha_deg', 'alpha_uncorrected_deg', 'q_pa', 'q_uncorrected_pa', 'v_mps', 'v_uncorrected_mps',
  'mach', 'mach_uncorrected', 'reynolds', 'reynolds_uncorrected', 'rho_kgm3', 'mu_pas', 'p_static_pa', 'p_total_pa',
  't_static_k', 't_total_k', 'rh_pct', 'cl', 'cd', 'cl_uncorrected', 'cd_uncorrected', 'lift_n', 'drag_n', 'cl_scatter',
] as const;

const STACK_LINE = /\n\s+at /;

/** A refusal that says where: the expected file with a 1-based line (and a 1-based column if any), or a setup field. */
export function locationProblem(n: Notice, files: string[]): string | undefined {
  const intPos = (x: unknown) => typeof x === 'number' && Number.isInteger(x) && x >= 1;
  if (typeof n.message !== 'string' || n.message.trim() === '') return 'a notice without a message';
  if (n.file === undefined || !files.includes(n.file)) return `"${n.message}" does not name the file (${String(n.file)})`;
  if (typeof n.field === 'string' && n.field.length > 0) return undefined;
  if (!intPos(n.line)) return `"${n.message}" names no line or field`;
  if (n.column !== undefined && !intPos(n.column)) return `"${n.message}" has column ${String(n.column)}`;
  return undefined;
}

/** Non-finite numbers anywhere in a value, by path. */
export function nonFinite(value: unknown, path = '$', out: string[] = []): string[] {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) out.push(`${path} = ${value}`);
  } else if (value && typeof value === 'object') {
    if (ArrayBuffer.isView(value)) {
      Array.from(value as unknown as ArrayLike<number>).forEach((v, i) => nonFinite(v, `${path}[${i}]`, out));
    } else {
      for (const [k, v] of Object.entries(value)) nonFinite(v, `${path}.${k}`, out);
    }
  }
  return out;
}

/** Contract checks on a reduction result and on what the command line would print of it. */
export function resultProblems(r: ReductionResult): string[] {
  const problems = nonFinite(r).slice(0, 5).map((p) => `non-finite number ${p}`);
  const doc = JSON.parse(JSON.stringify(r)) as ReductionResult;
  doc.points.forEach((p, i) => {
    for (const k of MANDATORY_POINT_NUMBERS) {
      if (typeof (p as unknown as Record<string, unknown>)[k] !== 'number') problems.push(`points[${i}].${k} is ${JSON.stringify((p as unknown as Record<string, unknown>)[k])}, not a number`);
    }
    if (r.corrections.enabled && (typeof p.eps_solid !== 'number' || typeof p.eps_wake !== 'number')) problems.push(`points[${i}] lacks the blockage terms though corrections are on`);
    if ((p.cm === null) !== (p.cm_uncorrected === null)) problems.push(`points[${i}].cm is ${p.cm} but cm_uncorrected is ${p.cm_uncorrected}`);
  });
  if (r.points.length === 0) problems.push('a result without points');
  problems.push(...csvProblems(pointsCsv(r)));
  return problems.slice(0, 8);
}

/** NaN or Infinity in a numeric column of an exported point table (comment lines and the point labels aside). */
export function csvProblems(text: string): string[] {
  const body = text.split('\n').filter((l) => !l.startsWith('#')).join('\n');
  const rows = Papa.parse<string[]>(body.trim(), { delimiter: ',' }).data;
  const header = rows[0] ?? [];
  const out: string[] = [];
  rows.slice(1).forEach((row, i) =>
    row.forEach((cell, j) => {
      if (header[j] !== 'point' && /^[+-]?(NaN|Infinity)$/.test(cell.trim())) out.push(`CSV row ${i + 1} column ${header[j]} is ${cell}`);
    }),
  );
  return out.slice(0, 3);
}

function describeThrow(where: string, err: unknown): string {
  const e = err as Error;
  const frame = String(e?.stack ?? '').split('\n').find((l) => /^\s+at /.test(l))?.trim() ?? '';
  return `${where} threw ${e?.name ?? typeof err}: ${String(e?.message ?? err).slice(0, 200)} ${frame}`;
}

/** Engine-level checks shared by run and setup cases. */
async function engine(
  report: CaseReport,
  run: { name: string; chunks: string[] },
  setup: { name: string; text: string },
  tare: { name: string; chunks: string[] } | undefined,
  noCorrections: boolean,
): Promise<void> {
  const p = report.problems;
  const call = async <T>(where: string, f: () => Promise<Outcome<T>> | Outcome<T>, files: string[]): Promise<Outcome<T> | undefined> => {
    try {
      const out = await f();
      if (!out.ok) {
        if (out.errors.length === 0) p.push(`${where} refused without saying why`);
        for (const n of out.errors) {
          const bad = locationProblem(n, files);
          if (bad) p.push(`${where}: ${bad}`);
        }
      }
      return out;
    } catch (err) {
      report.uncaught++;
      p.push(describeThrow(where, err));
      return undefined;
    }
  };
  const s = await call('readSetup', () => readSetup(setup.name, setup.text), [setup.name]);
  const read = async (where: string, file: { name: string; chunks: string[] }) => {
    const out = await call(where, () => readRun(file.name, file.chunks), [file.name]);
    // the outcome must not depend on how the text was cut into chunks
    if (out && file.chunks.length > 1) {
      const whole = await call(`${where} (one chunk)`, () => readRun(file.name, [file.chunks.join('')]), [file.name]);
      if (whole && !sameRead(out, whole)) {
        report.chunkDependent = true;
        const quotes = file.chunks.some((c) => c.includes('"')) ? ' (the text holds a quote character)' : '';
        p.push(`readRun gives a different outcome when the text arrives in ${file.chunks.length} chunks${quotes}: ${brief(out)} vs ${brief(whole)}`);
      }
    }
    return out;
  };
  const r = await read('readRun', run);
  const t = tare ? await read('readRun (tare)', tare) : undefined;
  if (!s?.ok || !r?.ok || (tare && !t?.ok)) {
    report.outcome = s && r && (!tare || t) ? 'rejected' : 'crashed';
    return;
  }
  const files = [run.name, setup.name, ...(tare ? [tare.name] : [])];
  const red = await call('reduceRun', () => reduceRun({ run: r.value, setup: s.value, tare: t?.ok ? t.value : undefined, noCorrections }), files);
  if (!red) return;
  if (!red.ok) {
    report.outcome = 'rejected';
    return;
  }
  report.outcome = 'reduced';
  p.push(...resultProblems(red.value));
}

function brief(o: Outcome<RunData>): string {
  return o.ok ? `${o.value.points.length} points, ${o.value.rowsSkipped} skipped` : o.errors.map((e) => `${e.line ?? ''}:${e.column ?? ''} ${e.message}`).join('; ').slice(0, 160);
}

function sameRead(a: Outcome<RunData>, b: Outcome<RunData>): boolean {
  const key = (o: Outcome<RunData>) =>
    JSON.stringify(o.ok ? { ...o.value, points: o.value.points.map((q) => ({ ...q, mean: Array.from(q.mean), std: Array.from(q.std) })) } : o.errors);
  return key(a) === key(b);
}

class Sink {
  text = '';
  write(chunk: string | Uint8Array): boolean {
    this.text += typeof chunk === 'string' ? chunk : Buffer.from(chunk).toString('utf8');
    return true;
  }
}

/** The command line on the same files, in-process (what `sweepbook reduce` does after argument parsing). */
async function cli(report: CaseReport, argv: string[], format: 'json' | 'csv'): Promise<void> {
  const p = report.problems;
  const stdout = new Sink();
  const stderr = new Sink();
  let code: number;
  try {
    code = await main(argv, { stdout: stdout as never, stderr: stderr as never });
  } catch (err) {
    report.uncaught++;
    p.push(describeThrow('main()', err));
    return;
  }
  if (STACK_LINE.test(stderr.text) || STACK_LINE.test(stdout.text)) {
    report.stackTraces++;
    p.push(`the command line printed a stack trace: ${stderr.text.slice(0, 300)}`);
  }
  if (/internal error/.test(stderr.text)) {
    report.uncaught++;
    p.push(`the command line reported an internal error: ${stderr.text.trim().split('\n').pop()}`);
  }
  if (code !== 0 && code !== 1 && code !== 2) p.push(`exit code ${code}`);
  if (code === 1 && !/^error: \S/m.test(stderr.text)) p.push(`exit 1 without an "error:" line: ${stderr.text.slice(0, 200)}`);
  if (code === 0) {
    if (format === 'csv') {
      p.push(...csvProblems(stdout.text).map((x) => `command line: ${x}`));
    } else {
      try {
        p.push(...resultProblems(JSON.parse(stdout.text)).map((x) => `command line: ${x}`));
      } catch (err) {
        p.push(`stdout is not JSON: ${(err as Error).message}`);
      }
    }
  }
  // the engine and the command line must agree on whether the inputs reduce (the command line reads a small
  // file in one chunk, so when chunking alone changes the outcome that has been reported already)
  if (report.chunkDependent) return;
  if (report.outcome === 'reduced' && code !== 0) p.push(`the engine reduces but the command line exits ${code}: ${stderr.text.slice(0, 200)}`);
  if (report.outcome === 'rejected' && code === 0) p.push('the engine refuses but the command line exits 0');
}

/** Scratch folder for one worker's case files. */
export interface Scratch {
  dir: string;
}

export function scratch(dir: string): Scratch {
  mkdirSync(dir, { recursive: true });
  return { dir };
}

function valueAtPath(o: unknown, field: string): unknown {
  let v = o;
  for (const k of field.split('.')) {
    if (v === null || typeof v !== 'object' || !Object.prototype.hasOwnProperty.call(v, k)) return undefined;
    v = (v as Record<string, unknown>)[k];
  }
  return v;
}

/** Bytes to text as the command line and the desktop host decode them (UTF-8, or UTF-16 after its byte-order mark). */
const decode = (bytes: Uint8Array) => {
  const d = chunkDecoder();
  return d.write(bytes) + d.end();
};

/** Time bound, then known issues set apart; the verdict stays "reduced"/"rejected" when only known issues remain. */
function finish(report: CaseReport, t0: number, label: string | undefined): CaseReport {
  report.ms = performance.now() - t0;
  if (report.ms > CASE_TIME_BOUND_MS) report.problems.push(`took ${report.ms.toFixed(0)} ms (bound ${CASE_TIME_BOUND_MS} ms)`);
  if (label) report.problems = report.problems.map((p) => `${p} — in "${label}"`);
  const fresh: string[] = [];
  for (const p of report.problems) {
    const k = knownIssueOf(p);
    if (k) {
      if (!report.known.includes(k.id)) report.known.push(k.id);
    } else fresh.push(p);
  }
  report.problems = fresh;
  report.verdict = fresh.length > 0 || report.outcome === 'crashed' ? 'problem' : report.outcome;
  return report;
}

/** `label` names a built (large) case in its problems. */
export async function checkRunCase(c: RunCase, where: Scratch, withCli = true, label?: string): Promise<CaseReport> {
  const t0 = performance.now();
  const report: CaseReport = { outcome: 'crashed', verdict: 'problem', problems: [], known: [], uncaught: 0, stackTraces: 0, ms: 0 };
  const cfg = RUN_SETUPS[c.setupKey];
  const fuzzed = join(where.dir, 'case.csv');
  const setupPath = join(where.dir, 'setup.json');
  const setupText = JSON.stringify(cfg.setup, null, 2);
  const text = decode(c.bytes);
  const chunks = chunksOf(text, c.cuts);
  if (c.role === 'run') {
    await engine(report, { name: fuzzed, chunks }, { name: setupPath, text: setupText }, undefined, c.noCorrections);
  } else {
    await engine(report, { name: join(where.dir, 'run.csv'), chunks: [cfg.run] }, { name: setupPath, text: setupText }, { name: fuzzed, chunks }, c.noCorrections);
  }
  if (withCli) {
    writeFileSync(fuzzed, c.bytes);
    writeFileSync(setupPath, setupText);
    const runPath = c.role === 'run' ? fuzzed : join(where.dir, 'run.csv');
    if (c.role === 'tare') writeFileSync(runPath, cfg.run);
    const argv = ['reduce', runPath, '--setup', setupPath, '--format', c.format];
    if (c.role === 'tare') argv.push('--tare', fuzzed);
    if (c.noCorrections) argv.push('--no-corrections');
    await cli(report, argv, c.format);
  }
  return finish(report, t0, label);
}

export async function checkSetupCase(c: SetupCase, where: Scratch, withCli = true, label?: string): Promise<CaseReport> {
  const t0 = performance.now();
  const report: CaseReport = { outcome: 'crashed', verdict: 'problem', problems: [], known: [], uncaught: 0, stackTraces: 0, ms: 0 };
  const setupPath = join(where.dir, 'setup.json');
  const runPath = join(where.dir, 'setup-run.csv');
  const runText = runForSetup(c.object);
  // the wind-off tare suits the 3D wind-axes run only
  const tare = c.withTare && runText === RUN_3D ? { name: sample('windoff-tare.csv'), chunks: [TARE_3D] } : undefined;
  await engine(report, { name: runPath, chunks: [runText] }, { name: setupPath, text: decode(c.bytes) }, tare, c.noCorrections);
  if (c.mustReject && report.outcome === 'reduced') report.problems.push(`a setup with ${c.mustReject} was accepted`);
  // a refusal that calls a field "missing" must be about a field that is really absent
  if (c.intact) {
    const o = readSetup(setupPath, decode(c.bytes));
    for (const e of o.ok ? [] : o.errors) {
      if (e.field && /^missing/.test(e.message) && valueAtPath(c.object, e.field) !== undefined) {
        report.problems.push(`readSetup calls ${e.field} missing, but it is ${JSON.stringify(valueAtPath(c.object, e.field))?.slice(0, 40)}`);
      }
    }
  }
  if (withCli) {
    writeFileSync(setupPath, c.bytes);
    writeFileSync(runPath, runText);
    const argv = ['reduce', runPath, '--setup', setupPath, '--format', c.format];
    if (tare) argv.push('--tare', tare.name);
    if (c.noCorrections) argv.push('--no-corrections');
    await cli(report, argv, c.format);
  }
  return finish(report, t0, label);
}
