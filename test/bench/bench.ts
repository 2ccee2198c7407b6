/**
 * `npm run bench`: how fast the command line reduces a big time-history run, against the floor
 * (papaparse alone over the same chunked read) and a vectorised pandas/numpy script, and whether
 * memory stays flat as the number of samples grows (docs/performance.md, targets).
 *
 * Every figure is a median over whole child processes, run in turn (one of each task per round) so
 * that load from other work on the machine falls on all of them alike. Data files are generated
 * outside the repository, in the system's temporary folder, and reused between runs.
 *
 * Options: --sizes 100k,1M,5M   --reps N (rounds at 100k and 1M; 5M gets fewer)   --no-pandas   --quick
 */
import { build } from 'esbuild';
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { benchFile, type BenchFile } from './generate.ts';
import { describeMachine, loadAverage } from './machine.ts';
import { hasGnuTime, measure, median, type Measurement } from './measure.ts';
import { textTable } from './table.ts';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const DATA = join(tmpdir(), 'sweepbook-bench');
/** Bundles live in the repository's ignored .bench folder: the CLI finds ../package.json from there. */
const BUNDLES = join(ROOT, '.bench');
const PYTHON = '/usr/bin/python3'; // Debian's interpreter, which has python3-pandas

interface Size {
  label: string;
  points: number;
  samples: number;
  reps: number;
  /** Count the checking run as the first round (the 5M file, where one more run of every task costs a minute). */
  checkCounts: boolean;
}

interface Task {
  id: string;
  label: string;
  cmd: string;
  args: (f: BenchFile) => string[];
  /** Checks a captured output; returns a note for the report or throws. */
  check: (stdout: string, f: BenchFile) => string | void;
}

interface Row {
  size: Size;
  file: BenchFile;
  task: Task;
  runs: Measurement[];
}

function options() {
  const argv = process.argv.slice(2);
  const quick = argv.includes('--quick');
  const get = (name: string) => {
    const i = argv.indexOf(name);
    return i >= 0 ? argv[i + 1] : undefined;
  };
  const reps = Number(get('--reps') ?? (quick ? 3 : 5));
  const all: Size[] = [
    { label: '100k', points: 5000, samples: 20, reps, checkCounts: false },
    { label: '1M', points: 5000, samples: 200, reps, checkCounts: false },
    { label: '5M', points: 5000, samples: 1000, reps: Math.max(1, Math.min(reps, 3)), checkCounts: true },
  ];
  const wanted = (get('--sizes') ?? (quick ? '100k,1M' : '100k,1M,5M')).split(',');
  return { sizes: all.filter((s) => wanted.includes(s.label)), pandas: !argv.includes('--no-pandas') && hasPandas() };
}

function hasPandas(): boolean {
  if (!existsSync(PYTHON)) return false;
  try {
    measure(PYTHON, ['-c', 'import pandas, numpy'], {});
    return true;
  } catch {
    return false;
  }
}

async function bundle(): Promise<void> {
  mkdirSync(BUNDLES, { recursive: true });
  const common = {
    bundle: true,
    platform: 'node' as const,
    format: 'esm' as const,
    target: 'node20',
    logLevel: 'warning' as const,
    // papaparse is CommonJS; give the ESM bundle a require for anything it asks for at run time
    banner: { js: "import { createRequire as __sbRequire } from 'node:module'; const require = __sbRequire(import.meta.url);" },
  };
  await build({ ...common, entryPoints: [join(ROOT, 'app/cli/entry.ts')], outfile: join(BUNDLES, 'cli.mjs') });
  await build({ ...common, entryPoints: [join(ROOT, 'test/bench/read-only.ts')], outfile: join(BUNDLES, 'read-only.mjs') });
}

function cliCheck(stdout: string, f: BenchFile): string {
  const doc = JSON.parse(stdout) as { points: unknown[]; run: { rows_read: number; rows_skipped: number } };
  if (doc.points.length !== f.points) throw new Error(`expected ${f.points} points, got ${doc.points.length}`);
  if (doc.run.rows_read !== f.rows || doc.run.rows_skipped !== 0) throw new Error(`rows read ${doc.run.rows_read}, skipped ${doc.run.rows_skipped}`);
  return '';
}

const node = process.execPath;
const TASKS: Task[] = [
  {
    id: 'bare',
    label: 'bare papaparse parse (floor)',
    cmd: node,
    args: (f) => [join(ROOT, 'test/bench/bare-parse.mjs'), f.run],
    check: (out, f) => {
      const r = JSON.parse(out) as { rows: number };
      if (r.rows !== f.rows + 4) throw new Error(`bare parse saw ${r.rows} lines, expected ${f.rows + 4}`);
    },
  },
  {
    id: 'read',
    label: 'reader only, bundled (no reduction)',
    cmd: node,
    args: (f) => [join(BUNDLES, 'read-only.mjs'), f.run],
    check: (out, f) => {
      const r = JSON.parse(out) as { rows: number; points: number; read_ms: number };
      if (r.rows !== f.rows || r.points !== f.points) throw new Error(`reader gave ${r.rows} rows, ${r.points} points`);
      return `in-process read ${r.read_ms} ms`;
    },
  },
  {
    id: 'cli-bundle',
    label: 'CLI reduce → JSON, bundled (node .bench/cli.mjs)',
    cmd: node,
    args: (f) => [join(BUNDLES, 'cli.mjs'), 'reduce', f.run, '--setup', f.setup],
    check: cliCheck,
  },
  {
    id: 'cli-tsx',
    label: 'CLI reduce → JSON, as installed (node bin/sweepbook.js: the bundle when fresh, else tsx)',
    cmd: node,
    args: (f) => [join(ROOT, 'bin/sweepbook.js'), 'reduce', f.run, '--setup', f.setup],
    check: cliCheck,
  },
  {
    id: 'pandas',
    label: 'pandas/numpy vectorised reduction',
    cmd: PYTHON,
    args: (f) => [join(ROOT, 'test/bench/pandas_reduce.py'), f.run, f.setup],
    check: (out, f) => {
      const doc = JSON.parse(out) as { points: unknown[] };
      if (doc.points.length !== f.points) throw new Error(`pandas gave ${doc.points.length} points`);
    },
  },
];

/** The parts of a reduction that must not depend on how the CLI was started (provenance carries a time stamp). */
function sameResult(stdout: string): string {
  const doc = JSON.parse(stdout) as Record<string, unknown>;
  return JSON.stringify([doc['run'], doc['points'], doc['fit'], doc['factors'], doc['warnings']]);
}

/** Largest relative difference of a few measured-flow fields between two reductions (a sanity check that pandas computes the same thing). */
function agreement(a: string, b: string): string {
  const pa = (JSON.parse(a) as { points: Record<string, number>[] }).points;
  const pb = (JSON.parse(b) as { points: Record<string, number>[] }).points;
  const fields = ['q_uncorrected_pa', 'rho_kgm3', 'mu_pas', 'cl_uncorrected', 'cd_uncorrected'];
  let worst = 0;
  for (let i = 0; i < pa.length; i++) {
    for (const k of fields) worst = Math.max(worst, Math.abs(pa[i]![k]! - pb[i]![k]!) / Math.max(Math.abs(pb[i]![k]!), 1e-3));
  }
  return worst.toExponential(1);
}

const fmt = (x: number, digits = 2) => x.toFixed(digits);
const mib = (bytes: number) => bytes / 2 ** 20;

async function main(): Promise<void> {
  const { sizes, pandas } = options();
  const machine = describeMachine();
  const started = Date.now();
  console.log(`Sweepbook bench — ${machine.cpus} CPUs (${machine.cpuModel}), ${machine.memoryGiB} GiB, Node ${machine.node}, ${machine.platform}`);
  console.log(`data in ${DATA}; peak RSS from ${hasGnuTime() ? '/usr/bin/time' : 'the processes themselves'}; load average at start ${loadAverage()}`);
  if (!pandas) console.log(`(no pandas comparison: ${PYTHON} with pandas not found; apt-get install python3-pandas)`);
  await bundle();
  const tasks = TASKS.filter((t) => pandas || t.id !== 'pandas');
  const rows: Row[] = [];
  for (const size of sizes) {
    process.stdout.write(`\n${size.label}: ${size.points} points × ${size.samples} samples … generating`);
    const file = benchFile(DATA, size.points, size.samples);
    process.stdout.write(` ${fmt(mib(file.bytes), 1)} MiB; checking outputs`);
    // a first run of each task warms the page cache and the loader cache, and checks the output
    const outputs = new Map<string, string>();
    const notes: string[] = [];
    const runs = new Map(tasks.map((t) => [t.id, [] as Measurement[]]));
    for (const t of tasks) {
      const m = measure(t.cmd, t.args(file), { captureStdout: true, cwd: ROOT });
      const note = t.check(m.stdout!, file);
      if (note) notes.push(`${t.id}: ${note}`);
      outputs.set(t.id, m.stdout!);
      if (size.checkCounts) runs.get(t.id)!.push({ ms: m.ms, rssKB: m.rssKB, cpuMs: m.cpuMs });
    }
    if (sameResult(outputs.get('cli-bundle')!) !== sameResult(outputs.get('cli-tsx')!)) {
      notes.push('WARNING: the bundled and the tsx command line give different results (is the bundle stale?)');
    }
    if (pandas) notes.push(`pandas vs CLI, largest relative difference of measured q, ρ, μ, CL, CD: ${agreement(outputs.get('pandas')!, outputs.get('cli-bundle')!)}`);
    for (let r = size.checkCounts ? 1 : 0; r < size.reps; r++) {
      process.stdout.write(` · round ${r + 1}/${size.reps}`);
      for (const t of tasks) runs.get(t.id)!.push(measure(t.cmd, t.args(file), { cwd: ROOT }));
    }
    process.stdout.write('\n');
    for (const n of notes) console.log(`  ${n}`);
    for (const t of tasks) rows.push({ size, file, task: t, runs: runs.get(t.id)! });
  }

  const med = (row: Row) => median(row.runs.map((m) => m.ms)) / 1000;
  const rss = (row: Row) => median(row.runs.map((m) => m.rssKB)) / 1024;
  const cpu = (row: Row) => median(row.runs.map((m) => m.cpuMs)) / 1000;
  const find = (size: string, task: string) => rows.find((r) => r.size.label === size && r.task.id === task);

  console.log('\nMedians of whole processes (wall time; min–max shows the noise of a shared machine; CPU = user + system):\n');
  const table = textTable(
    ['rows', 'task', 'runs', 'wall s', 'min–max s', 'CPU s', 'rows/s', 'MB/s', 'peak RSS MiB', '× bare (wall)', '× bare (CPU)'],
    rows.map((row) => {
      const t = med(row);
      const bare = find(row.size.label, 'bare');
      const ms = row.runs.map((m) => m.ms / 1000);
      return [
        row.size.label,
        row.task.label,
        String(row.runs.length),
        fmt(t),
        `${fmt(Math.min(...ms))}–${fmt(Math.max(...ms))}`,
        fmt(cpu(row)),
        `${fmt(row.file.rows / t / 1e6, 2)} M`,
        fmt(row.file.bytes / 1e6 / t, 0),
        fmt(rss(row), 0),
        bare ? fmt(t / med(bare)) : '',
        bare ? fmt(cpu(row) / cpu(bare)) : '',
      ];
    }),
    ['r', 'l', 'r', 'r', 'r', 'r', 'r', 'r', 'r', 'r', 'r'],
  );
  console.log(table);

  const labels = sizes.map((s) => s.label);
  const growth: string[][] = [];
  if (labels.length > 1) {
    const base = labels[0]!;
    for (const t of tasks) {
      const b = find(base, t.id)!;
      growth.push([t.label, ...labels.slice(1).flatMap((l) => [fmt(med(find(l, t.id)!) / med(b)), fmt(rss(find(l, t.id)!) / rss(b))])]);
    }
    console.log(`\nGrowth against ${base} rows (time ×, memory ×):\n`);
    console.log(textTable(['task', ...labels.slice(1).flatMap((l) => [`time ${l}`, `memory ${l}`])], growth, ['l', ...labels.slice(1).flatMap(() => ['r', 'r'] as const)]));
  }

  console.log('\nTargets (docs/performance.md):');
  const verdict = (ok: boolean) => (ok ? 'met' : 'NOT met');
  const bare1 = find('1M', 'bare');
  for (const id of ['cli-bundle', 'cli-tsx']) {
    const row = find('1M', id);
    if (row && bare1) {
      console.log(`  end-to-end ${id} at 1M ≤ 1.2 × bare parse: ${fmt(med(row) / med(bare1))} × wall — ${verdict(med(row) / med(bare1) <= 1.2)} (CPU ${fmt(cpu(row) / cpu(bare1))} ×)`);
    }
    const pd = find('1M', 'pandas');
    if (row && pd) console.log(`  ${id} faster than pandas at 1M (ratio < 1): ${fmt(med(row) / med(pd))} wall — ${verdict(med(row) < med(pd))} (CPU ${fmt(cpu(row) / cpu(pd))})`);
  }
  for (const id of ['cli-bundle', 'cli-tsx']) {
    const small = find('100k', id);
    const big = find('5M', id);
    if (small && big) console.log(`  ${id} peak memory 5M ≤ 1.5 × 100k: ${fmt(rss(big) / rss(small))} × — ${verdict(rss(big) / rss(small) <= 1.5)}`);
  }
  console.log(`\nload average at end ${loadAverage()}; total ${fmt((Date.now() - started) / 1000, 0)} s`);

  mkdirSync(DATA, { recursive: true });
  const summary = join(DATA, 'results.json');
  writeFileSync(
    summary,
    JSON.stringify(
      {
        machine,
        date: new Date().toISOString(),
        rows: rows.map((r) => ({ rows: r.file.rows, bytes: r.file.bytes, task: r.task.id, runs: r.runs.map((m) => ({ ms: Math.round(m.ms), cpuMs: Math.round(m.cpuMs), rssKB: m.rssKB })) })),
      },
      null,
      1,
    ),
  );
  console.log(`raw figures: ${summary}`);
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? err.message : err);
  process.exitCode = 1;
});
