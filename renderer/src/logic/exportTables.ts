/**
 * Export contents: the point table and the fit summary as CSV text and as sheet rows. The point table
 * CSV is core's report table (core/formats/reportTable.ts: trade names, a units row, numbers to the
 * digits they support); the sheets keep full precision under a number format.
 */
import { commentLine, pointTableComments, reportPointsCsv, reportTableCsv, ROUNDING_NOTE, type Cell, type TableColumn } from '../../../core/index.ts';
import { POINT_COLUMNS } from '../../../core/index.ts';
import type { FitResult } from '../../../core/index.ts';
import type { ReductionResult } from '../../../core/index.ts';
import { CAUTION, exportProvenanceLines, VALUES_NOTE, type ExportProvenance } from './provenance.ts';
import { KNOT_MPS, type Projection } from '../../../core/index.ts';
import type { FullScaleRow, StallChange } from './fullScale.ts';
import { deltas, dragAtMatchedLift, fitDeltas, incomparable, type DeltaRow, type FitDelta } from './delta.ts';

/**
 * Comment lines ("# key: value"), written raw so comment-skipping readers skip them (pandas
 * `comment='#'`, papaparse `comments`); formula characters after a comma are neutralised (commentLine).
 */
export function provenanceCsv(p: ExportProvenance): string {
  return [...exportProvenanceLines(p), CAUTION].map(commentLine).join('\n') + '\n';
}

/**
 * The point table of one run: the export's own lines, then the `#` lines the command line writes above
 * the same table (run, configuration, provenance, rounding rule), then the report table (header, units
 * row, numbers rounded as the command line rounds them).
 */
export function pointsCsvExport(p: ExportProvenance, result: ReductionResult): string {
  const record = p.runs[0]?.record;
  return reportPointsCsv(result, [...exportProvenanceLines({ ...p, runs: [] }), CAUTION, ...pointTableComments(result, record)]);
}

export interface FitSource {
  name: string;
  configuration: string | null;
  file: string;
  result: ReductionResult;
  asMeasured: ReductionResult;
}

/** Fit columns; the linear range pair becomes two columns. */
export function fitHeader(fit: FitResult): string[] {
  const cols: string[] = [];
  for (const k of Object.keys(fit)) {
    if (k === 'linear_range_deg') cols.push('linear_range_from_deg', 'linear_range_to_deg');
    else cols.push(k);
  }
  return cols;
}

function fitCells(fit: FitResult): Cell[] {
  const cells: Cell[] = [];
  for (const [k, v] of Object.entries(fit)) {
    if (k === 'linear_range_deg') {
      const r = v as [number, number] | null;
      cells.push(r ? r[0] : null, r ? r[1] : null);
    } else cells.push(v as Cell);
  }
  return cells;
}

/** Rows of the fit summary: one per run and basis (corrected, then as measured when corrections were on). */
export function fitRows(sources: readonly FitSource[]): { header: string[]; rows: Cell[][] } {
  const first = sources[0]?.result.fit;
  const header = ['run', 'configuration', 'file', 'basis', ...(first ? fitHeader(first) : [])];
  const rows: Cell[][] = [];
  for (const s of sources) {
    const on = s.result.corrections.enabled;
    rows.push([s.name, s.configuration, s.file, on ? 'corrected' : 'as measured (corrections off)', ...fitCells(s.result.fit)]);
    if (on) rows.push([s.name, s.configuration, s.file, 'as measured', ...fitCells(s.asMeasured.fit)]);
  }
  return { header, rows };
}

/** One row of the fit summary CSV: a run on one basis. */
interface FitExportRow {
  source: FitSource;
  basis: string;
  fit: FitResult;
}

type FitNumberKey = { [K in keyof FitResult]: FitResult[K] extends number | null ? K : never }[keyof FitResult];
type FitTextKey = { [K in keyof FitResult]: FitResult[K] extends string | null ? K : never }[keyof FitResult];

const num = (header: string, unit: string, decimals: number | `sig:${number}`, key: FitNumberKey, uKey?: FitNumberKey): TableColumn<FitExportRow> => ({
  header,
  unit,
  decimals,
  value: (r) => r.fit[key],
  ...(uKey ? { u: (r: FitExportRow) => r.fit[uKey] } : {}),
});
const uOf = (header: string, unit: string, key: FitNumberKey): TableColumn<FitExportRow> => ({
  header: `u(${header})`,
  unit,
  decimals: 'sig:2',
  value: (r) => r.fit[key],
});
const text = (header: string, key: FitTextKey): TableColumn<FitExportRow> => ({ header, unit: '', decimals: 0, value: (r) => r.fit[key] ?? '' });
const rangeEnd = (header: string, key: 'linear_range_deg' | 'polar_range_deg' | 'hysteresis_alpha_range_deg', end: 0 | 1): TableColumn<FitExportRow> => ({
  header,
  unit: 'deg',
  decimals: 2,
  value: (r) => (r.fit[key] as readonly [number, number] | null | undefined)?.[end] ?? null,
});

/**
 * The fit summary's columns in the trade's words with their units (ASCII, like the point table's
 * `alpha`, `CL`); u(…) is the combined standard uncertainty (k = 1) and rounds its value (GUM §7.2.6).
 */
const FIT_COLUMNS: readonly TableColumn<FitExportRow>[] = [
  { header: 'run', unit: '', decimals: 0, value: (r) => r.source.name },
  { header: 'configuration', unit: '', decimals: 0, value: (r) => r.source.configuration ?? '' },
  { header: 'file', unit: '', decimals: 0, value: (r) => r.source.file },
  { header: 'basis', unit: '', decimals: 0, value: (r) => r.basis },
  num('dCL/dalpha', '1/deg', 5, 'cl_alpha_per_deg', 'cl_alpha_u_per_deg'),
  uOf('dCL/dalpha', '1/deg', 'cl_alpha_u_per_deg'),
  num('alpha0', 'deg', 2, 'alpha_zero_lift_deg', 'alpha_zero_lift_u_deg'),
  uOf('alpha0', 'deg', 'alpha_zero_lift_u_deg'),
  rangeEnd('linear range from', 'linear_range_deg', 0),
  rangeEnd('linear range to', 'linear_range_deg', 1),
  { header: 'linear range points', unit: '-', decimals: 0, count: true, value: (r) => r.fit.linear_range_points },
  text('linear range chosen by', 'linear_range_source'),
  num('linear tolerance CL', '-', 4, 'linear_tolerance_cl'),
  num('CL scatter', '-', 'sig:2', 'noise_cl'),
  num('CLmax', '-', 4, 'cl_max', 'cl_max_u'),
  uOf('CLmax', '-', 'cl_max_u'),
  num('alpha at CLmax', 'deg', 2, 'alpha_cl_max_deg', 'alpha_cl_max_u_deg'),
  uOf('alpha at CLmax', 'deg', 'alpha_cl_max_u_deg'),
  text('CLmax method', 'cl_max_method'),
  text('no CLmax because', 'cl_max_reason'),
  num('stall alpha', 'deg', 2, 'alpha_stall_deg'),
  num('CD0', '-', 5, 'cd0', 'cd0_u'),
  uOf('CD0', '-', 'cd0_u'),
  num('k', '-', 4, 'k_induced', 'k_induced_u'),
  uOf('k', '-', 'k_induced_u'),
  num('Oswald e', '-', 3, 'oswald_e', 'oswald_e_u'),
  uOf('Oswald e', '-', 'oswald_e_u'),
  text('Oswald e from', 'oswald_e_source'),
  num('CDmin', '-', 5, 'cd_min'),
  num('CL at CDmin', '-', 4, 'cl_min_drag'),
  num("k'", '-', 4, 'k_induced_cambered'),
  rangeEnd('polar range from', 'polar_range_deg', 0),
  rangeEnd('polar range to', 'polar_range_deg', 1),
  num('L/D max', '-', 2, 'ld_max', 'ld_max_u'),
  uOf('L/D max', '-', 'ld_max_u'),
  num('CL at L/D max', '-', 4, 'cl_at_ld_max'),
  num('dCm/dalpha', '1/deg', 5, 'cm_alpha_per_deg'),
  num('dCm/dCL', '-', 4, 'cm_cl_slope'),
  num('x_ac aft of ref / c', '-', 4, 'x_ac_aft_of_ref_c'),
  {
    header: 'fitted sweep branch',
    unit: '-',
    decimals: 0,
    count: true,
    value: (r) => (r.fit.branch === null || r.fit.branch === undefined ? null : r.fit.branch + 1),
  },
  {
    header: 'branch direction',
    unit: '',
    decimals: 0,
    value: (r) => (r.fit.branch_direction === 'down' ? 'alpha falling' : r.fit.branch_direction === 'up' ? 'alpha rising' : ''),
  },
  rangeEnd('hysteresis alpha from', 'hysteresis_alpha_range_deg', 0),
  rangeEnd('hysteresis alpha to', 'hysteresis_alpha_range_deg', 1),
  num('hysteresis max delta CL', '-', 4, 'hysteresis_max_delta_cl'),
  num('alpha at max delta CL', 'deg', 2, 'hysteresis_alpha_at_max_deg'),
  { header: 'weighted fit', unit: '', decimals: 0, value: (r) => (r.fit.weighted ? 'yes' : 'no') },
];

/**
 * The fit summary as a report CSV, written like the point table (raw `#` lines, trade-word header, units
 * row, numbers to the digits their uncertainty supports, never past seven significant digits): one row per
 * run and basis, corrected first, then as measured when corrections were on.
 */
export function fitsCsvExport(p: ExportProvenance, sources: readonly FitSource[]): string {
  const rows: FitExportRow[] = [];
  for (const s of sources) {
    const on = s.result.corrections.enabled;
    rows.push({ source: s, basis: on ? 'corrected' : 'as measured (corrections off)', fit: s.result.fit });
    if (on) rows.push({ source: s, basis: 'as measured', fit: s.asMeasured.fit });
  }
  const note = 'u(...): combined standard uncertainty (k = 1), random and systematic parts; the value is rounded to its place';
  return reportTableCsv(FIT_COLUMNS, rows, [...exportProvenanceLines(p), CAUTION, note, ROUNDING_NOTE]);
}

/** Point table rows for a sheet: header then one row per point, nulls as empty cells. */
export function pointRows(result: ReductionResult): { header: string[]; rows: Cell[][] } {
  return {
    header: [...POINT_COLUMNS] as string[],
    rows: result.points.map((pt) => POINT_COLUMNS.map((k) => pt[k] as Cell)),
  };
}

/** A file name part from a run name: letters, digits, dot, dash and underscore only. */
export function safeName(text: string): string {
  return text.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'run';
}

/**
 * A file name part from a campaign or run name, whole words only: a name longer than `max` characters
 * is cut at the last separator before it, never inside a word.
 */
export function fileStem(text: string, max = 80): string {
  const name = safeName(text);
  if (name.length <= max) return name;
  const cut = name.slice(0, max + 1).search(/[-_.][^-_.]*$/);
  return cut > 0 ? name.slice(0, cut) : name.slice(0, max);
}

// --- differences against the baseline ------------------------------------------------------------

/** A run as an export names it: its label in the window, file, configuration and result on the basis shown. */
export interface ExportRun {
  file: string;
  /** The run's name (its `# run:` value or file stem). */
  name: string;
  /** As the window labels it (name · configuration). */
  label: string;
  configuration: string | null;
  result: ReductionResult;
}

/** One line of the differences table: at a run angle (matched α) or at a run CL (ΔCD at constant lift). */
export interface DeltaExportRow {
  run: string;
  configuration: string | null;
  matchedAt: 'alpha' | 'CL';
  alpha: number | null;
  cl: number | null;
  dCl: number | null;
  uDCl: number | null;
  dCd: number | null;
  uDCd: number | null;
  dCm: number | null;
  uDCm: number | null;
}

export interface DeltaExport {
  baseline: ExportRun;
  basis: 'corrected' | 'measured';
  /** Runs compared, in the order of the view. */
  runs: ExportRun[];
  /** Runs not compared (a 2D section against a 3D model), each with the view's reason. */
  refused: { run: ExportRun; reason: string }[];
  rows: DeltaExportRow[];
  /** The fitted characteristics against the baseline's, per compared run. */
  fits: { run: ExportRun; fits: FitDelta[] }[];
}

/**
 * What the Against baseline view shows, as rows: for each compared run, ΔCL, ΔCD, ΔCm at each of its
 * angles inside the baseline's α range, then ΔCD at each CL of its attached-flow branch inside the
 * baseline's (logic/delta.ts does the differencing; nothing is computed here beyond laying it out).
 */
export function deltaExport(baseline: ExportRun, compared: readonly ExportRun[], basis: 'corrected' | 'measured'): DeltaExport {
  const refused: DeltaExport['refused'] = [];
  const runs: ExportRun[] = [];
  for (const run of compared) {
    const reason = incomparable(run.result, baseline.result, run.label, baseline.label);
    if (reason) refused.push({ run, reason });
    else runs.push(run);
  }
  const rows: DeltaExportRow[] = [];
  const base = baseline.result.points;
  for (const run of runs) {
    const [cl, cd, cm] = (['cl', 'cd', 'cm'] as const).map((k) => deltas(run.result.points, base, k));
    const at = (list: DeltaRow[], alpha: number) => list.find((d) => d.alpha === alpha);
    for (const d of cl!) {
      const dd = at(cd!, d.alpha);
      const dm = at(cm!, d.alpha);
      rows.push({
        run: run.name,
        configuration: run.configuration,
        matchedAt: 'alpha',
        alpha: d.alpha,
        cl: d.value,
        dCl: d.delta,
        uDCl: d.u,
        dCd: dd?.delta ?? null,
        uDCd: dd?.u ?? null,
        dCm: dm?.delta ?? null,
        uDCm: dm?.u ?? null,
      });
    }
    for (const d of dragAtMatchedLift(run.result.points, base)) {
      rows.push({
        run: run.name,
        configuration: run.configuration,
        matchedAt: 'CL',
        alpha: null,
        cl: d.cl,
        dCl: null,
        uDCl: null,
        dCd: d.delta,
        uDCd: d.u,
        dCm: null,
        uDCm: null,
      });
    }
  }
  const fits = runs.map((run) => ({ run, fits: fitDeltas(run.result, baseline.result) }));
  return { baseline, basis, runs, refused, rows, fits };
}

const DELTA_COLUMNS: readonly TableColumn<DeltaExportRow>[] = [
  { header: 'run', unit: '', decimals: 0, value: (r) => r.run },
  { header: 'configuration', unit: '', decimals: 0, value: (r) => r.configuration ?? '' },
  { header: 'matched at', unit: '', decimals: 0, value: (r) => r.matchedAt },
  { header: 'alpha', unit: 'deg', decimals: 3, value: (r) => r.alpha },
  { header: 'CL', unit: '-', decimals: 4, value: (r) => r.cl },
  { header: 'delta CL', unit: '-', decimals: 4, value: (r) => r.dCl, u: (r) => r.uDCl },
  { header: 'u(delta CL)', unit: '-', decimals: 'sig:2', value: (r) => r.uDCl },
  { header: 'delta CD', unit: '-', decimals: 5, value: (r) => r.dCd, u: (r) => r.uDCd },
  { header: 'u(delta CD)', unit: '-', decimals: 'sig:2', value: (r) => r.uDCd },
  { header: 'delta Cm', unit: '-', decimals: 4, value: (r) => r.dCm, u: (r) => r.uDCm },
  { header: 'u(delta Cm)', unit: '-', decimals: 'sig:2', value: (r) => r.uDCm },
];

/** The difference columns, the u(Δ) ones only when some difference has an uncertainty (as in the view). */
export function deltaColumns(rows: readonly DeltaExportRow[]): TableColumn<DeltaExportRow>[] {
  const anyU = rows.some((r) => r.uDCl !== null || r.uDCd !== null || r.uDCm !== null);
  return DELTA_COLUMNS.filter((c) => anyU || !c.header.startsWith('u('));
}

export function basisText(basis: 'corrected' | 'measured'): string {
  return basis === 'corrected' ? 'free-air corrected (wall corrections applied)' : 'as measured in the tunnel (no wall corrections)';
}

const runName = (r: ExportRun) => `${r.label} (${r.file})`;

/** What the differences table is, before its provenance: baseline, runs, basis, method, runs not compared. */
export function deltaDescription(d: DeltaExport): string[] {
  const lines = [
    'table: differences against the baseline run, delta = run - baseline',
    `baseline: ${runName(d.baseline)}`,
    `runs compared: ${d.runs.length ? d.runs.map(runName).join('; ') : 'none'}`,
    `basis: ${basisText(d.basis)}`,
    "matched at alpha: at each run angle inside the baseline's alpha range, the baseline interpolated linearly in alpha; no extrapolation",
    "matched at CL: delta CD at constant lift, each run's attached-flow drag polar (up to its highest CL) against the baseline's at the same CL, interpolated linearly in CL; no extrapolation",
  ];
  if (d.rows.some((r) => r.uDCl !== null || r.uDCd !== null || r.uDCm !== null))
    lines.push(
      "u(delta) = sqrt(u_run^2 + u_baseline^2), standard uncertainty (k = 1), the two runs taken as independent, the baseline's u interpolated like its value",
    );
  for (const r of d.refused) lines.push(`not compared: ${r.run.file}: ${r.reason}`);
  lines.push(ROUNDING_NOTE);
  return lines;
}

/**
 * The provenance lines of a table that is not a point table: the note on `*_uncorrected` names is about
 * the point table's columns, and these tables state their basis themselves.
 */
export function tableProvenanceLines(p: ExportProvenance): string[] {
  return exportProvenanceLines(p).filter((l) => l !== VALUES_NOTE);
}

/** The differences as a report CSV: what it is, the provenance, then the table (header, units row, rounded numbers). */
export function deltaCsvExport(p: ExportProvenance, d: DeltaExport): string {
  return reportTableCsv(deltaColumns(d.rows), d.rows, [...deltaDescription(d), ...tableProvenanceLines(p), CAUTION]);
}

// --- the full-scale estimate ------------------------------------------------------------------------

/** One run of the full-scale table with what the view shows for it. */
export interface FullScaleExportRow {
  run: Omit<ExportRun, 'result'> & { result: ReductionResult | null };
  isBaseline: boolean;
  /** Core's projection for this run (null when it has no CLmax to project, with `row.reason`). */
  row: FullScaleRow;
  change: StallChange | null;
}

export interface FullScaleExport {
  /** The air and aircraft at the chosen condition (core's projection with CLmax 1 standing in). */
  air: Projection;
  rows: FullScaleExportRow[];
  baseline: string | null;
}

/** How the fit found CLmax (core/fits/clMax.ts), in words. */
const CL_MAX_METHOD: Record<string, string> = {
  parabola: 'parabola through the highest points',
  'measured peak': 'highest measured point',
  'smoothed peak': 'peak of the smoothed curve',
};

/** Where a run's CLmax came from, in words: the run, its basis, the sweep branch and the method. */
export function clMaxSource(name: string, result: ReductionResult | null): string {
  if (!result) return '';
  const f = result.fit;
  if (f.cl_max === null) return '';
  const basis = result.corrections.enabled ? 'free-air corrected' : 'as measured (wall corrections off in its setup)';
  const branch = f.branch_direction
    ? `${f.branch_direction === 'up' ? 'rising' : 'falling'} sweep branch${f.branch !== null ? ` ${f.branch + 1}` : ''}`
    : 'the sweep';
  const method = CL_MAX_METHOD[f.cl_max_method ?? ''] ?? f.cl_max_method ?? 'highest point';
  return `fit of run ${name}, ${basis}, ${branch}, ${method}`;
}

type FsRow = FullScaleExportRow & { air: Projection };
const p = (r: FsRow) => r.row.projection;
const kt = (v: number | null | undefined) => (v === null || v === undefined ? null : v / KNOT_MPS);

const FULL_SCALE_COLUMNS: readonly TableColumn<FsRow>[] = [
  { header: 'run', unit: '', decimals: 0, value: (r) => r.run.name },
  { header: 'configuration', unit: '', decimals: 0, value: (r) => r.run.configuration ?? '' },
  { header: 'run file', unit: '', decimals: 0, value: (r) => r.run.file },
  { header: 'baseline', unit: '', decimals: 0, value: (r) => (r.isBaseline ? 'yes' : '') },
  { header: 'mass', unit: 'kg', decimals: 0, given: true, value: (r) => r.air.mass_kg },
  { header: 'wing area', unit: 'm^2', decimals: 0, given: true, value: (r) => r.air.wing_area_m2 },
  { header: 'pressure altitude', unit: 'm', decimals: 0, given: true, value: (r) => r.air.pressure_altitude_m },
  { header: 'static pressure', unit: 'Pa', decimals: 0, value: (r) => r.air.pressure_pa },
  { header: 'outside air temperature', unit: 'degC', decimals: 1, value: (r) => r.air.temperature_c },
  { header: 'ISA deviation', unit: 'K', decimals: 1, value: (r) => r.air.isa_deviation_c },
  { header: 'relative humidity', unit: '%', decimals: 0, given: true, value: (r) => r.air.rh_pct },
  { header: 'air density', unit: 'kg/m^3', decimals: 4, value: (r) => r.air.rho_kgm3 },
  { header: 'density altitude', unit: 'm', decimals: 0, value: (r) => r.air.density_altitude_m },
  { header: 'wing loading', unit: 'Pa', decimals: 1, value: (r) => r.air.wing_loading_pa },
  { header: 'CLmax', unit: '-', decimals: 4, value: (r) => r.row.clMax, u: (r) => r.run.result?.fit.cl_max_u ?? null },
  { header: 'u(CLmax)', unit: '-', decimals: 'sig:2', value: (r) => (r.row.clMax === null ? null : (r.run.result?.fit.cl_max_u ?? null)) },
  { header: 'CLmax from', unit: '', decimals: 0, value: (r) => (r.row.clMax === null ? '' : clMaxSource(r.run.name, r.run.result)) },
  { header: 'model Re at CLmax', unit: '-', decimals: 'sig:3', value: (r) => r.row.reynolds },
  { header: 'V_s', unit: 'm/s', decimals: 1, value: (r) => p(r)?.v_stall_mps },
  { header: 'V_s knots', unit: 'kt', decimals: 1, value: (r) => p(r)?.v_stall_kt },
  { header: 'V_s EAS', unit: 'm/s', decimals: 1, value: (r) => p(r)?.v_stall_eas_mps },
  { header: 'V_s EAS knots', unit: 'kt', decimals: 1, value: (r) => kt(p(r)?.v_stall_eas_mps) },
  { header: 'lift-off factor', unit: '-', decimals: 0, given: true, value: (r) => r.air.lift_off_factor },
  { header: 'V_lift-off', unit: 'm/s', decimals: 1, value: (r) => p(r)?.v_lift_off_mps },
  { header: 'V_lift-off knots', unit: 'kt', decimals: 1, value: (r) => p(r)?.v_lift_off_kt },
  { header: 'delta CLmax', unit: '-', decimals: 4, value: (r) => r.change?.deltaClMax },
  { header: 'delta V_s', unit: 'm/s', decimals: 1, value: (r) => r.change?.deltaMps },
  { header: 'delta V_s knots', unit: 'kt', decimals: 1, value: (r) => kt(r.change?.deltaMps) },
  { header: 'delta V_s percent', unit: '%', decimals: 1, value: (r) => r.change?.deltaPct },
  { header: 'note', unit: '', decimals: 0, value: (r) => r.row.reason ?? r.row.note ?? '' },
];

export function fullScaleColumns(rows: readonly FsRow[]): TableColumn<FsRow>[] {
  const anyU = rows.some((r) => r.row.clMax !== null && typeof r.run.result?.fit.cl_max_u === 'number');
  const anyChange = rows.some((r) => r.change !== null);
  return FULL_SCALE_COLUMNS.filter((c) => (anyU || c.header !== 'u(CLmax)') && (anyChange || !c.header.startsWith('delta ')));
}

export function fullScaleRows(x: FullScaleExport): FsRow[] {
  return x.rows.map((r) => ({ ...r, air: x.air }));
}

export const FULL_SCALE_HEAD = 'ENGINEERING ESTIMATE FROM MODEL TESTS - NOT FOR OPERATIONAL USE';

/** The cautions that travel with the numbers: first in the file, before anything else. */
export function fullScaleCautions(x: FullScaleExport): string[] {
  return [`caution: ${FULL_SCALE_HEAD}`, ...x.air.cautions.map((c) => `caution: ${c}`)];
}

/** What the full-scale table is and how it was worked out. */
export function fullScaleDescription(x: FullScaleExport): string[] {
  const base = x.rows.find((r) => r.isBaseline);
  return [
    "table: full-scale stall and lift-off speeds from each run's free-air corrected CLmax",
    'V_s = sqrt(2 m g0 / (rho S CLmax)), the lift equation at CLmax; rho of moist air (CIPM-2007) at the ISO 2533 standard-atmosphere pressure of the pressure altitude and the outside air temperature; density altitude: the standard-atmosphere altitude of that density; EAS = V_s sqrt(rho / 1.225 kg/m^3); lift-off speed = factor x V_s',
    base ? `baseline: ${base.run.label} (${base.run.file}); delta = run - baseline at the same mass, wing area and day` : 'baseline: none chosen',
    ROUNDING_NOTE,
  ];
}

/** The full-scale table as a report CSV: the cautions first, then what it is, the provenance, the table. */
export function fullScaleCsvExport(prov: ExportProvenance, x: FullScaleExport): string {
  const rows = fullScaleRows(x);
  return reportTableCsv(fullScaleColumns(rows), rows, [...fullScaleCautions(x), ...fullScaleDescription(x), ...tableProvenanceLines(prov), CAUTION]);
}
