/**
 * CSV writing for exports: RFC 4180 quoting, numbers written as numbers, and text cells that a
 * spreadsheet would run as a formula (leading =, +, -, @, tab or carriage return) prefixed with an
 * apostrophe (OWASP, "CSV Injection").
 */

export type Cell = string | number | boolean | null | undefined;

const FORMULA_START = /^[=+\-@\t\r]/;

/** Neutralise a text cell that a spreadsheet would evaluate. */
export function escapeFormula(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

export function csvCell(value: Cell): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (typeof value === 'boolean') return value ? 'true' : 'false';
  const text = escapeFormula(value);
  // a leading # is quoted so comment-aware readers (pandas comment='#', our own reader) keep the row
  return /[",\n\r]/.test(text) || text.startsWith('#') ? `"${text.replace(/"/g, '""')}"` : text;
}

export function csvLine(cells: readonly Cell[]): string {
  return cells.map(csvCell).join(',');
}

/** A table as CSV text, CRLF-free, one header line. */
export function toCsv(header: readonly string[], rows: readonly (readonly Cell[])[]): string {
  const out = [csvLine(header)];
  for (const r of rows) out.push(csvLine(r));
  return out.join('\n') + '\n';
}
