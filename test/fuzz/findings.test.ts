import { describe, expect, it } from 'vitest';
import { readRun, readSetup, reduceRun, type ReductionResult } from '../../core/reduction/engine.ts';
import type { Notice } from '../../core/contract/messages.ts';
import { RUN_3D, RUN_SETUPS } from './inputs.ts';
import { nonFinite, resultProblems } from './properties.ts';

/**
 * The bugs the fuzz tests found, each as its smallest input, so that they stay fixed even if the
 * generators change. (Reader issues still open are listed in known-issues.ts.)
 */
const SETUP_TEXT = JSON.stringify(RUN_SETUPS.wind3d.setup);

async function reduceText(text: string, options: { tare?: string; noCorrections?: boolean } = {}) {
  const setup = readSetup('setup.json', SETUP_TEXT);
  const run = await readRun('run.csv', [text]);
  if (!setup.ok || !run.ok) throw new Error('the inputs should read');
  let tare;
  if (options.tare !== undefined) {
    const t = await readRun('tare.csv', [options.tare]);
    if (!t.ok) throw new Error('the tare should read');
    tare = t.value;
  }
  return reduceRun({ run: run.value, setup: setup.value, tare, noCorrections: options.noCorrections });
}

/** Six points of an invented sweep (not a measurement); `cell(i, column)` may replace any value. */
function sweep(cell: (i: number, column: string) => string | undefined = () => undefined): string {
  const columns = ['alpha', 'dp_pitot', 'p_static', 't_total', 'rh', 'lift', 'drag'];
  const lines = [columns.join(',')];
  for (let i = 0; i < 6; i++) {
    const plain = [2 * i, 600, 99000, 18, 50, 10 + 20 * i, 1 + 0.1 * i].map(String);
    lines.push(columns.map((c, j) => cell(i, c) ?? plain[j]!).join(','));
  }
  return lines.join('\n') + '\n';
}

function expectClean(r: ReductionResult) {
  expect(nonFinite(r)).toEqual([]);
  expect(resultProblems(r)).toEqual([]);
}

describe('setup files: every refusal is located and says what it found', () => {
  const place = (text: string) => {
    const o = readSetup('s.json', text);
    if (o.ok) throw new Error('expected a refusal');
    return o.errors[0] as Notice;
  };

  it('names line and column of JSON errors for which V8 gives no position', () => {
    // "Unexpected end of JSON input" and "Unexpected token '}', ... is not valid JSON" carry no position
    expect(place('')).toMatchObject({ line: 1, column: 1 });
    expect(place('{\n  "model": {\n    "kind": "3d",')).toMatchObject({ line: 3, column: 18 });
    expect(place('{\n  "model":\n}')).toMatchObject({ line: 3, column: 1 });
    expect(place('\ufeff{"a":}')).toMatchObject({ line: 1, column: 6 }); // counted after the byte-order mark
  });

  it('says a wrong-typed value is wrong, not missing', () => {
    const s = JSON.parse(SETUP_TEXT);
    s.model.chord_m = '0.225';
    const n = place(JSON.stringify(s));
    expect(n.field).toBe('model.chord_m');
    expect(n.message).toMatch(/not the text "0\.225"/);
    expect(n.message).not.toMatch(/missing/);
    delete s.model.chord_m;
    expect(place(JSON.stringify(s)).message).toMatch(/^missing/);
  });

  it('refuses geometry outside any tunnel (1e-300 m², 1e300 m), naming the field', () => {
    for (const [key, value] of [['area_m2', 1e-300], ['chord_m', 1e300], ['span_m', 5e-324]] as const) {
      const s = JSON.parse(SETUP_TEXT);
      s.model[key] = value;
      expect(place(JSON.stringify(s))).toMatchObject({ file: 's.json', field: `model.${key}` });
    }
  });
});

describe('run files: readings out of range are skipped and named, never NaN or Infinity', () => {
  it('skips a point whose humidity of 5e305 % gives no density, naming its line', async () => {
    const r = await reduceText(sweep((i, c) => (i === 2 && c === 'rh' ? '5e305' : undefined)));
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.value.points).toHaveLength(5);
    expect(r.value.warnings.some((w) => w.startsWith('run.csv:4:') && w.includes('skipped'))).toBe(true);
    expectClean(r.value);
  });

  it('drops a point whose drag of 1e300 N makes the wall corrections overflow', async () => {
    const r = await reduceText(sweep((i, c) => (i === 3 && c === 'drag' ? '1e300' : undefined)));
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.value.points.map((p) => p.line)).toEqual([2, 3, 4, 6, 7]);
    expect(r.value.warnings.some((w) => w.startsWith('run.csv:5:') && w.includes('wall corrections'))).toBe(true);
    expectClean(r.value);
  });

  it('gives L/D as null, not Infinity, when a drag underflows to 1e-320 N', async () => {
    const r = await reduceText(sweep((i, c) => (i === 3 && c === 'drag' ? '1e-320' : undefined)), { noCorrections: true });
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    expect(r.value.points[3]!.ld).toBeNull();
    expectClean(r.value);
  });

  it('names the first point and its reason when no point reduces (a wind-off file)', async () => {
    const r = await reduceText(sweep((_, c) => (c === 'dp_pitot' ? '0' : undefined)));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.errors[0]).toMatchObject({ file: 'run.csv', line: 2 });
    expect(r.errors[0]!.message).toMatch(/not positive \(wind off\?\).*5 more points/);
  });

  it('names the tare header line when the tare lacks alpha', async () => {
    const r = await reduceText(RUN_3D, { tare: '# wind-off\nlift,drag\n1,2\n' });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]).toMatchObject({ file: 'tare.csv', line: 2 });
  });
});
