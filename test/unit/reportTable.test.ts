/**
 * The report table: numbers to the digits their uncertainty supports (GUM §7.2.6), never more than seven
 * significant digits, trade names and a units row, `#` lines left raw for comment-skipping readers.
 */
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { countNumber, decimalsFromUncertainty, MAX_SIGNIFICANT, REPORT_COLUMNS, reportNumber, reportPointsCsv } from '../../core/formats/reportTable.ts';
import { commentLine } from '../../core/formats/csvWriter.ts';
import { POINT_COLUMNS, readSetup, reduceRun } from '../../core/reduction/engine.ts';
import { readRunText } from '../../core/formats/runFile.ts';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

/** Significant digits of a number as written ("0.004560" → 4, "-12.50" → 4, "1.2e-7" → 2). */
function significantDigits(text: string): number {
  const mantissa = text.replace(/^-/, '').replace(/e.*$/i, '');
  const digits = mantissa.replace('.', '').replace(/^0+/, '');
  return mantissa.includes('.') ? digits.length : digits.replace(/0+$/, '').length || 1;
}

describe('report numbers', () => {
  it('writes nothing for a missing or non-finite value, and 0 as 0', () => {
    expect(reportNumber(null, 3)).toBe('');
    expect(reportNumber(undefined, 3)).toBe('');
    expect(reportNumber(Number.NaN, 3)).toBe('');
    expect(reportNumber(Number.POSITIVE_INFINITY, 3)).toBe('');
    expect(reportNumber(0, 3)).toBe('0');
  });

  it('never writes a negative zero', () => {
    expect(reportNumber(-0.00001, 3)).toBe('0.000');
    expect(reportNumber(-0.4, 0)).toBe('0');
  });

  it('rounds float noise away: 3.9870000000000005 is 3.987', () => {
    expect(reportNumber(3.9870000000000005, 3)).toBe('3.987');
    expect(reportNumber(3.9870000000000005, 'sig:7')).toBe('3.987000');
  });

  it('quotes the value to the place of the uncertainty’s second significant digit (GUM §7.2.6)', () => {
    // GUM §7.2.2 example: u = 0.35 mg on a mass in grams puts the last digit at 1e-5 g
    expect(decimalsFromUncertainty(0.00035)).toBe(5);
    expect(reportNumber(1.0002147, 4, 0.00035)).toBe('1.00021');
    // a large uncertainty keeps fewer digits than the quantity's default
    expect(reportNumber(0.51234567, 4, 0.031)).toBe('0.512');
    expect(decimalsFromUncertainty(0)).toBeNull();
    expect(decimalsFromUncertainty(Number.NaN)).toBeNull();
    expect(decimalsFromUncertainty(10)).toBe(0);
    expect(decimalsFromUncertainty(12)).toBe(0);
    expect(decimalsFromUncertainty(120)).toBe(-1);
    expect(reportNumber(12345.6, 2, 120)).toBe('12350');
  });

  it('caps every number at seven significant digits, also where the uncertainty would allow more', () => {
    // GUM §7.2.2 quotes 100.021 47 g (8 digits); a report table stops at 7
    expect(reportNumber(100.02147, 5, 0.00035)).toBe('100.0215');
    expect(reportNumber(98765.4321, 3)).toBe('98765.43');
    expect(reportNumber(123456789.5, 2)).toBe('1.234568e+8');
    for (const v of [1e-9, 0.000123456789, 1.23456789, 987654.321, 12345678.9, -0.0098765432]) {
      for (const d of [0, 3, 9, 'sig:9'] as const) expect(significantDigits(reportNumber(v, d)), `${v} ${d}`).toBeLessThanOrEqual(MAX_SIGNIFICANT);
    }
  });

  it('writes counts and line numbers as the integers they are, past seven digits too', () => {
    expect(countNumber(12_345_678)).toBe('12345678');
    expect(countNumber(3)).toBe('3');
    expect(countNumber(null)).toBe('');
    expect(REPORT_COLUMNS.filter((c) => c.count).map((c) => c.key)).toEqual(['samples', 'line']);
  });

  it('uses significant digits for sig:N columns (Reynolds number to four)', () => {
    expect(reportNumber(476_123.7, 'sig:4')).toBe('476100');
    expect(reportNumber(0.00123456, 'sig:3')).toBe('0.00123');
  });
});

describe('report point table', () => {
  const text = readFileSync(join(__dirname, '../../sample-runs/run-101-clean.csv'), 'utf8');
  const campaign = JSON.parse(readFileSync(join(__dirname, '../../sample-runs/sweepbook-campaign.json'), 'utf8')) as { setups: Record<string, unknown> };
  const setup = readSetup('s', JSON.stringify(Object.values(campaign.setups)[0]));
  if (!setup.ok) throw new Error('sample setup invalid');
  const reduced = reduceRun({ run: readRunText('run-101-clean.csv', text), setup: setup.value });
  if (!reduced.ok) throw new Error('sample run did not reduce');
  const result = reduced.value;

  it('has a report column for every column the command line writes, in the same order', () => {
    expect(REPORT_COLUMNS.map((c) => c.key)).toEqual([...POINT_COLUMNS]);
    // trade words, not code names
    for (const c of REPORT_COLUMNS) expect(c.header).not.toMatch(/_(deg|pa|mps|n|nm|k|pct|kgm3)$/);
  });

  it('is read by a comment-skipping CSV reader: header, units row, one row per point, at most 7 significant digits', () => {
    const csv = reportPointsCsv(result, ['tool: sweepbook test', 'campaign: a, =1+1']);
    expect(csv.split('\n')[0]).toBe('# tool: sweepbook test');
    expect(csv).toContain("# campaign: a, '=1+1");
    const parsed = Papa.parse<string[]>(csv, { comments: '#', skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    const [header, units, ...rows] = parsed.data;
    expect(header).toContain('CL');
    expect(units![header!.indexOf('q')]).toBe('Pa');
    expect(units![header!.indexOf('alpha')]).toBe('deg');
    expect(rows.length).toBe(result.points.length);
    for (const r of rows)
      for (const cell of r.slice(1))
        if (cell !== '') {
          expect(Number.isFinite(Number(cell)), cell).toBe(true);
          expect(significantDigits(cell), cell).toBeLessThanOrEqual(7);
        }
    const q = header!.indexOf('q');
    rows.forEach((r, i) => expect(Math.abs(Number(r[q]) - result.points[i]!.q_pa!)).toBeLessThanOrEqual(0.005 + 1e-9));
  });

  it('leaves out columns no point has a value in (no uncertainty block → no u() columns)', () => {
    const header = reportPointsCsv(result).split('\n')[0]!.split(',');
    expect(header.some((h) => h.startsWith('u('))).toBe(result.points.some((p) => p.u_cl !== null));
  });

  it('writes one-line comments whatever the text holds', () => {
    expect(commentLine('a\nb\r\nc')).toBe('# a b c');
  });
});
