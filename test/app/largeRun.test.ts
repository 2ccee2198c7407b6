import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { FromWorker } from '../../renderer/src/worker/protocol.ts';
import { WorkerEngine } from '../../renderer/src/worker/workerEngine.ts';
import { runCli } from '../support/cli.ts';

/**
 * A run longer than a call's argument list may be: 150,000 points (V8 overflowed its stack somewhere
 * above 125,000 spread arguments, and a run of that size once exited 3). Both the command line and the
 * window's worker engine must reduce it. How fast is for `npm run bench`; this only checks that it works.
 * Invented sweep: CL = 0.08·(α + 2) on q = 500 Pa, S = 0.2025 m² (not a measurement).
 */
const ROOT = resolve(__dirname, '../..');
const POINTS = 150_000;

function sweep(n: number): string {
  // a point column: rows this close in alpha would otherwise be grouped into a few points
  const lines = ['point,alpha,dp_pitot,lift,drag'];
  for (let i = 0; i < n; i++) {
    const a = -4 + (14 * i) / n;
    lines.push(`${i + 1},${a.toFixed(6)},500,${(500 * 0.2025 * 0.08 * (a + 2)).toFixed(4)},${(500 * 0.2025 * 0.01).toFixed(4)}`);
  }
  return lines.join('\n') + '\n';
}

describe(`a run of ${POINTS.toLocaleString('en')} points`, () => {
  const text = sweep(POINTS);

  it('reduces on the command line', async () => {
    const run = join(mkdtempSync(join(tmpdir(), 'sweepbook-large-')), 'large.csv');
    writeFileSync(run, text);
    const r = await runCli('reduce', run, '--setup', join(ROOT, 'sample-runs', 'setup-3d.json'), '--format', 'csv');
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout.split('\n').filter((l) => l !== '' && !l.startsWith('#'))).toHaveLength(POINTS + 1);
  }, 600_000);

  it("reduces in the window's worker engine", () => {
    const got: FromWorker[] = [];
    const engine = new WorkerEngine((m) => got.push(m));
    engine.handle({ type: 'begin', id: 1, key: 'large', file: 'large.csv', mapping: null, mappings: {} });
    for (let i = 0; i < text.length; i += 1 << 20) engine.handle({ type: 'chunk', id: 1, text: text.slice(i, i + (1 << 20)) });
    engine.handle({ type: 'end', id: 1 });
    const read = got.find((m) => m.type === 'read');
    expect(read && read.type === 'read' && read.reply.ok).toBe(true);
    const setup = JSON.parse(readFileSync(join(ROOT, 'sample-runs', 'setup-3d.json'), 'utf8'));
    engine.handle({ type: 'reduce', id: 2, key: 'large', setupName: 'setup-3d.json', setup, tareKey: null });
    const reduced = got.find((m) => m.type === 'reduced' || m.type === 'crash');
    expect(reduced?.type, JSON.stringify(reduced).slice(0, 300)).toBe('reduced');
    if (reduced?.type === 'reduced' && reduced.reply.ok) expect(reduced.reply.result.points).toHaveLength(POINTS);
    else throw new Error(JSON.stringify(reduced).slice(0, 300));
  }, 600_000);
});
