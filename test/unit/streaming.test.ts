import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { readSetup, reduceRun } from '../../core/reduction/engine.ts';
import { RunFileReader, detectDelimiter, readRunText, type RunData } from '../../core/formats/runFile.ts';
import { BENCH_SETUP, runText } from '../bench/generate.ts';

/**
 * The streaming reader must give the same result, to the last printed digit, however the file is cut
 * into chunks, and whichever of its two paths splits the lines (the quote-free loop or papaparse, which
 * reads any block holding a quote). Checked on every held-out reference case that reduces and on a
 * generated time-history run.
 */
const CASES = resolve(__dirname, '../fixtures/reference/cases');
const index = JSON.parse(readFileSync(join(CASES, 'index.json'), 'utf8')) as Record<string, string>;
const reducible = Object.keys(index).filter((n) => !n.startsWith('error_'));

/** Odd and small sizes, so chunk boundaries fall inside numbers, CRLF pairs, the BOM and the header. */
const CHUNK_SIZES = [1, 2, 3, 7, 13, 64, 257, 4093];

function streamed(file: string, text: string, size: number): RunData {
  const reader = new RunFileReader(file);
  for (let i = 0; i < text.length; i += size) reader.push(text.slice(i, i + size));
  return reader.finish();
}

/** Everything the reader hands on, with typed arrays as plain arrays so JSON shows every digit. */
function runJson(run: RunData): string {
  return JSON.stringify({ ...run, points: run.points.map((p) => ({ ...p, mean: [...p.mean], std: [...p.std] })) });
}

/** The same file with every data cell in double quotes, as some tools write CSV: read by papaparse. */
function quoteEveryCell(text: string): string {
  const lines = text.split(/(?<=\n)/);
  let delimiter: string | undefined;
  return lines
    .map((line) => {
      const body = line.replace(/\r?\n$/, '');
      const end = line.slice(body.length);
      const trimmed = body.replace(/^\ufeff/, '').trim();
      if (trimmed === '' || trimmed.startsWith('#')) return line;
      if (delimiter === undefined) {
        delimiter = detectDelimiter(body);
        return line; // the header stays as it was
      }
      return body
        .split(delimiter)
        .map((cell) => `"${cell}"`)
        .join(delimiter) + end;
    })
    .join('');
}

function caseFiles(name: string) {
  const dir = join(CASES, name);
  const args = JSON.parse(readFileSync(join(dir, 'args.json'), 'utf8')) as { tare: string | null; no_corrections: boolean };
  return {
    run: readFileSync(join(dir, 'run.csv'), 'utf8'),
    tare: args.tare ? readFileSync(join(dir, args.tare), 'utf8') : undefined,
    setupText: readFileSync(join(dir, 'setup.json'), 'utf8'),
    noCorrections: args.no_corrections,
  };
}

function reducedJson(setupText: string, run: RunData, tare: RunData | undefined, noCorrections: boolean): string {
  const setup = readSetup('setup.json', setupText);
  if (!setup.ok) throw new Error(JSON.stringify(setup.errors));
  const result = reduceRun({ run, setup: setup.value, tare, noCorrections });
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return JSON.stringify(result.value, null, 2);
}

describe('streaming reader: same result whatever the chunks', () => {
  it('has held-out cases to check', () => {
    expect(reducible.length).toBeGreaterThanOrEqual(10);
  });

  it.each(reducible)('%s: streamed in small odd chunks = read whole = every cell quoted', (name) => {
    const f = caseFiles(name);
    const whole = reducedJson(f.setupText, readRunText('run.csv', f.run), f.tare === undefined ? undefined : readRunText('tare.csv', f.tare), f.noCorrections);
    expect(JSON.parse(whole).points.length).toBeGreaterThan(0);
    for (const size of CHUNK_SIZES) {
      const run = streamed('run.csv', f.run, size);
      const tare = f.tare === undefined ? undefined : streamed('tare.csv', f.tare, size);
      expect(reducedJson(f.setupText, run, tare, f.noCorrections), `chunks of ${size}`).toBe(whole);
    }
    const quotedRun = quoteEveryCell(f.run);
    expect(quotedRun).not.toBe(f.run);
    const quotedTare = f.tare === undefined ? undefined : quoteEveryCell(f.tare);
    for (const size of [3, 64, 1 << 20]) {
      const run = streamed('run.csv', quotedRun, size);
      const tare = quotedTare === undefined ? undefined : streamed('tare.csv', quotedTare, size);
      expect(reducedJson(f.setupText, run, tare, f.noCorrections), `quoted, chunks of ${size}`).toBe(whole);
    }
  });

  it('a generated time-history run (200 points × 40 samples, every channel) reduces identically streamed and whole', () => {
    const text = [...runText(200, 40)].join('');
    const setupText = JSON.stringify(BENCH_SETUP);
    const wholeRun = readRunText('th.csv', text);
    expect(wholeRun.rowsRead).toBe(8000);
    expect(wholeRun.points).toHaveLength(200);
    const whole = reducedJson(setupText, wholeRun, undefined, false);
    const crlf = text.replace(/\n/g, '\r\n');
    for (const size of [1, 5, 97, 1000, 65_537]) {
      expect(runJson(streamed('th.csv', text, size)), `chunks of ${size}`).toBe(runJson(wholeRun));
      expect(reducedJson(setupText, streamed('th.csv', text, size), undefined, false)).toBe(whole);
      expect(reducedJson(setupText, streamed('th.csv', crlf, size), undefined, false), `CRLF, chunks of ${size}`).toBe(whole);
    }
    expect(reducedJson(setupText, readRunText('th.csv', quoteEveryCell(text)), undefined, false), 'every cell quoted').toBe(whole);
  });

  it('irregular rows are skipped or kept alike on both paths, with the same messages and line numbers', () => {
    const text = [
      '# run: 9',
      'point,alpha,lift [lbf],clock [s],drag',
      '1,0.5,10,0.01,1',
      '1, 0.5 ,1e1,x,1.0', // spaces and an exponent: read by Number(), not the quick conversion
      '',
      '# a comment between samples',
      '1,0.5,abc,0.03,1',
      '2,1.5,12,0.04', // a field short
      '2,1.5,12,0.05,2,', // an empty extra field is allowed
      '2,1.5,12,0.06,2,7', // a filled extra field is not
      '2,-.5,+12.,0.07,-0',
      '2,,12,0.08,2',
      '3,0x10,Infinity,0.09,2',
      '3,2.0000000000000001,0.1000000000000000055511151231257827,1,1',
      '3,123456789012345678,1.5,1,1',
      '4;1;2;3',
    ].join('\r\n');
    const whole = readRunText('irr.csv', text);
    expect(whole.warnings.map((w) => [w.line, w.column])).toEqual([
      [7, 3],
      [8, undefined],
      [10, 6],
      [12, 2],
      [13, 2], // 0x10 is not a decimal number (it was once read as 16)
      [16, undefined],
      // samples of one point id at two angles are kept apart, never averaged (a point id restarted for a return sweep)
      [11, undefined],
      [15, undefined],
    ]);
    expect(whole.points.map((p) => [p.key, p.n])).toEqual([
      ['1', 2],
      ['2', 1],
      ['2', 1],
      ['3', 1],
      ['3', 1],
    ]);
    for (const size of [1, 2, 3, 11, 1000]) {
      expect(runJson(streamed('irr.csv', text, size)), `chunks of ${size}`).toBe(runJson(whole));
    }
    expect(runJson(readRunText('irr.csv', quoteEveryCell(text)))).toBe(runJson(whole));
  });

  it('converts every cell to exactly the number Number() gives (or skips it as Number() would)', () => {
    const cellArb = fc.oneof(
      fc.double({ noNaN: true, noDefaultInfinity: true }).map((x) => String(x)),
      fc.tuple(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.integer({ min: 0, max: 20 })).map(([x, d]) => x.toFixed(d)),
      fc.tuple(fc.double({ min: -1e30, max: 1e30, noNaN: true }), fc.integer({ min: 1, max: 21 })).map(([x, p]) => x.toPrecision(p)),
      fc.tuple(fc.constantFrom('', '-', '+'), fc.stringMatching(/^[0-9]{0,19}$/), fc.constantFrom('', '.'), fc.stringMatching(/^[0-9]{0,25}$/)).map((p) => p.join('')),
      fc.constantFrom('-0', '0', '.5', '5.', '-.', '.', '1.2.3', '--1', ' 7 ', '1e400', '0.1e-400', '0b11', 'NaN', '٣'),
    );
    fc.assert(
      fc.property(fc.array(cellArb, { minLength: 1, maxLength: 40 }), (cells) => {
        // one good row last, so that a draw of bad cells only still leaves a file to read
        const all = [...cells, '0'];
        // no alpha column, so no grouping by set angle: every row is a point of its own
        const text = 'lift [N],drag\n' + all.map((c) => `${c},1`).join('\n') + '\n';
        const run = readRunText('n.csv', text);
        // Number() also reads radix forms (0b11); run files are decimal only, so those rows are skipped
        const kept = all.map((c, i) => ({ v: c.trim() === '' || /^\s*[+-]?0[xbo]/i.test(c) ? Number.NaN : Number(c), line: i + 2 })).filter((x) => Number.isFinite(x.v));
        expect(run.points.map((p) => p.mean[0])).toEqual(kept.map((x) => x.v + 0));
        expect(run.points.map((p) => p.line)).toEqual(kept.map((x) => x.line));
        expect(run.rowsSkipped).toBe(all.length - kept.length);
        expect(runJson(readRunText('n.csv', quoteEveryCell(text)))).toBe(runJson(run));
      }),
      { numRuns: 300 },
    );
  });

  it('names the line that is too long when it arrives in pieces, whatever their size', () => {
    // 1,000 short rows first: past the 4096 characters held back for the binary probe, the long line arrives in pieces
    const text = '# run: 1\nalpha,lift\n' + '1,2\n'.repeat(1000) + '3'.repeat(2000) + ',4\n';
    for (const size of [1, 100, 999]) {
      const r = new RunFileReader('long.csv', { limits: { maxLineChars: 1000 } });
      expect(() => {
        for (let i = 0; i < text.length; i += size) r.push(text.slice(i, i + size));
      }, `chunks of ${size}`).toThrow(/^long\.csv:1003: a line is longer than 1000 characters/);
    }
  });

  it('decimal commas in semicolon files: the quick conversion agrees with the general one', () => {
    const text = 'alpha [rad];lift\n1,5;1\n-0,25;1\n2.5;1\n1,5,3;1\n,5;1\n12345678901234,5;1\n';
    const run = readRunText('dc.csv', text);
    expect(run.points.map((p) => p.mean[0])).toEqual([1.5, -0.25, 2.5, 0.5, 12345678901234.5]);
    expect(run.warnings.map((w) => [w.line, w.column])).toEqual([[5, 1]]);
    expect(runJson(streamed('dc.csv', text, 2))).toBe(runJson(run));
    expect(runJson(readRunText('dc.csv', quoteEveryCell(text)))).toBe(runJson(run));
  });
});

describe('a point id that restarts for the return sweep', () => {
  it('never averages samples of two angles: the point is split by α with a warning naming both lines', () => {
    const rows = ['point,alpha,dp_pitot,lift,drag'];
    for (const [k, a] of [['1', 0], ['2', 4], ['3', 8], ['1', 8.1], ['2', 4], ['3', 0]] as const) for (let s = 0; s < 3; s++) rows.push(`${k},${a + 0.05 * s},600,${10 + a},1`);
    const run = readRunText('return.csv', rows.join('\n'));
    // every visit of an id is its own point; the two that come back at another angle are named
    expect(run.points.map((p) => [p.key, p.n, p.line])).toEqual([
      ['1', 3, 2],
      ['2', 3, 5],
      ['3', 3, 8],
      ['1', 3, 11],
      ['2', 3, 14],
      ['3', 3, 17],
    ]);
    expect(run.warnings.map((w) => w.line)).toEqual([11, 17]);
    expect(run.warnings[0]!.message).toMatch(/point "1" lie at α = 0\.05° \(from line 2\) and 8\.10°/);
  });
});
