import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { jsonChunks } from '../../app/cli/output.ts';
import { pointsCsv, pointsCsvChunks, readRun, readSetup, reduceRun } from '../../core/reduction/engine.ts';
import Papa from 'papaparse';
import { decimalsFromUncertainty, REPORT_COLUMNS, reportCsvRow, reportNumber, ROUNDING_NOTE } from '../../core/formats/reportTable.ts';
import { POINT_COLUMNS } from '../../core/reduction/engine.ts';

const ROOT = resolve(__dirname, '../..');

async function sampleResult() {
  const run = await readRun('run-101-clean.csv', [readFileSync(join(ROOT, 'sample-runs', 'run-101-clean.csv'), 'utf8')]);
  const setup = readSetup('setup-3d.json', readFileSync(join(ROOT, 'sample-runs', 'setup-3d.json'), 'utf8'));
  if (!run.ok || !setup.ok) throw new Error('sample');
  const r = reduceRun({ run: run.value, setup: setup.value });
  if (!r.ok) throw new Error('sample');
  return r.value;
}

describe('documents written in pieces (a million-point result is too long for one string)', () => {
  it('the JSON in pieces is byte-identical to JSON.stringify of the whole, with and without points', async () => {
    const result = await sampleResult();
    const doc = { ...result, provenance: { tool: 'sweepbook', note: 'a "points": "x" look-alike' } };
    expect([...jsonChunks(doc)].join('')).toBe(JSON.stringify(doc, null, 2) + '\n');
    const empty = { ...doc, points: [] };
    expect([...jsonChunks(empty)].join('')).toBe(JSON.stringify(empty, null, 2) + '\n');
    // more points than one chunk holds
    const many = { ...doc, points: Array.from({ length: 2500 }, (_, i) => doc.points[i % doc.points.length]) };
    const chunks = [...jsonChunks(many)];
    expect(chunks.length).toBeGreaterThan(3);
    expect(chunks.join('')).toBe(JSON.stringify(many, null, 2) + '\n');
  });

  it('the CSV in pieces equals the table written whole, below the same # lines', async () => {
    const result = await sampleResult();
    const many = { ...result, points: Array.from({ length: 5000 }, (_, i) => result.points[i % result.points.length]!) };
    const whole = [POINT_COLUMNS.join(','), ...many.points.map(reportCsvRow)].join('\n') + '\n';
    const text = [...pointsCsvChunks(many)].join('');
    const body = text
      .split('\n')
      .filter((l) => !l.startsWith('# '))
      .join('\n');
    expect(body).toBe(whole);
    expect(text.startsWith(`# run: ${result.run.name}\n`)).toBe(true);
    expect(text).toContain(`# ${ROUNDING_NOTE}\n`);
    expect(pointsCsv(many)).toBe(text);
    expect([...pointsCsvChunks(many)].length).toBeGreaterThan(2);
  });

  it("writes the contract's names and each number rounded as the report table rounds it, no units row", async () => {
    const result = await sampleResult();
    const rows = Papa.parse<string[]>(pointsCsv(result), { comments: '#', skipEmptyLines: true }).data;
    expect(rows[0]).toEqual([...POINT_COLUMNS]);
    expect(rows).toHaveLength(1 + result.points.length);
    rows.slice(1).forEach((row, i) => {
      const p = result.points[i]!;
      REPORT_COLUMNS.forEach((col, j) => {
        const v = p[col.key];
        if (typeof v === 'string') return expect(row[j]).toBe(v);
        if (v === null) return expect(row[j]).toBe('');
        expect(row[j]).toBe(reportNumber(v, col.decimals, col.u ? (p[col.u] as number | null) : null));
        // and that is the value to within half a unit in the last place written
        const cell = row[j]!;
        const last = cell.includes('.') ? cell.replace(/e.*$/, '').split('.')[1]!.length : 0;
        const u = col.u ? (p[col.u] as number | null) : null;
        // the place rounded to: the uncertainty's second digit, N significant digits, or the decimals written
        const place =
          u !== null && u > 0
            ? 10 ** -decimalsFromUncertainty(u)!
            : typeof col.decimals === 'string'
              ? 10 ** (Math.floor(Math.log10(Math.abs(v))) - Number(col.decimals.slice(4)) + 1)
              : 10 ** -last;
        expect(Math.abs(Number(cell) - v), `${col.key} point ${i}: ${cell} vs ${v}`).toBeLessThanOrEqual(place / 2 + Math.abs(v) * 1e-12);
      });
    });
  });
});
