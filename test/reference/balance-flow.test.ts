/**
 * Zero-lift angle with its uncertainty, upflow from a pair, and pooled repeatability against an
 * independent numpy computation (test/fixtures/balance/generate_flow.py): numpy.polyfit with its
 * covariance and the delta method in the uncentred form (JCGM 100:2008 eq. 13), numpy.var(ddof=1)
 * pooled as in ISO 5725-2:1994 §7.4.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { upflowFromPair, zeroLiftAngle } from '../../core/flowAngle/upflow.ts';
import { repeatability } from '../../core/analysis/repeatability.ts';

const ref = JSON.parse(readFileSync(join(__dirname, '../fixtures/balance/flow_expected.json'), 'utf8'));
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('zero-lift angle and upflow against numpy', () => {
  it('α0 and u(α0) equal numpy.polyfit’s line and the delta method on its covariance, to 1e-10', () => {
    const z = zeroLiftAngle(ref.zero_lift.alpha, ref.zero_lift.cl)!;
    expect(rel(z.alphaDeg, ref.zero_lift.alpha0_deg)).toBeLessThan(1e-10);
    expect(rel(z.uDeg, ref.zero_lift.u_deg)).toBeLessThan(1e-10);
  });
  it('the pair made with 0.42° upflow gives numpy’s φ and u(φ), within 0.01° of the truth', () => {
    const u = ref.upflow;
    const r = upflowFromPair(zeroLiftAngle(u.alpha, u.cl_upright)!, zeroLiftAngle(u.alpha, u.cl_inverted)!);
    expect(rel(r.upflow_deg, u.upflow_deg)).toBeLessThan(1e-10);
    expect(rel(r.upflow_u_deg, u.upflow_u_deg)).toBeLessThan(1e-10);
    expect(Math.abs(r.upflow_deg - u.phi_true_deg)).toBeLessThan(0.01);
  });
  it('needs three points and a slope', () => {
    expect(zeroLiftAngle([0, 1], [0.1, 0.2])).toBeUndefined();
    expect(zeroLiftAngle([1, 1, 1], [0.1, 0.2, 0.3])).toBeUndefined();
    expect(zeroLiftAngle([0, 1, 2], [0.1, 0.1, 0.1])).toBeUndefined();
  });
});

describe('pooled repeatability of six repeats against numpy', () => {
  it('pooled SD of CL, CD and Cm equal numpy’s to 1e-12, with 5 × angles degrees of freedom', () => {
    const runs = ref.repeat.runs.map((r: { alpha: number[]; cl: number[]; cd: number[]; cm: number[] }, i: number) => ({
      name: `R${i}`,
      alphaDeg: r.alpha,
      cl: r.cl,
      cd: r.cd,
      cm: r.cm,
    }));
    const r = repeatability(runs);
    expect(rel(r.pooled_sd_cl!, ref.repeat.pooled_sd.cl)).toBeLessThan(1e-12);
    expect(rel(r.pooled_sd_cd!, ref.repeat.pooled_sd.cd)).toBeLessThan(1e-12);
    expect(rel(r.pooled_sd_cm!, ref.repeat.pooled_sd.cm)).toBeLessThan(1e-12);
    expect(r.degrees_of_freedom).toBe(ref.repeat.dof);
  });
});
