/**
 * The workbook export: a provenance sheet, the fit summary, and one sheet of points per run. Written
 * with write-excel-file; text is always written as text (never as a formula), numbers as numbers.
 */
import writeXlsxFile, { type Sheet, type SheetData } from 'write-excel-file/browser';
import { escapeFormula, type Cell } from '../../../core/index.ts';
import { withZipTimestamps } from './zipTimestamps.ts';
import { fitRows, pointRows, type FitSource } from './exportTables.ts';
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

export function workbookSheets(p: ExportProvenance, sources: readonly FitSource[]): Sheet<Blob>[] {
  const used = new Set<string>();
  const sheets: Sheet<Blob>[] = [];
  const fits = fitRows(sources);
  sheets.push({ sheet: sheetName('Fit summary', used), data: sheetRows(fits.header, fits.rows) });
  for (const s of sources) {
    const pts = pointRows(s.result);
    sheets.push({ sheet: sheetName(`Points ${s.name}`, used), data: sheetRows(pts.header, pts.rows) });
  }
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
