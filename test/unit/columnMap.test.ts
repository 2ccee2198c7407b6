import { describe, expect, it } from 'vitest';
import { InputError, formatNotice } from '../../core/contract/messages.ts';
import {
  channelScore,
  columnMapFromGuesses,
  guessColumns,
  inspectHeader,
  missingChannelMessage,
  parseColumnMap,
  serializeColumnMap,
} from '../../core/formats/columnMap.ts';
import { sheetRowsToCsv } from '../../core/formats/sheet.ts';
import { readRunText } from '../../core/formats/runFile.ts';

function errorOf(fn: () => unknown): string {
  try {
    fn();
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    return formatNotice((err as InputError).notice);
  }
  throw new Error('expected an InputError');
}
const doc = (columns: unknown, extra: object = {}) => JSON.stringify({ format: 'sweepbook-columns', version: 1, columns, ...extra }, null, 2);

describe('column map documents', () => {
  it('parses the documented example and writes it back in the same form', () => {
    const text = `{ "format": "sweepbook-columns", "version": 1,
  "columns": {
    "Angle of Attack [deg]": { "channel": "alpha" },
    "Pbar": { "channel": "p_static", "unit": "hPa" },
    "Mz":   { "channel": "pitch", "unit": "N m", "scale": -1 },
    "Note": null } }`;
    const map = parseColumnMap('m.json', text);
    expect(map.columns).toEqual({
      'Angle of Attack [deg]': { channel: 'alpha' },
      Pbar: { channel: 'p_static', unit: 'hPa' },
      Mz: { channel: 'pitch', unit: 'N m', scale: -1 },
      Note: null,
    });
    const again = parseColumnMap('m.json', serializeColumnMap(map));
    expect(again).toEqual(map);
    expect(serializeColumnMap(map)).toContain('    "Mz": {"channel": "pitch", "unit": "N m", "scale": -1},\n');
  });

  it('trims surrounding spaces of keys', () => {
    expect(Object.keys(parseColumnMap('m.json', doc({ ' AoA ': { channel: 'alpha' } })).columns)).toEqual(['AoA']);
  });

  it.each([
    [doc({ Mz: { channel: 'pich' } }), /^m\.json:5:5: columns\["Mz"\]\.channel: unknown channel "pich" \(did you mean "pitch"\?\)/],
    [doc({ Mz: { channel: 'pitch', unit: 'Nmm2' } }), /^m\.json:5:5: columns\["Mz"\]\.unit: unknown unit "Nmm2"/],
    [doc({ Mz: { channel: 'pitch', unit: 'hPa' } }), /columns\["Mz"\]\.unit: "hPa" is a pressure unit; channel "pitch" needs a moment unit/],
    [doc({ Mz: { channel: 'pitch', scale: 'x' } }), /columns\["Mz"\]\.scale: expected a finite number/],
    [doc({ Mz: { channel: 'pitch', scale: 0 } }), /a scale of 0/],
    [doc({ Mz: { channel: 'pitch', sclae: 2 } }), /columns\["Mz"\]\.sclae: unknown key \(did you mean "scale"\?\)/],
    [doc({ A: { channel: 'alpha' }, B: { channel: 'alpha' } }), /channel "alpha" is also given to "A"/],
    [doc({ Mz: 'pitch' }), /columns\["Mz"\]: expected \{ "channel": … \} or null/],
    [doc({}, { version: 2 }), /version: expected 1, not 2/],
    [JSON.stringify({ format: 'other', version: 1, columns: {} }), /format: expected "sweepbook-columns"/],
    ['{ "format": "sweepbook-columns",\n  "version": 1,\n  "columns": { "A": } }', /^m\.json:3:21: not valid JSON/],
  ])('refuses a bad map naming file, line, column and key (%#)', (text, pattern) => {
    expect(errorOf(() => parseColumnMap('m.json', text))).toMatch(pattern);
  });
});

describe('guessing channels', () => {
  const sketch = (text: string) => inspectHeader('f.txt', text);

  it('reads header, units row, layout and an example row from the first lines', () => {
    const s = sketch('# run: 4\nAoA   Qinf   Lift\ndeg   mmH2O  lb\n1.0   61.2   3.5\n');
    expect(s.metadata).toEqual({ run: '4' });
    expect(s.headerLine).toBe(2);
    expect(s.unitsLine).toBe(3);
    expect(s.cells.map((c) => [c.text, c.unit])).toEqual([
      ['AoA', 'deg'],
      ['Qinf', 'mmH2O'],
      ['Lift', 'lb'],
    ]);
    expect(s.example).toEqual(['1.0', '61.2', '3.5']);
  });

  it('guesses each channel once, by name and unit kind, and leaves unknown columns unassigned', () => {
    const s = sketch('Angle of attack (deg),q (Pa),Temp (C),Lift [N],Drag [N],My [N m],Comment,Point\n1,2,3,4,5,6,x,1\n');
    const g = guessColumns(s.cells);
    expect(g.map((x) => x.channel)).toEqual(['alpha', 'q', 't_total', 'lift', 'drag', 'pitch', null, 'point']);
    const map = columnMapFromGuesses(g);
    expect(map.columns['Temp (C)']).toEqual({ channel: 't_total', unit: 'C' });
    expect(map.columns['Comment']).toBeNull();
    // a ready map reads the file
    const run = readRunText('f.csv', 'Angle of attack (deg),q (Pa),Temp (C),Lift [N],Drag [N],My [N m],Comment,Point\n1,2,3,4,5,6,x,1\n', {
      mapping: { cells: map.columns as never, source: 'map.json' },
    });
    expect(run.channels).toEqual(['alpha', 'q', 't_total', 'lift', 'drag', 'pitch']);
  });

  it('rules a channel out when the written unit is of another kind', () => {
    expect(channelScore({ text: 'Lift [Pa]', name: 'Lift', unit: 'Pa', column: 1 }, 'lift')).toBe(0);
    expect(channelScore({ text: 'Lift [lbf]', name: 'Lift', unit: 'lbf', column: 1 }, 'lift')).toBeGreaterThan(0.9);
  });

  it('lists every column and the closest ones in the missing-channel message', () => {
    const cells = sketch('Incidence,Pdyn,FZ\n1,2,3\n').cells;
    const msg = missingChannelMessage('alpha', 'angle of attack', cells);
    expect(msg).toContain('the file\'s columns: 1 "Incidence", 2 "Pdyn", 3 "FZ"');
    expect(msg).toMatch(/closest: "Incidence" \(column 1\)/);
    expect(msg).toContain('sweepbook columns FILE --out MAP.json');
  });
});

describe('spreadsheet rows as run-file text', () => {
  it('keeps numbers as the workbook stores them, metadata rows bare, and one line per sheet row', () => {
    const csv = sheetRowsToCsv([
      ['# run: 12', null],
      ['alpha [deg]', 'lift, N'],
      ['1.5', '2E-3'],
      [2, 'a\nb'],
    ]);
    expect(csv).toBe('# run: 12\nalpha [deg],"lift, N"\n1.5,2E-3\n2,a b\n');
    const run = readRunText('w.xlsx', csv, { mapping: { cells: { 'lift, N': { channel: 'lift' } } } });
    expect(run.metadata['run']).toBe('12');
    expect(run.points[0]!.mean[1]).toBe(0.002);
    expect(run.points[0]!.line).toBe(3);
  });
});
