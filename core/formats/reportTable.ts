/**
 * Tables for reports: the point table with the trade's column names, a units row, and every number
 * written to the digits it supports. A value with a standard uncertainty is rounded to the decimal place
 * of the uncertainty's second significant digit (JCGM 100:2008, GUM §7.2.6: an uncertainty is quoted to
 * at most two significant digits and the value to the same place); a value without one takes its
 * quantity's resolution below (common practice for low-speed balance data, no source). Never more than
 * seven significant digits: more than a single-precision logger or a balance calibration carries.
 * Provenance comes first as raw `# ` lines, so comment-skipping CSV readers (pandas `comment='#'`, R's
 * `comment.char`, papaparse `comments`) skip them; the header row and the units row follow.
 */
import type { PointResult, ReductionResult } from '../reduction/pipeline.ts';
import { csvCell } from './csvWriter.ts';
import { commentLine } from './csvWriter.ts';

export const MAX_SIGNIFICANT = 7;

/** The rounding rule in one line, written as a `#` line above every table rounded by it. */
export const ROUNDING_NOTE =
  "numbers: rounded to the place of the standard uncertainty's second significant digit where there is one (GUM 7.2.6), else to the quantity's resolution; never more than 7 significant digits";

export interface ReportColumn {
  key: keyof PointResult;
  /** Name as a test engineer writes it, ASCII so every spreadsheet and reader shows it. */
  header: string;
  /** Unit as written in the units row; "-" for a ratio. */
  unit: string;
  /** Digits after the point without an uncertainty; `sig:N` columns use N significant digits instead. */
  decimals: number | `sig:${number}`;
  /** Column holding this value's standard uncertainty (same unit), if any. */
  u?: keyof PointResult;
  /** A count or a line number: written as the integer it is, whatever its number of digits. */
  count?: true;
}

const c = (key: keyof PointResult, header: string, unit: string, decimals: ReportColumn['decimals'], u?: keyof PointResult): ReportColumn => ({
  key,
  header,
  unit,
  decimals,
  ...(u ? { u } : {}),
});
const count = (key: keyof PointResult, header: string): ReportColumn => ({ key, header, unit: '-', decimals: 0, count: true });

/** The command line's point columns (POINT_COLUMNS), in the same order, with report names and units. */
export const REPORT_COLUMNS: readonly ReportColumn[] = [
  c('point', 'point', '-', 0),
  count('samples', 'samples'),
  c('alpha_deg', 'alpha', 'deg', 3, 'u_alpha_deg'),
  c('cl', 'CL', '-', 4, 'u_cl'),
  c('cd', 'CD', '-', 5, 'u_cd'),
  c('cm', 'Cm', '-', 4, 'u_cm'),
  c('ld', 'L/D', '-', 2),
  c('q_pa', 'q', 'Pa', 2, 'u_q_pa'),
  c('v_mps', 'V', 'm/s', 3, 'u_v_mps'),
  c('mach', 'Mach', '-', 4),
  c('reynolds', 'Re', '-', 'sig:4'),
  c('alpha_uncorrected_deg', 'alpha as measured', 'deg', 3),
  c('cl_uncorrected', 'CL as measured', '-', 4),
  c('cd_uncorrected', 'CD as measured', '-', 5),
  c('cm_uncorrected', 'Cm as measured', '-', 4),
  c('q_uncorrected_pa', 'q as measured', 'Pa', 2),
  c('v_uncorrected_mps', 'V as measured', 'm/s', 3),
  c('mach_uncorrected', 'Mach as measured', '-', 4),
  c('reynolds_uncorrected', 'Re as measured', '-', 'sig:4'),
  c('rho_kgm3', 'air density', 'kg/m^3', 5),
  c('mu_pas', 'dynamic viscosity', 'Pa s', 'sig:5'),
  c('p_static_pa', 'static pressure', 'Pa', 1),
  c('p_total_pa', 'total pressure', 'Pa', 1),
  c('t_static_k', 'static temperature', 'K', 2),
  c('t_total_k', 'total temperature', 'K', 2),
  c('rh_pct', 'relative humidity', '%', 1),
  c('cy', 'CY', '-', 4),
  c('c_roll', 'Cl roll', '-', 5),
  c('c_yaw', 'Cn yaw', '-', 5),
  c('cy_uncorrected', 'CY as measured', '-', 4),
  c('c_roll_uncorrected', 'Cl roll as measured', '-', 5),
  c('c_yaw_uncorrected', 'Cn yaw as measured', '-', 5),
  c('lift_n', 'lift', 'N', 3),
  c('drag_n', 'drag', 'N', 4),
  c('pitch_ref_nm', 'pitching moment', 'N m', 4),
  c('cl_scatter', 'CL scatter', '-', 'sig:2'),
  c('eps_solid', 'solid blockage', '-', 'sig:3'),
  c('eps_wake', 'wake blockage', '-', 'sig:3'),
  c('u_q_pa', 'u(q)', 'Pa', 'sig:2'),
  c('u_v_mps', 'u(V)', 'm/s', 'sig:2'),
  c('u_alpha_deg', 'u(alpha)', 'deg', 'sig:2'),
  c('u_cl', 'u(CL)', '-', 'sig:2'),
  c('u_cd', 'u(CD)', '-', 'sig:2'),
  c('u_cm', 'u(Cm)', '-', 'sig:2'),
  count('line', 'file line'),
];

/** Powers of ten from 1e-40 to 1e40, looked up rather than computed: the writer calls this for every cell. */
const POW10 = Array.from({ length: 81 }, (_, i) => Number(`1e${i - 40}`));
const pow10 = (n: number): number => (n >= -40 && n <= 40 ? POW10[n + 40]! : 10 ** n);

/** Decimal exponent of a finite non-zero number (floor(log10 |x|)), exact at powers of ten. */
function exponentOf(x: number): number {
  const a = Math.abs(x);
  const e = Math.floor(Math.log10(a));
  // log10 can land a hair either side of an exact power of ten
  if (a >= pow10(e + 1)) return e + 1;
  return a < pow10(e) ? e - 1 : e;
}

/** Digits after the point that put the uncertainty's second significant digit last (GUM §7.2.6). */
export function decimalsFromUncertainty(u: number): number | null {
  if (!Number.isFinite(u) || u <= 0) return null;
  return 1 - exponentOf(u);
}

/** `decimals` of a column parsed once: fixed digits after the point, or significant digits. */
interface Digits {
  fixed: number;
  sig: number | null;
}
function parseDigits(decimals: number | `sig:${number}`): Digits {
  return typeof decimals === 'string' ? { fixed: 0, sig: Number(decimals.slice(4)) } : { fixed: decimals, sig: null };
}

/**
 * A number as text with `decimals` digits after the point, but never more than seven significant
 * digits; beyond seven integer digits it switches to exponent form. "" for null and non-finite.
 */
export function reportNumber(value: number | null | undefined, decimals: number | `sig:${number}`, u?: number | null): string {
  return rounded(value, parseDigits(decimals), u);
}

function rounded(value: number | null | undefined, digits: Digits, u?: number | null): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  if (value === 0) return '0';
  const e = exponentOf(value);
  let d = digits.sig === null ? digits.fixed : Math.min(MAX_SIGNIFICANT, digits.sig) - 1 - e;
  const fromU = u === null || u === undefined ? null : decimalsFromUncertainty(u);
  if (fromU !== null) d = fromU;
  d = Math.min(d, MAX_SIGNIFICANT - 1 - e);
  if (e >= MAX_SIGNIFICANT) return tidy(value.toPrecision(Math.max(1, Math.min(MAX_SIGNIFICANT, e + 1 + d))));
  if (d >= 0) return tidy(value.toFixed(Math.min(d, 100)));
  // round to tens, hundreds…: the digits after are zeros that carry no information
  const step = pow10(-d);
  return tidy(String(Math.round(value / step) * step));
}

/** A count or line number: the integer as it is (no rounding to seven digits); anything else as a 7-digit number. */
export function countNumber(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  return Number.isInteger(value) ? String(value) : reportNumber(value, `sig:${MAX_SIGNIFICANT}`);
}

function tidy(text: string): string {
  // no "-0" or "-0.000"
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/** One point's cells, in REPORT_COLUMNS order: numbers as rounded text, text (the point label) as it is. */
export function reportCells(p: PointResult): (string | number)[] {
  return REPORT_COLUMNS.map((col) => {
    const v = p[col.key] as number | string | null;
    if (typeof v === 'string') return v;
    if (col.count) return countNumber(v);
    return reportNumber(v, col.decimals, col.u ? (p[col.u] as number | null) : null);
  });
}

const REPORT_DIGITS: readonly Digits[] = REPORT_COLUMNS.map((col) => parseDigits(col.decimals));

/**
 * One point's cells as CSV text in REPORT_COLUMNS order: text (the point label) through the CSV writer,
 * numbers rounded by the report rule. The command line's CSV rows (its header keeps the contract's names).
 */
export function reportCsvRow(p: PointResult): string {
  const cells = new Array<string>(REPORT_COLUMNS.length);
  for (let i = 0; i < REPORT_COLUMNS.length; i++) {
    const col = REPORT_COLUMNS[i]!;
    const v = p[col.key] as number | string | null;
    cells[i] = typeof v === 'string' ? csvCell(v) : col.count ? countNumber(v) : rounded(v, REPORT_DIGITS[i]!, col.u ? (p[col.u] as number | null) : null);
  }
  // one join makes a flat string; appending cell by cell left ropes that the collector spent most of the time on
  return cells.join(',');
}

/**
 * A CSV line of report cells: text through the CSV writer (quoted and formula-escaped as every export),
 * numbers, already rounded text of digits, sign, point and exponent, written as they are (a leading
 * minus is a number here, not a formula).
 */
function reportLine(cells: readonly { text: string; number: boolean }[]): string {
  return cells.map((cell) => (cell.number ? cell.text : csvCell(cell.text))).join(',');
}

/** Columns that carry at least one value (uncertainties and side-force terms only exist for some setups). */
export function reportColumnsWithValues(points: readonly PointResult[]): ReportColumn[] {
  return REPORT_COLUMNS.filter((col) => points.some((p) => p[col.key] !== null && p[col.key] !== undefined));
}

/**
 * The report CSV of a run's points: `# ` lines (written raw, never quoted), the header row, the units
 * row, then one row per point. Columns without any value are left out.
 */
export function reportPointsCsv(result: ReductionResult, comments: readonly string[] = []): string {
  const cols = reportColumnsWithValues(result.points);
  const idx = cols.map((col) => REPORT_COLUMNS.indexOf(col));
  const lines = comments.map(commentLine);
  lines.push(reportLine(cols.map((col) => ({ text: col.header, number: false }))));
  // units are our own constants; "-" (a ratio) is written as it is, not as a formula
  lines.push(reportLine(cols.map((col) => ({ text: col.unit, number: true }))));
  for (const p of result.points) {
    const cells = reportCells(p);
    lines.push(reportLine(idx.map((i) => ({ text: String(cells[i]), number: REPORT_COLUMNS[i]!.key !== 'point' }))));
  }
  return lines.join('\n') + '\n';
}

/** A column of a report table of any rows: trade-word header, unit, digits, and how to read it from a row. */
export interface TableColumn<R> {
  header: string;
  /** "-" for a ratio, "" for a text column. */
  unit: string;
  decimals: number | `sig:${number}`;
  value: (row: R) => number | string | null | undefined;
  /** The value's standard uncertainty (same unit); the value is then rounded to its place (GUM §7.2.6). */
  u?: (row: R) => number | null | undefined;
  count?: true;
  /** A value the user typed: written as given (shortest form), only cut to seven significant digits. */
  given?: true;
}

/** One cell of a report table: text as text, numbers rounded by the report rule ("" when absent). */
export function tableCell<R>(col: TableColumn<R>, row: R): { text: string; number: boolean } {
  const v = col.value(row);
  if (typeof v === 'string') return { text: v, number: false };
  if (col.count) return { text: countNumber(v), number: true };
  if (col.given)
    return { text: v === null || v === undefined || !Number.isFinite(v) ? '' : tidy(String(Number(v.toPrecision(MAX_SIGNIFICANT)))), number: true };
  return { text: reportNumber(v, col.decimals, col.u ? (col.u(row) ?? null) : null), number: true };
}

/**
 * A report CSV of any rows, written like the point table: raw `# ` lines, the header row, the units row,
 * one line per row, numbers rounded by the report rule and text cells quoted and formula-escaped.
 */
export function reportTableCsv<R>(columns: readonly TableColumn<R>[], rows: readonly R[], comments: readonly string[] = []): string {
  const lines = comments.map(commentLine);
  lines.push(reportLine(columns.map((col) => ({ text: col.header, number: false }))));
  lines.push(reportLine(columns.map((col) => ({ text: col.unit, number: true }))));
  for (const r of rows) lines.push(reportLine(columns.map((col) => tableCell(col, r))));
  return lines.join('\n') + '\n';
}
