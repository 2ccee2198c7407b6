/**
 * Reduced bench of the command line's CSV writer alone (no reading, no reduction): points written
 * through `pointsCsvChunks` with the report rounding, against the same rows written as plain shortest
 * round-trip numbers (the writer before the rounding). The points are the sample run's, each copy's
 * numbers moved by a small relative amount so no two cells are equal (V8 caches the text of recently
 * written numbers, which would flatter the plain writer); half carry standard uncertainties so the
 * rounding by uncertainty is exercised. Run: `npx tsx test/bench/csvWriter.ts [points]` (default
 * 250,000; the time scales linearly, the memory of the point objects does not stay small).
 */
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { csvCell, type Cell } from '../../core/formats/csvWriter.ts';
import { readRunText } from '../../core/formats/runFile.ts';
import { POINT_COLUMNS, pointsCsvChunks, readSetup, reduceRun, type PointResult } from '../../core/reduction/engine.ts';

const ROOT = resolve(import.meta.dirname, '../..');
const N = Number(process.argv[2] ?? 250_000);

const setup = readSetup('setup-3d.json', readFileSync(join(ROOT, 'sample-runs', 'setup-3d.json'), 'utf8'));
if (!setup.ok) throw new Error('sample setup');
const reduced = reduceRun({ run: readRunText('run-101-clean.csv', readFileSync(join(ROOT, 'sample-runs', 'run-101-clean.csv'), 'utf8')), setup: setup.value });
if (!reduced.ok) throw new Error('sample run');
const base = reduced.value.points;
const withU = base.map((p): PointResult => ({ ...p, u_cl: 0.0031, u_cd: 0.00042, u_cm: 0.0012, u_q_pa: 1.7, u_v_mps: 0.046, u_alpha_deg: 0.05 }));
/** A copy of a point with every number moved by a relative amount that differs per copy. */
function varied(p: PointResult, i: number): PointResult {
  const f = 1 + (i % 9973) * 1.3e-7;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(p)) out[k] = typeof v === 'number' && !['line', 'samples'].includes(k) ? v * f : v;
  return out as unknown as PointResult;
}
const points = Array.from({ length: N }, (_, i) => varied((i % 2 ? withU : base)[i % base.length]!, i));
const result = { ...reduced.value, points };

function* plainChunks(): Generator<string> {
  for (let start = 0; start < points.length; start += 2048) {
    let block = '';
    for (let i = start; i < Math.min(points.length, start + 2048); i++) block += POINT_COLUMNS.map((k) => csvCell(points[i]![k] as Cell)).join(',') + '\n';
    yield block;
  }
}

function time(label: string, chunks: () => Iterable<string>): void {
  const t0 = performance.now();
  let chars = 0;
  let largest = 0;
  for (const c of chunks()) {
    chars += c.length;
    largest = Math.max(largest, c.length);
  }
  const s = (performance.now() - t0) / 1000;
  console.log(
    `${label}: ${s.toFixed(2)} s, ${(chars / 1e6).toFixed(0)} M characters, largest chunk ${(largest / 1e6).toFixed(2)} M characters, heap ${(process.memoryUsage().heapUsed / 2 ** 20).toFixed(0)} MiB`,
  );
}

console.log(`${N.toLocaleString('en')} points × ${POINT_COLUMNS.length} columns`);
time('plain numbers (before)', plainChunks);
time('report rounding (now) ', () => pointsCsvChunks(result));
