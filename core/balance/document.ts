/**
 * The balance document: a strain-gauge balance's calibration, in either of its two usual forms —
 * loads as functions of the bridge outputs, or bridge outputs as functions of the loads (the form
 * of the AIAA recommended practice for internal strain-gauge balances, AIAA R-091-2003, solved for
 * the loads by iteration) — with natural zeros, a linear matrix and optional second-order terms.
 * Parsed and checked here; every problem names the file and the field.
 */
import { InputError } from '../contract/messages.ts';
import { CHANNELS, isChannel, type Channel } from '../formats/channels.ts';
import { lookupUnit, unitsOf, type UnitConversion } from '../physics/units.ts';
import { parseJsonText } from '../setup/schema.ts';
import { invert, type Matrix } from './matrix.ts';

export const BALANCE_FORMAT = 'sweepbook-balance';
export type BalanceForm = 'loads_from_outputs' | 'outputs_from_loads';

/** The document as written (and as `calibrate` writes it). */
export interface BalanceDocument {
  format: typeof BALANCE_FORMAT;
  version: 1;
  note?: string;
  loads: Channel[];
  load_units: string[];
  outputs: string[];
  natural_zeros?: number[];
  form: BalanceForm;
  linear: Matrix;
  quadratic?: Matrix;
  /** Residual statistics written by `calibrate` (kept, not used in the reduction). */
  fit?: Record<string, unknown>;
}

/** A checked balance, ready to convert samples. */
export interface Balance {
  /** Where it came from, for messages: the balance file, or the setup file for an inline one. */
  file: string;
  /** Field prefix for messages ("" in a balance file, "balance.calibration." inline). */
  fieldPrefix: string;
  doc: BalanceDocument;
  loads: Channel[];
  /** Load units and their conversions to SI, per load. */
  units: UnitConversion[];
  outputs: string[];
  zeros: number[];
  form: BalanceForm;
  linear: Matrix;
  /** null for a linear balance (no `quadratic`, or all zeros). */
  quadratic: Matrix | null;
  /** linear⁻¹ for `outputs_from_loads` (square); undefined for `loads_from_outputs`. */
  linearInverse?: Matrix;
}

/** Loads a balance can measure: the force and moment channels of the run-file contract. */
export const BALANCE_LOAD_CHANNELS: readonly Channel[] = (Object.keys(CHANNELS) as Channel[]).filter(
  (c) => CHANNELS[c].quantity === 'force' || CHANNELS[c].quantity === 'moment',
);

/** Number of second-order products p_t of n variables: n(n+1)/2. */
export function quadraticTermCount(n: number): number {
  return (n * (n + 1)) / 2;
}

/**
 * The second-order products p_t(x) = x_j·x_k, j ≤ k, in the order x1², x1x2, …, x1xn, x2², x2x3, …, xn²
 * (the term order of the data contract), written into `out`.
 */
export function quadraticTerms(x: ArrayLike<number>, out: number[] | Float64Array = new Array<number>(quadraticTermCount(x.length))): number[] | Float64Array {
  const n = x.length;
  let t = 0;
  for (let j = 0; j < n; j++) for (let k = j; k < n; k++) out[t++] = x[j]! * x[k]!;
  return out;
}

/** Names of the second-order terms for messages and tables: "r1²", "r1·r2", … */
export function quadraticTermNames(names: readonly string[]): string[] {
  const out: string[] = [];
  for (let j = 0; j < names.length; j++) for (let k = j; k < names.length; k++) out.push(j === k ? `${names[j]}²` : `${names[j]}·${names[k]}`);
  return out;
}

/** Parse a balance file's text. Throws InputError naming the file, and the line and column of a JSON error. */
export function parseBalance(file: string, text: string): Balance {
  return validateBalance(file, parseJsonText(file, text));
}

/**
 * Check a balance document (parsed JSON). `fieldPrefix` names where it sits ("balance.calibration."
 * when inline in a setup). Throws InputError naming the file and field.
 */
export function validateBalance(file: string, json: unknown, fieldPrefix = ''): Balance {
  const fail = (field: string, message: string): never => {
    throw new InputError({ file, field: `${fieldPrefix}${field}` || '(top level)', message });
  };
  if (json === null || typeof json !== 'object' || Array.isArray(json)) fail('', 'expected a balance document (a JSON object)');
  const d = json as Record<string, unknown>;
  const known = ['$schema', 'format', 'version', 'note', 'loads', 'load_units', 'outputs', 'natural_zeros', 'form', 'linear', 'quadratic', 'fit'];
  for (const key of Object.keys(d)) if (!known.includes(key)) fail(key, `unknown key "${key}"; expected one of ${known.slice(1).join(', ')}`);
  if (d['format'] !== BALANCE_FORMAT) fail('format', `expected "${BALANCE_FORMAT}"`);
  if (d['version'] !== 1) fail('version', 'expected 1 (the only version so far)');
  if (d['note'] !== undefined && typeof d['note'] !== 'string') fail('note', 'expected text');
  const strings = (key: string, unique = true): string[] => {
    const v = d[key];
    if (!Array.isArray(v) || v.length === 0) return fail(key, 'expected a non-empty list of names');
    v.forEach((s, i) => {
      if (typeof s !== 'string' || s.trim() === '') fail(`${key}[${i}]`, 'expected a name (text)');
    });
    const seen = new Set<string>();
    if (unique)
      v.forEach((s: string, i) => {
        const k = s.trim().toLowerCase();
        if (seen.has(k)) fail(`${key}[${i}]`, `"${s}" appears twice`);
        seen.add(k);
      });
    return (v as string[]).map((s) => s.trim());
  };
  const loads = strings('loads').map((l, i) => {
    const c = l.toLowerCase();
    if (!isChannel(c) || !BALANCE_LOAD_CHANNELS.includes(c)) fail(`loads[${i}]`, `"${l}" is not a load; expected one of ${BALANCE_LOAD_CHANNELS.join(', ')}`);
    return c as Channel;
  });
  const loadUnits = strings('load_units', false);
  if (loadUnits.length !== loads.length) fail('load_units', `${loadUnits.length} units for ${loads.length} loads; give one unit per load`);
  const units = loadUnits.map((u, i) => {
    const conv = lookupUnit(u);
    const quantity = CHANNELS[loads[i]!].quantity;
    if (!conv || conv.quantity !== quantity) {
      fail(
        `load_units[${i}]`,
        `"${u}" is ${conv ? `a ${conv.quantity} unit` : 'not a known unit'}; "${loads[i]}" needs a ${quantity} unit: ${unitsOf(quantity).join(', ')}`,
      );
    }
    return conv!;
  });
  const outputs = strings('outputs');
  const form = d['form'];
  if (form !== 'loads_from_outputs' && form !== 'outputs_from_loads') return fail('form', 'expected "loads_from_outputs" or "outputs_from_loads"');
  const nl = loads.length;
  const no = outputs.length;
  if (form === 'outputs_from_loads' && nl !== no)
    fail('outputs', `${no} outputs for ${nl} loads; the outputs_from_loads form is solved for the loads and needs as many outputs as loads`);
  if (form === 'loads_from_outputs' && no < nl) fail('outputs', `${no} outputs cannot determine ${nl} loads`);
  const zeros = d['natural_zeros'] === undefined ? new Array<number>(no).fill(0) : numbers(d['natural_zeros'], 'natural_zeros', no, fail);
  // rows: one per result (loads, or outputs); columns: one per argument (outputs, or loads)
  const [rows, cols, rowWhat, colWhat] = form === 'loads_from_outputs' ? [nl, no, 'loads', 'outputs'] : [no, nl, 'outputs', 'loads'];
  const matrix = (key: string, width: number, widthWhat: string): Matrix => {
    const v = d[key];
    if (!Array.isArray(v)) return fail(key, `expected a list of ${rows} rows (one per ${rowWhat.slice(0, -1)})`);
    if (v.length !== rows)
      fail(
        key,
        `${v.length} rows; the ${form} form needs ${rows}, one per ${rowWhat.slice(0, -1)} (${(form === 'loads_from_outputs' ? loads : outputs).join(', ')})`,
      );
    return v.map((row, i) => numbers(row, `${key}[${i}]`, width, fail, widthWhat));
  };
  const linear = matrix('linear', cols, `one per ${colWhat.slice(0, -1)}`);
  const nq = quadraticTermCount(cols);
  const quadraticRaw =
    d['quadratic'] === undefined || d['quadratic'] === null
      ? null
      : matrix('quadratic', nq, `the products of the ${cols} ${colWhat} taken two at a time, x1², x1x2, …, x${cols}²`);
  const quadratic = quadraticRaw && quadraticRaw.some((r) => r.some((x) => x !== 0)) ? quadraticRaw : null;
  let linearInverse: Matrix | undefined;
  if (form === 'outputs_from_loads') {
    linearInverse = invert(linear);
    if (!linearInverse)
      fail(
        'linear',
        'the linear matrix is singular (a load that moves no bridge, or two bridges that see the same load); the loads cannot be solved from the outputs',
      );
  } else if (!hasFullRowRank(linear)) {
    fail('linear', 'the linear matrix is singular (its rows are not independent), so some loads are combinations of others');
  }
  if (d['fit'] !== undefined && (d['fit'] === null || typeof d['fit'] !== 'object')) fail('fit', 'expected an object (residual statistics)');
  const doc: BalanceDocument = {
    format: BALANCE_FORMAT,
    version: 1,
    ...(typeof d['note'] === 'string' ? { note: d['note'] } : {}),
    loads,
    load_units: loadUnits,
    outputs,
    natural_zeros: zeros,
    form,
    linear,
    ...(quadraticRaw ? { quadratic: quadraticRaw } : {}),
    ...(d['fit'] ? { fit: d['fit'] as Record<string, unknown> } : {}),
  };
  return { file, fieldPrefix, doc, loads, units, outputs, zeros, form, linear, quadratic, linearInverse };
}

function numbers(v: unknown, field: string, n: number, fail: (f: string, m: string) => never, what = ''): number[] {
  if (!Array.isArray(v)) return fail(field, `expected a list of ${n} numbers${what ? ` (${what})` : ''}`);
  if (v.length !== n) fail(field, `${v.length} numbers; expected ${n}${what ? ` (${what})` : ''}`);
  v.forEach((x, i) => {
    if (typeof x !== 'number' || !Number.isFinite(x)) fail(`${field}[${i}]`, `expected a number, not ${JSON.stringify(x)}`);
  });
  return v as number[];
}

/** True when the rows of `a` are independent (rank = row count), by elimination on A·Aᵀ's factor. */
function hasFullRowRank(a: Matrix): boolean {
  if (a.length === a[0]!.length) return invert(a) !== undefined;
  const aat = a.map((r) => a.map((s) => r.reduce((acc, x, j) => acc + x * s[j]!, 0)));
  return invert(aat) !== undefined;
}

/**
 * The calibration must give the force pair the setup's `balance.axes` reduces (lift and drag, or normal
 * and axial); otherwise the run would miss them. Throws InputError naming the calibration's loads.
 */
export function checkBalanceAxes(b: Balance, axes: 'wind' | 'body'): void {
  const need: Channel[] = axes === 'wind' ? ['lift', 'drag'] : ['normal', 'axial'];
  const missing = need.filter((c) => !b.loads.includes(c));
  if (missing.length > 0) {
    throw new InputError({
      file: b.file,
      field: `${b.fieldPrefix}loads`,
      message: `the calibration gives ${b.loads.join(', ')} but not ${missing.join(' and ')}, which balance.axes "${axes}" needs`,
    });
  }
}

/**
 * What a result's provenance records of a setup's calibration: the file it came from and the
 * document's form, names, zeros and matrices (without the calibration's residual tables); a path not
 * yet read stays a path; none stays null.
 */
export function calibrationRecord(c: Balance | { path: string } | null): unknown {
  if (c === null || 'path' in c) return c;
  const { fit: _fit, ...doc } = c.doc;
  return { source: c.fieldPrefix ? 'inline' : c.file.replace(/^.*[\\/]/, ''), ...doc };
}
