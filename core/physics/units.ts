/**
 * Units accepted in run-file headers and their conversion to SI, applied once when a file is read.
 *
 * Factors: NIST Special Publication 811 (2008 ed.), Appendix B.8/B.9, unless noted.
 * Conventional water columns follow DESIGN §3.4 (inch of water 249.088 91 Pa, millimetre of water
 * 9.806 65 Pa, both at the conventional density 1000 kg/m³ and standard gravity).
 */

export type Quantity = 'pressure' | 'temperature' | 'force' | 'moment' | 'angle' | 'ratio' | 'count';

/** A linear conversion to SI: si = value * scale + offset. */
export interface UnitConversion {
  readonly quantity: Quantity;
  /** Canonical spelling shown back to the user. */
  readonly label: string;
  readonly scale: number;
  readonly offset: number;
}

const LBF_N = 4.4482216152605; // NIST SP 811 B.8: pound-force, exact by definition
const INCH_M = 0.0254; // exact
const FOOT_M = 0.3048; // exact

function u(quantity: Quantity, label: string, scale: number, offset = 0): UnitConversion {
  return { quantity, label, scale, offset };
}

/** SI units per quantity, as stored inside the engine. */
export const SI_UNIT: Record<Quantity, UnitConversion> = {
  pressure: u('pressure', 'Pa', 1),
  temperature: u('temperature', 'K', 1),
  force: u('force', 'N', 1),
  moment: u('moment', 'N m', 1),
  angle: u('angle', 'rad', 1),
  ratio: u('ratio', 'fraction', 1),
  count: u('count', '', 1),
};

const TABLE: Record<string, UnitConversion> = {
  // pressure
  pa: u('pressure', 'Pa', 1),
  kpa: u('pressure', 'kPa', 1e3),
  hpa: u('pressure', 'hPa', 1e2),
  mbar: u('pressure', 'mbar', 1e2), // NIST SP 811 B.8: 1 mbar = 100 Pa exactly
  bar: u('pressure', 'bar', 1e5),
  psi: u('pressure', 'psi', LBF_N / (INCH_M * INCH_M)), // 6 894.757 293 Pa; NIST SP 811 B.8 lists 6.894 757 E+03
  inh2o: u('pressure', 'inH2O', 249.08891), // conventional inch of water, NIST SP 811 B.8 footnote; DESIGN §3.4
  inwc: u('pressure', 'inH2O', 249.08891),
  mmh2o: u('pressure', 'mmH2O', 9.80665), // conventional millimetre of water, NIST SP 811 B.8
  torr: u('pressure', 'torr', 101325 / 760), // NIST SP 811 B.8: 1 torr = (101 325/760) Pa
  mmhg: u('pressure', 'mmHg', 133.322387415), // conventional mmHg, NIST SP 811 B.8
  // temperature (NIST SP 811 B.8: T/K = t/°C + 273.15; T/K = (t/°F + 459.67)/1.8)
  degc: u('temperature', 'degC', 1, 273.15),
  c: u('temperature', 'degC', 1, 273.15),
  celsius: u('temperature', 'degC', 1, 273.15),
  k: u('temperature', 'K', 1),
  kelvin: u('temperature', 'K', 1),
  degf: u('temperature', 'degF', 1 / 1.8, 459.67 / 1.8),
  f: u('temperature', 'degF', 1 / 1.8, 459.67 / 1.8),
  fahrenheit: u('temperature', 'degF', 1 / 1.8, 459.67 / 1.8),
  // force
  n: u('force', 'N', 1),
  newton: u('force', 'N', 1),
  kn: u('force', 'kN', 1e3),
  lbf: u('force', 'lbf', LBF_N),
  kgf: u('force', 'kgf', 9.80665), // NIST SP 811 B.8: kilogram-force = 9.806 65 N exactly
  // moment
  nm: u('moment', 'N m', 1),
  lbfin: u('moment', 'lbf in', LBF_N * INCH_M), // 0.112 984 8 N m, NIST SP 811 B.8
  inlbf: u('moment', 'lbf in', LBF_N * INCH_M),
  lbfft: u('moment', 'lbf ft', LBF_N * FOOT_M), // 1.355 818 N m, NIST SP 811 B.8
  ftlbf: u('moment', 'lbf ft', LBF_N * FOOT_M),
  kgfm: u('moment', 'kgf m', 9.80665),
  // angle
  deg: u('angle', 'deg', Math.PI / 180),
  degree: u('angle', 'deg', Math.PI / 180),
  degrees: u('angle', 'deg', Math.PI / 180),
  rad: u('angle', 'rad', 1),
  radian: u('angle', 'rad', 1),
  radians: u('angle', 'rad', 1),
  // relative humidity
  '%': u('ratio', '%', 0.01),
  percent: u('ratio', '%', 0.01),
  pct: u('ratio', '%', 0.01),
  fraction: u('ratio', 'fraction', 1),
  frac: u('ratio', 'fraction', 1),
  '1': u('ratio', 'fraction', 1),
};

/** Lower-case and drop the separators people write between unit parts ("N·m", "lbf-in", "N m"). */
export function normaliseUnit(text: string): string {
  return text
    .trim()
    .toLowerCase()
    .replace(/°/g, 'deg')
    .replace(/[\s·*.\-_]/g, '');
}

/** The conversion for a unit string, or undefined when the unit is not known. */
export function lookupUnit(text: string): UnitConversion | undefined {
  const key = normaliseUnit(text);
  if (key === 'deg') return TABLE.deg;
  return TABLE[key];
}

/** Units of one quantity, for messages ("expected one of ..."). */
export function unitsOf(quantity: Quantity): string[] {
  const seen = new Set<string>();
  for (const conv of Object.values(TABLE)) if (conv.quantity === quantity) seen.add(conv.label);
  return [...seen];
}

export function toSI(value: number, conv: UnitConversion): number {
  return value * conv.scale + conv.offset;
}

export function fromSI(value: number, conv: UnitConversion): number {
  return (value - conv.offset) / conv.scale;
}
