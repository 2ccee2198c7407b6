/**
 * Full-scale stall-speed estimate from a model's CLmax: V_s = √(2W/(ρ·S·CLmax)) (the lift equation at
 * CLmax; common practice, e.g. Anderson, Introduction to Flight, §6.x), at a density from pressure
 * altitude (ISO 2533:1975), temperature and humidity (CIPM-2007). An engineering estimate only:
 * see the cautions it carries.
 */
import { G0, isaAtmosphere, ISA_SEA_LEVEL, moistAirDensity } from '../physics/air.ts';
import { InputError } from '../contract/messages.ts';

/** 1 knot = 1852 m / 3600 s exactly (NIST SP 811 B.8). */
export const KNOT_MPS = 1852 / 3600;

/** Common practice: lift-off at about 1.1–1.3 times the stall speed; 1.2 is the default shown. */
export const DEFAULT_LIFT_OFF_FACTOR = 1.2;
export const LIFT_OFF_RANGE = [1.1, 1.3] as const;

export interface ProjectionInput {
  massKg: number;
  wingAreaM2: number;
  clMax: number;
  pressureAltitudeM?: number;
  /** Outside air temperature; defaults to the standard temperature at the pressure altitude plus isaDeviationC. */
  tempC?: number;
  isaDeviationC?: number;
  rhPct?: number;
  liftOffFactor?: number;
  /** Reynolds number of the model test at CLmax, for the scale-effect caution. */
  modelReynolds?: number | null;
  /** Standard uncertainty of CLmax (k = 1), when the run's fit gives one. */
  clMaxU?: number | null;
  /** Where CLmax came from: a model test in the tunnel (adds the trim caution) or given by the user. */
  clMaxFrom?: 'model test' | 'given';
}

export interface Projection {
  pressure_altitude_m: number;
  pressure_pa: number;
  temperature_c: number;
  isa_deviation_c: number;
  rh_pct: number;
  rho_kgm3: number;
  density_altitude_m: number;
  mass_kg: number;
  weight_n: number;
  wing_area_m2: number;
  wing_loading_pa: number;
  cl_max: number;
  v_stall_mps: number;
  v_stall_kt: number;
  v_stall_eas_mps: number;
  /** Standard uncertainty of V_s from u(CLmax) alone (V_s ∝ CLmax^−½); null without u(CLmax). */
  v_stall_u_mps: number | null;
  v_stall_u_kt: number | null;
  /** True when no humidity was given and dry air was assumed. */
  dry_air_assumed: boolean;
  /** V_s in saturated air (100 % RH) at the same pressure and temperature, given beside the dry-air value when humidity was not given. */
  v_stall_saturated_mps: number | null;
  v_stall_saturated_kt: number | null;
  lift_off_factor: number;
  v_lift_off_mps: number;
  v_lift_off_kt: number;
  cautions: string[];
}

/** Caution for a CLmax measured on a wind-tunnel model (common practice: trim and tail effects). */
export const TRIM_CAUTION =
  'A model tested tail-off or untrimmed overstates the aircraft\'s CLmax: in flight the tail carries a trim load (usually downward), so the trimmed CLmax and the stall speed it gives are less favourable than the model value suggests.';

export const CAUTIONS = [
  'This is an engineering estimate from wind-tunnel model tests, not certified data.',
  'Reynolds-number and scale effects usually change CLmax between the model and the full-scale aircraft, often by more than the differences between configurations; the model value is used here as it is.',
  'Not for operational use: certified flight-manual data, local regulations and licensed engineering practice govern.',
  `The lift-off speed is the stall speed times a factor; common practice puts lift-off at about ${LIFT_OFF_RANGE[0]} to ${LIFT_OFF_RANGE[1]} times the stall speed, and regulated take-off speeds follow their own rules.`,
];

function requirePositive(value: number | undefined, field: string, what: string): number {
  if (value === undefined || !Number.isFinite(value) || value <= 0) throw new InputError({ field, message: `expected a positive number (${what})` });
  return value;
}

/** The projection; throws InputError naming the option that is out of range. */
export function projectStallSpeed(input: ProjectionInput): Projection {
  const mass = requirePositive(input.massKg, 'mass-kg', 'aircraft mass, kg');
  const area = requirePositive(input.wingAreaM2, 'wing-area-m2', 'wing reference area, m²');
  const clMax = requirePositive(input.clMax, 'cl-max', 'maximum lift coefficient');
  const H = input.pressureAltitudeM ?? 0;
  if (!Number.isFinite(H) || H < -1000 || H > 20000) throw new InputError({ field: 'pressure-altitude-m', message: 'expected −1000 to 20 000 m (the standard atmosphere used here ends at 20 km)' });
  const dryAssumed = input.rhPct === undefined;
  const rhPct = input.rhPct ?? 0;
  if (!Number.isFinite(rhPct) || rhPct < 0 || rhPct > 100) throw new InputError({ field: 'rh-pct', message: 'expected 0 to 100 %' });
  const factor = input.liftOffFactor ?? DEFAULT_LIFT_OFF_FACTOR;
  if (!Number.isFinite(factor) || factor < 1) throw new InputError({ field: 'lift-off-factor', message: 'expected a number of at least 1' });
  const std = isaAtmosphere(H);
  const stdC = std.T - 273.15;
  const tempC = input.tempC ?? stdC + (input.isaDeviationC ?? 0);
  if (!Number.isFinite(tempC) || tempC < -90 || tempC > 60) throw new InputError({ field: 'temp-c', message: 'expected −90 to 60 °C' });
  const rho = moistAirDensity(std.p, tempC + 273.15, rhPct / 100);
  const W = mass * G0;
  const vs = Math.sqrt((2 * W) / (rho * area * clMax));
  const cautions = [...CAUTIONS];
  if (input.modelReynolds) {
    cautions[1] = `${CAUTIONS[1]} The model was tested at a Reynolds number of about ${Number(input.modelReynolds.toPrecision(2)).toExponential(1).replace('e+', ' × 10^')}.`;
  }
  if (input.clMaxFrom !== 'given') cautions.push(TRIM_CAUTION);
  let vsSat: number | null = null;
  if (dryAssumed) {
    // humid air is less dense than dry air at the same p and T, so dry air gives the lower, non-conservative V_s
    vsSat = Math.sqrt((2 * W) / (moistAirDensity(std.p, tempC + 273.15, 1) * area * clMax));
    cautions.push(
      `No humidity was given, so dry air was assumed. Humid air is less dense, and the stall speed in saturated air (100 % RH) at the same pressure and temperature is ${vsSat.toFixed(2)} m/s (${(vsSat / KNOT_MPS).toFixed(1)} kt) against ${vs.toFixed(2)} m/s dry: give --rh-pct for the day.`,
    );
  }
  // V_s ∝ CLmax^(−1/2): u(V_s)/V_s = ½·u(CLmax)/CLmax (JCGM 100:2008 eq. 12)
  const clU = input.clMaxU;
  const vsU = clU !== undefined && clU !== null && Number.isFinite(clU) && clU >= 0 ? (0.5 * vs * clU) / clMax : null;
  return {
    pressure_altitude_m: H,
    pressure_pa: std.p,
    temperature_c: tempC,
    isa_deviation_c: tempC - stdC,
    rh_pct: rhPct,
    rho_kgm3: rho,
    density_altitude_m: densityAltitudeOf(rho),
    mass_kg: mass,
    weight_n: W,
    wing_area_m2: area,
    wing_loading_pa: W / area,
    cl_max: clMax,
    v_stall_mps: vs,
    v_stall_kt: vs / KNOT_MPS,
    v_stall_eas_mps: vs * Math.sqrt(rho / ISA_SEA_LEVEL.rho),
    v_stall_u_mps: vsU,
    v_stall_u_kt: vsU === null ? null : vsU / KNOT_MPS,
    dry_air_assumed: dryAssumed,
    v_stall_saturated_mps: vsSat,
    v_stall_saturated_kt: vsSat === null ? null : vsSat / KNOT_MPS,
    lift_off_factor: factor,
    v_lift_off_mps: factor * vs,
    v_lift_off_kt: (factor * vs) / KNOT_MPS,
    cautions,
  };
}

/**
 * Density altitude with the same density model as the day's density: the altitude H at which dry air at
 * the standard pressure and temperature of H (ISO 2533:1975) has, by CIPM-2007, the density ρ. A standard
 * day at sea level is then exactly 0 m (mixing CIPM-2007 for ρ with the ISO ideal-gas table put it at
 * about −3 m). Solved by bisection on −2 000 to 20 000 m; the density falls monotonically with H.
 */
export function densityAltitudeOf(rho: number): number {
  const at = (H: number) => {
    const s = isaAtmosphere(H);
    return moistAirDensity(s.p, s.T, 0);
  };
  let lo = -2000;
  let hi = 20000;
  if (!(rho <= at(lo)) || !(rho >= at(hi))) return Number.NaN;
  for (let i = 0; i < 80 && hi - lo > 1e-6; i++) {
    const mid = (lo + hi) / 2;
    if (at(mid) > rho) lo = mid;
    else hi = mid;
  }
  // to the millimetre, so that a standard day reads 0 m rather than a few 1e-7 m either way
  return Math.round(((lo + hi) / 2) * 1000) / 1000 + 0;
}
