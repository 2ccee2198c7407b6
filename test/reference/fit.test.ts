import { describe, expect, it } from 'vitest';
import { findLinearRange, fitPolar, type FitInput } from '../../core/fits/characteristics.ts';
import { fitLine, fitPolynomial, parabolaVertex } from '../../core/fits/leastSquares.ts';
import { helmboldSlope } from '../../core/walls/wall3d.ts';

const RAD = 180 / Math.PI;

function polar(alphas: number[], cl: (a: number) => number, cd: (c: number, a: number) => number, kind: '2d' | '3d' = '3d', ar = 6): FitInput {
  const c = alphas.map(cl);
  return { alphaDeg: alphas, cl: c, cd: c.map((x, i) => cd(x, alphas[i]!)), cm: c.map((x) => -0.05 - 0.02 * x), clScatter: alphas.map(() => 0), kind, aspectRatio: ar };
}

describe('least squares', () => {
  it('fits an exact line exactly, with zero residual and slope error', () => {
    const f = fitLine([0, 1, 2, 3], [1, 3, 5, 7]);
    expect(f.slope).toBeCloseTo(2, 14);
    expect(f.intercept).toBeCloseTo(1, 14);
    expect(f.maxResidual).toBeCloseTo(0, 14);
    expect(f.slopeStderr).toBeCloseTo(0, 14);
  });

  it('gives the textbook slope standard error √(s²/Sxx) (Draper & Smith eq. 1.4.3) on a small worked set', () => {
    // x = 1..5, y = 2.1, 3.9, 6.2, 7.8, 10.1: hand-computed slope 1.99, residual SS 0.107, Sxx 10
    const f = fitLine([1, 2, 3, 4, 5], [2.1, 3.9, 6.2, 7.8, 10.1]);
    expect(f.slope).toBeCloseTo(1.99, 12);
    expect(f.slopeStderr).toBeCloseTo(Math.sqrt(0.107 / 3 / 10), 10);
  });

  it('recovers a quadratic exactly and refuses a singular system', () => {
    const p = fitPolynomial([-1, 0, 1, 2], [3, 1, 3, 9], 2)!; // 1 + 0x + 2x²
    expect(p[0]).toBeCloseTo(1, 12);
    expect(p[1]).toBeCloseTo(0, 12);
    expect(p[2]).toBeCloseTo(2, 12);
    expect(fitPolynomial([1, 1, 1], [1, 2, 3], 1)).toBeUndefined();
    expect(fitPolynomial([], [], 1)).toBeUndefined();
  });

  it('finds the vertex of a parabola through three points', () => {
    const v = parabolaVertex([10, 12, 14], [1.1, 1.2, 1.15])!;
    // through the three points: vertex where the derivative of the interpolant vanishes (hand algebra: x = 12.333…)
    expect(v.x).toBeCloseTo(12 + 1 / 3, 10);
    expect(parabolaVertex([0, 1, 2], [0, 1, 2])).toBeUndefined();
  });
});

describe('lift-curve fits', () => {
  it('gives null fits with a warning for empty input, too few points, and NaN', () => {
    const empty = fitPolar({ alphaDeg: [], cl: [], cd: [], cm: [], clScatter: [], kind: '3d', aspectRatio: 6 });
    expect(empty.fit.cl_alpha_per_deg).toBeNull();
    expect(empty.fit.cl_max).toBeNull();
    expect(empty.warnings.join()).toContain('no points to fit');
    const three = fitPolar(polar([0, 2, 4], (a) => 0.1 * a, () => 0.01));
    expect(three.fit.cl_alpha_per_deg).toBeNull();
    expect(findLinearRange([0, 1, 2, 3], [0, Number.NaN, 0.2, 0.3], [0, 0, 0, 0])).toBeUndefined();
  });

  it('recovers the thin-airfoil slope 2π per radian from a synthetic section polar (Abbott & von Doenhoff §4.3)', () => {
    const a0 = -2;
    const alphas = [-6, -4, -2, 0, 2, 4, 6, 8, 10, 12, 14, 16];
    const r = fitPolar(polar(alphas, (a) => (2 * Math.PI / RAD) * (a - a0) - (a > 10 ? 0.03 * (a - 10) ** 2 : 0), (c) => 0.008 + 0.005 * c * c, '2d'));
    expect(r.fit.cl_alpha_per_deg! * RAD).toBeCloseTo(2 * Math.PI, 6);
    expect(r.fit.alpha_zero_lift_deg).toBeCloseTo(a0, 8);
    expect(r.fit.linear_range_deg).toEqual([-6, 10]);
    expect(r.fit.oswald_e).toBeNull(); // 2D
    expect(r.fit.x_ac_aft_of_ref_c).toBeCloseTo(0.02, 10); // reported for a section too: cm = −0.05 − 0.02·cl puts it 0.02c aft of the reference
  });

  it('recovers the Helmbold finite-wing slope and the Oswald factor of a synthetic wing (AR 6, e = 0.85)', () => {
    const AR = 6;
    const a = helmboldSlope(AR) / RAD;
    const e = 0.85;
    const k = 1 / (Math.PI * AR * e);
    const alphas = [-4, -2, 0, 2, 4, 6, 8, 10, 12, 13, 14, 15, 16];
    const r = fitPolar(polar(alphas, (x) => a * (x + 1.5) - (x > 9 ? 0.012 * (x - 9) ** 2 : 0), (c, x) => 0.011 + k * c * c + (x > 10.5 ? 0.01 * (x - 10.5) : 0), '3d', AR));
    expect(Math.abs(r.fit.cl_alpha_per_deg! / a - 1)).toBeLessThan(0.01);
    expect(Math.abs(r.fit.oswald_e! / e - 1)).toBeLessThan(0.03);
    expect(r.fit.cd0).toBeCloseTo(0.011, 6);
  });

  it('puts CLmax at the vertex of the parabola through the highest point and its neighbours, not at the highest sample', () => {
    const alphas = [0, 2, 4, 6, 8, 10, 11, 12, 13, 14, 15];
    // exact parabola near the peak: CL = 1.3 − 0.01(α − 12.4)²
    const r = fitPolar(polar(alphas, (a) => (a <= 10 ? 0.1 * a + 0.2 - 0.0 : 1.3 - 0.01 * (a - 12.4) ** 2), () => 0.02));
    expect(r.fit.cl_max).toBeCloseTo(1.3, 10);
    expect(r.fit.alpha_cl_max_deg).toBeCloseTo(12.4, 10);
  });

  it('gives no CLmax when the highest CL is at the end of the sweep (no peak reached)', () => {
    const r = fitPolar(polar([0, 2, 4, 6, 8], (a) => 0.1 * a, () => 0.02));
    expect(r.fit.cl_max).toBeNull();
    expect(r.fit.cl_max_reason).toContain('does not reach stall');
    expect(r.warnings.join()).toContain('CLmax is not given');
  });

  it('fits the cambered polar CD = CDmin + k(CL − CLmin)²', () => {
    const r = fitPolar(polar([-4, -2, 0, 2, 4, 6, 8], (a) => 0.1 * (a + 2), (c) => 0.01 + 0.05 * (c - 0.3) ** 2));
    expect(r.fit.cd_min).toBeCloseTo(0.01, 10);
    expect(r.fit.cl_min_drag).toBeCloseTo(0.3, 10);
    expect(r.fit.k_induced_cambered).toBeCloseTo(0.05, 10);
  });

  // The old rule (a fixed 0.01 unless the sample scatter said otherwise) found no range in this wobbly line;
  // the tolerance now follows the scatter the curve itself shows (robust residual estimate).
  it('widens the linear-range tolerance with the scatter of the curve itself and with the sample scatter', () => {
    const alphas = [-4, -2, 0, 2, 4, 6, 8];
    const wobble = [0, 0.015, -0.015, 0.015, -0.015, 0.015, 0];
    const input = polar(alphas, (a) => 0.1 * a, () => 0.02);
    input.cl = input.cl.map((c, i) => c + wobble[i]!);
    const own = findLinearRange(input.alphaDeg, input.cl, input.clScatter)!;
    expect(own.to - own.from).toBe(7);
    // chord residuals of ±0.03/√(1.5) everywhere inside → σ = 1.4826·0.0245 = 0.0363, tolerance 3.5 σ
    expect(own.tolerance).toBeCloseTo(3.5 * 1.4826 * (0.03 / Math.sqrt(1.5)), 6);
    const scattered = findLinearRange(input.alphaDeg, input.cl, alphas.map(() => 0.05))!;
    expect(scattered.tolerance).toBeCloseTo(3.5 * 0.05, 12);
  });
});

describe('linear range on very many points', () => {
  it('finds the range of a 20,000-point continuous sweep (searched on every k-th point) with the slope of the data', () => {
    const n = 20000;
    const a = Array.from({ length: n }, (_, i) => -6 + (22 * i) / n);
    const cl = a.map((x) => 0.07 * (x + 2) - (x > 10 ? 0.01 * (x - 10) ** 2 : 0));
    const range = findLinearRange(a, cl, a.map(() => 0))!;
    expect(Math.abs(range.line.slope / 0.07 - 1)).toBeLessThan(2e-3); // the range ends where the bend exceeds the 0.01 tolerance
    expect(a[range.from]).toBe(-6);
    expect(a[range.to - 1]!).toBeGreaterThan(10);
    expect(a[range.to - 1]!).toBeLessThan(12);
  });
});
