/**
 * Command line (docs/data-format.md §7):
 *   sweepbook reduce RUN.csv --setup SETUP.json [--tare WINDOFF.csv] [--format json|csv] [--out FILE] [--no-corrections]
 *   sweepbook reduce RUN1 RUN2 … --setup SETUP.json [--tare T] --out-dir DIR   (batch: app/cli/batch.ts)
 *   sweepbook columns RUN [--out MAP.json]                                     (app/cli/columns.ts)
 * Run files may be CSV, whitespace-aligned text or .xlsx (first sheet); `--columns MAP.json` assigns
 * the columns of a facility's own layout.
 * Standard output carries only the document; messages go to standard error. Exit 0 on success,
 * 1 on input that cannot be reduced, 2 on a wrong command line, 3 on an internal error (§7.1).
 */
import { createHash } from 'node:crypto';
import { basename, resolve } from 'node:path';
import { readFile, stat } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import { parseColumnMap, pointsCsv, readerMapping, readRun, readSetup, reduceRun, type ColumnMapping } from '../../core/index.ts';
import { attempt, formatNotice, type Notice } from '../../core/index.ts';
import { projectStallSpeed } from '../../core/index.ts';
import { provenanceOf, reductionTime, type InputFile, type Provenance } from '../../core/index.ts';
import type { ReductionResult } from '../../core/index.ts';
import { writeFileAtomic } from '../files/atomic.ts';
import { VERSION } from '../version.ts';
import { batchReduce } from './batch.ts';
import { columnsCommand } from './columns.ts';
import { describeFsError, runText } from './runSource.ts';

const USAGE = `usage:
  sweepbook reduce RUN.csv --setup SETUP.json [--tare WINDOFF.csv] [--columns MAP.json] [--format json|csv] [--out FILE] [--no-corrections]
  sweepbook reduce RUN1 RUN2 ... --setup SETUP.json [--tare WINDOFF.csv] [--columns MAP.json] --out-dir DIR [--no-corrections]
  sweepbook columns RUN [--out MAP.json]
  sweepbook project RUN.csv --setup SETUP.json --mass-kg M --wing-area-m2 S [--pressure-altitude-m H]
                    [--temp-c T | --isa-deviation-c D] [--rh-pct RH] [--cl-max X] [--lift-off-factor F] [--tare WINDOFF.csv] [--columns MAP.json]
  sweepbook --version`;

class UsageError extends Error {}

export async function main(argv: string[], io = { stdout: process.stdout, stderr: process.stderr }): Promise<number> {
  const say = (line: string) => io.stderr.write(line + '\n');
  try {
    const [command, ...rest] = argv;
    if (command === '--version' || command === '-v') {
      io.stdout.write(`sweepbook ${VERSION}\n`);
      return 0;
    }
    if (command === undefined || command === '--help' || command === '-h') {
      (command === undefined ? say : (l: string) => io.stdout.write(l + '\n'))(USAGE);
      return command === undefined ? 2 : 0;
    }
    if (command === 'reduce') return await reduceCommand(rest, io, say);
    if (command === 'project') return await projectCommand(rest, io, say);
    if (command === 'columns') {
      return await columnsCommand(rest, io, say, (m) => {
        throw new UsageError(m);
      });
    }
    throw new UsageError(`unknown command "${command}"`);
  } catch (err) {
    if (err instanceof UsageError || (err as { code?: string }).code?.startsWith('ERR_PARSE_ARGS')) {
      say(`sweepbook: ${(err as Error).message}`);
      say(USAGE);
      return 2;
    }
    say(`sweepbook: internal error: ${(err as Error).message} (please report this with the input files)`);
    return 3;
  }
}

async function reduceCommand(args: string[], io: { stdout: NodeJS.WritableStream }, say: (l: string) => void): Promise<number> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: {
      setup: { type: 'string' },
      tare: { type: 'string' },
      format: { type: 'string', default: 'json' },
      out: { type: 'string' },
      'no-corrections': { type: 'boolean', default: false },
      columns: { type: 'string' },
      'out-dir': { type: 'string' },
    },
  });
  if (positionals.length === 0) throw new UsageError('reduce needs one run file');
  if (!values.setup) throw new UsageError('reduce needs --setup SETUP.json');
  if (positionals.length > 1 || values['out-dir'] !== undefined) {
    if (values['out-dir'] === undefined) throw new UsageError(`reduce takes one run file, got ${positionals.length}; give --out-dir DIR to reduce several`);
    if (values.out !== undefined) throw new UsageError('--out names one file; with several runs give --out-dir DIR');
    return await batchReduce({ runs: positionals, setup: values.setup, tare: values.tare, columns: values.columns, outDir: values['out-dir'], noCorrections: values['no-corrections'] }, say);
  }
  const format = values.format;
  if (format !== 'json' && format !== 'csv') throw new UsageError(`--format must be json or csv, not "${format}"`);
  // Raw files are never written: `--out RUN.csv` would have replaced the run with its own table.
  if (values.out) {
    for (const input of [positionals[0]!, values.setup, values.tare, values.columns]) {
      if (input !== undefined && (await sameFile(values.out, input))) {
        throw new UsageError(`--out ${values.out} is one of the input files; raw run and setup files are never overwritten, choose another name`);
      }
    }
  }
  const loaded = await loadAndReduce(positionals[0]!, values.setup, values.tare, values['no-corrections'], say, values.columns);
  if (typeof loaded === 'number') return loaded;
  const { result, provenance } = loaded;
  for (const w of result.warnings) say(`warning: ${w}`);
  const text = format === 'json' ? JSON.stringify({ ...result, provenance }, null, 2) + '\n' : pointsCsv(result, provenance);
  if (values.out) {
    await writeFileAtomic(values.out, text);
    say(`wrote ${values.out}`);
  } else {
    io.stdout.write(text);
  }
  return 0;
}

function failWith(say: (l: string) => void, errors: Notice[]): number {
  for (const e of errors) say(`error: ${formatNotice(e)}`);
  return 1;
}

/** Read setup, run and tare, and reduce; an exit code when something cannot be read or reduced. */
async function loadAndReduce(
  runPath: string,
  setupPath: string,
  tarePath: string | undefined,
  noCorrections: boolean,
  say: (l: string) => void,
  columnsPath?: string,
): Promise<{ result: ReductionResult; provenance: Provenance } | number> {
  const setupText = await readText(setupPath);
  if (typeof setupText !== 'string') return failWith(say, [setupText]);
  const setup = readSetup(setupPath, setupText);
  if (!setup.ok) return failWith(say, setup.errors);
  const inputs: InputFile[] = [{ role: 'setup', name: basename(setupPath), sha256: createHash('sha256').update(setupText).digest('hex') }];
  // a column map: the run must have every column it names; the tare takes the entries it has
  let mapping: ColumnMapping | undefined;
  if (columnsPath !== undefined) {
    const mapText = await readText(columnsPath);
    if (typeof mapText !== 'string') return failWith(say, [mapText]);
    const map = attempt(() => parseColumnMap(columnsPath, mapText));
    if (!map.ok) return failWith(say, map.errors);
    mapping = readerMapping(map.value, columnsPath);
    inputs.push({ role: 'columns', name: basename(columnsPath), sha256: createHash('sha256').update(mapText).digest('hex') });
  }
  const grouping = { alphaTolRad: ((setup.value.setup.grouping?.alpha_tol_deg ?? 0.2) * Math.PI) / 180 };
  const read = async (path: string, role: 'run' | 'tare') => {
    const hash = createHash('sha256');
    const r = await readRun(path, runText(path, hash), mapping && role === 'tare' ? { ...mapping, partial: true } : mapping, grouping);
    if (r.ok) inputs.push({ role, name: basename(path), sha256: hash.digest('hex') });
    return r;
  };
  const run = await read(runPath, 'run');
  if (!run.ok) return failWith(say, run.errors);
  let tare;
  if (tarePath) {
    const t = await read(tarePath, 'tare');
    if (!t.ok) return failWith(say, t.errors);
    tare = t.value;
  }
  const result = reduceRun({ run: run.value, setup: setup.value, tare, noCorrections });
  if (!result.ok) return failWith(say, result.errors);
  const provenance = provenanceOf(result.value, setup.value.setup, { version: VERSION, reducedAt: reductionTime(process.env['SOURCE_DATE_EPOCH']), inputs });
  return { result: result.value, provenance };
}

/** `project`: full-scale stall speed from the run's CLmax (or --cl-max), with its cautions. */
async function projectCommand(args: string[], io: { stdout: NodeJS.WritableStream }, say: (l: string) => void): Promise<number> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: {
      setup: { type: 'string' },
      tare: { type: 'string' },
      'mass-kg': { type: 'string' },
      'wing-area-m2': { type: 'string' },
      'pressure-altitude-m': { type: 'string' },
      'temp-c': { type: 'string' },
      'isa-deviation-c': { type: 'string' },
      'rh-pct': { type: 'string' },
      'cl-max': { type: 'string' },
      'lift-off-factor': { type: 'string' },
      columns: { type: 'string' },
    },
  });
  if (positionals.length !== 1) throw new UsageError('project needs one run file');
  if (!values.setup) throw new UsageError('project needs --setup SETUP.json');
  if (values['mass-kg'] === undefined) throw new UsageError('project needs --mass-kg M');
  if (values['wing-area-m2'] === undefined) throw new UsageError('project needs --wing-area-m2 S');
  if (values['temp-c'] !== undefined && values['isa-deviation-c'] !== undefined) throw new UsageError('give --temp-c or --isa-deviation-c, not both');
  const num = (name: keyof typeof values): number | undefined => {
    const v = values[name];
    if (v === undefined || typeof v !== 'string') return undefined;
    const x = Number(v);
    if (v.trim() === '' || !Number.isFinite(x)) throw new UsageError(`--${name} must be a number, not "${v}"`);
    return x;
  };
  const loaded = await loadAndReduce(positionals[0]!, values.setup, values.tare, false, say, values.columns);
  if (typeof loaded === 'number') return loaded;
  const { result, provenance } = loaded;
  // every warning of the reduction the estimate rests on is passed on, on stderr and in the document
  for (const w of result.warnings) say(`warning: ${w}`);
  const given = num('cl-max');
  if (given === undefined && result.corrections.kind === '2d') {
    say(`error: ${positionals[0]}: the setup describes a 2D section (model.kind "2d"); a section's CLmax is not a wing's (span loading, tip and root stall and the fuselage lower it), so no stall speed is estimated from it; give the wing's CLmax with --cl-max`);
    return 1;
  }
  const clMax = given ?? result.fit.cl_max;
  if (clMax === null) {
    say(`error: ${positionals[0]}: the run reached no CLmax (${result.fit.cl_max_reason ?? result.warnings.find((w) => w.includes('CLmax')) ?? 'see its warnings'}); give one with --cl-max`);
    return 1;
  }
  // Reynolds number of the point nearest the CLmax angle on the branch the fit describes
  const aMax = result.fit.alpha_cl_max_deg;
  const atMax = aMax === null ? result.points[0]! : result.points.reduce((best, p) => (Math.abs((p.alpha_deg ?? Infinity) - aMax) < Math.abs((best.alpha_deg ?? Infinity) - aMax) ? p : best), result.points[0]!);
  const projection = attempt(() =>
    projectStallSpeed({
      massKg: num('mass-kg')!,
      wingAreaM2: num('wing-area-m2')!,
      clMax,
      clMaxU: given !== undefined ? null : result.fit.cl_max_u,
      clMaxFrom: given !== undefined ? 'given' : 'model test',
      pressureAltitudeM: num('pressure-altitude-m'),
      tempC: num('temp-c'),
      isaDeviationC: num('isa-deviation-c'),
      rhPct: num('rh-pct'),
      liftOffFactor: num('lift-off-factor'),
      modelReynolds: atMax.reynolds,
    }),
  );
  if (!projection.ok) return failWith(say, projection.errors.map((e) => ({ ...e, field: e.field ? `--${e.field}` : undefined })));
  const doc = {
    ...projection.value,
    cl_max_u: given !== undefined ? null : result.fit.cl_max_u,
    cl_max_source: given !== undefined ? 'given (--cl-max)' : `fitted from the run (sweep branch ${(result.fit.branch ?? 0) + 1}, ${result.fit.branch_direction ?? 'up'}, ${result.fit.cl_max_method ?? ''})`,
    run: { name: result.run.name, configuration: result.run.configuration, source_file: result.run['source_file'] },
    warnings: result.warnings,
    provenance,
  };
  for (const c of doc.cautions) say(`caution: ${c}`);
  io.stdout.write(JSON.stringify(doc, null, 2) + '\n');
  return 0;
}

/** Same file: the same path, or another name (hard or symbolic link) for the same file. */
async function sameFile(a: string, b: string): Promise<boolean> {
  if (resolve(a) === resolve(b)) return true;
  try {
    const [x, y] = await Promise.all([stat(a), stat(b)]);
    return x.ino !== 0 && x.dev === y.dev && x.ino === y.ino;
  } catch {
    return false; // one of them does not exist yet: not the same file
  }
}

async function readText(path: string): Promise<string | Notice> {
  try {
    return await readFile(path, 'utf8');
  } catch (err) {
    return { file: path, message: describeFsError(err) };
  }
}
