/**
 * Properties of air: CIPM-2007 moist-air density, Sutherland viscosity, ISO 2533 standard atmosphere.
 * Inputs and outputs in SI (Pa, K, kg/m³, Pa s); relative humidity as a fraction 0..1.
 */

/** Molar gas constant used by CIPM-2007, J/(mol K). Picard et al., Metrologia 45 (2008) 149, §2. */
export const R_MOLAR_CIPM = 8.314472;
/** Molar mass of dry air for x_CO2 = 0.0004, kg/mol. CIPM-2007 eq. (A1.2) (argon-revised value). */
export const M_DRY_AIR = 28.96546e-3;
/** Molar mass of water, kg/mol. CIPM-2007 Table A1.1. */
export const M_WATER = 18.01528e-3;

/**
 * Saturation vapour pressure over water, Pa.
 * p_sv = exp(A T² + B T + C + D/T). CIPM-2007 eq. (A1.6) (Davis 1992 / CIPM-81 constants).
 */
export function saturationVapourPressure(T: number): number {
  const A = 1.2378847e-5;
  const B = -1.9121316e-2;
  const C = 33.93711047;
  const D = -6.3431645e3;
  return Math.exp(A * T * T + B * T + C + D / T);
}

/**
 * Enhancement factor of water vapour in air, f = α + β p + γ t² (t in °C). CIPM-2007 eq. (A1.5).
 */
export function enhancementFactor(p: number, T: number): number {
  const t = T - 273.15;
  return 1.00062 + 3.14e-8 * p + 5.6e-7 * t * t;
}

/**
 * Mole fraction of water vapour from relative humidity: x_v = h·f(p,t)·p_sv(T)/p. CIPM-2007 eq. (A1.4).
 * @param rh relative humidity as a fraction (0.5 for 50 %)
 */
export function vapourMoleFraction(p: number, T: number, rh: number): number {
  return (rh * enhancementFactor(p, T) * saturationVapourPressure(T)) / p;
}

/**
 * Compressibility factor of moist air. CIPM-2007 eq. (A1.3), constants of Table A1.2:
 * Z = 1 − (p/T)[a0 + a1 t + a2 t² + (b0 + b1 t) x_v + (c0 + c1 t) x_v²] + (p²/T²)(d + e x_v²).
 */
export function compressibilityFactor(p: number, T: number, xv: number): number {
  const t = T - 273.15;
  const a0 = 1.58123e-6;
  const a1 = -2.9331e-8;
  const a2 = 1.1043e-10;
  const b0 = 5.707e-6;
  const b1 = -2.051e-8;
  const c0 = 1.9898e-4;
  const c1 = -2.376e-6;
  const d = 1.83e-11;
  const e = -0.765e-8;
  return (
    1 -
    (p / T) * (a0 + a1 * t + a2 * t * t + (b0 + b1 * t) * xv + (c0 + c1 * t) * xv * xv) +
    ((p * p) / (T * T)) * (d + e * xv * xv)
  );
}

/**
 * Moist-air density for a given water-vapour mole fraction.
 * ρ = (p M_a/(Z R T))·[1 − x_v (1 − M_v/M_a)]. CIPM-2007 eq. (1).
 */
export function densityFromMoleFraction(p: number, T: number, xv: number): number {
  const Z = compressibilityFactor(p, T, xv);
  return ((p * M_DRY_AIR) / (Z * R_MOLAR_CIPM * T)) * (1 - xv * (1 - M_WATER / M_DRY_AIR));
}

/** Moist-air density from pressure, temperature and relative humidity at that same state. CIPM-2007. */
export function moistAirDensity(p: number, T: number, rh: number): number {
  return densityFromMoleFraction(p, T, vapourMoleFraction(p, T, rh));
}

/** Sutherland constants of ISO 2533:1975 §2.3: β_s = 1.458e-6 kg/(m s K^½), S = 110.4 K. */
export const SUTHERLAND_BETA = 1.458e-6;
export const SUTHERLAND_S = 110.4;

/** Dynamic viscosity by Sutherland's law, μ = β_s T^1.5 / (T + S). ISO 2533:1975 eq. (22). */
export function sutherlandViscosity(T: number): number {
  return (SUTHERLAND_BETA * T * Math.sqrt(T)) / (T + SUTHERLAND_S);
}

/** Specific gas constant of dry air in ISO 2533:1975, J/(kg K). */
export const R_AIR_ISO = 287.05287;
export const ISA_SEA_LEVEL = { p: 101325, T: 288.15, rho: 1.225 } as const;
/** Standard gravity, m/s². ISO 2533:1975 Table 1. */
export const G0 = 9.80665;

/** Speed of sound in a perfect gas a = √(γ R T). ISO 2533:1975 eq. (16) with γ = 1.4. */
export function speedOfSound(T: number, gamma = 1.4, R = R_AIR_ISO): number {
  return Math.sqrt(gamma * R * T);
}

/**
 * ISO 2533:1975 standard atmosphere in the troposphere (geopotential altitude H ≤ 11 000 m):
 * T = T0 + βH with β = −0.0065 K/m; p = p0 (T/T0)^(−g0/(βR)); ρ = p/(R T).
 */
export function isaTroposphere(H: number): { p: number; T: number; rho: number } {
  const beta = -0.0065;
  const T = ISA_SEA_LEVEL.T + beta * H;
  const p = ISA_SEA_LEVEL.p * Math.pow(T / ISA_SEA_LEVEL.T, -G0 / (beta * R_AIR_ISO));
  return { p, T, rho: p / (R_AIR_ISO * T) };
}

/** Tropopause of ISO 2533:1975: 11 000 m geopotential, 216.65 K. */
const H_TROPOPAUSE = 11000;

/**
 * ISO 2533:1975 standard atmosphere up to 20 000 m geopotential: the troposphere (lapse −6.5 K/km)
 * and the isothermal layer above it, p = p11·exp(−g0(H − 11 000)/(R·T11)).
 */
export function isaAtmosphere(H: number): { p: number; T: number; rho: number } {
  if (H <= H_TROPOPAUSE) return isaTroposphere(H);
  const top = isaTroposphere(H_TROPOPAUSE);
  const p = top.p * Math.exp((-G0 * (H - H_TROPOPAUSE)) / (R_AIR_ISO * top.T));
  return { p, T: top.T, rho: p / (R_AIR_ISO * top.T) };
}

/**
 * Density altitude: the ISO 2533 altitude whose standard density equals ρ. Troposphere:
 * ρ/ρ0 = (T/T0)^(−g0/(βR) − 1) inverted for H; above 11 000 m the isothermal layer's exponential.
 */
export function densityAltitude(rho: number): number {
  const beta = -0.0065;
  const exponent = -G0 / (beta * R_AIR_ISO) - 1; // 4.2559
  const top = isaTroposphere(H_TROPOPAUSE);
  if (rho >= top.rho) return (ISA_SEA_LEVEL.T / beta) * (Math.pow(rho / ISA_SEA_LEVEL.rho, 1 / exponent) - 1);
  return H_TROPOPAUSE - ((R_AIR_ISO * top.T) / G0) * Math.log(rho / top.rho);
}
