/**
 * Full-scale stall-speed estimate from a model's CLmax: V_s = √(2W/(ρ·S·CLmax)) (the lift equation at
 * CLmax; common practice, e.g. Anderson, Introduction to Flight, §6.x), at a density from pressure
 * altitude (ISO 2533:1975), temperature and humidity (CIPM-2007). An engineering estimate only:
 * see the cautions it carries.
 */
import { densityAltitude, G0, isaAtmosphere, ISA_SEA_LEVEL, moistAirDensity } from '../physics/air.ts';
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
  lift_off_factor: number;
  v_lift_off_mps: number;
  v_lift_off_kt: number;
  cautions: string[];
}

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
  return {
    pressure_altitude_m: H,
    pressure_pa: std.p,
    temperature_c: tempC,
    isa_deviation_c: tempC - stdC,
    rh_pct: rhPct,
    rho_kgm3: rho,
    density_altitude_m: densityAltitude(rho),
    mass_kg: mass,
    weight_n: W,
    wing_area_m2: area,
    wing_loading_pa: W / area,
    cl_max: clMax,
    v_stall_mps: vs,
    v_stall_kt: vs / KNOT_MPS,
    v_stall_eas_mps: vs * Math.sqrt(rho / ISA_SEA_LEVEL.rho),
    lift_off_factor: factor,
    v_lift_off_mps: factor * vs,
    v_lift_off_kt: (factor * vs) / KNOT_MPS,
    cautions,
  };
}
