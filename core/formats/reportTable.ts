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
}

const c = (key: keyof PointResult, header: string, unit: string, decimals: ReportColumn['decimals'], u?: keyof PointResult): ReportColumn => ({
  key,
  header,
  unit,
  decimals,
  ...(u ? { u } : {}),
});

/** The command line's point columns (POINT_COLUMNS), in the same order, with report names and units. */
export const REPORT_COLUMNS: readonly ReportColumn[] = [
  c('point', 'point', '-', 0),
  c('samples', 'samples', '-', 0),
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
  c('line', 'file line', '-', 0),
];

/** Decimal exponent of a finite non-zero number (floor(log10 |x|)), exact at powers of ten. */
function exponentOf(x: number): number {
  const e = Math.floor(Math.log10(Math.abs(x)));
  // log10 can land a hair below an exact power of ten
  return Math.abs(x) >= 10 ** (e + 1) ? e + 1 : e;
}

/** Digits after the point that put the uncertainty's second significant digit last (GUM §7.2.6). */
export function decimalsFromUncertainty(u: number): number | null {
  if (!Number.isFinite(u) || u <= 0) return null;
  return 1 - exponentOf(u);
}

/**
 * A number as text with `decimals` digits after the point, but never more than seven significant
 * digits; beyond seven integer digits it switches to exponent form. "" for null and non-finite.
 */
export function reportNumber(value: number | null | undefined, decimals: number | `sig:${number}`, u?: number | null): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '';
  if (value === 0) return '0';
  const e = exponentOf(value);
  let d: number;
  if (typeof decimals === 'string') d = Math.min(MAX_SIGNIFICANT, Number(decimals.slice(4))) - 1 - e;
  else d = decimals;
  const fromU = u === null || u === undefined ? null : decimalsFromUncertainty(u);
  if (fromU !== null) d = fromU;
  d = Math.min(d, MAX_SIGNIFICANT - 1 - e);
  if (e >= MAX_SIGNIFICANT) return tidy(value.toPrecision(Math.max(1, Math.min(MAX_SIGNIFICANT, e + 1 + d))));
  if (d >= 0) return tidy(value.toFixed(Math.min(d, 100)));
  // round to tens, hundreds…: the digits after are zeros that carry no information
  const step = 10 ** -d;
  return tidy(String(Math.round(value / step) * step));
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
    return reportNumber(v, col.decimals, col.u ? (p[col.u] as number | null) : null);
  });
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
