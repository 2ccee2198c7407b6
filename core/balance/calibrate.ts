/**
 * Balance calibration by least squares from a loadings file (one row per loading: the applied loads and
 * the bridge outputs they gave), in either form of the balance document:
 *   loads_from_outputs: each load regressed on ΔR and its second-order products p(ΔR);
 *   outputs_from_loads: each output ΔR regressed on the loads F and p(F), the regression of the AIAA
 *     recommended practice (AIAA R-091-2003), whose loads are then recovered by its iteration.
 * Least squares by Householder QR (matrix.ts). Residuals are those of the loads recomputed from the
 * outputs through the fitted document (for outputs_from_loads: by the iteration), so both forms are
 * judged alike. Per load component: residual_sd = √(Σr²/(n − p)) with p the terms per equation (the
 * regression's residual standard error, Draper & Smith, Applied Regression Analysis, 3rd ed., ch. 2),
 * residual_max = max |r|, and both in per cent of the largest applied |load| of that component.
 * Natural zeros are the mean outputs of the loadings with every load zero (none: zeros of 0, said so).
 */
import Papa from 'papaparse';
import { InputError, type Notice } from '../contract/messages.ts';
import { CHANNELS, type Channel } from '../formats/channels.ts';
import { detectDelimiter, parseCell, splitHeaderCell } from '../formats/runFile.ts';
import { lookupUnit, unitsOf } from '../physics/units.ts';
import {
  BALANCE_FORMAT,
  BALANCE_LOAD_CHANNELS,
  quadraticTermCount,
  quadraticTermNames,
  quadraticTerms,
  validateBalance,
  type BalanceDocument,
  type BalanceForm,
} from './document.ts';
import { loadsFromOutputs } from './convert.ts';
import { leastSquares, type Matrix } from './matrix.ts';
import { maxOf } from '../physics/numbers.ts';

export interface Loadings {
  file: string;
  loads: Channel[];
  /** Load units as written in the headers (SI default when a header has none). */
  loadUnits: string[];
  outputs: string[];
  /** Output units as written (kept, never converted). */
  outputUnits: (string | null)[];
  /** Applied loads per loading, in the load units. */
  applied: number[][];
  /** Bridge outputs per loading, as written. */
  readings: number[][];
  /** Physical line of each loading. */
  lines: number[];
  metadata: Record<string, string>;
  warnings: Notice[];
}

/** Read a loadings file: `# key: value` lines, a header, one row per loading. Throws InputError naming file, line and column. */
export function parseLoadings(file: string, text: string, loadNames: readonly string[], outputNames: readonly string[]): Loadings {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const lines = body.split(/\r\n|\n|\r/);
  const metadata: Record<string, string> = {};
  let h = 0;
  for (; h < lines.length; h++) {
    const t = lines[h]!.trim();
    if (t === '') continue;
    if (!t.startsWith('#')) break;
    const m = /^#\s*([^:]+?)\s*:\s*(.*)$/.exec(t);
    if (m) metadata[m[1]!.toLowerCase()] = m[2]!.trim();
  }
  if (h >= lines.length) throw new InputError({ file, line: Math.max(1, lines.length), message: 'no header line found' });
  const headerLine = h + 1;
  const delimiter = detectDelimiter(lines[h]!);
  const header = (Papa.parse<string[]>(lines[h]!, { delimiter }).data[0] ?? []).map((c) => splitHeaderCell(c.trim()));
  const find = (name: string, what: string): number => {
    const i = header.findIndex((c) => c.name.toLowerCase() === name.trim().toLowerCase());
    if (i < 0)
      throw new InputError({ file, line: headerLine, message: `no column "${name}" (${what}); the header has ${header.map((c) => `"${c.name}"`).join(', ')}` });
    return i;
  };
  const loads = loadNames.map((n) => {
    const c = n.trim().toLowerCase();
    if (!BALANCE_LOAD_CHANNELS.includes(c as Channel))
      throw new InputError({ file, message: `--loads: "${n}" is not a load; expected one of ${BALANCE_LOAD_CHANNELS.join(', ')}` });
    return c as Channel;
  });
  if (new Set(loads).size !== loads.length) throw new InputError({ file, message: '--loads names a load twice' });
  const loadCols = loadNames.map((n) => find(n, 'an applied load named by --loads'));
  const outCols = outputNames.map((n) => find(n, 'a bridge output named by --outputs'));
  const loadUnits = loads.map((ch, k) => {
    const written = header[loadCols[k]!]!.unit;
    const unit = written && written !== '' ? written : CHANNELS[ch].defaultUnit;
    const conv = lookupUnit(unit);
    const quantity = CHANNELS[ch].quantity;
    if (!conv || conv.quantity !== quantity) {
      throw new InputError({
        file,
        line: headerLine,
        column: loadCols[k]! + 1,
        message: `column "${header[loadCols[k]!]!.name}" has unit "${unit}"; a ${ch} load needs a ${quantity} unit: ${unitsOf(quantity).join(', ')}`,
      });
    }
    return unit;
  });
  const decimalComma = delimiter === ';';
  const applied: number[][] = [];
  const readings: number[][] = [];
  const rowLines: number[] = [];
  const warnings: Notice[] = [];
  for (let i = h + 1; i < lines.length; i++) {
    const raw = lines[i]!;
    if (raw.trim() === '' || raw.trim().startsWith('#')) continue;
    const cells = Papa.parse<string[]>(raw, { delimiter }).data[0] ?? [];
    const take = (col: number): number => parseCell((cells[col] ?? '').trim(), decimalComma);
    const f = loadCols.map(take);
    const r = outCols.map(take);
    const badAt = [...loadCols, ...outCols].find((col) => !Number.isFinite(take(col)));
    if (badAt !== undefined) {
      warnings.push({
        file,
        line: i + 1,
        column: badAt + 1,
        message: `loading skipped: "${(cells[badAt] ?? '').trim()}" in column "${header[badAt]!.name}" is not a number`,
      });
      continue;
    }
    applied.push(f);
    readings.push(r);
    rowLines.push(i + 1);
  }
  if (applied.length === 0) throw new InputError({ file, line: headerLine, message: 'no loadings could be read after the header' });
  return {
    file,
    loads,
    loadUnits,
    outputs: outCols.map((c) => header[c]!.name),
    outputUnits: outCols.map((c) => header[c]!.unit ?? null),
    applied,
    readings,
    lines: rowLines,
    metadata,
    warnings,
  };
}

export interface CalibrationFit {
  /** The balance document to write, with its `fit` block. */
  document: BalanceDocument;
  /** Load residuals per loading (applied − recomputed), in load units. */
  residuals: number[][];
  residualSd: number[];
  residualMax: number[];
  /** Largest applied |load| per component. */
  largestLoad: number[];
  warnings: Notice[];
}

export function fitCalibration(l: Loadings, form: BalanceForm, linearOnly = false): CalibrationFit {
  const warnings: Notice[] = [...l.warnings];
  const nl = l.loads.length;
  const no = l.outputs.length;
  if (form === 'outputs_from_loads' && nl !== no) {
    throw new InputError({
      file: l.file,
      message: `${no} outputs for ${nl} loads; the outputs_from_loads form needs one output per load (or use --form loads_from_outputs)`,
    });
  }
  if (no < nl) throw new InputError({ file: l.file, message: `${no} outputs cannot determine ${nl} loads` });
  // natural zeros: mean outputs of the zero-load loadings
  const zeroRows = l.applied.map((f, i) => (f.every((x) => x === 0) ? i : -1)).filter((i) => i >= 0);
  const zeros = new Array<number>(no).fill(0);
  if (zeroRows.length > 0) {
    for (const i of zeroRows) for (let j = 0; j < no; j++) zeros[j]! += l.readings[i]![j]! / zeroRows.length;
  } else {
    warnings.push({ file: l.file, message: 'no loading with all loads zero: natural zeros are taken as 0 (the outputs must already be zero-referenced)' });
  }
  const dR = l.readings.map((r) => r.map((x, j) => x - zeros[j]!));
  const [args, results, argNames] = form === 'loads_from_outputs' ? [dR, l.applied, l.outputs] : [l.applied, dR, l.loads as string[]];
  const width = args[0]!.length;
  const nq = linearOnly ? 0 : quadraticTermCount(width);
  const design = args.map((x) => (linearOnly ? [...x] : [...x, ...quadraticTerms(x)]));
  const p = width + nq;
  const n = design.length;
  if (n <= p) {
    throw new InputError({
      file: l.file,
      message: `${n} loadings cannot determine ${p} terms per ${form === 'loads_from_outputs' ? 'load' : 'output'} with residuals to spare; apply more loadings${linearOnly ? '' : ' or use --linear-only'}`,
    });
  }
  const ys = results[0]!.map((_, i) => results.map((r) => r[i]!));
  const ls = leastSquares(design, ys);
  if (ls.dependentColumn !== undefined) {
    const names = [...argNames, ...quadraticTermNames(argNames)];
    throw new InputError({
      file: l.file,
      message: `the loadings do not separate the term ${names[ls.dependentColumn]} from the others (the fit is singular); apply combined loads that excite it${linearOnly ? '' : ', or use --linear-only'}`,
    });
  }
  const linear: Matrix = ls.coef.map((c) => c.slice(0, width));
  const quadratic: Matrix | undefined = linearOnly ? undefined : ls.coef.map((c) => c.slice(width));
  const draft: BalanceDocument = {
    format: BALANCE_FORMAT,
    version: 1,
    loads: l.loads,
    load_units: l.loadUnits,
    outputs: l.outputs,
    natural_zeros: zeros,
    form,
    linear,
    ...(quadratic ? { quadratic } : {}),
  };
  const balance = validateBalance(l.file, draft);
  const residuals = l.readings.map((r, i) => {
    const s = loadsFromOutputs(balance, r);
    if (!s.ok) throw new InputError({ file: l.file, line: l.lines[i], message: `the fitted calibration cannot recompute this loading's loads: ${s.reason}` });
    return s.loads.map((x, k) => l.applied[i]![k]! - x);
  });
  const residualSd = l.loads.map((_, k) => Math.sqrt(residuals.reduce((s, r) => s + r[k]! ** 2, 0) / (n - p)));
  const residualMax = l.loads.map((_, k) => maxOf(residuals.map((r) => Math.abs(r[k]!))));
  const largestLoad = l.loads.map((_, k) => maxOf(l.applied.map((f) => Math.abs(f[k]!))));
  const pct = (v: number[]) => v.map((x, k) => (largestLoad[k]! > 0 ? (100 * x) / largestLoad[k]! : null));
  const note = [
    l.metadata['balance'] ? `balance ${l.metadata['balance']}` : null,
    `fitted by least squares from ${n} loadings in ${l.file.replace(/^.*[\\/]/, '')}`,
    l.metadata['note'] ?? null,
  ]
    .filter(Boolean)
    .join('; ');
  const document: BalanceDocument = {
    ...draft,
    note,
    fit: {
      loadings: n,
      terms_per_equation: p,
      degrees_of_freedom: n - p,
      natural_zeros_from: zeroRows.length > 0 ? `${zeroRows.length} zero-load loading(s)` : 'none (taken as 0)',
      output_units: l.outputUnits,
      residual_sd: residualSd,
      residual_max: residualMax,
      residual_sd_pct: pct(residualSd),
      residual_max_pct: pct(residualMax),
      largest_load: largestLoad,
      applied: l.applied,
      residuals,
    },
  };
  return { document, residuals, residualSd, residualMax, largestLoad, warnings };
}
