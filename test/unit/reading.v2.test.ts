import { describe, expect, it } from 'vitest';
import { InputError, formatNotice } from '../../core/contract/messages.ts';
import { readRunText, splitHeaderCell, detectDelimiter, WHITESPACE } from '../../core/formats/runFile.ts';
import { parseColumnMap, readerMapping } from '../../core/formats/columnMap.ts';

const ch = (run: ReturnType<typeof readRunText>, name: string, point = 0) => run.points[point]!.mean[run.channels.indexOf(name as never)]!;
const D = Math.PI / 180;

function errorOf(fn: () => unknown): string {
  try {
    fn();
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    return formatNotice((err as InputError).notice);
  }
  throw new Error('expected an InputError');
}

describe('header units in brackets, parentheses or a units row', () => {
  it('takes a unit in parentheses like one in brackets', () => {
    expect(splitHeaderCell('AoA (deg)')).toEqual({ name: 'AoA', unit: 'deg' });
    const run = readRunText('p.csv', 'alpha (deg),dp_pitot (inH2O),lift (lbf)\n2,1,1\n');
    expect(ch(run, 'alpha')).toBeCloseTo(2 * D, 14);
    expect(ch(run, 'dp_pitot')).toBeCloseTo(249.08891, 9);
    expect(ch(run, 'lift')).toBeCloseTo(4.4482216152605, 12);
  });

  it('reads a units row below the header: units, "/" or "-" (dimensionless) or empty (the default unit)', () => {
    const run = readRunText('u.csv', 'alpha,dp_pitot,rh,lift,drag\ndeg,kPa,-,,lbf\n2,0.5,0.4,10,1\n');
    expect(run.unitsLine).toBe(2);
    expect(ch(run, 'dp_pitot')).toBe(500);
    expect(ch(run, 'rh')).toBe(0.4); // "-": a fraction
    expect(ch(run, 'lift')).toBe(10); // empty: N
    expect(ch(run, 'drag')).toBeCloseTo(4.4482216152605, 12);
    expect(run.points[0]!.line).toBe(3);
  });

  it('refuses a units row cell that is not a unit, naming line and column', () => {
    expect(errorOf(() => readRunText('u.csv', 'alpha,dp_pitot,lift\ndeg,kPa,furlong\n1,2,3\n'))).toMatch(
      /^u\.csv:2:3: column "lift" \(lift\) has unit "furlong", which is not a known unit/,
    );
  });

  it('refuses a units row unit of the wrong kind, naming the units row line', () => {
    expect(errorOf(() => readRunText('u.csv', 'alpha,dp_pitot\ndeg,N\n1,2\n'))).toMatch(/^u\.csv:2:2: .*force unit, not a pressure unit/);
  });

  it('refuses a unit given twice that disagrees (header and units row)', () => {
    expect(errorOf(() => readRunText('u.csv', 'alpha [deg],dp_pitot\nrad,Pa\n1,2\n'))).toMatch(/^u\.csv:2:1: .*"deg" in the header and "rad" in the units row/);
  });

  it('takes a row of numbers below the header as data, not units', () => {
    const run = readRunText('n.csv', 'alpha,dp_pitot\n1,2\n3,4\n');
    expect(run.unitsLine).toBeUndefined();
    expect(run.rowsRead).toBe(2);
  });
});

describe('whitespace-aligned files', () => {
  it('detects columns aligned with spaces or tab runs, and keeps single-tab files tab-delimited', () => {
    expect(detectDelimiter('alpha   dp_pitot   lift')).toBe(WHITESPACE);
    expect(detectDelimiter('alpha\t\tdp_pitot\t\tlift')).toBe(WHITESPACE);
    expect(detectDelimiter('alpha\tdp_pitot\tlift')).toBe('\t');
    expect(detectDelimiter('alpha,dp_pitot')).toBe(',');
  });

  it('reads an aligned file with a units row whose units hold spaces ("degr. C", "in lbf")', () => {
    const text = [
      '# run: 7',
      '   alpha     dp_pitot   t_total   pitch',
      '   deg       mmH2O      degr. C   in lbf',
      '   -2.0      61.2       18.0      1.5',
      '\t 4.0 \t 61.0 \t 18.5 \t -1.5  ',
    ].join('\n');
    const run = readRunText('a.txt', text);
    expect(run.delimiter).toBe(WHITESPACE);
    expect(run.points).toHaveLength(2);
    expect(ch(run, 'dp_pitot')).toBeCloseTo(61.2 * 9.80665, 10);
    expect(ch(run, 't_total', 1)).toBeCloseTo(291.65, 10);
    expect(ch(run, 'pitch', 1)).toBeCloseTo(-1.5 * 0.1129848290276167, 12);
  });

  it('reads names holding single spaces when columns are two or more spaces apart, and units with spaces in brackets', async () => {
    const { splitHeaderLine } = await import('../../core/formats/runFile.ts');
    expect(splitHeaderLine('Angle of Attack   Lift force   Mz', WHITESPACE)).toEqual(['Angle of Attack', 'Lift force', 'Mz']);
    expect(splitHeaderLine('point  alpha [deg]  dp_pitot [Pa] p_static [Pa]  pitch [N m]', WHITESPACE)).toEqual([
      'point',
      'alpha [deg]',
      'dp_pitot [Pa]',
      'p_static [Pa]',
      'pitch [N m]',
    ]);
    expect(splitHeaderLine('alpha lift (N m)', WHITESPACE)).toEqual(['alpha', 'lift (N m)']);
  });

  it('keeps a bracketed unit written apart from its name in an aligned header', () => {
    const run = readRunText('b.txt', 'alpha [deg]   lift (lbf)\n1   2\n');
    expect(run.headerCells.map((c) => c.text)).toEqual(['alpha [deg]', 'lift (lbf)']);
    expect(ch(run, 'lift')).toBeCloseTo(2 * 4.4482216152605, 12);
  });
});

describe('numbers are decimal', () => {
  it.each(['0x10', '0b1', '0o7', '-0x1F', '+0B11'])('skips a row holding %s with a warning naming line and column', (cell) => {
    const run = readRunText('h.csv', `lift,drag\n1,1\n${cell},2\n3,3\n`);
    expect(run.rowsSkipped).toBe(1);
    expect(run.points.map((p) => p.line)).toEqual([2, 4]);
    expect(formatNotice(run.warnings[0]!)).toMatch(/^h\.csv:3:1: row skipped: .* is not a decimal number/);
  });

  it('skips a row with more cells than the header (a decimal comma in a comma file), naming line and column; never truncates it', () => {
    const run = readRunText('c.csv', 'lift,drag\n1.5,2.5\n1,5,2,5\n');
    expect(run.points).toHaveLength(1);
    expect(formatNotice(run.warnings[0]!)).toMatch(
      /^c\.csv:3:3: row skipped: 4 fields where the header has 2; column 3 has no header \(a decimal comma in a comma-separated file\?\)/,
    );
  });
});

describe('load cells reading mass', () => {
  it('turns kg and g into force with standard gravity, with a notice naming the column', () => {
    const run = readRunText('m.csv', 'alpha,lift [kg],drag [g]\n0,2,50\n');
    expect(ch(run, 'lift')).toBeCloseTo(2 * 9.80665, 12); // NIST SP 811 B.8: g_n = 9.806 65 m/s²
    expect(ch(run, 'drag')).toBeCloseTo(0.05 * 9.80665, 12);
    const notes = run.warnings.map(formatNotice);
    expect(notes[0]).toMatch(/^m\.csv:1:2: column "lift \[kg\]" \(lift\) is in kg, a mass: read as a load cell's indication, force = mass × 9\.80665/);
    expect(notes).toHaveLength(2);
  });
});

describe('grouping without a point column', () => {
  const rows = (list: [number, number][]) => 'alpha,dp_pitot,lift\n' + list.map(([a, dp], i) => `${a},${dp},${i}`).join('\n') + '\n';

  it("joins consecutive rows whose alpha stays within 0.2° of the group's first row (encoder jitter of 0.1°)", () => {
    const run = readRunText(
      'g.csv',
      rows([
        [0, 500],
        [0.1, 501],
        [-0.09, 499],
        [2, 500],
        [2.05, 500],
        [4, 500],
      ]),
    );
    expect(run.grouped).toBe(true);
    expect(run.points.map((p) => [p.key, p.n])).toEqual([
      ['2', 3],
      ['5', 2],
      ['7', 1],
    ]);
    expect(ch(run, 'lift')).toBeCloseTo(1, 12); // mean of 0, 1, 2
  });

  it('follows a finer tolerance from the setup', () => {
    const run = readRunText(
      'g.csv',
      rows([
        [0, 500],
        [0.1, 501],
        [0.2, 499],
      ]),
      { grouping: { alphaTolRad: 0.05 * D } },
    );
    expect(run.points).toHaveLength(3);
  });

  it('starts a new point where the wind state changes at the same angle (wind-off then wind-on)', () => {
    const run = readRunText(
      'g.csv',
      rows([
        [0, 0.3],
        [0, 0.2],
        [0, 500],
        [0, 502],
      ]),
    );
    expect(run.points.map((p) => p.n)).toEqual([2, 2]);
  });

  it('leaves files with a point column grouped by it', () => {
    // samples of point 1 within the grouping tolerance (0.1° of jitter); samples of one point id at two
    // angles are split instead (a point id restarted for a return sweep: streaming.test.ts)
    const run = readRunText('g.csv', 'point,alpha,dp_pitot\n1,0,500\n1,0.1,500\n2,3,500\n');
    expect(run.grouped).toBe(false);
    expect(run.points.map((p) => p.n)).toEqual([2, 1]);
  });

  it('streams the grouping alike whatever the chunking', async () => {
    const text = rows(Array.from({ length: 300 }, (_, i) => [Math.floor(i / 10) + (i % 3) * 0.05, 500] as [number, number]));
    const whole = readRunText('g.csv', text);
    const { RunFileReader } = await import('../../core/formats/runFile.ts');
    const r = new RunFileReader('g.csv');
    for (let i = 0; i < text.length; i += 7) r.push(text.slice(i, i + 7));
    const streamed = r.finish();
    expect(streamed.points.map((p) => [p.key, p.n])).toEqual(whole.points.map((p) => [p.key, p.n]));
    expect(whole.points).toHaveLength(30);
  });
});

describe('column maps applied by the reader', () => {
  const map = (columns: object) =>
    readerMapping(parseColumnMap('facility.json', JSON.stringify({ format: 'sweepbook-columns', version: 1, columns })), 'facility.json');

  it('assigns header cells as written, with unit override, scale and offset in that unit, and null to ignore', () => {
    const text = 'Angle of Attack [deg],Pbar,Mz,Note,Qinf\n4,1000,2,x,60\n';
    const m = map({
      'Angle of Attack [deg]': { channel: 'alpha' },
      Pbar: { channel: 'p_static', unit: 'hPa' },
      Mz: { channel: 'pitch', unit: 'N m', scale: -1 },
      Note: null,
      Qinf: { channel: 'q', unit: 'mmH2O', offset: 1 },
    });
    const run = readRunText('f.csv', text, { mapping: m });
    expect(run.channels).toEqual(['alpha', 'p_static', 'pitch', 'q']);
    expect(ch(run, 'alpha')).toBeCloseTo(4 * D, 14);
    expect(ch(run, 'p_static')).toBe(100000);
    expect(ch(run, 'pitch')).toBe(-2);
    expect(ch(run, 'q')).toBeCloseTo(61 * 9.80665, 10); // (raw + offset) in mmH2O, then to Pa
  });

  it('keeps the contract meaning of unmapped columns named like a channel', () => {
    const run = readRunText('f.csv', 'AoA,lift\n1,2\n', { mapping: map({ AoA: { channel: 'alpha' } }) });
    expect(run.channels).toEqual(['alpha', 'lift']);
  });

  it('refuses a map naming a column the file lacks, naming the map file and the key', () => {
    const msg = errorOf(() => readRunText('f.csv', 'AoA,lift\n1,2\n', { mapping: map({ 'Angle of attack': { channel: 'alpha' } }) }));
    expect(msg).toMatch(/^facility\.json: columns\["Angle of attack"\]: names a column that f\.csv does not have \(its header, line 1: "AoA", "lift"\)/);
  });

  it("passes over missing columns when reading a tare with its run's map", () => {
    const m = { ...map({ AoA: { channel: 'alpha' }, Qinf: { channel: 'q' } }), partial: true };
    const run = readRunText('t.csv', 'AoA,lift\n1,2\n', { mapping: m });
    expect(run.channels).toEqual(['alpha', 'lift']);
  });
});

describe('aligned files and units rows stream alike whatever the chunking', () => {
  it('gives the same points, units and warnings in chunks of any size, with LF or CRLF', async () => {
    const { RunFileReader } = await import('../../core/formats/runFile.ts');
    const body = [
      '# run: 8',
      'AoA      dp_pitot   lift     drag',
      'deg      mmH2O      lb       g',
      ...Array.from(
        { length: 40 },
        (_, i) =>
          `${(Math.floor(i / 4) * 2 + (i % 2) * 0.05).toFixed(2)}     ${(61 + (i % 3) * 0.1).toFixed(1)}       ${(i * 0.1).toFixed(2)}     ${i % 5 === 4 ? '0x1' : (10 + i).toString()}`,
      ),
    ];
    const whole = readRunText('s.txt', body.join('\n') + '\n', { mapping: { cells: { AoA: { channel: 'alpha' } } } });
    expect(whole.unitsLine).toBe(3);
    expect(whole.rowsSkipped).toBe(8);
    for (const eol of ['\n', '\r\n']) {
      const text = body.join(eol) + eol;
      for (const size of [1, 2, 5, 13, 64]) {
        const r = new RunFileReader('s.txt', { mapping: { cells: { AoA: { channel: 'alpha' } } } });
        for (let i = 0; i < text.length; i += size) r.push(text.slice(i, i + size));
        const got = r.finish();
        expect(
          got.points.map((p) => [p.key, p.n, ...p.mean]),
          `chunks of ${size}`,
        ).toEqual(whole.points.map((p) => [p.key, p.n, ...p.mean]));
        expect(got.warnings.map(formatNotice)).toEqual(whole.warnings.map(formatNotice));
      }
    }
  });
});
