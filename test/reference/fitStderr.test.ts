import { describe, expect, it } from 'vitest';
import { readRunText } from '../../core/formats/runFile.ts';
import { reduce } from '../../core/reduction/pipeline.ts';
import { validateSetup } from '../../core/setup/schema.ts';
import { normal } from '../support/random.ts';

/**
 * The zero-lift angle's standard error against an independent form of the delta method: with the line
 * written about the mean angle, CL = ȳ + b(α − ᾱ), the mean and the slope are uncorrelated, so
 * α0 = ᾱ − ȳ/b has Var(α0) = s²/(n·b²) + ȳ²·s²/(b⁴·Sxx) (Draper & Smith, Applied Regression Analysis,
 * 3rd ed., §1.4 and §3.2; JCGM 100:2008 eq. 13). The engine uses the uncentred form with the
 * intercept–slope covariance; a wrong sign of that covariance changes the result several-fold here,
 * where the zero-lift angle lies far from the mean angle.
 */
describe('standard error of the zero-lift angle', () => {
  it('agrees with the centred delta method when α0 lies far outside the sweep', () => {
    const rnd = normal(20261202);
    const rows = ['alpha,dp_pitot,lift,drag'];
    const q = 800;
    const S = 0.2;
    for (let a = 4; a <= 10; a += 1) {
      const cl = 0.1 * (a + 3) + 0.004 * rnd();
      rows.push(`${a},${q},${cl * q * S},${(0.02 + 0.05 * cl * cl) * q * S}`);
    }
    const setup = validateSetup('s', {
      model: { kind: '3d', area_m2: S, chord_m: 0.2, span_m: 1 },
      tunnel: { section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
      balance: { axes: 'wind' },
      ambient: { p_pa: 101325, t_c: 20, rh_pct: 50 },
      corrections: { enabled: false },
    }).setup;
    const r = reduce({ run: readRunText('far.csv', rows.join('\n')), setup });
    const [lo, hi] = r.fit.linear_range_deg!;
    const pts = r.points.filter((p) => p.alpha_deg! >= lo - 1e-9 && p.alpha_deg! <= hi + 1e-9);
    expect(pts.length).toBeGreaterThanOrEqual(5);
    const x = pts.map((p) => p.alpha_deg!);
    const y = pts.map((p) => p.cl!);
    const n = x.length;
    const mx = x.reduce((s, v) => s + v, 0) / n;
    const my = y.reduce((s, v) => s + v, 0) / n;
    const sxx = x.reduce((s, v) => s + (v - mx) ** 2, 0);
    const b = x.reduce((s, v, i) => s + (v - mx) * (y[i]! - my), 0) / sxx;
    const s2 = y.reduce((s, v, i) => s + (v - my - b * (x[i]! - mx)) ** 2, 0) / (n - 2);
    const se = Math.sqrt(s2 / (n * b * b) + (my * my * s2) / (b ** 4 * sxx));
    expect(r.fit.alpha_zero_lift_deg!).toBeCloseTo(mx - my / b, 9);
    expect(r.fit.alpha_zero_lift_stderr_deg!).toBeCloseTo(se, 9);
  });
});
