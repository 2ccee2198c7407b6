import { describe, expect, it } from 'vitest';
import { fitDifference, fitPolar, type FitInput } from '../../core/fits/characteristics.ts';
import { splitBranches } from '../../core/fits/sweepBranches.ts';
import { findClMax } from '../../core/fits/clMax.ts';
import { normal } from '../support/random.ts';

/**
 * Sweep branches, first-stall CLmax, the data's own linear range and the cambered polar, on synthetic
 * sweeps whose truth is known (invented numbers; the rules are those of docs/methods.md, fits).
 */
function input(alphaDeg: number[], cl: number[], cd?: number[], extra: Partial<FitInput> = {}): FitInput {
  return {
    alphaDeg,
    cl,
    cd: cd ?? cl.map((c) => 0.012 + 0.06 * c * c),
    cm: cl.map(() => Number.NaN),
    clScatter: cl.map(() => 0),
    kind: '3d',
    aspectRatio: 6,
    runName: 'R7',
    ...extra,
  };
}

const up = (a0: number, a1: number, step = 1) => Array.from({ length: Math.round((a1 - a0) / step) + 1 }, (_, i) => a0 + i * step);
/** Lift of an invented wing: slope 0.075/deg, α0 = −2°, rounding over from 10°, stall drop after 14°. */
const liftUp = (a: number) => (a <= 10 ? 0.075 * (a + 2) : a <= 14 ? 0.9 + 0.05 * (a - 10) - 0.008 * (a - 10) ** 2 : 0.972 - 0.09 * (a - 14));

describe('sweep branches', () => {
  it('edge cases: no points, one point, a monotone sweep, a repeat point that does not make a branch', () => {
    expect(splitBranches([])).toEqual([]);
    expect(splitBranches([3]).map((b) => b.points)).toEqual([[0]]);
    expect(splitBranches([0, 2, 4, 6]).map((b) => [b.direction, b.points.length])).toEqual([['up', 4]]);
    // a back-step of one point (6 → 5) is shorter than a branch and stays in the rising sweep
    expect(splitBranches([0, 2, 4, 6, 5, 7, 8, 9]).length).toBe(1);
    // encoder jitter of 0.01° inside a point does not reverse the sweep
    expect(splitBranches([0, 1, 2, 2.01, 3, 4]).length).toBe(1);
    expect(splitBranches([10, 8, 6, 4]).map((b) => b.direction)).toEqual(['down']);
  });

  it('splits a return sweep through stall into an up and a down branch, fits the up branch and reports the loop', () => {
    const a = [...up(-4, 20), ...up(-4, 19).reverse()];
    // the return sweep reattaches late: lower lift between 11° and 16° (hysteresis)
    const cl = a.map((x, i) => (i > 24 && x >= 11 && x <= 16 ? liftUp(x) - 0.15 : liftUp(x)));
    const r = fitPolar(input(a, cl));
    expect(r.fit_branches.map((b) => b.direction)).toEqual(['up', 'down']);
    expect(r.fit.branch).toBe(0);
    expect(r.fit.branch_direction).toBe('up');
    // CLmax within 1 % of the up-branch measured peak and never more than 1 % above it (never 4.35 from mixed sweeps)
    const peak = Math.max(...cl.slice(0, 25));
    expect(r.fit.cl_max!).toBeLessThanOrEqual(peak * 1.01);
    expect(Math.abs(r.fit.cl_max! / peak - 1)).toBeLessThan(0.01);
    expect(r.fit.cl_alpha_per_deg).toBeCloseTo(0.075, 6);
    expect(r.fit.hysteresis_alpha_range_deg).toEqual([11, 16]);
    expect(r.fit.hysteresis_max_delta_cl).toBeCloseTo(0.15, 10);
    expect(r.fit_branches[1]!.alpha_range_deg).toEqual([-4, 19]);
    expect(r.fit_branches[1]!.cl_max).not.toBeNull();
    const w = r.warnings.join('\n');
    expect(w).toContain('run R7');
    expect(w).toMatch(/2 sweep branches/);
    expect(w).toContain('branch 1 of 2 (up');
  });

  it('fits a single falling sweep as it runs', () => {
    const a = up(-4, 10).reverse();
    const r = fitPolar(input(a, a.map(liftUp)));
    expect(r.fit_branches.length).toBe(1);
    expect(r.fit.branch_direction).toBe('down');
    expect(r.fit.cl_alpha_per_deg).toBeCloseTo(0.075, 8);
  });
});

describe('CLmax at the first stall', () => {
  it('takes the measured peak of an abrupt stall (0.97, 0.98, then 0.60), never a vertex above every point', () => {
    const a = up(0, 14);
    const cl = a.map((x) => 0.08 * x);
    cl[11] = 0.97;
    cl[12] = 0.98;
    cl[13] = 0.6;
    cl[14] = 0.58;
    const r = fitPolar(input(a, cl));
    expect(r.fit.cl_max).toBe(0.98);
    expect(r.fit.alpha_cl_max_deg).toBe(12);
    expect(r.fit.cl_max_method).toBe('measured peak');
    expect(r.fit.alpha_stall_deg).toBe(13);
  });

  it('refines a rounded peak by the parabola when its vertex lies between the neighbours and within 1 %', () => {
    const a = up(0, 16);
    const cl = a.map((x) => 1.2 - 0.004 * (x - 12.4) ** 2);
    const r = findClMax(a, cl, 0.02);
    expect('reason' in r).toBe(false);
    if ('reason' in r) return;
    expect(r.method).toBe('parabola');
    expect(r.cl_max).toBeCloseTo(1.2, 10);
    expect(r.alpha_cl_max_deg).toBeCloseTo(12.4, 10);
  });

  it('keeps the first peak of a deep sweep whose post-stall lift rises again to a higher second peak at 37°', () => {
    const a = up(0, 45);
    const cl = a.map((x) => (x <= 14 ? liftUp(x) : x <= 24 ? 0.97 - 0.04 * (x - 14) : 0.57 + 0.06 * (x - 24) * (x <= 37 ? 1 : 0) + (x > 37 ? 0.78 - 0.05 * (x - 37) : 0)));
    expect(Math.max(...cl)).toBeGreaterThan(1.2); // the post-stall peak is the higher one
    const r = fitPolar(input(a, cl));
    expect(r.fit.alpha_cl_max_deg!).toBeGreaterThan(12);
    expect(r.fit.alpha_cl_max_deg!).toBeLessThan(15);
    expect(r.fit.cl_max!).toBeLessThan(1.0);
    expect(r.fit.cl_alpha_per_deg).toBeCloseTo(0.075, 6); // the linear range is looked for below the first stall
  });

  it('gives null with the reason when the sweep does not reach stall, and when CL only levels off', () => {
    const a = up(-4, 10);
    const r = fitPolar(input(a, a.map(liftUp)));
    expect(r.fit.cl_max).toBeNull();
    expect(r.fit.cl_max_reason).toMatch(/does not reach stall/);
    expect(r.warnings.join()).toMatch(/run R7, branch 1 of 1 \(up.*CLmax is not given/);
    const flat = up(0, 16).map((x) => Math.min(0.08 * x, 0.9 + 0.001 * Math.sin(x)));
    const f = fitPolar(input(up(0, 16), flat));
    expect(f.fit.cl_max).toBeNull();
    expect(f.fit.cl_max_reason).toMatch(/no stall is seen|does not reach stall/);
  });

  it('carries a standard uncertainty when the points have stated random uncertainties', () => {
    const a = up(0, 16);
    const cl = a.map((x) => 1.2 - 0.004 * (x - 12.4) ** 2);
    const r = findClMax(a, cl, 0.02, a.map(() => 0.01), a.map(() => 0.05));
    if ('reason' in r) throw new Error(r.reason);
    // vertex of three points with equal u: u(CLmax) lies between u/√3 and u (first-order propagation)
    expect(r.u!).toBeGreaterThan(0.01 / Math.sqrt(3));
    expect(r.u!).toBeLessThan(0.0125);
    const measured = findClMax([0, 1, 2, 3, 4], [0.1, 0.5, 0.9, 0.5, 0.4], 0.02, [0.01, 0.01, 0.02, 0.01, 0.01]);
    if ('reason' in measured) throw new Error(measured.reason);
    expect(measured.method).toBe('measured peak'); // vertex would be 1 % and more above 0.9
    expect(measured.u).toBe(0.02);
  });
});

describe('linear range from the data', () => {
  it('finds a slope on a small noisy model where a fixed 0.01 tolerance found none (σ_CL = 0.02)', () => {
    const g = normal(5);
    const a = up(-6, 18);
    const cl = a.map((x) => liftUp(x) + 0.02 * g());
    const r = fitPolar(input(a, cl));
    expect(r.fit.cl_alpha_per_deg).not.toBeNull();
    expect(Math.abs(r.fit.cl_alpha_per_deg! - 0.075)).toBeLessThan(3 * r.fit.cl_alpha_stderr_per_deg!);
    expect(r.fit.linear_range_points!).toBeGreaterThanOrEqual(8);
    expect(r.fit.linear_tolerance_cl!).toBeGreaterThan(0.05);
  });

  it('obeys the setup overrides fit.alpha_range_deg and fit.linear_tolerance_cl', () => {
    const a = up(-6, 18);
    const cl = a.map(liftUp);
    const byRange = fitPolar(input(a, cl, undefined, { alphaRangeDeg: [-2, 6] }));
    expect(byRange.fit.linear_range_deg).toEqual([-2, 6]);
    expect(byRange.fit.linear_range_source).toBe('setup alpha_range_deg');
    const tooFew = fitPolar(input(a, cl, undefined, { alphaRangeDeg: [0, 3] }));
    expect(tooFew.fit.cl_alpha_per_deg).toBeNull();
    expect(tooFew.warnings.join()).toMatch(/fit\.alpha_range_deg \[0, 3\] holds 4 points/);
    const byTol = fitPolar(input(a, cl, undefined, { linearToleranceCl: 0.2 }));
    expect(byTol.fit.linear_tolerance_cl).toBe(0.2);
    expect(byTol.fit.linear_range_source).toBe('setup linear_tolerance_cl');
  });

  it('gives null with the reason for a run too short or too noisy to fit, and warns on a short range', () => {
    const short = fitPolar(input([0, 2, 4, 6], [0.1, 0.25, 0.4, 0.55]));
    expect(short.fit.cl_alpha_per_deg).toBeNull();
    expect(short.warnings.join()).toMatch(/at least 5/);
    const five = fitPolar(input([0, 1, 2, 3, 4], [0.1, 0.175, 0.25, 0.325, 0.4]));
    expect(five.fit.cl_alpha_per_deg).toBeCloseTo(0.075, 10);
    expect(five.warnings.join()).toMatch(/linear lift range is short \(5 points/);
  });
});

describe('drag polar', () => {
  it('takes Oswald e from the cambered polar when CL at minimum drag is clearly off zero (truth e = 0.80, AR 8)', () => {
    const AR = 8;
    const k = 1 / (Math.PI * AR * 0.8);
    const a = up(-6, 10);
    const cl = a.map((x) => 0.08 * (x + 4));
    const cd = cl.map((c) => 0.011 + k * (c - 0.45) ** 2);
    const r = fitPolar(input(a, cl, cd, { aspectRatio: AR }));
    expect(r.fit.oswald_e_source).toBe('cambered polar');
    expect(r.fit.oswald_e).toBeCloseTo(0.8, 6);
    expect(r.fit.cl_min_drag).toBeCloseTo(0.45, 8);
    expect(r.warnings.join()).not.toMatch(/Oswald/);
  });

  it('warns when e falls outside 0.3–1.2', () => {
    const a = up(-4, 8);
    const cl = a.map((x) => 0.08 * (x + 2));
    const r = fitPolar(input(a, cl, cl.map((c) => 0.01 + 0.2 * c * c), { aspectRatio: 8 }));
    expect(r.fit.oswald_e!).toBeLessThan(0.3);
    expect(r.warnings.join()).toMatch(/Oswald efficiency 0\.2\d .* outside 0\.3–1\.2/);
  });
});

describe('differences against a baseline', () => {
  it('cancels systematic terms the two runs share and says which (JCGM 100:2008 §5.2, correlation 1)', () => {
    const a = up(-6, 18);
    const make = (s: number) => {
      const cl = a.map((x) => s * liftUp(x));
      return fitPolar(input(a, cl, undefined, {
        random: { alphaDeg: a.map(() => 0.02), cl: a.map(() => 0.004), cd: a.map(() => 0.0004) },
        systematic: [{ input: 'area', alphaDeg: a.map(() => 0), cl: cl.map((c) => -0.01 * c), cd: cl.map(() => 0), cm: cl.map(() => 0) }],
      }));
    };
    const run = make(1.1);
    const base = make(1.0);
    const d = fitDifference('cl_alpha_per_deg', run, base);
    expect(d.cancelled).toEqual(['area']);
    expect(d.difference).toBeCloseTo(0.0075, 8);
    const rs = run.fit.cl_alpha_stderr_per_deg!;
    const bs = base.fit.cl_alpha_stderr_per_deg!;
    // shared: only the difference of the two shifts stays, 1 % of (0.0825 − 0.075)
    expect(d.u!).toBeCloseTo(Math.hypot(rs, bs, 0.01 * 0.0075), 10);
    const apart = fitDifference('cl_alpha_per_deg', run, base, []);
    expect(apart.kept).toEqual(['area']);
    expect(apart.u!).toBeGreaterThan(d.u!);
    // CLmax carries its combined u in one field: the random part is recovered before the shared terms cancel
    const c = fitDifference('cl_max', run, base);
    const rnd = (f: typeof run) => Math.sqrt(f.fit.cl_max_u! ** 2 - f.fit_systematic['cl_max']!['area']! ** 2);
    expect(c.u!).toBeCloseTo(Math.hypot(rnd(run), rnd(base), run.fit_systematic['cl_max']!['area']! - base.fit_systematic['cl_max']!['area']!), 12);
  });
});

describe('sweep branches of a fine, noisy sweep', () => {
  it('keeps a continuous sweep with encoder jitter (σ 0.05° on 0.01° steps) as one branch, and finds its return', () => {
    const g = normal(21);
    const upA = Array.from({ length: 2000 }, (_, i) => -5 + 0.01 * i + 0.05 * g());
    expect(splitBranches(upA).length).toBe(1);
    const back = Array.from({ length: 2000 }, (_, i) => 15 - 0.01 * i + 0.05 * g());
    expect(splitBranches([...upA, ...back]).map((b) => b.direction)).toEqual(['up', 'down']);
  });
});

describe('CLmax of a continuous sweep', () => {
  it('smooths 5,000 noisy samples before seeking the first stall: no noise dip taken for stall, CLmax within 1 % of the truth', () => {
    const g = normal(3);
    const n = 5000;
    const a = Array.from({ length: n }, (_, i) => -6 + (24 * i) / n);
    // invented: slope 0.075/deg to a sharp peak of 1.05 at 12°, σ_CL = 0.005 per sample
    const cl = a.map((x) => (x < 12 ? 0.075 * (x + 2) : 1.05 - 0.05 * (x - 12)) + 0.005 * g());
    const r = fitPolar(input(a, cl));
    expect(r.fit.cl_max_method).toBe('smoothed peak');
    expect(Math.abs(r.fit.cl_max! / 1.05 - 1)).toBeLessThan(0.01);
    expect(Math.abs(r.fit.alpha_cl_max_deg! - 12)).toBeLessThan(0.3);
    expect(Math.abs(r.fit.cl_alpha_per_deg! / 0.075 - 1)).toBeLessThan(0.01);
  });
});
