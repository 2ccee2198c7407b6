/**
 * The workbook export: the fit summary, one sheet of points per run and a provenance sheet. Written with
 * write-excel-file; text is always written as text (never as a formula), numbers as numbers at full
 * precision under a number format with the report's digits, the heading rows frozen, columns wide enough
 * for their heading.
 */
import writeXlsxFile, { type Sheet, type SheetData } from 'write-excel-file/browser';
import { escapeFormula, REPORT_COLUMNS, reportColumnsWithValues, type Cell, type ReductionResult, type ReportColumn } from '../../../core/index.ts';
import { withZipTimestamps } from './zipTimestamps.ts';
import { fitRows, type FitSource } from './exportTables.ts';
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
export function numberFormat(col: ReportColumn): string {
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
