/**
 * Balance calibration: the document's checks, both forms of conversion, the outputs_from_loads
 * iteration and the least-squares calibration, against an independent reference computed with numpy
 * (numpy.linalg.lstsq) and scipy (scipy.optimize.fsolve, a general root finder rather than the
 * fixed-point iteration used here) by test/fixtures/balance/generate.py. The AIAA R-091 two-component
 * worked example was located (as a web copy) but its data tables could not be retrieved in full,
 * so the checks use this independent computation instead.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../core/contract/messages.ts';
import { fitCalibration, parseLoadings } from '../../core/balance/calibrate.ts';
import { ITERATION_LIMIT, loadsFromOutputs, outputsFromLoads } from '../../core/balance/convert.ts';
import { parseBalance, quadraticTermNames, quadraticTerms, validateBalance, type BalanceDocument } from '../../core/balance/document.ts';
import { invert, leastSquares } from '../../core/balance/matrix.ts';

const FIX = join(__dirname, '../fixtures/balance');
const truthText = readFileSync(join(FIX, 'truth.json'), 'utf8');
const expected = JSON.parse(readFileSync(join(FIX, 'expected.json'), 'utf8'));
const loadingsText = readFileSync(join(FIX, 'loadings.csv'), 'utf8');

function errorOf(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('expected an InputError');
}

const base = (): BalanceDocument => JSON.parse(truthText);

describe('second-order terms', () => {
  it('come in the contract order x1², x1x2, …, x1xn, x2², x2x3, …, xn²', () => {
    expect(Array.from(quadraticTerms([2, 3, 5]))).toEqual([4, 6, 10, 9, 15, 25]);
    expect(quadraticTermNames(['a', 'b', 'c'])).toEqual(['a²', 'a·b', 'a·c', 'b²', 'b·c', 'c²']);
    expect(Array.from(quadraticTerms([7]))).toEqual([49]);
  });
});

describe('balance document checks (bad input named by file and field)', () => {
  it('refuses a linear matrix with the wrong number of rows, naming the field', () => {
    const d = base();
    d.linear = d.linear.slice(0, 2);
    const e = errorOf(() => validateBalance('b.json', d));
    expect(e.notice).toMatchObject({ file: 'b.json', field: 'linear' });
    expect(e.notice.message).toMatch(/2 rows.*needs 3/);
  });
  it('refuses a row of the wrong width and a quadratic block of the wrong width', () => {
    const d = base();
    d.linear[1] = [1, 2];
    expect(errorOf(() => validateBalance('b.json', d)).notice.field).toBe('linear[1]');
    const q = base();
    q.quadratic![2] = [0, 0, 0];
    const e = errorOf(() => validateBalance('b.json', q));
    expect(e.notice.field).toBe('quadratic[2]');
    expect(e.notice.message).toMatch(/expected 6/);
  });
  it('refuses a singular linear matrix', () => {
    const d = base();
    d.linear[2] = [...d.linear[0]!].map((x) => 2 * x);
    const e = errorOf(() => validateBalance('b.json', d));
    expect(e.notice.field).toBe('linear');
    expect(e.notice.message).toMatch(/singular/);
  });
  it('refuses loads and outputs of different counts in the outputs_from_loads form, an unknown load and a wrong unit', () => {
    const d = base();
    d.outputs = ['r1', 'r2'];
    expect(errorOf(() => validateBalance('b.json', d)).notice.field).toBe('outputs');
    const u = base();
    (u.loads as string[])[1] = 'thrust';
    expect(errorOf(() => validateBalance('b.json', u)).notice).toMatchObject({ field: 'loads[1]' });
    const w = base();
    w.load_units[2] = 'N';
    expect(errorOf(() => validateBalance('b.json', w)).notice.message).toMatch(/moment unit/);
  });
  it('names the inline field path inside a setup, and the line and column of a JSON error', () => {
    const d = base();
    d.natural_zeros = [0, 0];
    expect(errorOf(() => validateBalance('setup.json', d, 'balance.calibration.')).notice.field).toBe('balance.calibration.natural_zeros');
    const e = errorOf(() => parseBalance('b.json', '{\n  "format": "sweepbook-balance",\n  "version": 1,,\n}'));
    expect(e.notice).toMatchObject({ file: 'b.json', line: 3 });
  });
});

describe('outputs_from_loads: loads by the recommended-practice iteration', () => {
  const truth = parseBalance('truth.json', truthText);
  const ts = expected.truth_solve;
  it('recovers the loads scipy.optimize.fsolve finds, to 1e-9 relative', () => {
    ts.outputs.forEach((R: number[], i: number) => {
      const s = loadsFromOutputs(truth, R);
      expect(s.ok).toBe(true);
      if (!s.ok) return;
      const want = ts.loads_fsolve[i] as number[];
      const scale = Math.max(1, ...want.map(Math.abs));
      s.loads.forEach((x, k) => expect(Math.abs(x - want[k]!)).toBeLessThan(1e-9 * scale));
      // and the loads the outputs were made from (generate.py)
      s.loads.forEach((x, k) => expect(x).toBeCloseTo(ts.loads_applied[i][k], 8));
    });
  });
  it('ignoring the interaction terms misses the loads by far more than the calibration scatter (the acceptance check has teeth)', () => {
    const linear = parseBalance('lin.json', JSON.stringify({ ...base(), quadratic: undefined }));
    const s = loadsFromOutputs(linear, ts.outputs[0]);
    expect(s.ok && Math.abs(s.loads[1]! - ts.loads_applied[0][1])).toBeGreaterThan(10); // axial: 13.8 N off of 90 N
    s.ok && s.loads.forEach((x, k) => expect(x).toBeCloseTo(ts.loads_linear_only[0][k], 9));
  });
  it('round-trips loads → outputs → loads', () => {
    const F = [123.4, -56.7, 8.9];
    const s = loadsFromOutputs(truth, outputsFromLoads(truth, F));
    expect(s.ok && s.loads.map((x, k) => x - F[k]!).every((d) => Math.abs(d) < 1e-9)).toBe(true);
  });
  it('zero outputs above the natural zeros give zero loads', () => {
    const s = loadsFromOutputs(truth, truth.zeros);
    expect(s).toMatchObject({ ok: true, loads: [0, 0, 0] });
  });
  it(`reports an iteration that does not converge in ${ITERATION_LIMIT} steps instead of guessing`, () => {
    const d = base();
    d.quadratic = d.quadratic!.map((r) => r.map((x) => x * 4000));
    const b = validateBalance('wild.json', d);
    const s = loadsFromOutputs(b, [2.0, 1.5, 1.0]);
    expect(s.ok).toBe(false);
    expect(!s.ok && s.reason).toMatch(/did not converge in 50 iterations/);
  });
  it('reports a non-finite output', () => {
    const s = loadsFromOutputs(truth, [Number.NaN, 0, 0]);
    expect(!s.ok && s.reason).toMatch(/"r1" is not a finite number/);
  });
});

describe('loads_from_outputs: the direct polynomial', () => {
  it('evaluates F = linear·ΔR + quadratic·p(ΔR) term by term', () => {
    const b = validateBalance('d.json', {
      format: 'sweepbook-balance',
      version: 1,
      loads: ['lift', 'drag'],
      load_units: ['N', 'lbf'],
      outputs: ['a', 'b'],
      natural_zeros: [1, 2],
      form: 'loads_from_outputs',
      linear: [
        [10, 1],
        [0.5, 20],
      ],
      quadratic: [
        [1, 2, 3],
        [0, -1, 0],
      ],
    });
    // ΔR = (1, 1): F1 = 10 + 1 + (1 + 2 + 3) = 17; F2 = 0.5 + 20 − 1 = 19.5 (by hand)
    expect(loadsFromOutputs(b, [2, 3])).toMatchObject({ ok: true, loads: [17, 19.5] });
  });
});

describe('least-squares calibration against numpy.linalg.lstsq (generate.py)', () => {
  const l = parseLoadings('loadings.csv', loadingsText, ['normal', 'axial', 'pitch'], ['r1', 'r2', 'r3']);
  const cases: [string, 'outputs_from_loads' | 'loads_from_outputs', boolean][] = [
    ['outputs_from_loads', 'outputs_from_loads', false],
    ['loads_from_outputs', 'loads_from_outputs', false],
    ['outputs_from_loads_linear', 'outputs_from_loads', true],
  ];
  it('reads the loadings with their units and finds the natural zeros from the zero-load loadings', () => {
    expect(l.applied).toHaveLength(55);
    expect(l.loadUnits).toEqual(['N', 'N', 'N m']);
    expect(l.outputUnits).toEqual(['mV/V', 'mV/V', 'mV/V']);
  });
  for (const [key, form, linearOnly] of cases) {
    it(`${key}: matrices, zeros and residual statistics agree to 1e-7 relative`, () => {
      const want = expected.fits[key];
      const f = fitCalibration(l, form, linearOnly);
      const close = (a: number, b: number, scale: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-7 * scale);
      const all = (m: number[][]) => Math.max(...m.flat().map(Math.abs));
      f.document.linear.forEach((r, i) => r.forEach((x, j) => close(x, want.linear[i][j], Math.abs(want.linear[i][j]) + 1e-3 * all(want.linear))));
      if (want.quadratic)
        f.document.quadratic!.forEach((r, i) =>
          r.forEach((x, j) => close(x, want.quadratic[i][j], Math.abs(want.quadratic[i][j]) + 1e-3 * all(want.quadratic))),
        );
      else expect(f.document.quadratic).toBeUndefined();
      f.document.natural_zeros!.forEach((z, j) => close(z, want.natural_zeros[j], 1));
      f.residualSd.forEach((x, k) => close(x, want.residual_sd[k], want.residual_sd[k]));
      f.residualMax.forEach((x, k) => close(x, want.residual_max[k], want.residual_max[k]));
      (f.document.fit!['residual_max_pct'] as number[]).forEach((x, k) => close(x, want.residual_max_pct[k], want.residual_max_pct[k]));
      expect(f.document.fit!['terms_per_equation']).toBe(want.terms);
    });
  }
  it('the quadratic fit in the recommended-practice form is far better than the linear one on these loadings', () => {
    const quad = fitCalibration(l, 'outputs_from_loads');
    const lin = fitCalibration(l, 'outputs_from_loads', true);
    quad.residualSd.forEach((s, k) => expect(s * 20).toBeLessThan(lin.residualSd[k]!));
  });
  it('refuses loadings that cannot separate the interaction terms, naming the term', () => {
    const single = loadingsText
      .split('\n')
      .filter(
        (line, i) =>
          i < 3 ||
          (/^\d+,/.test(line) &&
            line
              .split(',')
              .slice(1, 4)
              .filter((c) => Number(c) !== 0).length <= 1),
      )
      .join('\n');
    const ls = parseLoadings('single.csv', single, ['normal', 'axial', 'pitch'], ['r1', 'r2', 'r3']);
    const e = errorOf(() => fitCalibration(ls, 'outputs_from_loads'));
    expect(e.notice.message).toMatch(/do not separate the term normal·axial/);
    expect(fitCalibration(ls, 'outputs_from_loads', true).residualSd).toHaveLength(3);
  });
  it('names a missing column and a bad cell by line and column', () => {
    expect(errorOf(() => parseLoadings('x.csv', loadingsText, ['normal', 'axial', 'pitch'], ['r1', 'r2', 'r4'])).notice.message).toMatch(/no column "r4"/);
    const bad = loadingsText.replace('\n5,', '\n5,oops');
    const p = parseLoadings('x.csv', bad, ['normal', 'axial', 'pitch'], ['r1', 'r2', 'r3']);
    expect(p.warnings[0]).toMatchObject({ line: 8, column: 2 });
  });
});

describe('matrix helpers', () => {
  it('invert finds singular matrices and inverts well-posed ones', () => {
    expect(
      invert([
        [1, 2],
        [2, 4],
      ]),
    ).toBeUndefined();
    expect(
      invert([
        [4, 7],
        [2, 6],
      ])!
        .flat()
        .map((x) => Number(x.toFixed(12))),
    ).toEqual([0.6, -0.7, -0.2, 0.4]); // by hand: 1/10·[[6,−7],[−2,4]]
  });
  it('leastSquares fits an exact line exactly and flags a repeated column', () => {
    const X = [
      [1, 0],
      [1, 1],
      [1, 2],
      [1, 3],
    ];
    const r = leastSquares(X, [[1, 3, 5, 7]]);
    expect(r.coef[0]!.map((x) => Number(x.toFixed(12)))).toEqual([1, 2]);
    expect(
      leastSquares(
        [
          [1, 2],
          [2, 4],
          [3, 6],
        ],
        [[1, 2, 3]],
      ).dependentColumn,
    ).toBe(1);
  });
});

describe('robustness (property tests, fast-check)', () => {
  it('any JSON value as a balance document gives a checked balance or a message naming a field, never a crash', async () => {
    const fc = (await import('fast-check')).default;
    const doc = base();
    const mutated = fc.record({
      key: fc.constantFrom('format', 'version', 'loads', 'load_units', 'outputs', 'natural_zeros', 'form', 'linear', 'quadratic', 'fit', 'note', 'extra'),
      value: fc.jsonValue(),
    });
    fc.assert(
      fc.property(fc.array(mutated, { maxLength: 3 }), (changes) => {
        const d: Record<string, unknown> = JSON.parse(JSON.stringify(doc));
        for (const c of changes) d[c.key] = c.value;
        try {
          validateBalance('b.json', d);
        } catch (e) {
          if (!(e instanceof InputError)) throw e;
          expect(e.notice.file).toBe('b.json');
          expect(e.notice.field).toBeTruthy();
        }
      }),
      { numRuns: 400, seed: 13 },
    );
  });
  it('any outputs give loads or a reason, never a crash or a non-finite load', async () => {
    const fc = (await import('fast-check')).default;
    const truth = parseBalance('truth.json', truthText);
    fc.assert(
      fc.property(fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: false }), { minLength: 3, maxLength: 3 }), (R) => {
        const s = loadsFromOutputs(truth, R);
        if (s.ok) s.loads.forEach((x) => expect(Number.isFinite(x)).toBe(true));
        else expect(s.reason.length).toBeGreaterThan(10);
      }),
      { numRuns: 400, seed: 14 },
    );
  });
});
