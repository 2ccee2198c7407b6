import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { readRunText } from '../../core/formats/runFile.ts';
import { readSetup, reduceRun } from '../../core/reduction/engine.ts';
import { classifyWindOff, distinctAlphas, impactPressureFromQ, median, poolPoints, windOffRoles, zeroShiftAt } from '../../core/reduction/windOff.ts';
import type { ReductionResult } from '../../core/reduction/pipeline.ts';

const sample = (name: string) => readFileSync(new URL(`../../sample-runs/${name}`, import.meta.url), 'utf8');
const setupText = sample('setup-3d.json');
const D = Math.PI / 180;

function reduce(text: string, opts: { tare?: string; setup?: string } = {}): ReductionResult {
  const setup = readSetup('setup.json', opts.setup ?? setupText);
  if (!setup.ok) throw new Error(JSON.stringify(setup.errors));
  const r = reduceRun({ run: readRunText('run.csv', text), setup: setup.value, tare: opts.tare ? readRunText('tare.csv', opts.tare) : undefined });
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.file}:${e.line}: ${e.field ?? ''} ${e.message}`).join('\n'));
  return r.value;
}
function refusal(text: string, opts: { tare?: string; setup?: string } = {}): string {
  const setup = readSetup('setup.json', opts.setup ?? setupText);
  if (!setup.ok) throw new Error('bad setup');
  const r = reduceRun({ run: readRunText('run.csv', text), setup: setup.value, tare: opts.tare ? readRunText('tare.csv', opts.tare) : undefined });
  if (r.ok) throw new Error('expected a refusal');
  return r.errors.map((e) => `${e.file}:${e.line ?? ''}: ${e.field ?? ''} ${e.message}`).join('\n');
}

/** Data rows of a sample file as arrays of cells, and its header line. */
function table(name: string): { header: string; rows: string[][] } {
  const lines = sample(name)
    .split('\n')
    .filter((l) => l.trim() !== '' && !l.startsWith('#'));
  return { header: lines[0]!, rows: lines.slice(1).map((l) => l.split(',')) };
}
const run101 = table('run-101-clean.csv'); // alpha,dp_pitot,p_static,t_total,rh,lift,drag,pitch
const tare100 = table('windoff-tare.csv'); // alpha,lift,drag,pitch
const plain = reduce(sample('run-101-clean.csv'));
const withTare = reduce(sample('run-101-clean.csv'), { tare: sample('windoff-tare.csv') });

function sameCoefficients(a: ReductionResult, b: ReductionResult, digits = 9) {
  expect(a.points.map((p) => p.alpha_uncorrected_deg)).toEqual(b.points.map((p) => p.alpha_uncorrected_deg));
  a.points.forEach((p, i) => {
    const q = b.points[i]!;
    expect(p.cl_uncorrected).toBeCloseTo(q.cl_uncorrected, digits);
    expect(p.cd_uncorrected).toBeCloseTo(q.cd_uncorrected, digits);
    expect(p.cm_uncorrected!).toBeCloseTo(q.cm_uncorrected!, digits);
    expect(p.q_uncorrected_pa).toBeCloseTo(q.q_uncorrected_pa, digits - 4);
  });
}

describe('wind-off classification (pure)', () => {
  it('marks points below 5 % of the median q as wind-off, and all of them when the median is not positive', () => {
    expect(median([3, 1, 2])).toBe(2);
    expect(median([4, 1, 2, 3])).toBe(2.5);
    // median 590 Pa, threshold 29.5 Pa
    expect(classifyWindOff([600, 610, 605, 595, 590, 29, 31, 0, -3, Number.NaN])).toEqual([false, false, false, false, false, true, false, true, true, true]);
    expect(classifyWindOff([0, 0.1, -0.1])).toEqual([true, true, true]);
  });

  it('counts distinct alphas with the grouping tolerance', () => {
    expect(distinctAlphas([0, 0.1 * D, 2 * D, 2.05 * D, 4 * D], 0.2 * D)).toBe(3);
    expect(distinctAlphas([], 0.2 * D)).toBe(0);
  });

  it('gives roles: leading/trailing wind-off at one alpha are zero readings; a sweep of ≥3 alphas is the tare unless one is given', () => {
    const a = [0, -4, 0, 4, 8, -4, 0, 4, 0, 0].map((x) => x * D);
    const off = [true, true, true, true, true, false, false, false, true, true];
    // leading block spans several alphas: it is a sweep (the tare); trailing block at one alpha: zero reading
    expect(windOffRoles(a, off, 0.2 * D, false)).toEqual(['tare', 'tare', 'tare', 'tare', 'tare', 'on', 'on', 'on', 'zero-end', 'zero-end']);
    expect(windOffRoles(a, off, 0.2 * D, true)).toEqual(['excluded', 'excluded', 'excluded', 'excluded', 'excluded', 'on', 'on', 'on', 'zero-end', 'zero-end']);
    const b = [0, 0, 4, 8, 6, 0].map((x) => x * D);
    expect(windOffRoles(b, [true, false, false, true, false, true], 0.2 * D, false)).toEqual(['zero-start', 'on', 'on', 'excluded', 'on', 'zero-end']);
  });

  it('interpolates the zero shift linearly between a start and an end reading, constant with one', () => {
    const s = { at: 10, shift: Float64Array.of(1, -2) };
    const e = { at: 30, shift: Float64Array.of(3, 2) };
    expect([...zeroShiftAt(15, s, e)!]).toEqual([1.5, -1]);
    expect([...zeroShiftAt(40, s, e)!]).toEqual([3, 2]);
    expect([...zeroShiftAt(15, s, undefined)!]).toEqual([1, -2]);
    expect(zeroShiftAt(15, undefined, undefined)).toBeUndefined();
  });

  it('pools two points as if their samples had been averaged together (Chan, Golub & LeVeque 1979)', () => {
    const xs = [1, 2, 4, 8, 16];
    const stats = (v: number[]) => {
      const m = v.reduce((s, x) => s + x, 0) / v.length;
      const sd = Math.sqrt(v.reduce((s, x) => s + (x - m) ** 2, 0) / (v.length - 1));
      return { key: 'k', line: 1, n: v.length, mean: Float64Array.of(m), std: Float64Array.of(v.length > 1 ? sd : 0) };
    };
    const p = poolPoints(stats(xs.slice(0, 2)), stats(xs.slice(2)));
    const all = stats(xs);
    expect(p.n).toBe(5);
    expect(p.mean[0]).toBeCloseTo(all.mean[0]!, 14);
    expect(p.std[0]).toBeCloseTo(all.std[0]!, 13);
  });

  it('turns a dynamic pressure into the pitot impact pressure by the isentropic relations (NACA Report 1135)', () => {
    // q = (γ/2)·p·M²; p0/p = (1 + 0.2 M²)^3.5 for γ = 1.4 (NACA 1135 eq. 44)
    const p = 101325;
    const M = 0.1;
    const q = 0.7 * p * M * M;
    const dp = p * ((1 + 0.2 * M * M) ** 3.5 - 1);
    expect(impactPressureFromQ(q, p, 1.4)).toBeCloseTo(dp, 9);
    expect(dp / q).toBeCloseTo(1 + (M * M) / 4, 4); // low-Mach expansion p0 − p ≈ q(1 + M²/4)
    expect(impactPressureFromQ(-3, p, 1.4)).toBe(-3);
  });
});

describe('pressure sources', () => {
  const withSource = (name: string, value: (row: string[]) => number) =>
    [run101.header.replace('dp_pitot [Pa]', name), ...run101.rows.map((r) => [r[0], String(value(r)), ...r.slice(2)].join(','))].join('\n');
  const qOf = (r: string[]) => {
    const dp = Number(r[1]);
    const p = Number(r[2]);
    const m2 = 5 * ((1 + dp / p) ** (1 / 3.5) - 1); // NACA 1135 eq. 48 with γ = 1.4
    return 0.7 * p * m2;
  };

  it("reads the facility's own q and reduces it to the same coefficients as the pitot pressure", () => {
    const r = reduce(withSource('q [Pa]', qOf));
    sameCoefficients(r, plain);
    expect(r.warnings.join('\n')).toContain('q is taken from "q" as the facility logged it');
  });

  it('reads dp_contraction × flow.contraction_factor', () => {
    const setup = JSON.parse(setupText);
    setup.flow.contraction_factor = 1.08;
    const r = reduce(
      withSource('dp_contraction [Pa]', (row) => qOf(row) / 1.08),
      { setup: JSON.stringify(setup) },
    );
    sameCoefficients(r, plain);
    expect(r.warnings.join('\n')).toContain('× flow.contraction_factor 1.08');
  });

  it('refuses dp_contraction without flow.contraction_factor, naming the field', () => {
    expect(refusal(withSource('dp_contraction [Pa]', qOf))).toMatch(/flow\.contraction_factor/);
  });

  it('takes q before dp_pitot before dp_contraction, and says which', () => {
    const text = [
      run101.header.replace('dp_pitot [Pa]', 'dp_pitot [Pa],q [Pa],dp_contraction [Pa]'),
      ...run101.rows.map((r) => [r[0], '9999', String(qOf(r)), '1', ...r.slice(2)].join(',')),
    ].join('\n');
    const r = reduce(text);
    sameCoefficients(r, plain);
    expect(r.warnings.join('\n')).toContain('"q", "dp_pitot", "dp_contraction" are all present: q is taken from "q"');
  });
});

describe('wind-off points inside a run', () => {
  const windOffRow = (t: string[], dp: string, ref: string[]) => [t[0], dp, ...ref.slice(2, 5), t[1], t[2], t[3]].join(',');

  it('takes a wind-off sweep at the start of the file as the tare when none is given, with a notice', () => {
    const ref = run101.rows[0]!;
    const text = [
      run101.header,
      ...tare100.rows.map((t, i) => windOffRow(t, (0.3 * (i % 2 ? 1 : -1)).toFixed(2), ref)),
      ...run101.rows.map((r) => r.join(',')),
    ].join('\n');
    const r = reduce(text);
    expect(r.points).toHaveLength(15);
    sameCoefficients(r, withTare, 12);
    expect(r.warnings.join('\n')).toMatch(/no tare file given: the run's own wind-off points \(14, at 14 angles, lines 2–15\) are used as its tare/);
    expect(r.run['tare_file']).toBe('run.csv');
  });

  it("leaves the run's wind-off sweep out, naming its lines, when a tare file is given", () => {
    const ref = run101.rows[0]!;
    const text = [run101.header, ...tare100.rows.slice(0, 3).map((t) => windOffRow(t, '0.1', ref)), ...run101.rows.map((r) => r.join(','))].join('\n');
    const r = reduce(text, { tare: sample('windoff-tare.csv') });
    sameCoefficients(r, withTare, 12);
    const w = r.warnings.filter((x) => x.includes('wind-off ('));
    expect(w.map((x) => x.slice(0, 10))).toEqual(['run.csv:2:', 'run.csv:3:', 'run.csv:4:']);
  });

  it('removes balance zero drift interpolated in file order between start and end readings', () => {
    const zero = (lift: number, drag: number, pitch: number) => ['0.0', '0.2', ...run101.rows[0]!.slice(2, 5), lift, drag, pitch].join(',');
    const n = run101.rows.length;
    const start = { l: 0.8, d: 0.05, m: -0.02 };
    const end = { l: 2.0, d: -0.07, m: 0.04 };
    // line of the start reading is 2, wind-on rows 3 … n + 2, end reading n + 3
    const drift = (line: number, a: number, b: number) => a + ((b - a) * (line - 2)) / (n + 1);
    const rows = run101.rows.map((r, i) => {
      const line = i + 3;
      return [
        ...r.slice(0, 5),
        Number(r[5]) + drift(line, start.l, end.l),
        Number(r[6]) + drift(line, start.d, end.d),
        Number(r[7]) + drift(line, start.m, end.m),
      ].join(',');
    });
    const text = [run101.header, zero(start.l, start.d, start.m), ...rows, zero(end.l, end.d, end.m)].join('\n');
    const r = reduce(text);
    sameCoefficients(r, plain, 10);
    expect(r.warnings.join('\n')).toMatch(
      /balance zero drift removed: start reading at line 2 .* end reading at line 18 .* interpolated linearly in file order/,
    );
  });

  it("interpolates in the time column when there is one, and subtracts the tare at the reading's alpha", () => {
    const n = run101.rows.length;
    const times = [0, ...Array.from({ length: n }, (_, i) => 100 + 30 * i * i), 100 + 30 * n * n];
    const tAt = (i: number) => times[i]!;
    const shift = (t: number) => 0.5 + (1.5 * t) / times[n + 1]!; // lift shift, N
    const tareLift0 = -14.138; // the tare at alpha 0.015° is near its alpha-0 value; the reading sits on a tare point
    const header = run101.header + ',time [s]';
    const zero = (i: number) => ['0.015', '0.1', ...run101.rows[0]!.slice(2, 5), tareLift0 + shift(tAt(i)), '0.0182', '-0.1723', tAt(i)].join(',');
    const rows = run101.rows.map((r, i) => [...r.slice(0, 5), Number(r[5]) + shift(tAt(i + 1)), r[6], r[7], tAt(i + 1)].join(','));
    const r = reduce([header, zero(0), ...rows, zero(n + 1)].join('\n'), { tare: sample('windoff-tare.csv') });
    sameCoefficients(r, withTare, 10);
    expect(r.warnings.join('\n')).toContain('interpolated linearly in the time column');
  });

  it('pools the samples of a wind-off point that noise split while grouping', () => {
    const ref = run101.rows[0]!;
    const zeroRows = [0.3, 0.01, -0.2, 0.25].map((dp) => ['0.0', String(dp), ...ref.slice(2, 5), '1', '0', '0'].join(','));
    const r = reduce([run101.header, ...zeroRows, ...run101.rows.map((x) => x.join(','))].join('\n'));
    expect(r.points).toHaveLength(15);
    expect(r.warnings.join('\n')).toMatch(/start reading at line 2 \(lift 1\.00, drag 0\.00, pitch 0\.00\)/);
  });
});

describe('tare checks', () => {
  it('refuses a tare without a load channel the run uses, naming the channel', () => {
    const tare = sample('windoff-tare.csv')
      .replace('pitch [N m]', 'note')
      .replace(/,(-?[\d.]+)$/gm, ',x');
    expect(refusal(sample('run-101-clean.csv'), { tare })).toMatch(/^tare\.csv:6: +the tare has no "pitch" column, which the run run\.csv uses/);
  });

  it('refuses a wind-on file given as the tare', () => {
    expect(refusal(sample('run-101-clean.csv'), { tare: sample('run-102-flap10.csv') })).toMatch(
      /the tare is a wind-on file: its median q \(6\d\d Pa, from "dp_pitot"\) exceeds 5 % of the run's/,
    );
  });

  it('accepts a tare whose pressure column reads wind-off', () => {
    const t = table('windoff-tare.csv');
    const tare = [t.header + ',dp_pitot', ...t.rows.map((r, i) => [...r, String(i % 3)].join(','))].join('\n');
    sameCoefficients(reduce(sample('run-101-clean.csv'), { tare }), withTare, 12);
  });
});

describe('missing required channel', () => {
  it('lists every column of the file with the closest matches', () => {
    const text = sample('run-101-clean.csv').replace('alpha [deg]', 'AoA [deg]');
    expect(refusal(text)).toMatch(
      /missing required column "alpha" \(angle of attack\); the file's columns: 1 "AoA \[deg\]", 2 "dp_pitot \[Pa\]", .*8 "pitch \[N m\]"; closest: "AoA \[deg\]" \(column 1\)/,
    );
  });
});

describe('setup fields for reading tunnel files', () => {
  const edit = (f: (s: Record<string, any>) => void) => {
    const s = JSON.parse(setupText);
    f(s);
    return readSetup('setup.json', JSON.stringify(s));
  };
  it('defaults grouping.alpha_tol_deg to 0.2 and leaves contraction_factor unset', () => {
    const r = edit(() => undefined);
    expect(r.ok && r.value.setup.grouping).toEqual({ alpha_tol_deg: 0.2 });
    expect(r.ok && r.value.setup.flow.contraction_factor).toBeUndefined();
  });
  it('refuses a tolerance or factor that is not a positive number, naming the field', () => {
    for (const [f, field] of [
      [(s: Record<string, any>) => (s.grouping = { alpha_tol_deg: 0 }), 'grouping.alpha_tol_deg'],
      [(s: Record<string, any>) => (s.grouping = { alpha_tol_deg: 12 }), 'grouping.alpha_tol_deg'],
      [(s: Record<string, any>) => (s.flow.contraction_factor = -1), 'flow.contraction_factor'],
    ] as const) {
      const r = edit(f);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.errors[0]!.field).toBe(field);
    }
  });
});
