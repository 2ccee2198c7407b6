/**
 * Spreadsheet run files: the first sheet's rows, as a spreadsheet library gives them, become CSV
 * text that the run-file reader takes by the same rules as any other file. One sheet row is one
 * line, so a message's line number is the sheet's row number. Numbers should be passed as the text
 * the workbook stores (so no digit is lost or added); numbers given as numbers are written in their
 * shortest round-trip form.
 */
import Papa from 'papaparse';

export type SheetCell = string | number | boolean | Date | null | undefined;

/** Rows of a sheet as CSV text (comma-delimited, quoted where needed, line breaks inside a cell turned into spaces). */
export function sheetRowsToCsv(rows: readonly (readonly SheetCell[])[]): string {
  const text = rows.map((row) =>
    row.map((c) => {
      if (c === null || c === undefined) return '';
      if (c instanceof Date) return c.toISOString();
      return String(c).replace(/[\r\n]+/g, ' ');
    }),
  );
  // a leading "#" cell is a metadata line of the contract: written bare, not quoted, so it reads as one
  return (
    text
      .map((cells) => {
        const first = cells[0] ?? '';
        if (first.startsWith('#') && cells.slice(1).every((c) => c === '')) return first;
        return Papa.unparse([cells], { newline: '\n' });
      })
      .join('\n') + '\n'
  );
}

/** True when a file name is a spreadsheet workbook this reader opens (.xlsx). */
export function isWorkbookName(name: string): boolean {
  return /\.xlsx$/i.test(name);
}
