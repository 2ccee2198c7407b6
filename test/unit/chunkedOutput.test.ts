import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { jsonChunks } from '../../app/cli/output.ts';
import { pointsCsv, pointsCsvChunks, readRun, readSetup, reduceRun } from '../../core/reduction/engine.ts';
import { toCsv, type Cell } from '../../core/formats/csvWriter.ts';
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
    const whole = toCsv(
      POINT_COLUMNS as string[],
      many.points.map((p) => POINT_COLUMNS.map((k) => p[k] as Cell)),
    );
    const text = [...pointsCsvChunks(many)].join('');
    const body = text
      .split('\n')
      .filter((l) => !l.startsWith('# '))
      .join('\n');
    expect(body).toBe(whole);
    expect(text.startsWith(`# run: ${result.run.name}\n`)).toBe(true);
    expect(pointsCsv(many)).toBe(text);
    expect([...pointsCsvChunks(many)].length).toBeGreaterThan(2);
  });
});
