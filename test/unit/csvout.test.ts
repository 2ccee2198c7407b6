import { describe, expect, it } from 'vitest';
import { csvCell, escapeFormula, toCsv } from '../../core/formats/csvWriter.ts';

describe('CSV export cells', () => {
  // OWASP "CSV Injection": cells starting with =, +, -, @, tab or carriage return are run by spreadsheets
  it.each(['=HYPERLINK("http://x","y")', '+1+1', '-2+3', '@SUM(A1)', '\tX', '\rX'])('neutralises the formula-like text %j', (text) => {
    expect(escapeFormula(text).startsWith("'")).toBe(true);
  });

  it('leaves ordinary text alone and writes numbers as numbers, negative ones too', () => {
    expect(csvCell('flap 20')).toBe('flap 20');
    expect(csvCell(-0.25)).toBe('-0.25');
    expect(csvCell(1e-7)).toBe('1e-7');
    expect(csvCell(0)).toBe('0');
  });

  it('writes null, undefined, NaN and infinities as empty cells, never as text a reader would misparse', () => {
    expect(csvCell(null)).toBe('');
    expect(csvCell(undefined)).toBe('');
    expect(csvCell(Number.NaN)).toBe('');
    expect(csvCell(Number.POSITIVE_INFINITY)).toBe('');
  });

  it('quotes cells with delimiters, quotes or line breaks (RFC 4180)', () => {
    expect(csvCell('a,b')).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell('two\nlines')).toBe('"two\nlines"');
    expect(csvCell('=1,2')).toBe(`"'=1,2"`);
  });

  it('builds a table with one header line and a final newline', () => {
    expect(toCsv(['configuration', 'cl'], [['=cmd|x', 0.5], ['clean', -0.1]])).toBe("configuration,cl\n'=cmd|x,0.5\nclean,-0.1\n");
  });
});

describe('CSV export of labels starting with #', () => {
  it('quotes them so comment-aware readers keep the row', () => {
    expect(csvCell('#3')).toBe('"#3"');
  });
});
