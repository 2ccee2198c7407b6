/**
 * Tab-separated text for pasting into a spreadsheet. Tabs and line breaks inside a cell become spaces;
 * text a spreadsheet would run as a formula is neutralised as in CSV exports (core/csvout.ts).
 */
import { escapeFormula } from '../../../core/index.ts';

export type TsvCell = string | number | null | undefined;

export function tsvCell(value: TsvCell): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  return escapeFormula(value.replace(/[\t\r\n]+/g, ' '));
}

export function toTsv(rows: readonly (readonly TsvCell[])[]): string {
  return rows.map((r) => r.map(tsvCell).join('\t')).join('\n') + '\n';
}
