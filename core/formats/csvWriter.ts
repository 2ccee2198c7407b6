/**
 * CSV writing for exports: RFC 4180 quoting, numbers written as numbers, and text cells that a
 * spreadsheet would run as a formula (leading =, +, -, @, tab or carriage return) prefixed with an
 * apostrophe (OWASP, "CSV Injection"). Cells and `#` comment lines go through the same
 * `escapeFormula`, so a file or setup name cannot become a live formula in either.
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

/** Where a spreadsheet may start a new cell inside a `#` line: comma, semicolon (some locales), tab. */
const SEPARATOR = /([,;\t])/;
/** A plain JSON number (with the brackets that may close it) is data, not a formula. */
const PLAIN_NUMBER = /^-\d+(\.\d+)?([eE][+-]?\d+)?[\]}]*$/;

/**
 * A `# ` comment line for the head of a CSV file. Comment-aware readers (pandas `comment='#'`, our
 * own reader) skip it whole, but a spreadsheet splits it into cells at every separator; each piece
 * that would start a cell with a formula character (after any spaces or opening quote) gets the same
 * apostrophe as a cell. Line breaks become spaces so the comment stays one line.
 */
export function commentLine(text: string): string {
  const parts = text.replace(/[\r\n]+/g, ' ').split(SEPARATOR);
  // split with a capturing group keeps the separators at the odd indices
  for (let i = 2; i < parts.length; i += 2) {
    const piece = parts[i]!;
    const lead = /^[ "]*/.exec(piece)![0];
    const rest = piece.slice(lead.length);
    if (!PLAIN_NUMBER.test(rest)) parts[i] = lead + escapeFormula(rest);
  }
  return `# ${parts.join('')}`;
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
