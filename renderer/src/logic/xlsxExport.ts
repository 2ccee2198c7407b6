/**
 * The workbook export: the fit summary, one sheet of points per run and a provenance sheet. Written with
 * write-excel-file; text is always written as text (never as a formula), numbers as numbers at full
 * precision under a number format with the report's digits, the heading rows frozen, columns wide enough
 * for their heading.
 */
import writeXlsxFile, { type Sheet, type SheetData } from 'write-excel-file/browser';
import {
  escapeFormula,
  REPORT_COLUMNS,
  reportColumnsWithValues,
  type Cell,
  type ReductionResult,
  type ReportColumn,
  type TableColumn,
} from '../../../core/index.ts';
import { withZipTimestamps } from './zipTimestamps.ts';
import {
  deltaColumns,
  deltaDescription,
  fitRows,
  fullScaleCautions,
  fullScaleColumns,
  fullScaleDescription,
  fullScaleRows,
  tableProvenanceLines,
  type DeltaExport,
  type FitSource,
  type FullScaleExport,
} from './exportTables.ts';
import { CAUTION, exportProvenanceLines, type ExportProvenance } from './provenance.ts';

/** Text cells a spreadsheet might treat as a formula are escaped as in the CSV export (OWASP, "CSV Injection"); numbers stay numbers. */
function cellValue(c: Cell): Cell | null {
  if (c === undefined || (typeof c === 'number' && !Number.isFinite(c))) return null;
  return typeof c === 'string' ? escapeFormula(c) : c;
}

function sheetRows(header: string[], rows: Cell[][]): SheetData {
  const bold = header.map((h) => ({ value: escapeFormula(h), fontWeight: 'bold' as const }));
  return [bold, ...rows.map((r) => r.map(cellValue))];
}

/** Sheet names: at most 31 characters, none of : \ / ? * [ ], unique. */
export function sheetName(text: string, used: Set<string>): string {
  const base = text.replace(/[:\\/?*[\]]/g, '-').slice(0, 28) || 'Sheet';
  let name = base;
  for (let i = 2; used.has(name.toLowerCase()); i++) name = `${base.slice(0, 27)}~${i}`;
  used.add(name.toLowerCase());
  return name;
}

/** Excel number format of a report column: its fixed decimals, or significant digits in exponent form. */
export function numberFormat<C extends Pick<ReportColumn, 'decimals'>>(col: C): string {
  if (typeof col.decimals === 'string') {
    const sig = Number(col.decimals.slice(4));
    return sig <= 1 ? '0E+00' : `0.${'0'.repeat(sig - 1)}E+00`;
  }
  return col.decimals <= 0 ? '0' : `0.${'0'.repeat(col.decimals)}`;
}

/** One run's points: trade names, units row, numbers under their column's format; both heading rows frozen. */
export function pointSheet(name: string, result: ReductionResult): Omit<Sheet<Blob>, 'sheet'> & { data: SheetData } {
  const cols = reportColumnsWithValues(result.points);
  const data: SheetData = [
    cols.map((c) => ({ value: c.header, fontWeight: 'bold' as const })),
    cols.map((c) => ({ value: c.unit, fontStyle: 'italic' as const })),
    ...result.points.map((pt) =>
      cols.map((c) => {
        const v = pt[c.key] as number | string | null;
        if (typeof v === 'string') return { value: escapeFormula(v) };
        if (v === null || v === undefined || !Number.isFinite(v)) return null;
        return { value: v, format: numberFormat(c) };
      }),
    ),
  ];
  return {
    data,
    columns: cols.map((c) => ({ width: Math.max(9, c.header.length + 2) })),
    stickyRowsCount: 2,
    stickyColumnsCount: REPORT_COLUMNS[0]!.key === 'point' ? 1 : 0,
  };
}

export function workbookSheets(p: ExportProvenance, sources: readonly FitSource[]): Sheet<Blob>[] {
  const used = new Set<string>();
  const sheets: Sheet<Blob>[] = [];
  const fits = fitRows(sources);
  sheets.push({
    sheet: sheetName('Fit summary', used),
    data: sheetRows(fits.header, fits.rows),
    columns: fits.header.map((h) => ({ width: Math.max(11, h.length + 2) })),
    stickyRowsCount: 1,
  });
  for (const s of sources) sheets.push({ sheet: sheetName(`Points ${s.name}`, used), ...pointSheet(s.name, s.result) });
  const prov = [...exportProvenanceLines(p), CAUTION].map((l) => [l]);
  sheets.push({ sheet: sheetName('Provenance', used), data: sheetRows(['provenance'], prov), columns: [{ width: 120 }] });
  return sheets;
}

/** The workbook's bytes; its ZIP entries are stamped with the export time, so the same content gives the same bytes. */
export async function workbookBytes(p: ExportProvenance, sources: readonly FitSource[]): Promise<Uint8Array> {
  const blob = await writeXlsxFile(workbookSheets(p, sources)).toBlob();
  const when = new Date(p.exportedAt);
  const bytes = new Uint8Array(await blob.arrayBuffer());
  return Number.isFinite(when.getTime()) ? withZipTimestamps(bytes, when) : bytes;
}

type SheetSpec = Omit<Sheet<Blob>, 'sheet'> & { data: SheetData };

/**
 * A report table as a sheet: any lines above it (the full-scale cautions), then the trade-word header
 * and the units row, then the rows; numbers at full precision under their column's format (typed
 * inputs and counts in the general format), text escaped. The heading rows are frozen when nothing
 * stands above them.
 */
export function tableSheet<R>(columns: readonly TableColumn<R>[], rows: readonly R[], above: readonly string[] = []): SheetSpec {
  const data: SheetData = [
    ...above.map((line) => [{ value: escapeFormula(line), fontWeight: 'bold' as const }]),
    ...(above.length ? [[null]] : []),
    columns.map((c) => ({ value: c.header, fontWeight: 'bold' as const })),
    columns.map((c) => ({ value: c.unit, fontStyle: 'italic' as const })),
    ...rows.map((r) =>
      columns.map((c) => {
        const v = c.value(r);
        if (typeof v === 'string') return v === '' ? null : { value: escapeFormula(v) };
        if (v === null || v === undefined || !Number.isFinite(v)) return null;
        return c.given || c.count ? { value: v } : { value: v, format: numberFormat(c) };
      }),
    ),
  ];
  return {
    data,
    columns: columns.map((c) => ({ width: Math.max(9, c.header.length + 2) })),
    ...(above.length ? {} : { stickyRowsCount: 2 }),
  };
}

function linesSheet(lines: readonly string[]): SheetSpec {
  return {
    data: sheetRows(
      ['notes and provenance'],
      lines.map((l) => [l]),
    ),
    columns: [{ width: 120 }],
  };
}

async function bytesOf(sheets: Sheet<Blob>[], exportedAt: string): Promise<Uint8Array> {
  const blob = await writeXlsxFile(sheets).toBlob();
  const when = new Date(exportedAt);
  const bytes = new Uint8Array(await blob.arrayBuffer());
  return Number.isFinite(when.getTime()) ? withZipTimestamps(bytes, when) : bytes;
}

/** The differences against the baseline: the table as the CSV has it, the fitted characteristics, and the notes with provenance. */
export function deltaSheets(p: ExportProvenance, d: DeltaExport): Sheet<Blob>[] {
  const used = new Set<string>();
  const fitHeader = ['characteristic', 'unit', 'baseline', ...d.fits.flatMap((f) => [`delta ${f.run.name}`, `u(delta) ${f.run.name}`])];
  const specs = d.fits[0]?.fits ?? [];
  const fitData: Cell[][] = specs.map((spec, i) => [
    spec.label,
    spec.unit === '–' ? '-' : spec.unit,
    spec.baseline,
    ...d.fits.flatMap((f) => [f.fits[i]!.delta, f.fits[i]!.u]),
  ]);
  return [
    { sheet: sheetName('Differences', used), ...tableSheet(deltaColumns(d.rows), d.rows) },
    {
      sheet: sheetName('Fitted characteristics', used),
      data: sheetRows(fitHeader, fitData),
      columns: fitHeader.map((h) => ({ width: Math.max(12, h.length + 2) })),
      stickyRowsCount: 1,
    },
    { sheet: sheetName('Notes', used), ...linesSheet([...deltaDescription(d), ...tableProvenanceLines(p), CAUTION]) },
  ];
}

export function deltaWorkbookBytes(p: ExportProvenance, d: DeltaExport): Promise<Uint8Array> {
  return bytesOf(deltaSheets(p, d), p.exportedAt);
}

/** The full-scale table with its cautions above it on the same sheet, and the notes with provenance. */
export function fullScaleSheets(p: ExportProvenance, x: FullScaleExport): Sheet<Blob>[] {
  const used = new Set<string>();
  const rows = fullScaleRows(x);
  return [
    { sheet: sheetName('Full-scale estimate', used), ...tableSheet(fullScaleColumns(rows), rows, fullScaleCautions(x)) },
    { sheet: sheetName('Notes', used), ...linesSheet([...fullScaleCautions(x), ...fullScaleDescription(x), ...tableProvenanceLines(p), CAUTION]) },
  ];
}

export function fullScaleWorkbookBytes(p: ExportProvenance, x: FullScaleExport): Promise<Uint8Array> {
  return bytesOf(fullScaleSheets(p, x), p.exportedAt);
}
