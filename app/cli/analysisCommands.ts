/**
 * Commands around the reduction: balance calibration from loadings (`calibrate`), flow angularity
 * from an upright/inverted pair (`upflow`) and between-run repeatability (`repeat`), plus the reading
 * of a setup's balance calibration file for every command that reads runs.
 *   sweepbook calibrate LOADINGS.csv --loads L1,L2,… --outputs R1,R2,… [--form F] [--linear-only] --out BALANCE.json
 *   sweepbook upflow UPRIGHT.csv INVERTED.csv --setup S [--tare T] [--tare-inverted T2]
 *   sweepbook repeat RUN1.csv RUN2.csv … --setup S [--tare T] [--alpha-tol-deg X]
 * Standard output carries only the JSON document; messages go to standard error.
 */
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { readFile, stat } from 'node:fs/promises';
import { basename, dirname, isAbsolute, join, resolve } from 'node:path';
import { StringDecoder } from 'node:string_decoder';
import { parseArgs } from 'node:util';
import {
  attempt,
  balanceTransform,
  checkBalanceAxes,
  DEFAULT_REPEAT_ALPHA_TOL_DEG,
  fitCalibration,
  formatNotice,
  InputError,
  parseBalance,
  parseLoadings,
  readRun,
  readSetup,
  reduceRun,
  repeatability,
  upflowFromPair,
  zeroLiftAngle,
  type Balance,
  type BalanceForm,
  type InputFile,
  type Notice,
  type ReductionResult,
  type RunData,
  type SampleTransform,
  type SetupResult,
} from '../../core/index.ts';
import { writeFileAtomic } from '../files/atomic.ts';

type Say = (line: string) => void;
type Out = { stdout: NodeJS.WritableStream };

/** A wrong command line: main.ts prints it with the usage and exits 2. */
export class AnalysisUsageError extends Error {}

export const ANALYSIS_USAGE = `  sweepbook calibrate LOADINGS.csv --loads L1,L2,… --outputs R1,R2,… [--form outputs_from_loads|loads_from_outputs] [--linear-only] --out BALANCE.json
  sweepbook upflow UPRIGHT.csv INVERTED.csv --setup SETUP.json [--tare WINDOFF.csv] [--tare-inverted WINDOFF-INV.csv]
  sweepbook repeat RUN1.csv RUN2.csv … --setup SETUP.json [--tare WINDOFF.csv] [--alpha-tol-deg X]`;

function fail(say: Say, errors: Notice[]): number {
  for (const e of errors) say(`error: ${formatNotice(e)}`);
  return 1;
}

/**
 * The setup's balance calibration as the reader's per-sample transform: an inline document, or the
 * balance file named by path relative to the setup file (read here, checked against balance.axes, and
 * put in the setup in place of its path). Undefined when the run holds loads.
 */
export async function balanceTransformFor(setupPath: string, setup: SetupResult, inputs?: InputFile[]): Promise<SampleTransform | undefined | Notice> {
  const c = setup.setup.balance.calibration;
  if (c === null) return undefined;
  let balance: Balance;
  if ('path' in c) {
    const path = isAbsolute(c.path) ? c.path : join(dirname(setupPath), c.path);
    let text: string;
    try {
      text = await readFile(path, 'utf8');
    } catch (err) {
      return { file: setupPath, field: 'balance.calibration', message: `cannot read the balance file "${c.path}" (${path}): ${describeFsError(err)}` };
    }
    const parsed = attempt(() => {
      const b = parseBalance(path, text);
      checkBalanceAxes(b, setup.setup.balance.axes);
      return b;
    });
    if (!parsed.ok) return parsed.errors[0]!;
    balance = parsed.value;
    inputs?.push({ role: 'balance', name: basename(path), sha256: createHash('sha256').update(text).digest('hex') });
    setup.setup.balance.calibration = balance;
  } else {
    balance = c;
  }
  return balanceTransform(balance);
}

/** Setup read and its balance resolved; a run reader bound to that balance. */
async function loadSetup(setupPath: string, say: Say): Promise<{ setup: SetupResult; read: (path: string) => Promise<RunData | number> } | number> {
  let text: string;
  try {
    text = await readFile(setupPath, 'utf8');
  } catch (err) {
    return fail(say, [{ file: setupPath, message: describeFsError(err) }]);
  }
  const setup = readSetup(setupPath, text);
  if (!setup.ok) return fail(say, setup.errors);
  const transform = await balanceTransformFor(setupPath, setup.value);
  if (transform !== undefined && !('apply' in transform)) return fail(say, [transform]);
  const read = async (path: string): Promise<RunData | number> => {
    const grouping = { alphaTolRad: ((setup.value.setup.grouping?.alpha_tol_deg ?? 0.2) * Math.PI) / 180 };
    const r = await readRun(path, textStream(path), undefined, grouping, transform);
    return r.ok ? r.value : fail(say, r.errors);
  };
  return { setup: setup.value, read };
}

/** Reduce one run (and its tare) with the given setup. */
async function reduceOne(
  s: { setup: SetupResult; read: (path: string) => Promise<RunData | number> },
  runPath: string,
  tarePath: string | undefined,
  noCorrections: boolean,
  say: Say,
): Promise<ReductionResult | number> {
  const run = await s.read(runPath);
  if (typeof run === 'number') return run;
  let tare: RunData | undefined;
  if (tarePath) {
    const t = await s.read(tarePath);
    if (typeof t === 'number') return t;
    tare = t;
  }
  const r = reduceRun({ run, setup: s.setup, tare, noCorrections });
  return r.ok ? r.value : fail(say, r.errors);
}

// ---------------------------------------------------------------------------------------------- calibrate

export async function calibrateCommand(args: string[], io: Out, say: Say): Promise<number> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: {
      loads: { type: 'string' },
      outputs: { type: 'string' },
      form: { type: 'string', default: 'outputs_from_loads' },
      'linear-only': { type: 'boolean', default: false },
      out: { type: 'string' },
    },
  });
  if (positionals.length !== 1) throw new AnalysisUsageError('calibrate needs one loadings file');
  if (!values.loads) throw new AnalysisUsageError('calibrate needs --loads L1,L2,… (the applied-load columns, e.g. normal,axial,pitch)');
  if (!values.outputs) throw new AnalysisUsageError('calibrate needs --outputs R1,R2,… (the bridge-output columns)');
  if (!values.out) throw new AnalysisUsageError('calibrate needs --out BALANCE.json');
  const form = values.form as BalanceForm;
  if (form !== 'outputs_from_loads' && form !== 'loads_from_outputs')
    throw new AnalysisUsageError(`--form must be outputs_from_loads or loads_from_outputs, not "${values.form}"`);
  const path = positionals[0]!;
  if (resolve(values.out) === resolve(path) || (await sameInode(values.out, path))) {
    throw new AnalysisUsageError(`--out ${values.out} is the loadings file; raw files are never overwritten, choose another name`);
  }
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    return fail(say, [{ file: path, message: describeFsError(err) }]);
  }
  const split = (s: string) =>
    s
      .split(',')
      .map((x) => x.trim())
      .filter((x) => x !== '');
  const fitted = attempt(() => fitCalibration(parseLoadings(path, text, split(values.loads!), split(values.outputs!)), form, values['linear-only']));
  if (!fitted.ok) return fail(say, fitted.errors);
  const f = fitted.value;
  for (const w of f.warnings) say(`warning: ${formatNotice(w)}`);
  const doc = f.document;
  await writeFileAtomic(values.out, JSON.stringify(doc, null, 2) + '\n');
  say(
    `${doc.form}${values['linear-only'] ? ' (linear only)' : ''} from ${doc.fit!['loadings']} loadings, ${doc.fit!['terms_per_equation']} terms per equation:`,
  );
  doc.loads.forEach((l, k) => {
    const pct = (v: unknown) => ((v as (number | null)[])[k] === null ? '—' : `${(v as number[])[k]!.toFixed(3)} %`);
    say(
      `  ${l.padEnd(7)} residual SD ${f.residualSd[k]!.toPrecision(3)} ${doc.load_units[k]} (${pct(doc.fit!['residual_sd_pct'])} of ${f.largestLoad[k]} ${doc.load_units[k]}), largest ${f.residualMax[k]!.toPrecision(3)} ${doc.load_units[k]} (${pct(doc.fit!['residual_max_pct'])})`,
    );
  });
  say(`wrote ${values.out}`);
  void io;
  return 0;
}

// ---------------------------------------------------------------------------------------------- upflow

export async function upflowCommand(args: string[], io: Out, say: Say): Promise<number> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: { setup: { type: 'string' }, tare: { type: 'string' }, 'tare-inverted': { type: 'string' } },
  });
  if (positionals.length !== 2) throw new AnalysisUsageError('upflow needs two run files: the model upright, then inverted');
  if (!values.setup) throw new AnalysisUsageError('upflow needs --setup SETUP.json');
  const s = await loadSetup(values.setup, say);
  if (typeof s === 'number') return s;
  const warnings: string[] = [];
  // zero-lift angles from uncorrected data, and with no upflow already applied
  if (s.setup.setup.flow.upflow_deg !== 0) {
    warnings.push(
      `${values.setup}: flow.upflow_deg ${s.setup.setup.flow.upflow_deg} is not applied here; the upflow is measured from the runs as the tunnel gave them`,
    );
    s.setup.setup.flow.upflow_deg = 0;
  }
  if (values.tare && !values['tare-inverted'])
    warnings.push('no --tare-inverted: the inverted run is reduced without a tare (the upright tare does not apply to the inverted model)');
  const runs: [string, string | undefined][] = [
    [positionals[0]!, values.tare],
    [positionals[1]!, values['tare-inverted']],
  ];
  const angles = [];
  for (const [run, tare] of runs) {
    const r = await reduceOne(s, run, tare, true, say);
    if (typeof r === 'number') return r;
    for (const w of r.warnings) warnings.push(`${r.run.name}: ${w}`);
    const range = r.fit.linear_range_deg;
    if (!range) return fail(say, [{ file: run, message: 'no linear range of the lift curve was found, so its zero-lift angle cannot be measured' }]);
    const inRange = r.points.filter((p) => p.alpha_uncorrected_deg >= range[0] - 1e-9 && p.alpha_uncorrected_deg <= range[1] + 1e-9);
    const z = zeroLiftAngle(
      inRange.map((p) => p.alpha_uncorrected_deg),
      inRange.map((p) => p.cl_uncorrected),
    );
    if (!z) return fail(say, [{ file: run, message: `the lift curve's linear range (${range[0]}° to ${range[1]}°) has too few points for a zero-lift angle` }]);
    if (z.alphaDeg < z.rangeDeg[0] - 2 || z.alphaDeg > z.rangeDeg[1] + 2)
      warnings.push(
        `${run}: the zero-lift angle ${z.alphaDeg.toFixed(2)}° lies outside the fitted range ${z.rangeDeg[0].toFixed(1)}° to ${z.rangeDeg[1].toFixed(1)}° (an extrapolation)`,
      );
    angles.push(z);
  }
  const result = upflowFromPair(angles[0]!, angles[1]!);
  for (const w of warnings) say(`warning: ${w}`);
  const doc = {
    ...result,
    linear_range_upright_deg: angles[0]!.rangeDeg,
    linear_range_inverted_deg: angles[1]!.rangeDeg,
    points_upright: angles[0]!.n,
    points_inverted: angles[1]!.n,
    upright_file: positionals[0],
    inverted_file: positionals[1],
    apply_to_setup: { flow: { upflow_deg: Number(result.upflow_deg.toFixed(4)) } },
    warnings,
  };
  io.stdout.write(JSON.stringify(doc, null, 2) + '\n');
  say(`upflow ${result.upflow_deg.toFixed(3)}° ± ${result.upflow_u_deg.toFixed(3)}° (standard uncertainty); set flow.upflow_deg in the setup to apply it`);
  return 0;
}

// ---------------------------------------------------------------------------------------------- repeat

export async function repeatCommand(args: string[], io: Out, say: Say): Promise<number> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: { setup: { type: 'string' }, tare: { type: 'string' }, 'alpha-tol-deg': { type: 'string' } },
  });
  if (positionals.length < 2) throw new AnalysisUsageError('repeat needs at least two run files of the same configuration');
  if (!values.setup) throw new AnalysisUsageError('repeat needs --setup SETUP.json');
  const tolText = values['alpha-tol-deg'];
  const tol = tolText === undefined ? DEFAULT_REPEAT_ALPHA_TOL_DEG : Number(tolText);
  if (!(tol > 0) || !Number.isFinite(tol)) throw new AnalysisUsageError(`--alpha-tol-deg must be a positive number, not "${tolText}"`);
  const s = await loadSetup(values.setup, say);
  if (typeof s === 'number') return s;
  const results: ReductionResult[] = [];
  for (const run of positionals) {
    const r = await reduceOne(s, run, values.tare, false, say);
    if (typeof r === 'number') return r;
    results.push(r);
  }
  const rep = repeatability(
    results.map((r) => ({
      name: r.run.name,
      alphaDeg: r.points.map((p) => p.alpha_deg!),
      cl: r.points.map((p) => p.cl!),
      cd: r.points.map((p) => p.cd!),
      cm: r.points.map((p) => p.cm),
    })),
    tol,
  );
  const warnings = [...results.flatMap((r) => r.warnings.map((w) => `${r.run.name}: ${w}`)), ...rep.warnings];
  const configs = [...new Set(results.map((r) => r.run.configuration ?? '(none)'))];
  if (configs.length > 1) warnings.push(`the runs name different configurations (${configs.join(', ')}): their scatter is not repeatability`);
  for (const w of warnings) say(`warning: ${w}`);
  const doc = {
    pooled_sd_cl: rep.pooled_sd_cl,
    pooled_sd_cd: rep.pooled_sd_cd,
    pooled_sd_cm: rep.pooled_sd_cm,
    degrees_of_freedom: rep.degrees_of_freedom,
    alpha_tol_deg: rep.alpha_tol_deg,
    runs: results.map((r) => ({ name: r.run.name, configuration: r.run.configuration, source_file: r.run['source_file'], points: r.points.length })),
    corrections: results[0]!.corrections.enabled,
    points: rep.points,
    warnings,
  };
  io.stdout.write(JSON.stringify(doc, null, 2) + '\n');
  const f = (x: number | null) => (x === null ? '—' : x.toPrecision(2));
  say(
    `pooled repeatability (1 SD, ${rep.degrees_of_freedom} degrees of freedom): CL ${f(rep.pooled_sd_cl)}, CD ${f(rep.pooled_sd_cd)}, Cm ${f(rep.pooled_sd_cm)}`,
  );
  return 0;
}

// ---------------------------------------------------------------------------------------------- files

async function* textStream(path: string): AsyncGenerator<string> {
  const stream = createReadStream(path, { flags: 'r', highWaterMark: 1 << 20 });
  const decoder = new StringDecoder('utf8');
  try {
    for await (const chunk of stream) {
      const text = decoder.write(chunk as Buffer);
      if (text.length > 0) yield text;
    }
    const rest = decoder.end();
    if (rest.length > 0) yield rest;
  } catch (err) {
    throw new InputError({ file: path, message: describeFsError(err) });
  }
}

async function sameInode(a: string, b: string): Promise<boolean> {
  try {
    const [x, y] = await Promise.all([stat(a), stat(b)]);
    return x.ino !== 0 && x.dev === y.dev && x.ino === y.ino;
  } catch {
    return false;
  }
}

function describeFsError(err: unknown): string {
  const code = (err as { code?: string }).code;
  if (code === 'ENOENT') return 'no such file';
  if (code === 'EISDIR') return 'is a folder, not a file';
  if (code === 'EACCES') return 'permission denied';
  return (err as Error).message;
}
