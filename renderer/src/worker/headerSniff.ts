/**
 * Finds a run file's header line in the first text of the file, following the reader's own rules
 * (byte-order mark, blank lines and `#` metadata lines before it; docs/data-format.md §2), so the worker can pick
 * a remembered column mapping by header signature before the reader sees the header.
 */
import Papa from 'papaparse';
import { headerSignature } from '../../../core/index.ts';
import { detectDelimiter, lookupUnit, splitHeaderCell } from '../../../core/index.ts';
import type { HeaderInfo } from './protocol.ts';

const PREVIEW_ROWS = 5;

/** "-" and "/" in a units row mean dimensionless (a ratio). */
const DIMENSIONLESS = new Set(['-', '/', '–']);

/** A unit in parentheses at the end of a header cell ("AoA (deg)" → "deg"), when it is a unit at all. */
export function parenthesisedUnit(cell: string): string | null {
  const m = /\(([^()]*)\)\s*$/.exec(cell);
  if (!m) return null;
  const unit = m[1]!.trim();
  return lookupUnit(unit) || DIMENSIONLESS.has(unit) ? unit : null;
}

/** Whether a row is a units row: no numbers, every cell a unit, "-", "/" or empty, at least one unit. */
export function isUnitsRow(cells: readonly string[]): boolean {
  let units = 0;
  for (const raw of cells) {
    const c = raw.trim();
    if (c === '' || DIMENSIONLESS.has(c)) continue;
    if (Number.isFinite(Number(c)) || !lookupUnit(c.replace(/^[[(]|[\])]$/g, ''))) return false;
    units++;
  }
  return units > 0;
}

/** Header and preview from text that starts at the beginning of the file; null until the header line is complete. */
export function sniffHeader(text: string): HeaderInfo | null {
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const lines = text.split(/\r\n|\n|\r/);
  // the last piece may be an incomplete line
  const complete = lines.length - 1;
  for (let i = 0; i < complete; i++) {
    const trimmed = lines[i]!.trim();
    if (trimmed === '' || trimmed.startsWith('#')) continue;
    const raw = lines[i]!;
    const delimiter = detectDelimiter(raw);
    const parsed = Papa.parse<string[]>(raw, { delimiter, newline: '\n' });
    const cells: HeaderInfo['cells'] = (parsed.data[0] ?? []).map((c) => {
      const { name, unit } = splitHeaderCell(c.trim());
      if (unit !== undefined) return { name, unit, unitFrom: c.trim().endsWith(')') ? ('parentheses' as const) : ('brackets' as const) };
      const inParens = parenthesisedUnit(name);
      return inParens ? { name, unit: inParens, unitFrom: 'parentheses' as const } : { name, unit: null };
    });
    const preview: string[][] = [];
    let unitsRow: number | undefined;
    for (let j = i + 1; j < complete && preview.length < PREVIEW_ROWS; j++) {
      const t = lines[j]!.trim();
      if (t === '' || t.startsWith('#')) continue;
      const row = (Papa.parse<string[]>(lines[j]!, { delimiter, newline: '\n' }).data[0] ?? []).map((c) => c.trim());
      if (unitsRow === undefined && preview.length === 0 && isUnitsRow(row)) {
        unitsRow = j + 1;
        row.forEach((u, k) => {
          const cell = cells[k];
          const unit = u.replace(/^[[(]|[\])]$/g, '');
          if (cell && !cell.unit && unit !== '') {
            cell.unit = unit;
            cell.unitFrom = 'units row';
          }
        });
        continue;
      }
      preview.push(row);
    }
    return { line: i + 1, text: raw, signature: headerSignature(raw), delimiter, cells, preview, ...(unitsRow ? { unitsRow } : {}) };
  }
  return null;
}
