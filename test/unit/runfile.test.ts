import { describe, expect, it } from 'vitest';
import { InputError } from '../../core/contract/messages.ts';
import { RunFileReader, readRunText, splitHeaderCell, detectDelimiter } from '../../core/formats/runFile.ts';

const ch = (run: ReturnType<typeof readRunText>, name: string, point = 0) => run.points[point]!.mean[run.channels.indexOf(name as never)]!;

function expectInputError(fn: () => unknown, ...parts: string[]) {
  try {
    fn();
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    for (const p of parts) expect((err as Error).message).toContain(p);
    return;
  }
  throw new Error('expected an InputError');
}

describe('run-file reader', () => {
  it('refuses an empty file, naming it', () => {
    expectInputError(() => readRunText('empty.csv', ''), 'empty.csv', 'no header');
    expectInputError(() => new RunFileReader('none.csv').finish(), 'none.csv', 'empty');
  });

  it('refuses a file of comments only', () => {
    expectInputError(() => readRunText('c.csv', '# run: 1\n# note: x\n'), 'c.csv', 'no header');
  });

  it('refuses binary data', () => {
    expectInputError(() => readRunText('b.csv', 'alpha,lift\n\u0000\u0001\u0002'), 'b.csv', 'binary');
  });

  it('names line and column of an unknown unit, and the units it expected', () => {
    expectInputError(() => readRunText('u.csv', '# run: 3\nalpha [deg],dp_pitot [furlong]\n1,2\n'), 'u.csv:2:2', 'furlong', 'kPa');
  });

  it('refuses a unit of the wrong kind (a force unit on a pressure column)', () => {
    expectInputError(() => readRunText('w.csv', 'alpha,dp_pitot [lbf]\n1,2\n'), 'w.csv:1:2', 'force unit, not a pressure unit');
  });

  it('refuses a column given twice', () => {
    expectInputError(() => readRunText('d.csv', 'alpha,Alpha [rad]\n1,2\n'), 'd.csv:1:2', 'twice');
  });

  it('reads metadata, case-insensitive names, units and a BOM', () => {
    const run = readRunText('r.csv', '\ufeff# Run: 14\n# configuration: flap 20\nALPHA [deg],Dp_Pitot [inH2O],t_total [K],rh [fraction]\n2,1,300,0.5\n');
    expect(run.metadata).toEqual({ run: '14', configuration: 'flap 20' });
    expect(ch(run, 'alpha')).toBeCloseTo((2 * Math.PI) / 180, 12);
    expect(ch(run, 'dp_pitot')).toBeCloseTo(249.08891, 9);
    expect(ch(run, 't_total')).toBe(300);
    expect(ch(run, 'rh')).toBe(0.5);
    expect(run.headerLine).toBe(3);
  });

  it('applies the contract default units without a bracket (deg, Pa, degC, %)', () => {
    const run = readRunText('d.csv', 'alpha,dp_pitot,t_total,rh\n90,10,20,50\n');
    expect(ch(run, 'alpha')).toBeCloseTo(Math.PI / 2, 12);
    expect(ch(run, 'dp_pitot')).toBe(10);
    expect(ch(run, 't_total')).toBeCloseTo(293.15, 12);
    expect(ch(run, 'rh')).toBeCloseTo(0.5, 12);
  });

  it('detects semicolon files and reads decimal commas in them', () => {
    expect(detectDelimiter('a;b;c')).toBe(';');
    expect(detectDelimiter('a\tb\tc')).toBe('\t');
    expect(detectDelimiter('a,b')).toBe(',');
    const run = readRunText('s.csv', 'alpha;dp_pitot [kPa]\n1,5;0,25\n');
    expect(ch(run, 'dp_pitot')).toBeCloseTo(250, 9);
    expect(run.decimalComma).toBe(true);
  });

  it('reads tab-delimited files and CRLF line ends', () => {
    const run = readRunText('t.csv', 'alpha\tdp_pitot\r\n1\t5\r\n2\t6\r\n');
    expect(run.points).toHaveLength(2);
    expect(ch(run, 'dp_pitot', 1)).toBe(6);
  });

  it('splits header cells into name and unit', () => {
    expect(splitHeaderCell('dp_pitot [inH2O]')).toEqual({ name: 'dp_pitot', unit: 'inH2O' });
    expect(splitHeaderCell(' lift ')).toEqual({ name: 'lift', unit: undefined });
  });

  it('averages samples of one point and keeps their standard deviation and count', () => {
    const run = readRunText('p.csv', 'point,alpha,lift\n1,0,10\n1,0,12\n1,0,14\n2,5,20\n');
    expect(run.points).toHaveLength(2);
    const [p1, p2] = run.points;
    expect(p1!.n).toBe(3);
    expect(ch(run, 'lift', 0)).toBeCloseTo(12, 12);
    expect(p1!.std[run.channels.indexOf('lift')]).toBeCloseTo(2, 12);
    expect(p2!.n).toBe(1);
    expect(p2!.std[run.channels.indexOf('lift')]).toBe(0);
  });

  it('gives the same points whatever the chunk size (streaming)', () => {
    const lines = ['# run: 5', 'point,alpha,lift [lbf],drag'];
    for (let i = 0; i < 300; i++) lines.push(`${Math.floor(i / 30)},${(i % 7) * 0.5},${(i * 1.37) % 11},"${i % 3}"`);
    const text = lines.join('\r\n') + '\r\n';
    const whole = readRunText('s.csv', text);
    for (const size of [1, 2, 7, 64, 1000]) {
      const r = new RunFileReader('s.csv');
      for (let i = 0; i < text.length; i += size) r.push(text.slice(i, i + size));
      const got = r.finish();
      expect(got.points.map((p) => [p.key, p.n, ...p.mean])).toEqual(whole.points.map((p) => [p.key, p.n, ...p.mean]));
      expect(got.rowsRead).toBe(300);
    }
  });

  it('skips a row with a non-numeric value, naming its physical line and column, and keeps the others', () => {
    const run = readRunText('bad.csv', '# run: 1\nalpha,lift\n1,10\n2,abc\n3,NaN\n4,\n5,50\n');
    expect(run.points.map((p) => p.key)).toEqual(['3', '7']);
    expect(run.rowsSkipped).toBe(3);
    expect(run.warnings.map((w) => [w.line, w.column])).toEqual([
      [4, 2],
      [5, 2],
      [6, 2],
    ]);
    expect(run.warnings[0]!.message).toContain('"abc"');
  });

  it('skips a truncated last line with a warning', () => {
    const run = readRunText('t.csv', 'alpha,lift,drag\n1,2,3\n4,5');
    expect(run.points).toHaveLength(1);
    expect(run.warnings[0]).toMatchObject({ line: 3 });
  });

  it('ignores columns outside the contract and blank lines', () => {
    const run = readRunText('x.csv', 'clock [s],alpha,comment\n\n0.1,2,hello\n\n0.2,3,x\n');
    expect(run.channels).toEqual(['alpha']);
    expect(run.points.map((p) => p.line)).toEqual([3, 5]);
  });

  it('stops with a clear message on an absurdly long line instead of eating memory', () => {
    const r = new RunFileReader('long.csv', { limits: { maxLineChars: 1000 } });
    expect(() => r.push('alpha,lift\n' + '1'.repeat(5000))).toThrow(/long\.csv:2: a line is longer than 1000 characters/);
  });
});

describe('run-file reader: quotes', () => {
  const chunked = (text: string, size: number) => {
    const r = new RunFileReader('q.csv');
    for (let i = 0; i < text.length; i += size) r.push(text.slice(i, i + size));
    return r.finish();
  };

  it('skips a row with a malformed quote, naming line and column, and keeps the rows after it however the text is cut', () => {
    const text = 'alpha,dp_pitot,lift,drag\n"1"x,500,10,1\n2,500,11,1\n3,500,12,1\n4,500,13,1\n';
    for (const size of [text.length, 40, 7, 1]) {
      const run = chunked(text, size);
      expect(run.points.map((p) => p.line)).toEqual([3, 4, 5]);
      expect(run.warnings[0]).toMatchObject({ line: 2, column: 1 });
      expect(run.warnings[0]!.message).toContain('malformed quotes');
    }
  });

  it('skips the row of a quote that never closes and reads the rows after it, in linear time', () => {
    const rows = Array.from({ length: 5000 }, (_, i) => `${i},500,10,1`);
    const text = `alpha,dp_pitot,lift,drag\n1,"500,10,1\n${rows.join('\n')}\n`;
    const run = chunked(text, 4096);
    expect(run.points).toHaveLength(5000);
    expect(run.warnings[0]).toMatchObject({ line: 2, column: 2, message: 'row skipped: a quote opens here and is never closed' });
  });

  it('reads a quoted field holding a line break as one row, counting its lines', () => {
    const run = readRunText('m.csv', 'alpha,dp_pitot,lift,note\n1,500,10,"two\nlines"\n2,500,11,x\n');
    expect(run.points.map((p) => p.line)).toEqual([2, 4]);
  });

  it('finds binary content in the first characters however they are chunked', () => {
    const text = 'alpha,dp_pitot,lift,drag\n1,500,10,1\n\u0000';
    expect(() => chunked(text, text.length)).toThrow(/q\.csv:3: the file holds binary data/);
    expect(() => chunked(text, 25)).toThrow(/q\.csv:3: the file holds binary data/);
  });
});

describe('run-file reader: binary content found first', () => {
  it('refuses a file with NUL bytes as binary even when its header has a fault that would be met earlier in small chunks', () => {
    const text = 'alpha,lift,lift\n1,2,3\n\u0000\n';
    for (const size of [text.length, 5, 1]) {
      const r = new RunFileReader('b.csv');
      expect(() => {
        for (let i = 0; i < text.length; i += size) r.push(text.slice(i, i + size));
        r.finish();
      }).toThrow(/b\.csv:3: the file holds binary data/);
    }
  });
});
