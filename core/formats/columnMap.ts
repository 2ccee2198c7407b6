/**
 * Column maps: one small JSON document that says what each column of a tunnel's own file means,
 * written once per facility and used alike by the command line (`--columns MAP.json`) and by the
 * window's column-assignment step (which saves and opens the same document).
 *
 * ```json
 * { "format": "sweepbook-columns", "version": 1,
 *   "columns": { "AoA (deg)": { "channel": "alpha" },
 *                "Mz": { "channel": "pitch", "unit": "N m", "scale": -1 },
 *                "Note": null } }
 * ```
 * A key is the header cell exactly as written (surrounding spaces trimmed). `unit` overrides the
 * header's or units row's unit; `scale` and `offset` apply in that unit before conversion to SI
 * (value = raw·scale + offset); `null` ignores the column.
 *
 * Also here: a light look at a file's header (`inspectHeader`), the guess of each column's channel
 * (`guessColumns`, behind `sweepbook columns`), and the message that lists the file's columns with
 * the closest matches when a required channel is missing.
 */
import { CHANNELS, CHANNEL_NAMES, POINT_COLUMN, isChannel, type Channel } from './channels.ts';
import { InputError } from '../contract/messages.ts';
import { lookupUnit } from '../physics/units.ts';
import {
  detectDelimiter,
  joinUnitWords,
  splitHeaderCell,
  splitHeaderLine,
  splitWhitespace,
  unitsRow,
  WHITESPACE,
  type ColumnMapping,
  type HeaderCell,
} from './runFile.ts';
import { editDistance, nearest, parseJsonText } from '../setup/schema.ts';

export const COLUMN_MAP_FORMAT = 'sweepbook-columns';
export const COLUMN_MAP_VERSION = 1;

export interface ColumnMapEntry {
  channel: Channel | typeof POINT_COLUMN;
  unit?: string;
  scale?: number;
  offset?: number;
}

export interface ColumnMap {
  format: typeof COLUMN_MAP_FORMAT;
  version: typeof COLUMN_MAP_VERSION;
  columns: Record<string, ColumnMapEntry | null>;
}

const ENTRY_KEYS = ['channel', 'unit', 'scale', 'offset'];
const TOP_KEYS = ['format', 'version', 'columns'];

/** Channels a map may assign: the contract's channels and `point`. */
export const MAP_CHANNELS: readonly string[] = [POINT_COLUMN, ...CHANNEL_NAMES];

/**
 * Parse and check a column map's text. Every refusal names the map file, the line and column of
 * the offending key or value, and the key (`columns["Mz"].unit`). Nothing is guessed.
 */
export function parseColumnMap(file: string, text: string): ColumnMap {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const json = parseJsonText(file, text);
  const fail = (field: string, where: string | undefined, message: string): never => {
    throw new InputError({ file, ...(where === undefined ? {} : placeOfKey(body, where)), field, message });
  };
  if (json === null || typeof json !== 'object' || Array.isArray(json))
    fail('(document)', undefined, 'expected an object with "format", "version" and "columns"');
  const doc = json as Record<string, unknown>;
  for (const k of Object.keys(doc)) {
    if (!TOP_KEYS.includes(k)) {
      const near = nearest(k, TOP_KEYS);
      fail(k, k, `unknown key${near ? ` (did you mean "${near}"?)` : ''}; a column map has ${TOP_KEYS.map((t) => `"${t}"`).join(', ')}`);
    }
  }
  if (doc['format'] !== COLUMN_MAP_FORMAT)
    fail('format', 'format', `expected "${COLUMN_MAP_FORMAT}"${doc['format'] === undefined ? ' (missing)' : `, not ${JSON.stringify(doc['format'])}`}`);
  if (doc['version'] !== COLUMN_MAP_VERSION)
    fail(
      'version',
      'version',
      `expected ${COLUMN_MAP_VERSION}${doc['version'] === undefined ? ' (missing)' : `, not ${JSON.stringify(doc['version'])}; this map was written by a newer version`}`,
    );
  const cols = doc['columns'];
  if (cols === null || typeof cols !== 'object' || Array.isArray(cols))
    fail('columns', 'columns', 'expected an object: header cell as written → { "channel": … } or null');
  const columns: Record<string, ColumnMapEntry | null> = {};
  const taken = new Map<string, string>();
  for (const [rawKey, value] of Object.entries(cols as Record<string, unknown>)) {
    const key = rawKey.trim();
    const field = `columns[${JSON.stringify(rawKey)}]`;
    if (key === '') fail(field, rawKey, 'a key must be a header cell as written, not empty');
    if (Object.prototype.hasOwnProperty.call(columns, key)) fail(field, rawKey, `"${key}" is given twice (keys are trimmed of surrounding spaces)`);
    if (value === null) {
      columns[key] = null;
      continue;
    }
    if (typeof value !== 'object' || Array.isArray(value)) fail(field, rawKey, 'expected { "channel": … } or null (to ignore the column)');
    const v = value as Record<string, unknown>;
    for (const k of Object.keys(v)) {
      if (!ENTRY_KEYS.includes(k)) {
        const near = nearest(k, ENTRY_KEYS);
        fail(`${field}.${k}`, k, `unknown key${near ? ` (did you mean "${near}"?)` : ''}; an entry has ${ENTRY_KEYS.map((t) => `"${t}"`).join(', ')}`);
      }
    }
    const channel = v['channel'];
    if (typeof channel !== 'string' || !MAP_CHANNELS.includes(channel)) {
      const near = typeof channel === 'string' ? nearest(channel, [...MAP_CHANNELS]) : undefined;
      fail(
        `${field}.channel`,
        rawKey,
        `${channel === undefined ? 'missing' : `unknown channel ${JSON.stringify(channel)}`}${near ? ` (did you mean "${near}"?)` : ''}; one of ${MAP_CHANNELS.join(', ')}`,
      );
    }
    const ch = channel as Channel | typeof POINT_COLUMN;
    const other = taken.get(ch);
    if (other !== undefined) fail(`${field}.channel`, rawKey, `channel "${ch}" is also given to "${other}"; one column per channel`);
    taken.set(ch, key);
    const entry: ColumnMapEntry = { channel: ch };
    if (v['unit'] !== undefined) {
      const unit = v['unit'];
      if (typeof unit !== 'string') fail(`${field}.unit`, rawKey, 'expected a unit written as text, e.g. "N m"');
      if (ch === POINT_COLUMN) fail(`${field}.unit`, rawKey, 'the point column takes no unit');
      const conv = lookupUnit(unit as string);
      const quantity = CHANNELS[ch as Channel].quantity;
      if (!conv) fail(`${field}.unit`, rawKey, `unknown unit ${JSON.stringify(unit)}`);
      if (conv!.quantity !== quantity)
        fail(`${field}.unit`, rawKey, `"${unit as string}" is a ${conv!.quantity} unit; channel "${ch}" needs a ${quantity} unit`);
      entry.unit = unit as string;
    }
    for (const k of ['scale', 'offset'] as const) {
      if (v[k] === undefined) continue;
      if (typeof v[k] !== 'number' || !Number.isFinite(v[k])) fail(`${field}.${k}`, rawKey, 'expected a finite number');
      if (ch === POINT_COLUMN) fail(`${field}.${k}`, rawKey, 'the point column is a label; it takes no scale or offset');
      if (k === 'scale' && v[k] === 0) fail(`${field}.scale`, rawKey, 'a scale of 0 would erase the column');
      entry[k] = v[k] as number;
    }
    columns[key] = entry;
  }
  return { format: COLUMN_MAP_FORMAT, version: COLUMN_MAP_VERSION, columns };
}

/** The map as the JSON text a user edits: two-space indent, one column per line. */
export function serializeColumnMap(map: ColumnMap): string {
  const lines = Object.entries(map.columns).map(
    ([k, v]) => `    ${JSON.stringify(k)}: ${v === null ? 'null' : JSON.stringify(compactEntry(v)).replace(/,"/g, ', "').replace(/":/g, '": ')}`,
  );
  return `{\n  "format": "${COLUMN_MAP_FORMAT}",\n  "version": ${COLUMN_MAP_VERSION},\n  "columns": {\n${lines.join(',\n')}\n  }\n}\n`;
}

function compactEntry(e: ColumnMapEntry): ColumnMapEntry {
  const out: ColumnMapEntry = { channel: e.channel };
  if (e.unit !== undefined) out.unit = e.unit;
  if (e.scale !== undefined && e.scale !== 1) out.scale = e.scale;
  if (e.offset !== undefined && e.offset !== 0) out.offset = e.offset;
  return out;
}

/** The reader's column assignment from a map; `source` (the map's file name) is named in messages. */
export function readerMapping(map: ColumnMap, source: string): ColumnMapping {
  return { cells: { ...map.columns }, source };
}

/** A file's header as found in its first lines, before any reading of values. */
export interface HeaderSketch {
  metadata: Record<string, string>;
  headerLine: number;
  unitsLine: number | undefined;
  delimiter: string;
  cells: HeaderCell[];
  /** The first data row's cells (for showing an example value), when there is one. */
  example: string[];
}

/**
 * Header, units row and first data row of a file's text (its first few kilobytes are enough). The
 * same splitting rules as the reader. Throws InputError when no header is found.
 */
export function inspectHeader(file: string, text: string): HeaderSketch {
  const lines = text.replace(/^\ufeff/, '').split(/\r\n|\n|\r/);
  const metadata: Record<string, string> = {};
  let i = 0;
  for (; i < lines.length; i++) {
    const t = lines[i]!.trim();
    if (t === '') continue;
    if (t.startsWith('#')) {
      const m = /^#\s*([^:]+?)\s*:\s*(.*)$/.exec(t);
      if (m) metadata[m[1]!.toLowerCase()] = m[2]!.trim();
      continue;
    }
    break;
  }
  if (i >= lines.length)
    throw new InputError({
      file,
      line: Math.max(1, lines.length - (lines[lines.length - 1] === '' ? 1 : 0)),
      message: 'no header line found (the file is empty or holds only comments)',
    });
  const headerLine = i + 1;
  const delimiter = detectDelimiter(lines[i]!);
  const split = (l: string) => (delimiter === WHITESPACE ? splitWhitespace(l) : l.split(delimiter).map((c) => c.trim()));
  const cells: HeaderCell[] = splitHeaderLine(lines[i]!, delimiter).map((t, k) => ({ text: t, ...splitHeaderCell(t), column: k + 1 }));
  let unitsLine: number | undefined;
  let j = i + 1;
  const next = lines[j];
  if (next !== undefined && next.trim() !== '') {
    const units = unitsRow(delimiter === WHITESPACE ? joinUnitWords(split(next), cells.length) : split(next), delimiter === ';');
    if (units) {
      unitsLine = j + 1;
      units.forEach((u, k) => {
        if (u !== '' && cells[k]) cells[k]!.unit = u;
      });
      j++;
    }
  }
  while (j < lines.length && (lines[j]!.trim() === '' || lines[j]!.trim().startsWith('#'))) j++;
  const example = j < lines.length ? split(lines[j]!) : [];
  return { metadata, headerLine, unitsLine, delimiter, cells, example };
}

/** Names people give each channel's column, normalised (lower case, letters and digits only). */
const NAMES: Record<string, readonly string[]> = {
  point: ['point', 'pt', 'pnt', 'pointno', 'pointnumber', 'tp', 'testpoint', 'seq'],
  alpha: ['alpha', 'aoa', 'angleofattack', 'alfa', 'incidence', 'angle', 'aa', 'alph'],
  dp_pitot: ['dppitot', 'pitot', 'dp', 'deltap', 'pitotdp', 'ppitot', 'dpp', 'impactpressure'],
  q: ['q', 'qinf', 'qbar', 'dynamicpressure', 'dynpress', 'pdyn', 'qdyn', 'qu'],
  dp_contraction: ['dpcontraction', 'contraction', 'dpc', 'dpcon', 'dpsettling', 'deltapc', 'settlingdp', 'dpn'],
  p_static: ['pstatic', 'ps', 'pbar', 'pbaro', 'barometer', 'baro', 'pamb', 'pambient', 'patm', 'p', 'staticpressure', 'pinf'],
  t_total: ['ttotal', 't0', 'temp', 'temperature', 'tamb', 'troom', 't', 'tt', 'tstag', 'tair', 'airtemp'],
  rh: ['rh', 'humidity', 'relhum', 'relativehumidity', 'hum'],
  lift: ['lift', 'l', 'liftforce', 'fl', 'lft'],
  drag: ['drag', 'd', 'dragforce', 'fd', 'drg'],
  side: ['side', 'sideforce', 'y', 'fy', 'sf'],
  normal: ['normal', 'normalforce', 'n', 'nf', 'fn', 'fz'],
  axial: ['axial', 'axialforce', 'af', 'fa', 'chordforce', 'fx'],
  pitch: ['pitch', 'pitchingmoment', 'pm', 'm', 'my', 'mp', 'moment', 'mz'],
  roll: ['roll', 'rollingmoment', 'rm', 'mx'],
  yaw: ['yaw', 'yawingmoment', 'ym', 'yawmoment'],
  time: ['time', 'clock', 'elapsed', 'timestamp', 'seconds', 'sec', 'timer'],
};

const norm = (s: string) => s.toLowerCase().replace(/[^a-z0-9]/g, '');

/** How well a header cell fits a channel, 0 … 1: its name (exact, a known name, a prefix, edit distance) and its unit's kind. */
export function channelScore(cell: HeaderCell, channel: Channel | typeof POINT_COLUMN): number {
  const name = norm(cell.name);
  if (name === '') return 0;
  const names = NAMES[channel]!;
  let s = 0;
  if (name === norm(channel)) s = 1;
  else if (names.includes(name)) s = 0.9 - names.indexOf(name) * 0.01;
  else {
    for (const n of names) {
      if (n.length >= 3 && (name.startsWith(n) || (name.length >= 3 && n.startsWith(name)))) s = Math.max(s, 0.6);
      else if (n.length >= 4 && name.includes(n)) s = Math.max(s, 0.5);
      const d = editDistance(name, n);
      if (n.length >= 4 && d <= Math.floor(n.length / 3)) s = Math.max(s, 0.55 - 0.05 * d);
    }
  }
  // a unit of the right kind makes a guess likelier; one of the wrong kind rules it out
  if (cell.unit !== undefined && channel !== POINT_COLUMN) {
    const conv = lookupUnit(cell.unit);
    if (conv) {
      if (conv.quantity === CHANNELS[channel].quantity) s += s > 0 ? 0.05 : 0.2;
      else if (!(conv.quantity === 'ratio' && CHANNELS[channel].quantity === 'ratio')) return 0;
    }
  }
  return Math.min(1, s);
}

export interface ColumnGuess {
  cell: HeaderCell;
  /** The channel guessed, or null when the column looks like none (it is then ignored). */
  channel: Channel | typeof POINT_COLUMN | null;
  /** How sure the guess is, 0 … 1. */
  score: number;
  /** Unit as written in the file, or the channel's default when none is written. */
  unit: string | undefined;
  /** True when the written unit is not one the reader knows (a map must give one). */
  unknownUnit: boolean;
}

/** Minimum score for a guess to be made (common practice: names and units both weigh in). */
const GUESS_THRESHOLD = 0.5;

/**
 * Each column's likely channel: the best-scoring pairs first, each channel to one column at most.
 * A guess is only a starting point for a map the user checks; the reader never acts on a guess.
 */
export function guessColumns(cells: HeaderCell[]): ColumnGuess[] {
  const pairs: { c: number; ch: Channel | typeof POINT_COLUMN; s: number }[] = [];
  cells.forEach((cell, c) => {
    for (const ch of MAP_CHANNELS as (Channel | typeof POINT_COLUMN)[]) {
      const s = channelScore(cell, ch);
      if (s >= GUESS_THRESHOLD) pairs.push({ c, ch, s });
    }
  });
  pairs.sort((a, b) => b.s - a.s || a.c - b.c);
  const byCell = new Map<number, { ch: Channel | typeof POINT_COLUMN; s: number }>();
  const used = new Set<string>();
  for (const p of pairs) {
    if (byCell.has(p.c) || used.has(p.ch)) continue;
    byCell.set(p.c, { ch: p.ch, s: p.s });
    used.add(p.ch);
  }
  return cells.map((cell, c) => {
    const g = byCell.get(c);
    const unknownUnit = cell.unit !== undefined && cell.unit !== '' && lookupUnit(cell.unit) === undefined;
    const unit = g && g.ch !== POINT_COLUMN ? (cell.unit && cell.unit !== '' ? cell.unit : undefined) : undefined;
    return { cell, channel: g?.ch ?? null, score: g?.s ?? 0, unit, unknownUnit };
  });
}

/** A ready map from guesses: guessed columns assigned (with the written unit), the rest ignored. */
export function columnMapFromGuesses(guesses: ColumnGuess[]): ColumnMap {
  const columns: Record<string, ColumnMapEntry | null> = {};
  for (const g of guesses) {
    if (g.cell.text === '' || Object.prototype.hasOwnProperty.call(columns, g.cell.text)) continue;
    if (g.channel === null) {
      columns[g.cell.text] = null;
      continue;
    }
    const entry: ColumnMapEntry = { channel: g.channel };
    if (g.channel !== POINT_COLUMN) {
      const written = g.unit !== undefined && !g.unknownUnit && lookupUnit(g.unit)?.quantity === CHANNELS[g.channel].quantity;
      entry.unit = written ? g.unit! : CHANNELS[g.channel].defaultUnit;
    }
    columns[g.cell.text] = entry;
  }
  return { format: COLUMN_MAP_FORMAT, version: COLUMN_MAP_VERSION, columns };
}

/**
 * The message for a required channel the file lacks: every column of the file, and the closest
 * matches for that channel, so the user can write the map entry straight away.
 */
export function missingChannelMessage(channel: string, why: string, cells: HeaderCell[]): string {
  const list = cells.map((c) => `${c.column} "${c.text}"`).join(', ');
  const ranked =
    isChannel(channel) || channel === POINT_COLUMN
      ? cells
          .map((c) => ({ c, s: Math.max(channelScore(c, channel as Channel), nameSimilarity(c.name, channel)) }))
          .filter((x) => x.s > 0.2)
          .sort((a, b) => b.s - a.s)
          .slice(0, 3)
      : [];
  const closest = ranked.length > 0 ? `; closest: ${ranked.map((x) => `"${x.c.text}" (column ${x.c.column})`).join(', ')}` : '';
  return `missing required column "${channel}" (${why}); the file's columns: ${list}${closest}. Assign columns with a column map (--columns MAP.json; \`sweepbook columns FILE --out MAP.json\` writes one to edit)`;
}

function nameSimilarity(a: string, b: string): number {
  const x = norm(a);
  const y = norm(b);
  if (x === '' || y === '') return 0;
  return 1 - editDistance(x, y) / Math.max(x.length, y.length);
}

function placeOf(text: string, pos: number): { line: number; column: number } {
  const before = text.slice(0, pos);
  return { line: before.split('\n').length, column: pos - before.lastIndexOf('\n') };
}

/** Line and column of the first `"key"` written as a JSON key in the text (good enough to point at it). */
function placeOfKey(text: string, key: string): { line?: number; column?: number } {
  const needle = JSON.stringify(key);
  let at = text.indexOf(needle);
  while (at >= 0) {
    const after = text.slice(at + needle.length).trimStart();
    if (after.startsWith(':')) return placeOf(text, at);
    at = text.indexOf(needle, at + 1);
  }
  return {};
}
