import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { fitPolar } from '../../core/fits/characteristics.ts';

/**
 * The fits on published, measured aerofoil polars (test/fixtures/real/README.md names each source and
 * its licence): NASA TM-4074 (Ladson 1988) NACA 0012 at three trip sizes, and SAND80-2114 (Sheldahl &
 * Klimas 1981) NACA 0015 through deep stall.
 */
const DIR = resolve(__dirname, '../fixtures/real');
function load(name: string) {
  const rows = readFileSync(join(DIR, `${name}.csv`), 'utf8').trim().split('\n').slice(1).map((l) => l.split(',').map(Number));
  return { alpha: rows.map((r) => r[0]!), cl: rows.map((r) => r[1]!), cd: rows.map((r) => r[2]!) };
}
function fit(name: string) {
  const d = load(name);
  return fitPolar({ alphaDeg: d.alpha, cl: d.cl, cd: d.cd, cm: d.cl.map(() => Number.NaN), clScatter: d.cl.map(() => 0), kind: '2d', aspectRatio: 0, runName: name });
}
/** Independent check: plain least-squares slope (textbook formula) through the source's points with α in [lo, hi]. */
function lsSlope(alpha: number[], cl: number[], lo: number, hi: number): number {
  const idx = alpha.map((_, i) => i).filter((i) => alpha[i]! >= lo && alpha[i]! <= hi);
  const n = idx.length;
  const mx = idx.reduce((s, i) => s + alpha[i]!, 0) / n;
  const my = idx.reduce((s, i) => s + cl[i]!, 0) / n;
  return idx.reduce((s, i) => s + (alpha[i]! - mx) * (cl[i]! - my), 0) / idx.reduce((s, i) => s + (alpha[i]! - mx) ** 2, 0);
}

describe('fits on published measured polars', () => {
  const LADSON = [
    ['ladson-naca0012-re6e6-80grit', 1.6116, 17.13],
    ['ladson-naca0012-re6e6-120grit', 1.6347, 17.24],
    ['ladson-naca0012-re6e6-180grit', 1.6219, 17.13],
  ] as const;
  for (const [name, peak, at] of LADSON) {
    it(`${name}: CLmax is the source's measured peak before the abrupt stall, and the slope is found (NASA TM-4074)`, () => {
      const r = fit(name);
      expect(r.fit.cl_max).toBe(peak);
      expect(r.fit.alpha_cl_max_deg).toBe(at);
      expect(r.fit.cl_max_method).toBe('measured peak');
      const d = load(name);
      // within 1 % of a plain least-squares line through the source's points from −4° to 10° (independent formula)
      expect(Math.abs(r.fit.cl_alpha_per_deg! / lsSlope(d.alpha, d.cl, -4.1, 10.2) - 1)).toBeLessThan(0.01);
      // within 3 % of thin-aerofoil theory, 2π per radian (Abbott & von Doenhoff §4.3)
      expect(Math.abs(r.fit.cl_alpha_per_deg! / ((2 * Math.PI * Math.PI) / 180) - 1)).toBeLessThan(0.03);
      // a symmetric section: zero lift at zero angle, within the fit's uncertainty and a tenth of a degree
      expect(Math.abs(r.fit.alpha_zero_lift_deg!)).toBeLessThan(Math.max(0.1, 2 * r.fit.alpha_zero_lift_stderr_deg!));
      expect(r.fit.linear_range_points!).toBeGreaterThanOrEqual(8);
      expect(r.warnings).toEqual([]);
    });
  }

  it('SAND80-2114 NACA 0015 to 90°: CLmax at the first stall (within 1 % of 0.8322 at 10°), never the post-stall 1.05 at 45°', () => {
    const r = fit('sheldahl-naca0015-re160k');
    expect(r.fit.cl_max!).toBeLessThanOrEqual(0.8322 * 1.01);
    expect(r.fit.cl_max!).toBeGreaterThanOrEqual(0.8322);
    expect(r.fit.alpha_cl_max_deg!).toBeGreaterThan(9);
    expect(r.fit.alpha_cl_max_deg!).toBeLessThan(11);
    expect(r.fit.cl_alpha_per_deg).toBeCloseTo(0.11, 10); // the source's 0.11 per degree below 5°
    expect(r.fit.alpha_stall_deg).toBe(11);
  });
});
