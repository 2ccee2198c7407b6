/**
 * Generated run files for the fuzz tests: a table (from a sample file, or a synthetic sweep whose
 * loads follow a plausible lift curve so that many cases reduce all the way), bent by a few
 * structural mutations (columns dropped, doubled or renamed, bad units, nasty cells, short and long
 * rows, junk lines), written with a chosen delimiter, quoting and line endings, and finally damaged
 * at the byte level (BOMs, UTF-16, truncation, injected bytes) — or replaced by noise altogether.
 * Every choice is plain data, so a failing case prints as something a person can read and replay.
 */
import fc from 'fast-check';
import { lookupUnit } from '../../core/physics/units.ts';
import { RUN_SETUPS, SEED_RUNS, type RunSetupKey } from './inputs.ts';
import { uniform } from '../support/random.ts';

export interface RunCase {
  /** The file's bytes, as the disk holds them. */
  bytes: Uint8Array;
  /** Character offsets where the decoded text is cut into chunks when streamed to the reader. */
  cuts: number[];
  setupKey: RunSetupKey;
  /** "run": the fuzzed file is the run; "tare": it is the wind-off tare of a known-good run. */
  role: 'run' | 'tare';
  noCorrections: boolean;
  format: 'json' | 'csv';
}

interface Table {
  pre: string[];
  header: string[];
  rows: string[][];
}

// ---------------------------------------------------------------- tables

/** A sample file as a table (metadata lines kept as they are). */
function tableOf(text: string): Table {
  const lines = text.replace(/\r\n?/g, '\n').replace(/\n$/, '').split('\n');
  const h = lines.findIndex((l) => !l.startsWith('#'));
  const d = lines[h]!.includes('\t') ? '\t' : ',';
  return { pre: lines.slice(0, h), header: lines[h]!.split(d), rows: lines.slice(h + 1).map((l) => l.split(d)) };
}
const SEED_TABLES = SEED_RUNS.map(tableOf);

const UNITS: Record<string, string[]> = {
  alpha: ['deg', 'rad', '°', 'degrees'],
  dp_pitot: ['Pa', 'kPa', 'inH2O', 'mmH2O', 'psi', 'torr', 'mbar', 'hPa'],
  p_static: ['Pa', 'kPa', 'hPa', 'mbar', 'psi', 'torr', 'bar'],
  t_total: ['degC', 'K', 'degF', '°C'],
  rh: ['%', 'fraction'],
  lift: ['N', 'lbf', 'kgf'],
  drag: ['N', 'lbf', 'kgf'],
  side: ['N', 'lbf'],
  normal: ['N', 'lbf', 'kgf'],
  axial: ['N', 'lbf', 'kgf'],
  pitch: ['N m', 'lbf in', 'lbf ft', 'N·m'],
  roll: ['N m', 'lbf in'],
  yaw: ['N m', 'lbf ft'],
};

const PROFILES: readonly string[][] = [
  ['alpha', 'dp_pitot', 'p_static', 't_total', 'rh', 'lift', 'drag', 'pitch'],
  ['alpha', 'dp_pitot', 'lift', 'drag'],
  ['alpha', 'dp_pitot', 'p_static', 't_total', 'rh', 'normal', 'axial', 'pitch'],
  ['point', 'alpha', 'dp_pitot', 'p_static', 't_total', 'rh', 'lift', 'drag', 'pitch', 'side', 'roll', 'yaw'],
  ['alpha', 'lift', 'drag', 'pitch'],
  ['point', 'time', 'alpha', 'dp_pitot', 'lift', 'drag'],
];

/** Deterministic noise in [−0.5, 0.5) for a synthetic sweep. */
function noise(seed: number): () => number {
  const u = uniform(seed);
  return () => u() - 0.5;
}

interface Sweep {
  profile: number;
  units: number[];
  unitless: boolean;
  n: number;
  samples: number;
  alpha0: number;
  step: number;
  dp: number;
  digits: number;
  style: 'fixed' | 'precision' | 'exponent';
  seed: number;
}

const sweepArb: fc.Arbitrary<Sweep> = fc.record({
  profile: fc.nat(PROFILES.length - 1),
  units: fc.array(fc.nat(7), { minLength: 12, maxLength: 12 }),
  unitless: fc.boolean(),
  n: fc.oneof({ arbitrary: fc.integer({ min: 4, max: 30 }), weight: 4 }, { arbitrary: fc.integer({ min: 0, max: 3 }), weight: 1 }),
  samples: fc.oneof({ arbitrary: fc.constant(1), weight: 3 }, { arbitrary: fc.integer({ min: 2, max: 6 }), weight: 1 }),
  alpha0: fc.integer({ min: -12, max: 2 }),
  step: fc.constantFrom(0.5, 1, 2, 2.5),
  dp: fc.integer({ min: 80, max: 2500 }),
  digits: fc.integer({ min: 1, max: 8 }),
  style: fc.constantFrom('fixed', 'precision', 'exponent'),
  seed: fc.integer(),
});

/**
 * A synthetic sweep: CL = 0.08·(α + 2) up to a stall near 12°, CD = 0.01 + 0.05·CL², q = dp, S = 0.2 m²,
 * c = 0.225 m (invented test data shaped like a wing's polar, not a measurement).
 */
function sweepTable(s: Sweep): Table {
  const cols = PROFILES[s.profile]!;
  const rnd = noise(s.seed);
  const unitOf = cols.map((c, i) => {
    const list = UNITS[c];
    return list && !s.unitless ? list[s.units[i]! % list.length]! : undefined;
  });
  const header = cols.map((c, i) => (unitOf[i] ? `${c} [${unitOf[i]}]` : c));
  const fmt = (x: number) => (s.style === 'fixed' ? x.toFixed(Math.min(s.digits, 6)) : s.style === 'precision' ? x.toPrecision(s.digits) : x.toExponential(s.digits - 1));
  const rows: string[][] = [];
  for (let i = 0; i < s.n; i++) {
    const aDeg = s.alpha0 + i * s.step;
    const cl = aDeg < 12 ? 0.08 * (aDeg + 2) : 0.08 * 14 - 0.05 * (aDeg - 12) ** 2;
    const cd = 0.01 + 0.05 * cl * cl;
    for (let k = 0; k < s.samples; k++) {
      const q = s.dp * (1 + 0.004 * rnd());
      const L = q * 0.2 * cl + 0.3 * rnd();
      const D = q * 0.2 * cd + 0.02 * rnd();
      const a = (aDeg + 0.01 * rnd()) * (Math.PI / 180);
      const si: Record<string, number> = {
        point: i + 1,
        time: (i * s.samples + k) * 0.01,
        alpha: a,
        dp_pitot: q,
        p_static: 99_000 + 300 * rnd(),
        t_total: 292 + rnd(),
        rh: 0.5 + 0.1 * rnd(),
        lift: L,
        drag: D,
        normal: L * Math.cos(a) + D * Math.sin(a),
        axial: -L * Math.sin(a) + D * Math.cos(a),
        pitch: -0.02 * L + 0.05 * rnd(),
        side: 0.2 * rnd(),
        roll: 0.05 * rnd(),
        yaw: 0.05 * rnd(),
      };
      rows.push(
        cols.map((c, j) => {
          if (c === 'point') return String(i + 1);
          const conv = lookupUnit(unitOf[j] ?? DEFAULT_UNIT[c] ?? '1');
          const v = si[c]!;
          return fmt(conv ? (v - conv.offset) / conv.scale : v);
        }),
      );
    }
  }
  return { pre: s.seed % 3 === 0 ? [] : ['# run: 900', '# note: generated by the fuzz tests (invented data)'], header, rows };
}
const DEFAULT_UNIT: Record<string, string> = { alpha: 'deg', t_total: 'degC', rh: '%' };

// ---------------------------------------------------------------- mutations

export const NASTY_CELLS: readonly string[] = [
  '', ' ', 'NaN', 'nan', 'Infinity', '-Infinity', '+Infinity', 'inf', '1e309', '-1e309', '1e308', '-1e308',
  '1.7976931348623157e308', '-1.7976931348623157e308', '5e-324', '-5e-324', '1e-320', '0', '-0', '0x1A', '0b11',
  '1_000', '1,5', '1.5.3', '+.5', '.', '-', 'e5', '1e', '١٢٣', '１２', '"1.5"', '"1.5', '1.5"', '"', '""', '\u00a01.5',
  ' 1.5 ', 'true', 'null', '#5', '=1+1', '@SUM(A1)', '\t', '1 000', '12abc', '--1', '1E5', '000001', '9'.repeat(400),
  `0.${'0'.repeat(400)}1`, '1e-400', '\u0000', '\ufeff1', '1\r', '\u2028',
];

const HEADER_JUNK: readonly string[] = [
  '', ' ', 'alpha [furlong]', 'dp_pitot [lbf]', 'lift [Pa]', 'alpha [', 'alpha [deg', 'alpha]', 'alpha [deg] [rad]', 'ALPHA',
  ' Lift ', 'dp_pitot []', 'pitch [N m m]', 'rh [%%]', 't_total [°F]', 'point', 'Point [s]', 'α', 'alpha\u0000', '"alpha"',
  'lift, drag', 'time [s]', 'angle', 'unknown', '#alpha', 'alpha [deg]\r', 'dp_pitot [inh2o]', 'p_static [KPA]',
];

type Mutation =
  | { kind: 'dropColumn'; c: number }
  | { kind: 'doubleColumn'; c: number }
  | { kind: 'renameColumn'; c: number; name: string }
  | { kind: 'addColumn'; c: number; name: string; cell: string }
  | { kind: 'setCell'; r: number; c: number; cell: string }
  | { kind: 'fillColumn'; c: number; cell: string }
  | { kind: 'scaleColumn'; c: number; factor: number }
  | { kind: 'shortRow'; r: number; drop: number }
  | { kind: 'longRow'; r: number; cells: string[] }
  | { kind: 'insertLine'; r: number; line: string }
  | { kind: 'junkBeforeHeader'; line: string }
  | { kind: 'duplicateRows'; r: number; count: number }
  | { kind: 'reverseRows' }
  | { kind: 'dropRows'; r: number; count: number }
  | { kind: 'pointKeys'; keys: string[] };

const cellArb: fc.Arbitrary<string> = fc.oneof(
  { arbitrary: fc.constantFrom(...NASTY_CELLS), weight: 6 },
  { arbitrary: fc.double().map(String), weight: 2 },
  { arbitrary: fc.string({ unit: 'binary', maxLength: 6 }), weight: 1 },
  { arbitrary: fc.string({ unit: 'grapheme', maxLength: 6 }), weight: 1 },
);

const lineArb: fc.Arbitrary<string> = fc.oneof(
  fc.constantFrom('', '   ', '#', '# :', '#: value', '# key:', '# run:', '# configuration: =HYPERLINK("x")', ',,,,', ';;;', '\t\t', '"', '"",""', 'END', '# run: 1\r'),
  fc.string({ unit: 'grapheme', maxLength: 20 }),
  fc.string({ unit: 'binary', maxLength: 20 }),
);

const mutationArb: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('dropColumn' as const), c: fc.nat() }),
  fc.record({ kind: fc.constant('doubleColumn' as const), c: fc.nat() }),
  fc.record({ kind: fc.constant('renameColumn' as const), c: fc.nat(), name: fc.oneof(fc.constantFrom(...HEADER_JUNK), fc.string({ unit: 'grapheme', maxLength: 10 })) }),
  fc.record({ kind: fc.constant('addColumn' as const), c: fc.nat(), name: fc.constantFrom(...HEADER_JUNK, 'side', 'roll', 'yaw', 'p_static', 'rh'), cell: cellArb }),
  { arbitrary: fc.record({ kind: fc.constant('setCell' as const), r: fc.nat(), c: fc.nat(), cell: cellArb }), weight: 4 },
  fc.record({ kind: fc.constant('fillColumn' as const), c: fc.nat(), cell: fc.oneof(cellArb, fc.constantFrom('0', '1', '-5', '1e-300', '1e300')) }),
  fc.record({
    kind: fc.constant('scaleColumn' as const),
    c: fc.nat(),
    factor: fc.constantFrom(1e-300, 1e-30, 1e-9, -1, 0, 1e6, 1e30, 1e150, 1e300, 1.5e308),
  }),
  fc.record({ kind: fc.constant('shortRow' as const), r: fc.nat(), drop: fc.integer({ min: 1, max: 20 }) }),
  fc.record({ kind: fc.constant('longRow' as const), r: fc.nat(), cells: fc.array(cellArb, { minLength: 1, maxLength: 4 }) }),
  fc.record({ kind: fc.constant('insertLine' as const), r: fc.nat(), line: lineArb }),
  fc.record({ kind: fc.constant('junkBeforeHeader' as const), line: fc.oneof(lineArb, fc.constantFrom('DAQ export v3.2', 'Channel,Value', 'Time;Date')) }),
  fc.record({ kind: fc.constant('duplicateRows' as const), r: fc.nat(), count: fc.integer({ min: 1, max: 5 }) }),
  fc.constant({ kind: 'reverseRows' as const }),
  fc.record({ kind: fc.constant('dropRows' as const), r: fc.nat(), count: fc.integer({ min: 1, max: 40 }) }),
  fc.record({ kind: fc.constant('pointKeys' as const), keys: fc.array(fc.constantFrom('1', '1', '2', ' 2', '02', '', 'a', '1.0', '#3', '"4"'), { minLength: 1, maxLength: 5 }) }),
);

function applyMutation(t: Table, m: Mutation): void {
  const width = t.header.length;
  const col = (c: number) => (width === 0 ? 0 : c % width);
  const row = (r: number) => (t.rows.length === 0 ? -1 : r % t.rows.length);
  switch (m.kind) {
    case 'dropColumn': {
      if (width === 0) return;
      const c = col(m.c);
      t.header.splice(c, 1);
      for (const r of t.rows) r.splice(c, 1);
      return;
    }
    case 'doubleColumn': {
      if (width === 0) return;
      const c = col(m.c);
      t.header.splice(c, 0, t.header[c]!);
      for (const r of t.rows) r.splice(c, 0, r[c] ?? '');
      return;
    }
    case 'renameColumn':
      if (width > 0) t.header[col(m.c)] = m.name;
      return;
    case 'addColumn': {
      const c = width === 0 ? 0 : m.c % (width + 1);
      t.header.splice(c, 0, m.name);
      for (const r of t.rows) r.splice(c, 0, m.cell);
      return;
    }
    case 'setCell': {
      const r = row(m.r);
      if (r >= 0 && t.rows[r]!.length > 0) t.rows[r]![m.c % t.rows[r]!.length] = m.cell;
      return;
    }
    case 'fillColumn': {
      const c = col(m.c);
      for (const r of t.rows) if (c < r.length) r[c] = m.cell;
      return;
    }
    case 'scaleColumn': {
      const c = col(m.c);
      for (const r of t.rows) if (c < r.length && r[c] !== '' && Number.isFinite(+r[c]!)) r[c] = String(+r[c]! * m.factor);
      return;
    }
    case 'shortRow': {
      const r = row(m.r);
      if (r >= 0) t.rows[r]!.splice(Math.max(0, t.rows[r]!.length - m.drop));
      return;
    }
    case 'longRow': {
      const r = row(m.r);
      if (r >= 0) t.rows[r]!.push(...m.cells);
      return;
    }
    case 'insertLine':
      t.rows.splice(t.rows.length === 0 ? 0 : m.r % (t.rows.length + 1), 0, [m.line]);
      return;
    case 'junkBeforeHeader':
      t.pre.push(m.line);
      return;
    case 'duplicateRows': {
      const r = row(m.r);
      if (r >= 0) t.rows.splice(r, 0, ...Array.from({ length: m.count }, () => [...t.rows[r]!]));
      return;
    }
    case 'reverseRows':
      t.rows.reverse();
      return;
    case 'dropRows': {
      const r = row(m.r);
      if (r >= 0) t.rows.splice(r, m.count);
      return;
    }
    case 'pointKeys': {
      let c = t.header.findIndex((h) => h.trim().toLowerCase() === 'point');
      if (c < 0) {
        t.header.unshift('point');
        t.rows.forEach((r) => r.unshift(''));
        c = 0;
      }
      t.rows.forEach((r, i) => (r[c] = m.keys[i % m.keys.length]!));
      return;
    }
  }
}

// ---------------------------------------------------------------- writing

interface Layout {
  delimiter: ',' | ';' | '\t' | '|' | ' ' | 'mixed';
  decimalComma: boolean;
  quoting: 'none' | 'all' | 'some' | 'unbalanced';
  eol: '\n' | '\r\n' | '\r' | 'mixed';
  finalNewline: boolean;
  seed: number;
}

const layoutArb: fc.Arbitrary<Layout> = fc.record({
  delimiter: fc.oneof(
    { arbitrary: fc.constant(',' as const), weight: 6 },
    { arbitrary: fc.constant(';' as const), weight: 2 },
    { arbitrary: fc.constant('\t' as const), weight: 2 },
    { arbitrary: fc.constantFrom('|' as const, ' ' as const, 'mixed' as const), weight: 1 },
  ),
  decimalComma: fc.boolean(),
  quoting: fc.oneof({ arbitrary: fc.constant('none' as const), weight: 6 }, { arbitrary: fc.constantFrom('all' as const, 'some' as const, 'unbalanced' as const), weight: 1 }),
  eol: fc.oneof({ arbitrary: fc.constant('\n' as const), weight: 4 }, { arbitrary: fc.constantFrom('\r\n' as const, '\r' as const, 'mixed' as const), weight: 2 }),
  finalNewline: fc.oneof({ arbitrary: fc.constant(true), weight: 4 }, { arbitrary: fc.constant(false), weight: 1 }),
  seed: fc.nat(),
});

function writeTable(t: Table, l: Layout): string {
  const pick = noise(l.seed);
  const D = [',', ';', '\t'] as const;
  const EOL = ['\n', '\r\n', '\r'] as const;
  const delim = () => (l.delimiter === 'mixed' ? D[Math.floor((pick() + 0.5) * 3) % 3]! : l.delimiter);
  const eol = () => (l.eol === 'mixed' ? EOL[Math.floor((pick() + 0.5) * 3) % 3]! : l.eol);
  const unbalancedRow = t.rows.length > 0 ? l.seed % (t.rows.length + 1) : 0; // row index + 1; 0 = header
  const cell = (c: string, i: number, r: number, header: boolean) => {
    let v = !header && l.delimiter === ';' && l.decimalComma ? c.replace('.', ',') : c;
    if (l.quoting === 'all' || (l.quoting === 'some' && i % 3 === 0)) v = `"${v.replace(/"/g, '""')}"`;
    if (l.quoting === 'unbalanced' && r === unbalancedRow && i === 1) v = `"${v}`;
    return v;
  };
  const lines = [...t.pre, ...[t.header, ...t.rows].map((cells, r) => cells.map((c, i) => cell(c, i, r, r === 0)).join(delim()))];
  let text = '';
  lines.forEach((line, i) => (text += line + (i < lines.length - 1 || l.finalNewline ? eol() : '')));
  return text;
}

// ---------------------------------------------------------------- bytes

interface Damage {
  bom: 'none' | 'utf8' | 'utf8-twice' | 'utf16le' | 'utf16be';
  truncateAt: number | null;
  inject: { at: number; bytes: Uint8Array } | null;
}

const damageArb: fc.Arbitrary<Damage> = fc.record({
  bom: fc.oneof({ arbitrary: fc.constant('none' as const), weight: 12 }, { arbitrary: fc.constantFrom('utf8' as const, 'utf8-twice' as const, 'utf16le' as const, 'utf16be' as const), weight: 2 }),
  truncateAt: fc.oneof({ arbitrary: fc.constant(null), weight: 6 }, { arbitrary: fc.nat(), weight: 1 }),
  inject: fc.oneof({ arbitrary: fc.constant(null), weight: 8 }, { arbitrary: fc.record({ at: fc.nat(), bytes: fc.uint8Array({ minLength: 1, maxLength: 12 }) }), weight: 1 }),
});

function encode(text: string, d: Damage): Uint8Array {
  let bytes: Buffer;
  if (d.bom === 'utf16le') bytes = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]);
  else if (d.bom === 'utf16be') bytes = Buffer.concat([Buffer.from([0xfe, 0xff]), Buffer.from(text, 'utf16le').swap16()]);
  else bytes = Buffer.from((d.bom === 'utf8' ? '\ufeff' : d.bom === 'utf8-twice' ? '\ufeff\ufeff' : '') + text, 'utf8');
  if (d.truncateAt !== null && bytes.length > 0) bytes = bytes.subarray(0, d.truncateAt % bytes.length);
  if (d.inject) {
    const at = bytes.length === 0 ? 0 : d.inject.at % bytes.length;
    bytes = Buffer.concat([bytes.subarray(0, at), d.inject.bytes, bytes.subarray(at)]);
  }
  return new Uint8Array(bytes);
}

/** Files that are not tables at all. */
const noiseFileArb: fc.Arbitrary<Uint8Array> = fc.oneof(
  fc.uint8Array({ maxLength: 400 }),
  fc.string({ unit: 'binary', maxLength: 300 }).map((s) => new Uint8Array(Buffer.from(s, 'utf8'))),
  fc.string({ unit: 'grapheme', maxLength: 300 }).map((s) => new Uint8Array(Buffer.from(s, 'utf8'))),
  fc.constantFrom('', '\n', '\r\n\r\n', '   \n\t\n', '\ufeff', '# run: 5\n# note: only comments\n', 'alpha,dp_pitot,lift,drag\n', 'alpha,dp_pitot,lift,drag', ',,,\n,,,\n', '"', '"""\n"').map((s) => new Uint8Array(Buffer.from(s, 'utf8'))),
);

// ---------------------------------------------------------------- the case

const tableArb: fc.Arbitrary<Table> = fc.oneof(fc.nat(SEED_TABLES.length - 1).map((i) => structuredClone(SEED_TABLES[i]!)), sweepArb.map(sweepTable));

const bytesArb: fc.Arbitrary<Uint8Array> = fc.oneof(
  {
    weight: 10,
    arbitrary: fc
      .tuple(tableArb, fc.array(mutationArb, { maxLength: 4 }), layoutArb, damageArb)
      .map(([t, ms, layout, damage]) => {
        for (const m of ms) applyMutation(t, m);
        return encode(writeTable(t, layout), damage);
      }),
  },
  { weight: 1, arbitrary: noiseFileArb },
);

export const runCaseArb: fc.Arbitrary<RunCase> = fc.record({
  bytes: bytesArb,
  cuts: fc.array(fc.nat(), { maxLength: 5 }),
  setupKey: fc.oneof(
    { arbitrary: fc.constantFrom<RunSetupKey>('wind3d', 'wind2d', 'body3d', 'bare3d', 'wind3dMaskell'), weight: 20 },
    { arbitrary: fc.constant<RunSetupKey>('wind3dImages'), weight: 1 },
  ),
  role: fc.oneof({ arbitrary: fc.constant('run' as const), weight: 5 }, { arbitrary: fc.constant('tare' as const), weight: 1 }),
  noCorrections: fc.oneof({ arbitrary: fc.constant(false), weight: 5 }, { arbitrary: fc.constant(true), weight: 1 }),
  format: fc.constantFrom('json' as const, 'csv' as const),
}).map((c) => (c.role === 'tare' && RUN_SETUPS[c.setupKey].tare === undefined ? { ...c, role: 'run' as const } : c));

/** The text a reader sees, cut into the case's chunks (never empty ones; none for an empty file, as a file stream gives). */
export function chunksOf(text: string, cuts: number[]): string[] {
  if (text.length === 0) return [];
  const at = [...new Set(cuts.map((c) => c % text.length).filter((c) => c > 0))].sort((a, b) => a - b);
  const out: string[] = [];
  let from = 0;
  for (const c of at) {
    out.push(text.slice(from, c));
    from = c;
  }
  out.push(text.slice(from));
  return out;
}
