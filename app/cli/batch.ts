/**
 * `sweepbook reduce RUN1 RUN2 … --setup S [--tare T] [--columns M] --out-dir DIR`: many runs in one
 * command, reduced in parallel child processes (one per core), each writing its run's JSON; then one
 * CSV per run, and combined tables of all points and all fits in CSV and XLSX. A run that fails is
 * reported with its messages and the others go on; the exit code is 1 when any failed.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { mkdir, readFile, stat } from 'node:fs/promises';
import { availableParallelism } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import writeXlsxFile from 'write-excel-file/node';
import {
  commentLine,
  csvLine,
  escapeFormula,
  pointsCsv,
  POINT_COLUMNS,
  reportCsvRow,
  ROUNDING_NOTE,
  toCsv,
  type Cell,
  type Provenance,
  type ReductionResult,
} from '../../core/index.ts';
import { writeFileAtomic } from '../files/atomic.ts';

export interface BatchOptions {
  runs: string[];
  setup: string;
  tare?: string;
  columns?: string;
  outDir: string;
  noCorrections: boolean;
}

/** The installed command's script, found from this module (app/cli in the sources, dist/ in the bundle). */
function commandScript(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 4; i++) {
    const bin = join(dir, 'bin', 'sweepbook.js');
    if (existsSync(bin)) return bin;
    dir = dirname(dir);
  }
  throw new Error('bin/sweepbook.js not found beside the command line');
}

/** Output names: the run file's stem, made unique (run.csv and other/run.csv → run, run-2). */
export function outputStems(runs: readonly string[]): string[] {
  const used = new Set<string>();
  return runs.map((r) => {
    const base =
      basename(r)
        .replace(/\.[^.]*$/, '')
        .replace(/[^\w.+-]+/g, '_') || 'run';
    let stem = base;
    for (let i = 2; used.has(stem.toLowerCase()); i++) stem = `${base}-${i}`;
    used.add(stem.toLowerCase());
    return stem;
  });
}

interface Outcome {
  run: string;
  stem: string;
  code: number;
  stderr: string;
  doc?: ReductionResult & { provenance: Provenance };
}

function reduceInChild(script: string, o: BatchOptions, run: string, out: string): Promise<{ code: number; stderr: string }> {
  const args = [script, 'reduce', run, '--setup', o.setup, '--format', 'json', '--out', out];
  if (o.tare) args.push('--tare', o.tare);
  if (o.columns) args.push('--columns', o.columns);
  if (o.noCorrections) args.push('--no-corrections');
  return new Promise((resolve) => {
    const child = spawn(process.execPath, args, { stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.setEncoding('utf8');
    child.stderr.on('data', (d: string) => (stderr += d));
    child.on('error', (err) => resolve({ code: 3, stderr: `${stderr}could not start: ${err.message}\n` }));
    child.on('close', (code) => resolve({ code: code ?? 3, stderr }));
  });
}

const FIT_HEAD = [
  'cl_alpha_per_deg',
  'cl_alpha_stderr_per_deg',
  'alpha_zero_lift_deg',
  'cl_max',
  'alpha_cl_max_deg',
  'cd0',
  'k_induced',
  'oswald_e',
  'ld_max',
  'cl_at_ld_max',
  'cm_alpha_per_deg',
] as const;

export async function batchReduce(o: BatchOptions, say: (l: string) => void): Promise<number> {
  const stems = outputStems(o.runs);
  const clash = await overwrittenInput(o, stems);
  if (clash) {
    say(`error: ${clash.output}: would overwrite the input ${clash.input}; raw run, setup and tare files are never overwritten, choose another --out-dir`);
    return 1;
  }
  await mkdir(o.outDir, { recursive: true });
  const script = commandScript();
  const workers = Math.max(1, Math.min(availableParallelism(), o.runs.length));
  say(`reducing ${o.runs.length} runs, ${workers} at a time`);
  const outcomes: Outcome[] = new Array(o.runs.length);
  let next = 0;
  const worker = async () => {
    for (let i = next++; i < o.runs.length; i = next++) {
      const run = o.runs[i]!;
      const json = join(o.outDir, `${stems[i]}.json`);
      const r = await reduceInChild(script, o, run, json);
      const outcome: Outcome = { run, stem: stems[i]!, code: r.code, stderr: r.stderr };
      if (r.code === 0) outcome.doc = JSON.parse(await readFile(json, 'utf8'));
      outcomes[i] = outcome;
      const errors = r.stderr.split('\n').filter((l) => l.startsWith('error:') || l.startsWith('sweepbook:'));
      say(r.code === 0 ? `ok      ${run}` : `FAILED  ${run}: ${errors.join(' | ') || `exit ${r.code}`}`);
    }
  };
  await Promise.all(Array.from({ length: workers }, worker));

  const done = outcomes.filter((x) => x.doc);
  for (const x of done) {
    const { provenance, ...result } = x.doc!;
    await writeFileAtomic(join(o.outDir, `${x.stem}.csv`), pointsCsv(result as ReductionResult, provenance));
    for (const w of result.warnings) say(`warning: ${x.run}: ${w}`);
  }
  // combined tables: every point of every run, and one line of fits per run (failed runs named with their error)
  const pointHead = ['run', 'configuration', 'source_file', ...POINT_COLUMNS];
  const pointRows: Cell[][] = [];
  for (const x of done) {
    const r = x.doc!;
    for (const p of r.points)
      pointRows.push([r.run.name, r.run.configuration, String(r.run['source_file'] ?? basename(x.run)), ...POINT_COLUMNS.map((k) => p[k] as Cell)]);
  }
  const fitHead = ['run', 'configuration', 'source_file', 'status', 'points', ...FIT_HEAD, 'linear_range_from_deg', 'linear_range_to_deg', 'warnings'];
  const fitRows: Cell[][] = outcomes.map((x) => {
    if (!x.doc) {
      const err = x.stderr.split('\n').find((l) => l.startsWith('error:')) ?? `exit ${x.code}`;
      return [
        basename(x.run).replace(/\.[^.]*$/, ''),
        null,
        basename(x.run),
        `failed: ${err.replace(/^error:\s*/, '')}`,
        null,
        ...FIT_HEAD.map(() => null),
        null,
        null,
        null,
      ];
    }
    const r = x.doc;
    const f = r.fit as unknown as Record<string, unknown>;
    const range = f['linear_range_deg'] as [number, number] | null;
    return [
      r.run.name,
      r.run.configuration,
      String(r.run['source_file'] ?? basename(x.run)),
      'ok',
      r.points.length,
      ...FIT_HEAD.map((k) => f[k] as Cell),
      range?.[0] ?? null,
      range?.[1] ?? null,
      r.warnings.length,
    ];
  });
  await writeFileAtomic(join(o.outDir, 'points.csv'), combinedPointsCsv(pointHead, done));
  await writeFileAtomic(join(o.outDir, 'fits.csv'), toCsv(fitHead, fitRows));
  await writeFileAtomic(join(o.outDir, 'points.xlsx'), await workbook('Points', pointHead, pointRows));
  await writeFileAtomic(join(o.outDir, 'fits.xlsx'), await workbook('Fits', fitHead, fitRows));
  const failed = outcomes.length - done.length;
  say(`wrote ${done.length} run tables, points.csv/.xlsx and fits.csv/.xlsx to ${o.outDir}${failed ? `; ${failed} run(s) failed` : ''}`);
  return failed > 0 ? 1 : 0;
}

/** Every point of every run as CSV: the rounding rule as a `#` line, the header, then each run's points rounded as in its own table. */
function combinedPointsCsv(head: readonly string[], done: readonly Outcome[]): string {
  let text = `${commentLine(ROUNDING_NOTE)}\n${csvLine(head)}\n`;
  for (const x of done) {
    const r = x.doc!;
    const lead = csvLine([r.run.name, r.run.configuration, String(r.run['source_file'] ?? basename(x.run))]);
    for (const p of r.points) text += `${lead},${reportCsvRow(p)}\n`;
  }
  return text;
}

async function workbook(name: string, head: string[], rows: Cell[][]): Promise<Buffer> {
  const cell = (c: Cell) =>
    c === null || c === undefined || (typeof c === 'number' && !Number.isFinite(c)) ? null : { value: typeof c === 'string' ? escapeFormula(c) : c };
  const data = [head.map((h) => ({ value: h, fontWeight: 'bold' as const })), ...rows.map((r) => r.map(cell))];
  return (await writeXlsxFile(data as never, { sheet: name }).toBuffer()) as Buffer;
}

// --- raw files are never written ---------------------------------------------------------------
// An --out-dir that holds the runs would otherwise replace run-101.csv with its own table.

/** The first output of the batch that is one of its input files (same path, or a link to it). */
async function overwrittenInput(o: BatchOptions, stems: readonly string[]): Promise<{ output: string; input: string } | undefined> {
  const inputs = [...o.runs, o.setup, o.tare, o.columns].filter((p): p is string => !!p);
  const byPath = new Map(inputs.map((p) => [resolve(p), p] as const));
  const byIdentity = new Map<string, string>();
  for (const p of inputs) {
    const s = await stat(p).catch(() => undefined);
    if (s && s.ino !== 0) byIdentity.set(`${s.dev}:${s.ino}`, p);
  }
  const names = [...stems.flatMap((s) => [`${s}.json`, `${s}.csv`]), 'points.csv', 'fits.csv', 'points.xlsx', 'fits.xlsx'];
  for (const name of names) {
    const output = join(o.outDir, name);
    const same = byPath.get(resolve(output));
    if (same) return { output, input: same };
    const s = await stat(output).catch(() => undefined);
    const linked = s && s.ino !== 0 ? byIdentity.get(`${s.dev}:${s.ino}`) : undefined;
    if (linked) return { output, input: linked };
  }
  return undefined;
}
