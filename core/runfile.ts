/**
 * Streaming reader for run files (data contract v1, DESIGN §3.1).
 *
 * Text arrives in chunks of any size (`push`), complete lines are handed to papaparse block by
 * block, and each row is folded straight into its point's running statistics, so memory grows with
 * the number of points, never with the number of samples. Values are converted to SI as they are read.
 */
import Papa from 'papaparse';
import { CHANNELS, POINT_COLUMN, defaultConversion, isChannel, type Channel } from './channels.ts';
import { InputError, type Notice } from './messages.ts';
import { PointAccumulator, type PointStats } from './points.ts';
import { lookupUnit, unitsOf, type UnitConversion } from './units.ts';

export interface ColumnInfo {
  /** Name as written in the header (without the unit). */
  header: string;
  channel: Channel | typeof POINT_COLUMN;
  /** 1-based column number in the file. */
  column: number;
  unit: string;
}

export interface RunData {
  file: string;
  metadata: Record<string, string>;
  columns: ColumnInfo[];
  channels: Channel[];
  points: PointStats[];
  warnings: Notice[];
  rowsRead: number;
  rowsSkipped: number;
  delimiter: string;
  decimalComma: boolean;
  hasPointColumn: boolean;
  /** Physical line of the header. */
  headerLine: number;
}

export interface ReaderLimits {
  /** Longest line accepted, in characters. */
  maxLineChars: number;
  maxColumns: number;
  maxPoints: number;
  /** Skipped rows named one by one in warnings; the rest are counted. */
  maxRowWarnings: number;
}

export const DEFAULT_LIMITS: ReaderLimits = {
  maxLineChars: 1_000_000,
  maxColumns: 1000,
  maxPoints: 1_000_000,
  maxRowWarnings: 50,
};

const DELIMITERS = [',', ';', '\t'] as const;

/** A column assignment given by the user for a file whose header does not follow the contract. */
export interface ColumnMapping {
  /** Header text (without unit, case-insensitive) → contract channel or "point" or "ignore". */
  names?: Record<string, string>;
  /** Contract channel → unit to use instead of the header's. */
  units?: Record<string, string>;
}

interface BoundColumn {
  index: number; // 0-based
  slot: number; // index into the accumulator's channel array
  conv: UnitConversion;
  channel: Channel;
}

type Phase = 'preamble' | 'data';

export class RunFileReader {
  readonly file: string;
  private readonly limits: ReaderLimits;
  private readonly mapping: ColumnMapping;
  private phase: Phase = 'preamble';
  private carry = '';
  private line = 0; // physical lines consumed so far
  private started = false;
  private metadata: Record<string, string> = {};
  private columns: ColumnInfo[] = [];
  private bound: BoundColumn[] = [];
  private channels: Channel[] = [];
  private pointIndex = -1;
  private headerWidth = 0;
  private headerLine = 0;
  private delimiter = ',';
  private decimalComma = false;
  private acc: PointAccumulator | undefined;
  private warnings: Notice[] = [];
  private skipped = 0;
  private read = 0;
  private values: Float64Array = new Float64Array(0);

  constructor(file: string, options: { limits?: Partial<ReaderLimits>; mapping?: ColumnMapping } = {}) {
    this.file = file;
    this.limits = { ...DEFAULT_LIMITS, ...options.limits };
    this.mapping = options.mapping ?? {};
  }

  /** Feed the next piece of the file's text. */
  push(chunk: string): void {
    if (!this.started) {
      this.started = true;
      if (chunk.charCodeAt(0) === 0xfeff) chunk = chunk.slice(1);
      this.rejectBinary(chunk);
    }
    let text = this.carry + chunk;
    const lastNl = lastLineBreak(text);
    if (lastNl < 0) {
      this.carry = text;
      if (text.length > this.limits.maxLineChars) this.tooLong();
      return;
    }
    this.carry = text.slice(lastNl + 1);
    text = text.slice(0, lastNl + 1);
    if (this.carry.length > this.limits.maxLineChars) this.tooLong();
    this.consume(text);
  }

  /** End of file: read what is left and return the points. Throws InputError on a file that cannot be reduced. */
  finish(): RunData {
    if (!this.started) this.fail({ message: 'the file is empty' });
    if (this.carry.length > 0) {
      const rest = this.carry;
      this.carry = '';
      this.consume(rest + '\n');
    }
    if (this.phase === 'preamble') this.fail({ message: 'no header line found (the file is empty or holds only comments)' });
    const acc = this.accumulator();
    const points = acc.result();
    if (this.skipped > this.limits.maxRowWarnings) {
      this.warnings.push({
        file: this.file,
        message: `${this.skipped - this.limits.maxRowWarnings} more rows skipped (only the first ${this.limits.maxRowWarnings} are listed)`,
      });
    }
    if (points.length === 0) this.fail({ line: this.headerLine, message: 'no data rows could be read after the header' });
    return {
      file: this.file,
      metadata: this.metadata,
      columns: this.columns,
      channels: this.channels,
      points,
      warnings: this.warnings,
      rowsRead: this.read,
      rowsSkipped: this.skipped,
      delimiter: this.delimiter,
      decimalComma: this.decimalComma,
      hasPointColumn: this.pointIndex >= 0,
      headerLine: this.headerLine,
    };
  }

  private fail(n: Omit<Notice, 'file'>): never {
    throw new InputError({ file: this.file, ...n });
  }

  private tooLong(): never {
    this.fail({ line: this.line + 1, message: `a line is longer than ${this.limits.maxLineChars} characters; this is not a run file` });
  }

  private rejectBinary(chunk: string): void {
    const probe = chunk.slice(0, 4096);
    let bad = 0;
    for (let i = 0; i < probe.length; i++) {
      const c = probe.charCodeAt(i);
      if (c === 0) this.fail({ line: 1, message: 'the file holds binary data (NUL bytes), not CSV text' });
      if (c === 0xfffd || (c < 32 && c !== 9 && c !== 10 && c !== 13)) bad++;
    }
    if (bad > 8 && bad > probe.length / 100) {
      this.fail({ line: 1, message: 'the file is not UTF-8 text (it looks binary)' });
    }
  }

  private consume(text: string): void {
    if (text.indexOf('\r') >= 0) text = text.replace(/\r\n?/g, '\n');
    let pos = 0;
    while (this.phase === 'preamble' && pos < text.length) {
      const nl = text.indexOf('\n', pos);
      const end = nl < 0 ? text.length : nl;
      const raw = text.slice(pos, end);
      pos = end + 1;
      this.line++;
      this.preambleLine(raw);
    }
    if (this.phase === 'data' && pos < text.length) this.dataBlock(pos === 0 ? text : text.slice(pos));
  }

  private preambleLine(raw: string): void {
    const trimmed = raw.trim();
    if (trimmed === '') return;
    if (trimmed.startsWith('#')) {
      const m = /^#\s*([^:]+?)\s*:\s*(.*)$/.exec(trimmed);
      if (m) this.metadata[m[1]!.toLowerCase()] = m[2]!.trim();
      return;
    }
    this.header(raw);
  }

  private header(raw: string): void {
    this.headerLine = this.line;
    this.delimiter = detectDelimiter(raw);
    this.decimalComma = this.delimiter === ';';
    const parsed = Papa.parse<string[]>(raw, { delimiter: this.delimiter, newline: '\n' });
    const cells = (parsed.data[0] ?? []).map((c) => c.trim());
    if (cells.length > this.limits.maxColumns) {
      this.fail({ line: this.line, message: `${cells.length} columns; more than ${this.limits.maxColumns} is not a run file` });
    }
    this.headerWidth = cells.length;
    const seen = new Map<string, number>();
    const bound: BoundColumn[] = [];
    cells.forEach((cell, i) => {
      const column = i + 1;
      const { name, unit } = splitHeaderCell(cell);
      const mapped = this.mapping.names?.[name.toLowerCase()];
      const key = (mapped ?? name).toLowerCase();
      if (key === 'ignore' || key === '') return;
      if (key !== POINT_COLUMN && !isChannel(key)) return; // columns outside the contract are not used
      const earlier = seen.get(key);
      if (earlier !== undefined) {
        this.fail({ line: this.line, column, message: `column "${key}" appears twice (columns ${earlier} and ${column})` });
      }
      seen.set(key, column);
      if (key === POINT_COLUMN) {
        this.pointIndex = i;
        this.columns.push({ header: name, channel: POINT_COLUMN, column, unit: '' });
        return;
      }
      const channel = key as Channel;
      const unitText = this.mapping.units?.[channel] ?? unit;
      let conv: UnitConversion;
      if (unitText === undefined || unitText.trim() === '') {
        conv = defaultConversion(channel);
      } else {
        const found = lookupUnit(unitText);
        const quantity = CHANNELS[channel].quantity;
        if (!found || found.quantity !== quantity) {
          const why = found ? `which is a ${found.quantity} unit, not a ${quantity} unit` : 'which is not a known unit';
          this.fail({
            line: this.line,
            column,
            message: `column "${channel}" has unit "${unitText}", ${why}; expected one of ${unitsOf(quantity).join(', ')}`,
          });
        }
        conv = found;
      }
      this.columns.push({ header: name, channel, column, unit: conv.label });
      bound.push({ index: i, slot: bound.length, conv, channel });
    });
    this.bound = bound;
    this.channels = bound.map((b) => b.channel);
    this.values = new Float64Array(bound.length);
    this.acc = new PointAccumulator(this.channels.length);
    this.phase = 'data';
  }

  private accumulator(): PointAccumulator {
    if (!this.acc) throw new Error('reader used before its header');
    return this.acc;
  }

  private dataBlock(text: string): void {
    const hasQuotes = text.indexOf('"') >= 0;
    const parsed = Papa.parse<string[]>(text, {
      delimiter: this.delimiter,
      newline: '\n',
      fastMode: !hasQuotes,
      skipEmptyLines: false,
    });
    const rows = parsed.data;
    // papaparse returns one trailing empty row for the final newline
    const count = rows.length > 0 && text.endsWith('\n') && isBlankRow(rows[rows.length - 1]!) ? rows.length - 1 : rows.length;
    const acc = this.accumulator();
    const bound = this.bound;
    const values = this.values;
    const decimalComma = this.decimalComma;
    const pointIndex = this.pointIndex;
    for (let r = 0; r < count; r++) {
      const row = rows[r]!;
      const lineNo = ++this.line;
      if (hasQuotes) this.line += countQuotedBreaks(row);
      if (row.length === 1 && row[0]!.trim() === '') continue;
      const first = row[0]!;
      if (first.length > 0 && first.charCodeAt(0) === 35 /* # */) continue;
      if (row.length < this.headerWidth) {
        this.skip(lineNo, undefined, `${row.length} of ${this.headerWidth} fields (a truncated or malformed row)`);
        continue;
      }
      let ok = true;
      for (let b = 0; b < bound.length; b++) {
        const col = bound[b]!;
        const cell = row[col.index]!;
        const v = parseCell(cell, decimalComma);
        if (!Number.isFinite(v)) {
          this.skip(lineNo, col.index + 1, `"${clip(cell)}" in column "${col.channel}" is not a finite number`);
          ok = false;
          break;
        }
        values[b] = v * col.conv.scale + col.conv.offset;
      }
      if (!ok) continue;
      if (row.length > this.headerWidth && !extraCellsEmpty(row, this.headerWidth)) {
        this.skip(lineNo, this.headerWidth + 1, `${row.length} fields where the header has ${this.headerWidth}`);
        continue;
      }
      const key = pointIndex >= 0 ? row[pointIndex]!.trim() : String(lineNo);
      acc.add(key, lineNo, values);
      if (acc.size > this.limits.maxPoints) {
        this.fail({ line: lineNo, message: `more than ${this.limits.maxPoints} distinct points; is the "point" column a sample counter?` });
      }
      this.read++;
    }
  }

  private skip(line: number, column: number | undefined, why: string): void {
    this.skipped++;
    if (this.skipped <= this.limits.maxRowWarnings) {
      this.warnings.push({ file: this.file, line, column, message: `row skipped: ${why}` });
    }
  }
}

/** Number from a cell; empty cells, NaN and ±Infinity come back as NaN. */
export function parseCell(cell: string, decimalComma: boolean): number {
  if (decimalComma && cell.indexOf(',') >= 0) cell = cell.replace(',', '.');
  if (cell.length === 0) return Number.NaN;
  const v = +cell;
  if (v === 0 && cell.trim() === '') return Number.NaN;
  return v;
}

/** "dp_pitot [inH2O]" → { name: "dp_pitot", unit: "inH2O" }. */
export function splitHeaderCell(cell: string): { name: string; unit: string | undefined } {
  const m = /^(.*?)\s*\[([^\]]*)\]\s*$/.exec(cell);
  if (!m) return { name: cell.trim(), unit: undefined };
  return { name: m[1]!.trim(), unit: m[2]!.trim() };
}

/** The delimiter that splits the header into the most fields (comma when none does). */
export function detectDelimiter(headerLine: string): string {
  let best = ',';
  let bestCount = 0;
  for (const d of DELIMITERS) {
    const n = headerLine.split(d).length - 1;
    if (n > bestCount) {
      best = d;
      bestCount = n;
    }
  }
  return best;
}

/** Index of the last line break that is not inside a quoted field, or −1. */
function lastLineBreak(text: string): number {
  let nl = Math.max(text.lastIndexOf('\n'), text.lastIndexOf('\r'));
  // a CR at the very end may be the first half of a CRLF split between chunks: keep it for later
  if (nl === text.length - 1 && text.charCodeAt(nl) === 13) nl = Math.max(text.lastIndexOf('\n', nl - 1), text.lastIndexOf('\r', nl - 1));
  if (nl < 0 || text.indexOf('"') < 0) return nl;
  // quoted fields may hold line breaks: step back until the quotes before the break balance
  while (nl >= 0) {
    let quotes = 0;
    for (let i = 0; i < nl; i++) if (text.charCodeAt(i) === 34) quotes++;
    if (quotes % 2 === 0) return nl;
    nl = Math.max(text.lastIndexOf('\n', nl - 1), text.lastIndexOf('\r', nl - 1));
  }
  return -1;
}

function isBlankRow(row: string[]): boolean {
  return row.length === 1 && row[0] === '';
}

function extraCellsEmpty(row: string[], from: number): boolean {
  for (let i = from; i < row.length; i++) if (row[i]!.trim() !== '') return false;
  return true;
}

function countQuotedBreaks(row: string[]): number {
  let n = 0;
  for (const cell of row) for (let i = 0; i < cell.length; i++) if (cell.charCodeAt(i) === 10) n++;
  return n;
}

function clip(cell: string): string {
  return cell.length > 24 ? `${cell.slice(0, 24)}…` : cell;
}

/** Read a whole run file held in memory (tests, the browser host's small files). */
export function readRunText(file: string, text: string, options?: { mapping?: ColumnMapping; limits?: Partial<ReaderLimits> }): RunData {
  const reader = new RunFileReader(file, options);
  reader.push(text);
  return reader.finish();
}
