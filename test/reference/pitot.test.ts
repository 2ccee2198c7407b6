import { describe, expect, it } from 'vitest';
import { dynamicPressure, dynamicToTotalPressureRatio, machFromImpactPressure, staticTemperature } from '../../core/physics/pitot.ts';

describe('isentropic pitot relations', () => {
  it('gives NaN for impossible pressures instead of a number', () => {
    expect(machFromImpactPressure(0, 100, 1.4)).toBeNaN();
    expect(machFromImpactPressure(-1, 100, 1.4)).toBeNaN();
    expect(machFromImpactPressure(101325, -5, 1.4)).toBeNaN();
    expect(machFromImpactPressure(Number.NaN, 5, 1.4)).toBeNaN();
  });

  it('gives Mach 0 and q 0 with no impact pressure', () => {
    expect(machFromImpactPressure(101325, 0, 1.4)).toBe(0);
    expect(dynamicPressure(101325, 0, 1.4)).toBe(0);
  });

  // NACA Report 1135 (1953), Table I (γ = 1.4): q/p0 at M = 0.3, 0.5, 0.8, 1.0 (4-5 printed digits; from memory).
  it.each([
    [0.3, 0.05919],
    [0.5, 0.1475],
    [0.8, 0.2939],
    [1.0, 0.3698],
  ])('at M = %d, q/p0 = %d', (M, ratio) => {
    expect(dynamicToTotalPressureRatio(M, 1.4)).toBeCloseTo(ratio, 4);
  });

  it('inverts: the Mach number from (p, p0 − p) returns the Mach number that made them', () => {
    for (const M of [0.05, 0.2, 0.5, 0.9]) {
      const p = 95000;
      const p0 = p * Math.pow(1 + 0.2 * M * M, 3.5);
      expect(machFromImpactPressure(p, p0 - p, 1.4)).toBeCloseTo(M, 12);
    }
  });

  it('tends to the incompressible Bernoulli q = p0 − p at low speed (within M²/4)', () => {
    const p = 101325;
    const dp = 250;
    const M = machFromImpactPressure(p, dp, 1.4);
    const q = dynamicPressure(p, M, 1.4);
    expect(q).toBeLessThan(dp);
    expect((dp - q) / dp).toBeCloseTo((M * M) / 4, 5); // p0 − p = q(1 + M²/4 + ...), NACA Report 1135 eq. 47
  });

  it('gives the static temperature of the isentropic relation (T0/T = 1.2 at M = 1, NACA Report 1135 Table I)', () => {
    expect(staticTemperature(300, 1, 1.4)).toBeCloseTo(250, 10);
  });
});
