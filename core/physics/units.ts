/**
 * Units accepted in run files (headers, units rows, column maps) and their conversion to SI,
 * applied once when a file is read.
 *
 * Factors: NIST Special Publication 811 (2008 ed.), Appendix B.8/B.9, unless noted.
 * Conventional water columns: inch of water 249.088 91 Pa, millimetre of water 9.806 65 Pa, both at
 * the conventional density 1000 kg/m³ and standard gravity; conventional mercury columns at
 * 13 595.1 kg/m³. A load cell's kg or g reading is a mass indication, turned into force with standard
 * gravity 9.806 65 m/s².
 */

export type Quantity = 'pressure' | 'temperature' | 'force' | 'moment' | 'angle' | 'ratio' | 'time' | 'count';

/** A linear conversion to SI: si = value * scale + offset. */
export interface UnitConversion {
  readonly quantity: Quantity;
  /** Canonical spelling shown back to the user. */
  readonly label: string;
  readonly scale: number;
  readonly offset: number;
  /** A mass unit read as a force (a load cell showing kg or g): the reader says so once per column. */
  readonly massAsForce?: boolean;
}

// Factors named after the NIST SP 811 (2008) Appendix B.8 entry they come from.
/** Standard acceleration of free fall, m/s², exact (NIST SP 811 B.8 "kilogram-force"; CGPM 1901). */
export const STANDARD_GRAVITY = 9.80665;
const LBF_N = 4.4482216152605; // NIST SP 811 B.8: pound-force, 4.448 222 E+00 N (exact: 0.45359237 kg × 9.80665 m/s²)
const KGF_N = STANDARD_GRAVITY; // NIST SP 811 B.8: kilogram-force, 9.806 65 N exactly
const OZF_N = LBF_N / 16; // NIST SP 811 B.8: ounce-force (avoirdupois), 2.780 139 E-01 N
const INCH_M = 0.0254; // exact
const FOOT_M = 0.3048; // exact
const INHG_PA = 3386.389; // NIST SP 811 B.8: inch of mercury, conventional, 3.386 389 E+03 Pa
const MMHG_PA = 133.322387415; // NIST SP 811 B.8: millimetre of mercury, conventional, 1.333 224 E+02 Pa (13 595.1 kg/m³ × g_n × 1 mm)
const MMH2O_PA = 9.80665; // NIST SP 811 B.8: conventional millimetre of water, 9.806 65 Pa
const INH2O_PA = 249.08891; // NIST SP 811 B.8 footnote: conventional inch of water, 2.490 889 E+02 Pa

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
  time: u('time', 's', 1),
  count: u('count', '', 1),
};

const C = u('temperature', 'degC', 1, 273.15); // NIST SP 811 B.8: T/K = t/°C + 273.15
const F = u('temperature', 'degF', 1 / 1.8, 459.67 / 1.8); // NIST SP 811 B.8: T/K = (t/°F + 459.67)/1.8
const DEG = u('angle', 'deg', Math.PI / 180);
const LBF_IN = u('moment', 'lbf in', LBF_N * INCH_M); // 0.112 984 8 N m, NIST SP 811 B.8
const LBF_FT = u('moment', 'lbf ft', LBF_N * FOOT_M); // 1.355 818 N m, NIST SP 811 B.8
const mass = (label: string, kg: number): UnitConversion => ({ ...u('force', label, kg * STANDARD_GRAVITY), massAsForce: true });

/** Keys are spellings after normaliseUnit (lower case, no spaces, dots, dashes, middle dots or stars). */
const TABLE: Record<string, UnitConversion> = {
  // pressure
  pa: u('pressure', 'Pa', 1),
  kpa: u('pressure', 'kPa', 1e3),
  hpa: u('pressure', 'hPa', 1e2),
  mbar: u('pressure', 'mbar', 1e2), // NIST SP 811 B.8: 1 mbar = 100 Pa exactly
  millibar: u('pressure', 'mbar', 1e2),
  bar: u('pressure', 'bar', 1e5), // NIST SP 811 B.8: exact
  psi: u('pressure', 'psi', LBF_N / (INCH_M * INCH_M)), // 6 894.757 293 Pa; NIST SP 811 B.8 lists 6.894 757 E+03
  psia: u('pressure', 'psi', LBF_N / (INCH_M * INCH_M)),
  psid: u('pressure', 'psi', LBF_N / (INCH_M * INCH_M)),
  inh2o: u('pressure', 'inH2O', INH2O_PA),
  inwc: u('pressure', 'inH2O', INH2O_PA),
  inwg: u('pressure', 'inH2O', INH2O_PA),
  mmh2o: u('pressure', 'mmH2O', MMH2O_PA),
  mmwc: u('pressure', 'mmH2O', MMH2O_PA),
  cmh2o: u('pressure', 'cmH2O', 10 * MMH2O_PA), // conventional centimetre of water, 98.066 5 Pa (NIST SP 811 B.8)
  torr: u('pressure', 'torr', 101325 / 760), // NIST SP 811 B.8: 1 torr = (101 325/760) Pa
  mmhg: u('pressure', 'mmHg', MMHG_PA),
  inhg: u('pressure', 'inHg', INHG_PA),
  // temperature
  degc: C,
  c: C,
  degrc: C,
  celsius: C,
  k: u('temperature', 'K', 1),
  kelvin: u('temperature', 'K', 1),
  degf: F,
  f: F,
  degrf: F,
  fahrenheit: F,
  // force
  n: u('force', 'N', 1),
  newton: u('force', 'N', 1),
  newtons: u('force', 'N', 1),
  kn: u('force', 'kN', 1e3),
  lbf: u('force', 'lbf', LBF_N),
  lb: u('force', 'lbf', LBF_N), // on a force column "lb" is the pound-force
  lbs: u('force', 'lbf', LBF_N),
  ozf: u('force', 'ozf', OZF_N),
  kgf: u('force', 'kgf', KGF_N),
  kp: u('force', 'kgf', KGF_N), // kilopond = kilogram-force
  gf: u('force', 'gf', KGF_N / 1000), // gram-force, NIST SP 811 B.8: 9.806 65 E-03 N
  // a load cell's mass indication: force = m × g_n (standard gravity)
  kg: mass('kg', 1),
  g: mass('g', 1e-3),
  // moment
  nm: u('moment', 'N m', 1),
  nmm: u('moment', 'N mm', 1e-3),
  ncm: u('moment', 'N cm', 1e-2),
  lbfin: LBF_IN,
  inlbf: LBF_IN,
  inlb: LBF_IN,
  lbin: LBF_IN,
  inlbs: LBF_IN,
  lbfft: LBF_FT,
  ftlbf: LBF_FT,
  ftlb: LBF_FT,
  lbft: LBF_FT,
  kgfm: u('moment', 'kgf m', KGF_N),
  // angle
  deg: DEG,
  degr: DEG,
  degree: DEG,
  degrees: DEG,
  rad: u('angle', 'rad', 1),
  radian: u('angle', 'rad', 1),
  radians: u('angle', 'rad', 1),
  // relative humidity
  '%': u('ratio', '%', 0.01),
  '%rh': u('ratio', '%', 0.01),
  percent: u('ratio', '%', 0.01),
  pct: u('ratio', '%', 0.01),
  fraction: u('ratio', 'fraction', 1),
  frac: u('ratio', 'fraction', 1),
  '1': u('ratio', 'fraction', 1),
  // time (the `time` column orders zero readings)
  s: u('time', 's', 1),
  sec: u('time', 's', 1),
  seconds: u('time', 's', 1),
  ms: u('time', 'ms', 1e-3),
  min: u('time', 'min', 60),
  h: u('time', 'h', 3600),
};

/** What a units-row cell of "/" or "-" means: a dimensionless number. */
export const DIMENSIONLESS = u('ratio', 'fraction', 1);

/** Lower-case and drop the separators people write between unit parts ("N·m", "lbf-in", "N m", "degr. C"). */
export function normaliseUnit(text: string): string {
  return text
    .trim()
    .toLowerCase()
    .replace(/°/g, 'deg')
    .replace(/[\s·*.\-_]/g, '');
}

/** The conversion for a unit string, or undefined when the unit is not known. "/" and "-" are dimensionless. */
export function lookupUnit(text: string): UnitConversion | undefined {
  const t = text.trim();
  if (t === '/' || t === '-') return DIMENSIONLESS;
  const key = normaliseUnit(t);
  return Object.prototype.hasOwnProperty.call(TABLE, key) ? TABLE[key] : undefined;
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
