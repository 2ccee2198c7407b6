/**
 * Pitot-static reduction by the subsonic isentropic relations of a perfect gas
 * (NACA Report 1135, 1953, eqs. 44 and 45). Pressures in Pa, temperatures in K.
 */

/**
 * Mach number from static pressure p and impact pressure Δp = p0 − p:
 * M² = (2/(γ−1))·((p0/p)^((γ−1)/γ) − 1). NACA Report 1135 eq. 44 solved for M.
 * Returns NaN for p ≤ 0 or p0 < p (no real subsonic solution).
 */
export function machFromImpactPressure(p: number, dp: number, gamma: number): number {
  if (!(p > 0) || !(dp >= 0)) return Number.NaN;
  const ratio = (p + dp) / p;
  return Math.sqrt((2 / (gamma - 1)) * (Math.pow(ratio, (gamma - 1) / gamma) - 1));
}

/** Dynamic pressure q = ½ρV² = (γ/2)·p·M². NACA Report 1135 eq. 50. */
export function dynamicPressure(p: number, mach: number, gamma: number): number {
  return 0.5 * gamma * p * mach * mach;
}

/** Static temperature from stagnation: T = T0 / (1 + (γ−1)/2·M²). NACA Report 1135 eq. 43. */
export function staticTemperature(T0: number, mach: number, gamma: number): number {
  return T0 / (1 + 0.5 * (gamma - 1) * mach * mach);
}

/** Ratio q/p0 at Mach M: (γ/2)M² / (1 + (γ−1)/2·M²)^(γ/(γ−1)). NACA Report 1135 eq. 44 and 50. */
export function dynamicToTotalPressureRatio(mach: number, gamma: number): number {
  return (0.5 * gamma * mach * mach) / Math.pow(1 + 0.5 * (gamma - 1) * mach * mach, gamma / (gamma - 1));
}
