/**
 * Flow state of one test point from pitot-static and ambient readings (docs/data-format.md).
 * RH is measured where the air is at rest, so the water-vapour mole fraction is taken at the
 * stagnation condition and carried unchanged into the test section.
 */
import { densityFromMoleFraction, sutherlandViscosity, vapourMoleFraction } from './air.ts';
import { dynamicPressure, machFromImpactPressure, staticTemperature } from './pitot.ts';

export interface FlowInput {
  /** Test-section static pressure, Pa (absolute). */
  p: number;
  /** Pitot impact pressure p0 − p, Pa. */
  dp: number;
  /** Stagnation temperature, K. */
  T0: number;
  /** Relative humidity at the stagnation condition, fraction. */
  rh: number;
  gamma: number;
  /** Reference chord for the Reynolds number, m. */
  chord: number;
}

export interface FlowState {
  p: number;
  p0: number;
  T0: number;
  T: number;
  xv: number;
  mach: number;
  q: number;
  rho: number;
  mu: number;
  V: number;
  Re: number;
}

/**
 * p0 = p + Δp; M from the isentropic pitot relation; q = (γ/2)pM²; T = T0/(1 + (γ−1)/2 M²);
 * x_v = CIPM-2007 at (p0, T0, rh); ρ = CIPM-2007 at (p, T, x_v); V = √(2q/ρ); μ = Sutherland(T);
 * Re = ρVc/μ. Sources: NACA Report 1135; Picard et al. 2008; ISO 2533:1975.
 */
export function flowState(f: FlowInput): FlowState {
  const p0 = f.p + f.dp;
  const mach = machFromImpactPressure(f.p, f.dp, f.gamma);
  const q = dynamicPressure(f.p, mach, f.gamma);
  const T = staticTemperature(f.T0, mach, f.gamma);
  const xv = vapourMoleFraction(p0, f.T0, f.rh);
  const rho = densityFromMoleFraction(f.p, T, xv);
  const V = Math.sqrt((2 * q) / rho);
  const mu = sutherlandViscosity(T);
  const Re = (rho * V * f.chord) / mu;
  return { p: f.p, p0, T0: f.T0, T, xv, mach, q, rho, mu, V, Re };
}
