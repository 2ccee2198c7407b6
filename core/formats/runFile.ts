/**
 * Streaming reader for run files (docs/data-format.md): CSV (comma, semicolon with decimal comma,
 * tab) and whitespace-aligned text; units in brackets, parentheses or a units row; columns assigned
 * by name or by a column map; samples grouped by the point column or, without one, by set angle
 * and wind state.
 *
 * Order of work: preamble (metadata) → header → units row or first data row → `bind` (each column's
 * channel and conversion) → data rows, each ending in `fold`.
 *
 * Text arrives in chunks of any size (`push`), complete lines are read block by block, and each row
 * is folded straight into its point's running statistics, so memory grows with the number of points,
 * never with the number of samples. Values are converted to SI as they are read.
 *
 * papaparse is the CSV parser of record: it reads the header and every block that holds a quote.
 * A block without quotes (nearly every block of an acquisition system's file) can only split at line
 * breaks and delimiters, and is read by a loop that converts each number where it lies in the text,
 * with no string or array per row; see `plainBlock`. Both paths give the same rows, values and messages
 * (test/unit/streaming.test.ts), and `npm run bench` shows what the second one is worth.
 */
import Papa from 'papaparse';
import { CHANNELS, POINT_COLUMN, PRESSURE_SOURCES, defaultConversion, isChannel, type Channel } from './channels.ts';
import { InputError, type Notice } from '../contract/messages.ts';
import { PointAccumulator, type PointStats } from './pointStats.ts';
import { lookupUnit, unitsOf, STANDARD_GRAVITY, type UnitConversion } from '../physics/units.ts';
import type { SampleTransform } from './sampleTransform.ts';

export interface ColumnInfo {
  /** Name as written in the header (without the unit). */
  header: string;
  channel: Channel | typeof POINT_COLUMN;
  /** 1-based column number in the file. */
  column: number;
  unit: string;
}

/** One cell of the header as the file wrote it, whether or not it was used. */
export interface HeaderCell {
  /** The cell as written, surrounding spaces trimmed: the key of a column map. */
  text: string;
  /** Name without the unit. */
  name: string;
  /** Unit from brackets, parentheses or the units row; undefined when none is written. */
  unit: string | undefined;
  /** 1-based column. */
  column: number;
}

export interface RunData {
  file: string;
  /** Every header cell, used or not (for messages that list the file's columns, and the column map). */
  headerCells: HeaderCell[];
  /** Physical line of the units row below the header, when the file has one. */
  unitsLine: number | undefined;
  /** True when samples without a point column were grouped by set angle (see `alphaTolRad`). */
  grouped: boolean;
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
/** The delimiter value of a whitespace-aligned file (columns separated by runs of spaces and/or tabs). */
export const WHITESPACE = ' ';

/** What one header cell is assigned to by a column map (see core/formats/columnMap.ts). */
export interface CellAssignment {
  channel: Channel | typeof POINT_COLUMN;
  /** Overrides the unit of the header or units row. */
  unit?: string;
  /** value = raw·scale + offset, in the column's unit, before conversion to SI. */
  scale?: number;
  offset?: number;
}

/** A column assignment given by the user for a file whose header does not follow the contract. */
export interface ColumnMapping {
  /** Header text (without unit, case-insensitive) → contract channel or "point" or "ignore". */
  names?: Record<string, string>;
  /** Contract channel → unit to use instead of the header's. */
  units?: Record<string, string>;
  /**
   * Header cell exactly as written (trimmed) → assignment, or null to ignore the column. Built from a
   * column-map document by `readerMapping`; a key the file lacks is refused naming `source`.
   */
  cells?: Record<string, CellAssignment | null>;
  /** Name of the map file, for messages about its keys. */
  source?: string;
  /** Entries naming columns the file lacks are passed over instead of refused (a tare read with its run's map). */
  partial?: boolean;
}

/** How samples are grouped into points when the file has no `point` column. */
export interface GroupingOptions {
  /** Rows whose alpha stays within this of the group's first row form one point, rad. */
  alphaTolRad: number;
}

/** The grouping tolerance without a setup: 0.2° (an encoder jitters by about 0.1° within a point). */
export const DEFAULT_ALPHA_TOL_DEG = 0.2;

/**
 * Two readings of the dynamic-pressure source are in different wind states (one wind-off, one
 * wind-on) when the smaller magnitude is below this fraction of the larger: the same 5 % that marks
 * a wind-off point against the run's median q.
 */
export const WIND_OFF_FRACTION = 0.05;

interface BoundColumn {
  index: number; // 0-based
  slot: number; // index into the accumulator's channel array
  conv: UnitConversion;
  channel: Channel;
  /** Per-sample transform hook: the header name of a column read raw for the transform. */
  raw?: string;
}

type Phase = 'preamble' | 'unitsRow' | 'data';

export class RunFileReader {
  readonly file: string;
  private readonly limits: ReaderLimits;
  private readonly mapping: ColumnMapping;
  private readonly alphaTol: number;
  private phase: Phase = 'preamble';
  private headerCells: HeaderCell[] = [];
  private unitsLine: number | undefined;
  // grouping without a point column: slots of alpha and of the pressure source, and the open group
  private alphaSlot = -1;
  private pressureSlot = -1;
  private groupAlpha = Number.NaN;
  private groupPressure = Number.NaN;
  private groupKey = '';
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
  // quote-free fast path: what each field of a line is for, and the bound columns' unit factors
  private fieldSlot: Int32Array = new Int32Array(0);
  private scale: Float64Array = new Float64Array(0);
  private offset: Float64Array = new Float64Array(0);
  // the last point key, and the text it was trimmed from, so a run of samples of one point costs no new string
  private lastKeyRaw: string | undefined;
  private lastKey = '';
  // a quoted record still open at the end of a line: its lines so far and where it started
  private pending: { lines: string[]; line: number } | undefined;
  // the file's first characters, held back until probed for binary content
  private probe = '';
  private probed = false;
  // --- per-sample transform hook (see sampleTransform.ts) ---
  private readonly transform: SampleTransform | undefined;
  private rawIn: Float64Array = new Float64Array(0);
  private transformed: Float64Array = new Float64Array(0);
  private sampleRow: Float64Array = new Float64Array(0);
  private transformFailures = 0;
  // --- end of the hook's fields ---

  constructor(
    file: string,
    options: { limits?: Partial<ReaderLimits>; mapping?: ColumnMapping; grouping?: GroupingOptions; sampleTransform?: SampleTransform } = {},
  ) {
    this.file = file;
    this.transform = options.sampleTransform;
    this.limits = { ...DEFAULT_LIMITS, ...options.limits };
    this.mapping = options.mapping ?? {};
    this.alphaTol = options.grouping?.alphaTolRad ?? (DEFAULT_ALPHA_TOL_DEG * Math.PI) / 180;
  }

  /** Feed the next piece of the file's text. */
  push(chunk: string): void {
    if (!this.started) {
      this.started = true;
      if (chunk.charCodeAt(0) === 0xfeff) chunk = chunk.slice(1);
    }
    if (this.probed) {
      this.pushText(chunk);
      return;
    }
    // the first characters are held back until they have been probed, so a binary file is refused
    // as such however its text is chunked (and not, say, for a duplicate column found first)
    this.probe += chunk;
    if (this.probe.length >= PROBE_CHARS) this.releaseProbe();
  }

  /** Judge the probed characters and read them. */
  private releaseProbe(): void {
    const text = this.probe;
    this.probe = '';
    this.judgeProbe(text.slice(0, PROBE_CHARS));
    this.pushText(text);
  }

  private pushText(chunk: string): void {
    if (chunk.length === 0) return;
    // Common case, no quotes anywhere: read the chunk where it lies. Only the line it completes is
    // joined to the carried text, so the big chunk is never copied into a concatenation.
    if (this.pending === undefined && chunk.indexOf('"') < 0 && this.carry.indexOf('"') < 0) {
      let from = 0;
      if (this.carry.length > 0) {
        const nl = firstLineBreak(chunk);
        if (nl < 0) {
          this.carry += chunk;
          if (this.carry.length > this.limits.maxLineChars) this.tooLong();
          return;
        }
        if (nl === chunk.length - 1 && chunk.charCodeAt(nl) === 13) {
          // a CR ending the chunk may be half of a CRLF: wait for the next chunk
          this.carry += chunk;
          if (this.carry.length > this.limits.maxLineChars) this.tooLong();
          return;
        }
        from = nl + (chunk.charCodeAt(nl) === 13 && chunk.charCodeAt(nl + 1) === 10 ? 2 : 1);
        const head = this.carry + chunk.slice(0, from);
        this.carry = '';
        this.consume(head, 0, head.length, false);
      }
      const lastNl = lastLineBreak(chunk);
      if (lastNl < from) {
        this.carry = chunk.slice(from);
      } else {
        this.consume(chunk, from, lastNl + 1, true);
        this.carry = lastNl + 1 < chunk.length ? chunk.slice(lastNl + 1) : '';
      }
      if (this.carry.length > this.limits.maxLineChars) this.tooLong();
      return;
    }
    const text = this.carry + chunk;
    const lastNl = lastLineBreak(text);
    if (lastNl < 0) {
      this.carry = text;
      if (text.length > this.limits.maxLineChars) this.tooLong();
      return;
    }
    this.carry = text.slice(lastNl + 1);
    this.consume(text, 0, lastNl + 1, false);
    if (this.carry.length > this.limits.maxLineChars) this.tooLong();
  }

  /** End of file: read what is left and return the points. Throws InputError on a file that cannot be reduced. */
  finish(): RunData {
    if (!this.started) this.fail({ line: 1, message: 'the file is empty' });
    if (!this.probed) this.releaseProbe();
    if (this.carry.length > 0) {
      const rest = this.carry + '\n';
      this.carry = '';
      this.consume(rest, 0, rest.length, false);
    }
    if (this.pending) this.unclosedQuote();
    if (this.phase === 'preamble') this.fail({ line: Math.max(1, this.line), message: 'no header line found (the file is empty or holds only comments)' });
    if (this.phase === 'unitsRow') this.bind(undefined);
    const acc = this.accumulator();
    const points = acc.result();
    // fits: name every point split by angle (at most a few, then a count)
    for (const sp of acc.splits.slice(0, this.limits.maxRowWarnings)) {
      this.warnings.push({
        file: this.file,
        line: sp.line,
        message: `samples of point "${sp.key}" lie at α = ${((sp.alphaBefore * 180) / Math.PI).toFixed(2)}° (from line ${sp.firstLine}) and ${((sp.alphaAfter * 180) / Math.PI).toFixed(2)}° (from this line), more than 0.2° apart (a point id restarted for a return sweep?): they are kept as two points, not averaged`,
      });
    }
    if (acc.splits.length > this.limits.maxRowWarnings) {
      this.warnings.push({
        file: this.file,
        message: `${acc.splits.length - this.limits.maxRowWarnings} more points split by angle (only the first ${this.limits.maxRowWarnings} are listed)`,
      });
    }
    if (this.skipped > this.limits.maxRowWarnings) {
      this.warnings.push({
        file: this.file,
        message: `${this.skipped - this.limits.maxRowWarnings} more rows skipped (only the first ${this.limits.maxRowWarnings} are listed)`,
      });
    }
    if (points.length === 0) this.fail({ line: this.headerLine, message: 'no data rows could be read after the header' });
    return {
      file: this.file,
      headerCells: this.headerCells,
      unitsLine: this.unitsLine,
      grouped: this.pointIndex < 0 && this.alphaSlot >= 0,
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

  /** NUL bytes, or many control or replacement characters, in the file's first characters: not UTF-8 text. */
  private judgeProbe(probe: string): void {
    this.probed = true;
    const nul = probe.indexOf('\u0000');
    // a UTF-16 byte-order mark read as UTF-8 is two replacement characters, and its ASCII has NUL halves
    if (nul >= 0 && probe.startsWith('\ufffd\ufffd'))
      this.fail({ line: 1, message: 'the file is UTF-16 text (it starts with a UTF-16 byte-order mark); save or export it as UTF-8 and read it again' });
    if (nul >= 0) this.fail({ line: lineOfOffset(probe, nul), message: 'the file holds binary data (NUL bytes), not CSV text' });
    let bad = 0;
    for (let i = 0; i < probe.length; i++) {
      const c = probe.charCodeAt(i);
      if (c === 0xfffd || (c < 32 && c !== 9 && c !== 10 && c !== 13)) bad++;
    }
    if (bad > 8 && bad > probe.length / 100) {
      this.fail({ line: 1, message: 'the file is not UTF-8 text (it looks binary)' });
    }
  }

  /**
   * Complete lines text[from, to) (`to` just past a line break): preamble lines one by one, then the
   * data. `direct`: text is a chunk as the source gave it, worth the quote-free loop; joined pieces
   * (a carried line and its end, the file's last line) are split line by line instead, which keeps
   * the loop's code specialised to one kind of string.
   */
  private consume(text: string, from: number, to: number, direct: boolean): void {
    let pos = from;
    while (this.phase !== 'data' && pos < to) {
      let end = pos;
      for (let c = text.charCodeAt(end); c !== 10 && c !== 13; c = text.charCodeAt(++end));
      const raw = text.slice(pos, end);
      pos = end + (text.charCodeAt(end) === 13 && text.charCodeAt(end + 1) === 10 ? 2 : 1);
      this.line++;
      if (this.phase === 'preamble') this.preambleLine(raw);
      else this.unitsRowOrData(raw);
    }
    if (this.phase !== 'data' || pos >= to) return;
    if (this.delimiter === WHITESPACE) {
      this.splitLines(text, pos, to);
      return;
    }
    const quote = text.indexOf('"', pos);
    if (this.pending !== undefined || (quote >= 0 && quote < to)) this.quotedBlock(text.slice(pos, to));
    else if (direct) this.plainBlock(text, pos, to);
    else this.splitLines(text, pos, to);
  }

  private preambleLine(raw: string): void {
    const trimmed = raw.trim();
    if (trimmed === '') return;
    if (trimmed.startsWith('#')) {
      const m = /^#\s*([^:]+?)\s*:\s*(.*)$/.exec(trimmed);
      // the first value of a key is kept: an exported table's `# run: NAME` precedes its provenance lines
      if (m && !Object.prototype.hasOwnProperty.call(this.metadata, m[1]!.toLowerCase())) this.metadata[m[1]!.toLowerCase()] = m[2]!.trim();
      return;
    }
    this.header(raw);
  }

  /** The header line: its cells are kept until the next line shows whether it is a units row. */
  private header(raw: string): void {
    this.headerLine = this.line;
    this.delimiter = detectDelimiter(raw);
    this.decimalComma = this.delimiter === ';';
    const cells = splitHeaderLine(raw, this.delimiter);
    if (cells.length > this.limits.maxColumns) {
      this.fail({ line: this.line, message: `${cells.length} columns; more than ${this.limits.maxColumns} is not a run file` });
    }
    this.headerWidth = cells.length;
    this.headerCells = cells.map((text, i) => ({ text, ...splitHeaderCell(text), column: i + 1 }));
    this.phase = 'unitsRow';
  }

  /**
   * The line directly below the header: a units row (every cell a unit, "/", "-" or empty, and no
   * number) gives the units of its columns; any other line is the first data row.
   */
  private unitsRowOrData(raw: string): void {
    if (raw.trim() === '') {
      this.bind(undefined);
      return;
    }
    const cells =
      this.delimiter === WHITESPACE
        ? joinUnitWords(splitWhitespace(raw), this.headerWidth)
        : raw.indexOf('"') >= 0
          ? (Papa.parse<string[]>(raw, { delimiter: this.delimiter, newline: '\n' }).data[0] ?? [])
          : raw.split(this.delimiter);
    const units = unitsRow(
      cells.map((c) => c.trim()),
      this.decimalComma,
    );
    if (units === undefined) {
      this.bind(undefined);
      if (this.delimiter !== WHITESPACE && raw.indexOf('"') >= 0) {
        // the first data row, read as any quoted line (it may open a record spanning lines)
        this.line--;
        this.quotedLine(raw);
      } else {
        this.takeRow(this.delimiter === WHITESPACE ? splitWhitespace(raw) : raw.split(this.delimiter), this.line);
      }
      return;
    }
    this.unitsLine = this.line;
    // a whitespace-aligned units row cannot leave a column empty: it must name every column
    if (this.delimiter === WHITESPACE && units.length !== this.headerWidth) {
      this.fail({
        line: this.line,
        message: `the units row has ${units.length} cells and the header ${this.headerWidth}; in a space-aligned file every column needs a unit ("-" for none)`,
      });
    }
    units.forEach((u, i) => {
      const cell = this.headerCells[i];
      if (cell === undefined) {
        if (u !== '') this.fail({ line: this.line, column: i + 1, message: `units row cell "${clip(u)}" has no header column above it` });
        return;
      }
      if (u === '') return;
      if (cell.unit !== undefined && cell.unit !== u) {
        this.fail({
          line: this.line,
          column: i + 1,
          message: `column "${cell.text}" has unit "${cell.unit}" in the header and "${u}" in the units row; keep one`,
        });
      }
      cell.unit = u;
    });
    this.bind(units);
  }

  /** Assign every header cell its channel and unit conversion; `units` holds the units row when there is one. */
  private bind(units: string[] | undefined): void {
    const headerLine = this.headerLine;
    const unitPlace = (column: number, fromMap: boolean): Omit<Notice, 'file' | 'message'> =>
      fromMap
        ? { field: `columns["${this.headerCells[column - 1]!.text}"].unit` }
        : { line: units && units[column - 1] ? this.unitsLine! : headerLine, column };
    const seen = new Map<string, number>();
    const bound: BoundColumn[] = [];
    const cellMap = this.mapping.cells;
    if (cellMap && !this.mapping.partial) {
      const texts = new Set(this.headerCells.map((c) => c.text));
      for (const key of Object.keys(cellMap)) {
        if (!texts.has(key.trim())) {
          throw new InputError({
            file: this.mapping.source ?? 'column map',
            field: `columns["${key}"]`,
            message: `names a column that ${this.file} does not have (its header, line ${headerLine}: ${this.headerCells.map((c) => `"${c.text}"`).join(', ')})`,
          });
        }
      }
    }
    for (const cell of this.headerCells) {
      const { name, column } = cell;
      const i = column - 1;
      const assigned = cellMap && Object.prototype.hasOwnProperty.call(cellMap, cell.text) ? cellMap[cell.text] : undefined;
      if (assigned === null) continue; // ignored by the map
      const mapped = assigned ? assigned.channel : this.mapping.names?.[name.toLowerCase()];
      const key = (mapped ?? name).toLowerCase();
      if (this.transformHeader(name, i, column, key, bound)) continue;
      if (key === 'ignore' || key === '') continue;
      if (key !== POINT_COLUMN && !isChannel(key)) continue; // columns outside the contract are not used
      const earlier = seen.get(key);
      if (earlier !== undefined) {
        this.fail({ line: headerLine, column, message: `column "${key}" appears twice (columns ${earlier} and ${column})` });
      }
      seen.set(key, column);
      if (key === POINT_COLUMN) {
        this.pointIndex = i;
        this.columns.push({ header: name, channel: POINT_COLUMN, column, unit: '' });
        continue;
      }
      const channel = key as Channel;
      const fromMap = assigned?.unit !== undefined;
      const unitText = assigned?.unit ?? this.mapping.units?.[channel] ?? cell.unit;
      let conv: UnitConversion;
      if (unitText === undefined || unitText.trim() === '') {
        conv = defaultConversion(channel);
      } else {
        const found = lookupUnit(unitText);
        const quantity = CHANNELS[channel].quantity;
        if (!found || found.quantity !== quantity) {
          const why = found
            ? `which is a ${found.quantity === 'ratio' ? 'dimensionless' : found.quantity} unit, not a ${quantity} unit`
            : 'which is not a known unit';
          const place = unitPlace(column, fromMap);
          throw new InputError({
            file: fromMap ? (this.mapping.source ?? 'column map') : this.file,
            ...place,
            message: `column "${cell.text}" (${channel}) has unit "${unitText}", ${why}; expected one of ${unitsOf(quantity).join(', ')}`,
          });
        }
        conv = found;
      }
      if (conv.massAsForce) {
        this.warnings.push({
          file: this.file,
          line: headerLine,
          column,
          message: `column "${cell.text}" (${channel}) is in ${conv.label}, a mass: read as a load cell's indication, force = mass × ${STANDARD_GRAVITY} m/s² (standard gravity)`,
        });
      }
      // a map's scale and offset apply in the column's unit, before conversion: si = (raw·s + o)·k + c
      const s = assigned?.scale ?? 1;
      const o = assigned?.offset ?? 0;
      if (s !== 1 || o !== 0) conv = { ...conv, scale: s * conv.scale, offset: o * conv.scale + conv.offset };
      this.columns.push({ header: name, channel, column, unit: conv.label });
      bound.push({ index: i, slot: bound.length, conv, channel });
    }
    this.bound = bound;
    this.channels = bound.filter((b) => b.raw === undefined).map((b) => b.channel);
    this.transformReady(bound);
    this.values = new Float64Array(bound.length);
    this.fieldSlot = new Int32Array(this.headerWidth).fill(UNUSED_FIELD);
    if (this.pointIndex >= 0) this.fieldSlot[this.pointIndex] = POINT_FIELD;
    for (const b of bound) this.fieldSlot[b.index] = b.slot;
    this.scale = Float64Array.from(bound, (b) => b.conv.scale);
    this.offset = Float64Array.from(bound, (b) => b.conv.offset);
    this.alphaSlot = this.channels.indexOf('alpha');
    const source = PRESSURE_SOURCES.find((c) => this.channels.includes(c));
    this.pressureSlot = source === undefined ? -1 : this.channels.indexOf(source);
    // fits: with a point column, a point whose samples lie at two angles, or an id that comes back
    // after other points, is split (see PointAccumulator.add)
    this.acc = new PointAccumulator(this.channels.length, this.pointIndex >= 0 ? this.alphaSlot : -1);
    this.phase = 'data';
  }

  /**
   * The point a sample belongs to in a file without a point column: consecutive rows whose alpha
   * stays within the tolerance of the group's first row, in the same wind state, form one point
   * (named by its first line). Wind-off rows of one point that flicker across the 5 % ratio are
   * joined again once the run's median q is known (core/reduction/windOff.ts).
   */
  private groupOf(lineNo: number, values: Float64Array): string {
    const slot = this.alphaSlot;
    if (slot < 0) return String(lineNo);
    const a = values[slot]!;
    const p = this.pressureSlot >= 0 ? Math.abs(values[this.pressureSlot]!) : 0;
    const g = this.groupPressure;
    if (!(Math.abs(a - this.groupAlpha) <= this.alphaTol) || Math.min(p, g) < WIND_OFF_FRACTION * Math.max(p, g)) {
      this.groupAlpha = a;
      this.groupPressure = p;
      this.groupKey = String(lineNo);
    }
    return this.groupKey;
  }

  private accumulator(): PointAccumulator {
    if (!this.acc) throw new Error('reader used before its header');
    return this.acc;
  }

  /**
   * Complete lines holding quotes, one record at a time. A line whose quotes do not balance opens a
   * record that may span lines (a quoted field holding a line break); it is closed by the line that
   * balances it, or, after MAX_RECORD_LINES lines, reported as an unclosed quote and skipped, and the
   * lines after it are read afresh. So a stray quote costs one row, never the rest of the file, and
   * the work stays linear. papaparse, the CSV parser of record, splits each record.
   */
  private quotedBlock(text: string): void {
    if (text.indexOf('\r') >= 0) text = text.replace(/\r\n?/g, '\n');
    let pos = 0;
    const end = text.endsWith('\n') ? text.length - 1 : text.length;
    while (pos <= end) {
      let nl = text.indexOf('\n', pos);
      if (nl < 0 || nl > end) nl = end;
      this.quotedLine(text.slice(pos, nl));
      pos = nl + 1;
    }
  }

  private quotedLine(line: string): void {
    const lineNo = ++this.line;
    const odd = quoteCount(line) % 2 === 1;
    const open = this.pending;
    if (open) {
      open.lines.push(line);
      if (odd) {
        this.pending = undefined;
        this.record(open.lines.join('\n'), open.line);
      } else if (open.lines.length >= MAX_RECORD_LINES) {
        this.unclosedQuote();
      }
      return;
    }
    if (odd) this.pending = { lines: [line], line: lineNo };
    else this.record(line, lineNo);
  }

  /** Skip the line that opened a record never closed, and read the lines it had swallowed afresh. */
  private unclosedQuote(): void {
    const open = this.pending!;
    this.pending = undefined;
    const first = open.lines[0]!;
    this.skip(open.line, fieldOfOffset(first, first.indexOf('"'), this.delimiter), 'a quote opens here and is never closed');
    this.line = open.line;
    for (const rest of open.lines.slice(1)) this.quotedLine(rest);
  }

  /** One record (a line, or lines joined by a quoted line break) starting at line lineNo. */
  private record(text: string, lineNo: number): void {
    if (text.trim() === '') return; // a blank line, as on the quote-free path
    const parsed = Papa.parse<string[]>(text, { delimiter: this.delimiter, newline: '\n', skipEmptyLines: false });
    const bad = parsed.errors.find((e) => e.type === 'Quotes');
    if (bad || parsed.data.length !== 1) {
      const at = text.indexOf('"');
      this.skip(lineNo, fieldOfOffset(text, at, this.delimiter), 'malformed quotes (a quoted field must be followed by a delimiter or the end of the line)');
      return;
    }
    this.takeRow(parsed.data[0]!, lineNo);
  }

  /**
   * A block without quotes, text[from, to): every line is split at the delimiter and its numbers are
   * converted where they lie, with no string made per cell or row. This is the same split papaparse
   * makes of quote-free text (fast mode: lines at line breaks, fields at the delimiter). Any line that
   * is not a plain row of numbers (too few or many fields, a comment, a cell that is not a finite
   * number) is cut out and goes through `takeRow`, the one place that decides what a row means.
   */
  private plainBlock(text: string, from: number, to: number): void {
    const width = this.headerWidth;
    const slots = this.fieldSlot;
    const values = this.values;
    const scale = this.scale;
    const offset = this.offset;
    const delim = this.delimiter.charCodeAt(0);
    const decimalComma = this.decimalComma;
    const hasPoint = this.pointIndex >= 0;
    let pos = from;
    while (pos < to) {
      const lineStart = pos;
      const lineNo = ++this.line;
      let plain = width > 1 && text.charCodeAt(pos) !== 35; /* # */
      let field = 0;
      let keyStart = -1;
      let keyEnd = -1;
      let c = text.charCodeAt(pos);
      while (plain) {
        const slot = field < width ? slots[field]! : UNUSED_FIELD;
        const start = pos;
        if (slot >= 0) {
          // a number where it lies: [+-]digits[.digits], at most 15 digits in all, is exactly
          // mantissa / 10^decimals, one correctly rounded division of two exact doubles, so the same
          // double as Number(cell) (Clinger, PLDI 1990, the "fast path"); any other cell is converted
          // from its text by parseCell, as on the papaparse path
          c = text.charCodeAt(pos);
          let negative = false;
          if (c === 45 || c === 43) {
            negative = c === 45;
            c = text.charCodeAt(++pos);
          }
          const digitsStart = pos;
          let mantissa = 0;
          while (c >= 48 && c <= 57) {
            mantissa = mantissa * 10 + (c - 48);
            c = text.charCodeAt(++pos);
          }
          let digits = pos - digitsStart;
          let decimals = 0;
          if (c === 46 || (c === 44 && decimalComma)) {
            const fractionStart = ++pos;
            c = text.charCodeAt(pos);
            while (c >= 48 && c <= 57) {
              mantissa = mantissa * 10 + (c - 48);
              c = text.charCodeAt(++pos);
            }
            decimals = pos - fractionStart;
            digits += decimals;
          }
          let v: number;
          if (digits > 0 && digits <= 15 && (c === delim || c === 10 || c === 13)) {
            v = decimals === 0 ? mantissa : mantissa / POW10[decimals]!;
            if (negative) v = -v;
          } else {
            while (c !== delim && c !== 10 && c !== 13) c = text.charCodeAt(++pos);
            v = parseCell(text.slice(start, pos), decimalComma);
            if (!Number.isFinite(v)) {
              plain = false;
              break;
            }
          }
          values[slot] = v * scale[slot]! + offset[slot]!;
        } else {
          c = text.charCodeAt(pos);
          while (c !== delim && c !== 10 && c !== 13) c = text.charCodeAt(++pos);
          if (slot === POINT_FIELD) {
            keyStart = start;
            keyEnd = pos;
          } else if (field >= width && pos > start) {
            plain = false; // a filled cell beyond the header's columns
            break;
          }
        }
        field++;
        if (c !== delim) break;
        pos++;
      }
      if (field < width) plain = false;
      // find the line's end (already there unless the line left the plain path early)
      while (c !== 10 && c !== 13) c = text.charCodeAt(++pos);
      const lineEnd = pos;
      pos += c === 13 && text.charCodeAt(pos + 1) === 10 ? 2 : 1;
      if (!plain) {
        this.takeRow(text.slice(lineStart, lineEnd).split(this.delimiter), lineNo);
        continue;
      }
      let key: string;
      if (!hasPoint) key = this.groupOf(lineNo, values);
      else if (this.lastKeyRaw !== undefined && sameText(text, keyStart, keyEnd, this.lastKeyRaw)) key = this.lastKey;
      else {
        this.lastKeyRaw = text.slice(keyStart, keyEnd);
        key = this.lastKey = this.lastKeyRaw.trim();
      }
      this.fold(key, lineNo, values);
    }
  }

  /** Quote-free lines split one by one, as papaparse's fast mode splits them (for a few joined lines). */
  private splitLines(text: string, from: number, to: number): void {
    let pos = from;
    while (pos < to) {
      let end = pos;
      for (let c = text.charCodeAt(end); c !== 10 && c !== 13; c = text.charCodeAt(++end));
      const lineNo = ++this.line;
      const line = text.slice(pos, end);
      this.takeRow(this.delimiter === WHITESPACE ? splitWhitespace(line) : line.split(this.delimiter), lineNo);
      pos = end + (text.charCodeAt(end) === 13 && text.charCodeAt(end + 1) === 10 ? 2 : 1);
    }
  }

  /** One row, split into cells: skipped with a warning, or folded into its point. */
  private takeRow(row: string[], lineNo: number): void {
    if (row.length === 1 && row[0]!.trim() === '') return;
    const first = row[0]!;
    if (first.length > 0 && first.charCodeAt(0) === 35 /* # */) return;
    if (row.length < this.headerWidth) {
      this.skip(lineNo, undefined, `${row.length} of ${this.headerWidth} fields (a truncated or malformed row)`);
      return;
    }
    // more filled cells than the header: never truncated, since the cells may have shifted (a decimal
    // comma in a comma-separated file splits one number into two cells)
    if (row.length > this.headerWidth && !extraCellsEmpty(row, this.headerWidth)) {
      const firstExtra = row.findIndex((c, i) => i >= this.headerWidth && c.trim() !== '');
      const hint = this.delimiter === ',' && row.some((c) => /^\s*-?\d+\s*$/.test(c)) ? ' (a decimal comma in a comma-separated file?)' : '';
      this.skip(lineNo, firstExtra + 1, `${row.length} fields where the header has ${this.headerWidth}; column ${firstExtra + 1} has no header${hint}`);
      return;
    }
    const bound = this.bound;
    const values = this.values;
    for (let b = 0; b < bound.length; b++) {
      const col = bound[b]!;
      const cell = row[col.index]!;
      const v = parseCell(cell, this.decimalComma);
      if (!Number.isFinite(v)) {
        const why = NOT_DECIMAL.test(cell.trim()) ? 'is not a decimal number (hexadecimal, binary and octal forms are not read)' : 'is not a finite number';
        this.skip(lineNo, col.index + 1, `"${clip(cell)}" in column "${col.raw ?? col.channel}" ${why}`);
        return;
      }
      values[b] = v * col.conv.scale + col.conv.offset;
    }
    const key = this.pointIndex >= 0 ? row[this.pointIndex]!.trim() : this.groupOf(lineNo, values);
    this.fold(key, lineNo, values);
  }

  /**
   * Every accepted sample passes here, from both paths, with its values in SI in channel order
   * (`this.channels`): the one place for anything done per sample before it is averaged into its point.
   */
  private fold(key: string, lineNo: number, values: Float64Array): void {
    const acc = this.accumulator();
    acc.add(key, lineNo, this.transform ? this.sample(values, lineNo) : values);
    if (acc.size > this.limits.maxPoints) {
      this.fail({ line: lineNo, message: `more than ${this.limits.maxPoints} distinct points; is the "point" column a sample counter?` });
    }
    this.read++;
  }

  // --- per-sample transform hook: raw columns bound after the channels, outputs appended to the channels ---

  /** A header cell the transform reads (bound raw, true) or replaces (ignored with a notice, true); false otherwise. */
  private transformHeader(name: string, index: number, column: number, key: string, bound: BoundColumn[]): boolean {
    const t = this.transform;
    if (!t) return false;
    const lower = name.toLowerCase();
    if (t.inputs.some((n) => n.toLowerCase() === lower)) {
      if (bound.some((b) => b.raw?.toLowerCase() === lower)) this.fail({ line: this.headerLine, column, message: `column "${name}" appears twice` });
      bound.push({ index, slot: -1, conv: IDENTITY, channel: 'alpha', raw: name });
      return true;
    }
    if ((t.outputs as readonly string[]).includes(key)) {
      this.warnings.push({ file: this.file, line: this.headerLine, column, message: `column "${name}" is not used: "${key}" comes from ${t.source}` });
      return true;
    }
    return false;
  }

  /** After the header: every input present, channel slots first, raw slots after them in the transform's order. */
  private transformReady(bound: BoundColumn[]): void {
    const t = this.transform;
    if (!t) return;
    const raw = t.inputs.map((n) => bound.find((b) => b.raw?.toLowerCase() === n.toLowerCase()));
    const missing = t.inputs.filter((_, i) => raw[i] === undefined);
    if (missing.length > 0) {
      this.fail({
        line: this.headerLine,
        message: `missing column${missing.length > 1 ? 's' : ''} ${missing.map((m) => `"${m}"`).join(', ')} (bridge output${missing.length > 1 ? 's' : ''} named by ${t.source})`,
      });
    }
    const channels = bound.filter((b) => b.raw === undefined);
    channels.forEach((b, i) => (b.slot = i));
    raw.forEach((b, i) => (b!.slot = channels.length + i));
    bound.sort((a, b) => a.slot - b.slot);
    this.channels = [...this.channels, ...t.outputs];
    this.rawIn = new Float64Array(t.inputs.length);
    this.transformed = new Float64Array(t.outputs.length);
    this.sampleRow = new Float64Array(this.channels.length);
  }

  /** The sample as the accumulator takes it: the read channels, then the transform's outputs in place of its raw inputs. */
  private sample(values: Float64Array, lineNo: number): Float64Array {
    const t = this.transform!;
    const nCh = this.channels.length - t.outputs.length;
    const row = this.sampleRow;
    for (let i = 0; i < nCh; i++) row[i] = values[i]!;
    for (let i = 0; i < this.rawIn.length; i++) this.rawIn[i] = values[nCh + i]!;
    const why = t.apply(this.rawIn, this.transformed);
    if (why !== undefined) {
      this.transformed.fill(Number.NaN);
      if (++this.transformFailures <= this.limits.maxRowWarnings) {
        this.warnings.push({ file: this.file, line: lineNo, message: `sample not converted by ${t.source}: ${why}; its point is not reduced` });
      }
    }
    row.set(this.transformed, nCh);
    return row;
  }
  // --- end of the transform hook ---

  private skip(line: number, column: number | undefined, why: string): void {
    this.skipped++;
    if (this.skipped <= this.limits.maxRowWarnings) {
      this.warnings.push({ file: this.file, line, column, message: `row skipped: ${why}` });
    }
  }
}

/** Field roles in the quote-free path besides a channel's slot (≥ 0). */
const UNUSED_FIELD = -1;
const POINT_FIELD = -2;

/** Exact powers of ten 10^0 … 10^15 (each one a double without rounding). */
const POW10 = Float64Array.from({ length: 16 }, (_, i) => Number(`1e${i}`));

/** True when text[start, end) is exactly `s`. */
function sameText(text: string, start: number, end: number, s: string): boolean {
  if (end - start !== s.length) return false;
  for (let i = 0; i < s.length; i++) if (text.charCodeAt(start + i) !== s.charCodeAt(i)) return false;
  return true;
}

/** Index of the first CR or LF, or −1. */
function firstLineBreak(text: string): number {
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || c === 13) return i;
  }
  return -1;
}

/** Index of the last CR or LF at or before `from`, or −1 (a backward scan: the break is usually a line's length from the end). */
function lastBreakFrom(text: string, from: number): number {
  for (let i = from; i >= 0; i--) {
    const c = text.charCodeAt(i);
    if (c === 10 || c === 13) return i;
  }
  return -1;
}

/** Number from a cell; empty cells, NaN and ±Infinity come back as NaN. */
export function parseCell(cell: string, decimalComma: boolean): number {
  if (decimalComma && cell.indexOf(',') >= 0) cell = cell.replace(',', '.');
  if (cell.length === 0) return Number.NaN;
  const v = +cell;
  if (v === 0 && cell.trim() === '') return Number.NaN;
  // JavaScript's Number() also reads 0x10, 0b1 and 0o7; a run file's numbers are decimal only
  if (NOT_DECIMAL.test(cell)) return Number.NaN;
  return v;
}

/** A number written with a radix prefix (0x, 0b, 0o), which Number() would accept. */
const NOT_DECIMAL = /^\s*[+-]?0[xbo]/i;

/** Cells of a whitespace-aligned line: runs of spaces and tabs separate, leading and trailing ones do not count. */
export function splitWhitespace(line: string): string[] {
  const t = line.trim();
  return t === '' ? [''] : t.split(/[ \t]+/);
}

/**
 * A whitespace-aligned units row splits units written with a space ("degr. C", "N m", "in lbf") into
 * two cells: while there are more cells than header columns, the first neighbouring pair that makes a
 * known unit together is joined.
 */
export function joinUnitWords(cells: string[], width: number): string[] {
  const out = [...cells];
  while (out.length > width) {
    let joined = false;
    for (let i = 0; i + 1 < out.length; i++) {
      const both = `${out[i]} ${out[i + 1]}`;
      if (lookupUnit(both) !== undefined) {
        out.splice(i, 2, both);
        joined = true;
        break;
      }
    }
    if (!joined) break;
  }
  return out;
}

/**
 * Header cells of a line. In a whitespace-aligned header a unit written apart from its name
 * (`alpha [deg]`, `AoA (deg)`) belongs to the name before it; names with inner spaces need a
 * delimited file or a column map.
 */
export function splitHeaderLine(raw: string, delimiter: string): string[] {
  if (delimiter !== WHITESPACE) return (Papa.parse<string[]>(raw, { delimiter, newline: '\n' }).data[0] ?? []).map((c) => c.trim());
  // columns lined up with two or more spaces (or tabs) may hold single spaces in their names
  const t = raw.trim();
  if (/ {2,}|\t/.test(t)) {
    const wide = t.split(/ {2,}|\t[ \t]*/).map((c) => c.trim());
    // …unless a cell runs on past a unit ("dp [Pa] p [Pa]": two columns one space apart)
    if (wide.every((c) => c !== '' && balanced(c) && !/[\])]\s+\S/.test(c))) return wide;
  }
  const out: string[] = [];
  let open = false; // inside a bracket begun by an earlier token
  for (const token of splitWhitespace(raw)) {
    if (out.length > 0 && (open || /^[[(]/.test(token))) {
      out[out.length - 1] += ` ${token}`;
      open = !balanced(out[out.length - 1]!);
    } else {
      out.push(token);
      open = !balanced(token);
    }
  }
  return out;
}

/** True when every "[" and "(" of the text is closed. */
function balanced(text: string): boolean {
  let depth = 0;
  for (const ch of text) {
    if (ch === '[' || ch === '(') depth++;
    else if ((ch === ']' || ch === ')') && depth > 0) depth--;
  }
  return depth === 0;
}

/**
 * The cells of a units row (trimmed, brackets removed), or undefined when the line is not one: a
 * units row holds no number, and its non-empty cells are units, "/" or "-". A line with no number
 * whose cells are mostly units but one is not is refused by the caller naming that cell.
 */
export function unitsRow(cells: string[], decimalComma: boolean): string[] | undefined {
  const units = cells.map((c) =>
    c
      .trim()
      .replace(/^[[(](.*)[\])]$/, '$1')
      .trim(),
  );
  let known = 0;
  let filled = 0;
  for (const u of units) {
    if (u === '') continue;
    filled++;
    if (Number.isFinite(parseCell(u, decimalComma))) return undefined;
    if (lookupUnit(u) !== undefined) known++;
  }
  if (filled === 0 || known * 2 < filled) return undefined;
  return units;
}

/** "dp_pitot [inH2O]" or "AoA (deg)" → { name, unit }; a cell without a trailing bracket has no unit. */
export function splitHeaderCell(cell: string): { name: string; unit: string | undefined } {
  const m = /^(.*?)\s*(?:\[([^\]]*)\]|\(([^)]*)\))\s*$/.exec(cell);
  if (!m || m[1]!.trim() === '') return { name: cell.trim(), unit: undefined };
  return { name: m[1]!.trim(), unit: (m[2] ?? m[3]!).trim() };
}

/**
 * The delimiter that splits the header into the most fields (comma, semicolon or tab), or WHITESPACE
 * for a header of names separated only by spaces, or by tabs that line columns up (runs of tabs, or
 * tabs mixed with runs of spaces). Comma when nothing splits it.
 */
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
  const line = headerLine.trim();
  if (best === '\t' && (/\t\t/.test(line) || / {2}/.test(line))) return WHITESPACE;
  if (bestCount === 0 && /\S\s+\S/.test(line)) return WHITESPACE;
  return best;
}

/** Index of the last line break, or −1 (quoted line breaks are joined again line by line in quotedLine). */
function lastLineBreak(text: string): number {
  let nl = lastBreakFrom(text, text.length - 1);
  // a CR at the very end may be the first half of a CRLF split between chunks: keep it for later
  if (nl === text.length - 1 && text.charCodeAt(nl) === 13) nl = lastBreakFrom(text, nl - 1);
  return nl;
}

/** Characters probed for binary content at the start of a file. */
const PROBE_CHARS = 4096;
/** Lines a quoted record may span before its opening quote is taken for a stray one. */
const MAX_RECORD_LINES = 64;

function quoteCount(line: string): number {
  let n = 0;
  for (let i = line.indexOf('"'); i >= 0; i = line.indexOf('"', i + 1)) n++;
  return n;
}

/** 1-based line of a character offset. */
function lineOfOffset(text: string, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset; i++) if (text.charCodeAt(i) === 10 || (text.charCodeAt(i) === 13 && text.charCodeAt(i + 1) !== 10)) line++;
  return line;
}

/** 1-based field of a character offset in a line (delimiters before it, outside quotes, plus one). */
function fieldOfOffset(line: string, offset: number, delimiter: string): number {
  let field = 1;
  let quoted = false;
  for (let i = 0; i < Math.max(0, offset); i++) {
    const c = line[i];
    if (c === '"') quoted = !quoted;
    else if (!quoted && c === delimiter) field++;
  }
  return field;
}

function extraCellsEmpty(row: string[], from: number): boolean {
  for (let i = from; i < row.length; i++) if (row[i]!.trim() !== '') return false;
  return true;
}

function clip(cell: string): string {
  return cell.length > 24 ? `${cell.slice(0, 24)}…` : cell;
}

/** Unit conversion of a column read raw for a sample transform: none. */
const IDENTITY: UnitConversion = { ...defaultConversion('alpha'), scale: 1, offset: 0, label: 'as written' };

/** Read a whole run file held in memory (tests, the browser host's small files). */
export function readRunText(
  file: string,
  text: string,
  options?: { mapping?: ColumnMapping; limits?: Partial<ReaderLimits>; grouping?: GroupingOptions; sampleTransform?: SampleTransform },
): RunData {
  const reader = new RunFileReader(file, options);
  reader.push(text);
  return reader.finish();
}
