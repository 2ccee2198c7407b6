/**
 * Export contents: the point table and the fit summary as CSV text and as sheet rows. The point table
 * CSV is core's report table (core/formats/reportTable.ts: trade names, a units row, numbers to the
 * digits they support); the sheets keep full precision under a number format.
 */
import { commentLine, pointTableComments, reportPointsCsv, toCsv, type Cell } from '../../../core/index.ts';
import { POINT_COLUMNS } from '../../../core/index.ts';
import type { FitResult } from '../../../core/index.ts';
import type { ReductionResult } from '../../../core/index.ts';
import { CAUTION, exportProvenanceLines, type ExportProvenance } from './provenance.ts';

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

export function fitsCsvExport(p: ExportProvenance, sources: readonly FitSource[]): string {
  const { header, rows } = fitRows(sources);
  return provenanceCsv(p) + toCsv(header, rows);
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
