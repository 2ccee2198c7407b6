import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { commentLine, escapeFormula, toCsv } from '../../core/formats/csvWriter.ts';
import { provenanceLines, type Provenance } from '../../core/formats/provenance.ts';

/** Names an attacker (or an unlucky user) can give a run, setup or campaign. */
const HOSTILE = ['=1+2.csv', 'a,=1+2.csv', 'b,+SUM(A1)', 'c,-2+3+cmd|x', 'd,@SUM(A1)', 'e\t=1+2', 'f\r=1+2', 'g;=1+2', 'h, =1+2', 'i,"=1+2"', 'j\n=1+2'];

/**
 * Every cell a spreadsheet would make of `text` when it opens it as delimited text with `delimiter`
 * (RFC 4180 quoting, as Excel and LibreOffice do). A cell is live when it starts with a formula
 * character and is not a plain number.
 */
function liveCells(text: string, delimiter: string): string[] {
  const rows = Papa.parse<string[]>(text, { delimiter, quoteChar: '"' }).data;
  const live: string[] = [];
  for (const row of rows) for (const cell of row) if (/^[=+\-@\t\r]/.test(cell) && !/^-\d+(\.\d+)?([eE][+-]?\d+)?[\]}]*$/.test(cell)) live.push(cell);
  return live;
}

function provenance(name: string): Provenance {
  return {
    tool: 'sweepbook',
    version: '0.1.0',
    reduced_at: '2026-01-01T00:00:00.000Z',
    inputs: [
      { role: 'setup', name, sha256: 'a'.repeat(64) },
      { role: 'run', name, sha256: 'b'.repeat(64) },
    ],
    corrections: { method: name } as never,
    factors: { list: [-0.25, -1e-3] } as never,
    setup: { name, model: { ref: [-0.05, 0, -0.1] } } as never,
  };
}

describe('formula-safe CSV: cells and # lines share one escaping rule', () => {
  it.each(HOSTILE)('a # line naming %j has no live formula cell however a spreadsheet splits it', (name) => {
    const text = provenanceLines(provenance(name)).map(commentLine).join('\n');
    for (const d of [',', ';', '\t']) expect(liveCells(text, d), `delimiter ${JSON.stringify(d)}`).toEqual([]);
  });

  it.each(HOSTILE)('a cell holding %j is neutralised', (name) => {
    const text = toCsv(['name', 'cl'], [[name, 0.5]]);
    expect(liveCells(text, ',')).toEqual([]);
  });

  it('keeps a # line one line, starting with "# ", and leaves plain negative numbers as numbers', () => {
    expect(commentLine('factors: {"list":[-0.25,-1e-3]}')).toBe('# factors: {"list":[-0.25,-1e-3]}');
    expect(commentLine('name: two\r\nlines')).toBe('# name: two lines');
    expect(commentLine('run: a,=1+2.csv sha256 x')).toBe("# run: a,'=1+2.csv sha256 x");
    expect(commentLine('run: =1+2.csv')).toBe('# run: =1+2.csv'); // inside the first cell, after "#"
  });

  it('uses the same rule as the cells (one function); a tab or line break in a # line separates, it never leads', () => {
    expect(commentLine('k: a\t\tx')).toBe('# k: a\t\tx');
    for (const n of ['=x', '+x', '-x', '@x']) expect(commentLine(`k: a,${n}`)).toBe(`# k: a,${escapeFormula(n)}`);
  });
});
