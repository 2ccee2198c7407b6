/**
 * Every number the window shows is written here (exports keep their own rounding in core's
 * reportTable.ts). The rules, the same on every view:
 * - No value (null, undefined, NaN, ±Infinity) is "—", never "NaN" or a made-up number.
 * - Minus is the ASCII hyphen-minus "-": a number selected on screen and pasted into a spreadsheet stays
 *   a number (a U+2212 minus would arrive as text). Negative zero is shown as "0" ("-0.000" never appears).
 * - No thousands grouping ("99180", "474000"): a space inside a number also breaks the paste, and ISO
 *   80000-1 makes grouping optional.
 * - Rounding is that of Number.prototype.toFixed, on the binary value: halves away from zero
 *   (0.125 → "0.13", -0.125 → "-0.13"); a decimal written as 1.005 is stored as 1.00499999… and shows
 *   "1.00", exactly as the exported files round it.
 * - Each quantity has its own resolution (QUANTITY below). With a standard uncertainty the value is rounded
 *   to the decimal place of the uncertainty's second significant digit and the uncertainty to two
 *   significant digits (JCGM 100:2008, GUM §7.2.6), through core's `decimalsFromUncertainty`, the rule the
 *   report exports use, capped at seven significant digits like them.
 * - Magnitudes of 10¹⁵ and more, and non-zero ones below 10⁻⁴ where significant digits are asked for,
 *   go to exponent form "1.2e-7" (also read by spreadsheets).
 * - Reynolds numbers are quoted in millions: "0.474" under a column header "Re [10⁶]", and
 *   "0.474 × 10⁶" in running text.
 * - A column header is "symbol [unit]" with "[–]" for a ratio, the style of the plots' axis titles.
 */
import { decimalsFromUncertainty } from '../../../core/index.ts';

export const DASH = '—';
/** The minus sign of every number on screen (see above for why not U+2212). */
export const MINUS = '-';
/** Significant digits past which no screen number goes, as in the exports (core MAX_SIGNIFICANT). */
export const MAX_DIGITS = 7;

function absent(value: number | null | undefined): value is null | undefined {
  return value === null || value === undefined || !Number.isFinite(value);
}

/** Decimal exponent of a finite non-zero number (floor(log10 |x|)), exact at powers of ten. */
function exponentOf(x: number): number {
  const e = Math.floor(Math.log10(Math.abs(x)));
  return Math.abs(x) >= 10 ** (e + 1) ? e + 1 : e;
}

/** "-0", "-0.000" → without the sign. */
function noNegativeZero(s: string): string {
  return /^-0(\.0*)?(e.*)?$/.test(s) ? s.slice(1) : s;
}

/** Exponent form without "+" and leading zeros in the exponent: 1.20e-7, 4.7e21. */
function exponent(value: number, digits: number): string {
  const [m, e] = value.toExponential(Math.max(0, digits - 1)).split('e') as [string, string];
  return noNegativeZero(`${m}e${Number(e)}`);
}

/** Fixed decimals; "—" for null, undefined or non-finite values; huge magnitudes in exponent form. */
export function fixed(value: number | null | undefined, decimals: number): string {
  if (absent(value)) return DASH;
  if (Math.abs(value) >= 1e15) return exponent(value, MAX_DIGITS);
  const d = Math.max(0, Math.min(20, Math.round(decimals)));
  return noNegativeZero(value.toFixed(d));
}

/**
 * Significant digits, trailing zeros kept ("0.1250" to four: they state the resolution), switching to
 * exponent form for magnitudes (after rounding) of 10⁶ and more or below 10⁻⁴.
 */
export function significant(value: number | null | undefined, digits = 4): string {
  if (absent(value)) return DASH;
  if (value === 0) return '0';
  const d = Math.max(1, Math.min(MAX_DIGITS, Math.round(digits)));
  const rounded = Number(value.toPrecision(d));
  const mag = Math.abs(rounded);
  if (mag >= 1e6 || mag < 1e-4) return exponent(value, d);
  return toPlace(rounded, d - 1 - exponentOf(rounded));
}

/** Significant digits without trailing zeros ("1.2", "0.225"): for echoing dimensions the user typed, not for measured values. */
export function compact(value: number | null | undefined, digits = 3): string {
  const s = significant(value, digits);
  return s.includes('.') && !s.includes('e') ? s.replace(/\.?0+$/, '') : s;
}

/** Reynolds number in millions, the way test engineers quote it ("0.470" for 470 000), for a column headed "Re [10⁶]". */
export function millions(value: number | null | undefined, decimals = 3): string {
  return absent(value) ? DASH : fixed(value / 1e6, decimals);
}

/** A Reynolds number in running text: "0.474 × 10⁶". */
export function reynoldsText(value: number | null | undefined): string {
  return absent(value) ? DASH : `${millions(value)} × 10⁶`;
}

/** Digits after the point for a value with standard uncertainty `u` (GUM §7.2.6), or `fallback` without a usable u. */
export function decimalsFor(value: number, u: number | null | undefined, fallback: number): number {
  const fromU = absent(u) ? null : decimalsFromUncertainty(u);
  let d = fromU ?? fallback;
  if (value !== 0 && Number.isFinite(value)) d = Math.min(d, MAX_DIGITS - 1 - exponentOf(value));
  return d;
}

/** A value rounded to `d` decimals where d may be negative (rounded to tens, hundreds…). */
function toPlace(value: number, d: number): string {
  if (d >= 0) return fixed(value, d);
  const step = 10 ** -d;
  return noNegativeZero(String(Math.round(value / step) * step));
}

/**
 * A value and its standard uncertainty, "0.06578 ± 0.00013": the value to the place of the uncertainty's
 * second significant digit, the uncertainty to the same place (GUM §7.2.6). Without an uncertainty, the
 * value alone at `decimals`.
 */
export function withUncertainty(value: number | null | undefined, u: number | null | undefined, decimals: number): string {
  if (absent(value)) return DASH;
  if (absent(u) || u <= 0) return fixed(value, decimals);
  const d = decimalsFor(value, u, decimals);
  return `${toPlace(value, d)} ± ${toPlace(u, Math.max(d, decimalsFromUncertainty(u) ?? d))}`;
}

/** An angle and its standard uncertainty in running text, "0.3512° ± 0.0041°" (GUM §7.2.6 rounding). */
export function degreesWithUncertainty(value: number | null | undefined, u: number | null | undefined, decimals: number): string {
  const t = withUncertainty(value, u, decimals);
  return t === DASH ? t : t.replace(' ± ', '° ± ') + '°';
}

/** A value rounded as withUncertainty rounds it, without the "± u" (for a table whose uncertainty has its own column). */
export function valueForUncertainty(value: number | null | undefined, u: number | null | undefined, decimals: number): string {
  if (absent(value)) return DASH;
  return toPlace(value, decimalsFor(value, u, decimals));
}

/** A standard uncertainty on its own: two significant digits (GUM §7.2.6). */
export function uncertainty(u: number | null | undefined): string {
  return significant(u, 2);
}

/** Quantities with a screen resolution of their own. `decimals` after the point, or `sig` significant digits. */
export type Quantity =
  | 'alpha'
  | 'cl'
  | 'cd'
  | 'cm'
  | 'cy'
  | 'cRoll'
  | 'cYaw'
  | 'ld'
  | 'q'
  | 'v'
  | 'mach'
  | 'reynolds'
  | 'rho'
  | 'pressure'
  | 'temperatureC'
  | 'rh'
  | 'slopePerDeg'
  | 'cdPolar'
  | 'kInduced'
  | 'oswald'
  | 'xAc'
  | 'epsilon'
  | 'factor'
  | 'uncertainty'
  | 'count'
  | 'force'
  | 'moment'
  | 'speedKt'
  | 'altitude';

export interface QuantityFormat {
  /** Unit for the column header ('-' for a ratio, '' for none). */
  unit: string;
  decimals?: number;
  sig?: number;
}

/**
 * Screen resolution per quantity: what a low-speed balance, pitot and thermometer resolve (common practice,
 * no source; the exports' resolutions in core/formats/reportTable.ts are one digit finer where they differ,
 * because a report table is reused in further calculations).
 */
export const QUANTITY: Readonly<Record<Quantity, QuantityFormat>> = {
  alpha: { unit: 'deg', decimals: 2 },
  cl: { unit: '-', decimals: 4 },
  cd: { unit: '-', decimals: 5 },
  cm: { unit: '-', decimals: 4 },
  cy: { unit: '-', decimals: 4 },
  cRoll: { unit: '-', decimals: 5 },
  cYaw: { unit: '-', decimals: 5 },
  ld: { unit: '-', decimals: 2 },
  q: { unit: 'Pa', decimals: 1 },
  v: { unit: 'm/s', decimals: 2 },
  mach: { unit: '-', decimals: 4 },
  reynolds: { unit: '10⁶', decimals: 3 },
  rho: { unit: 'kg/m³', decimals: 4 },
  pressure: { unit: 'Pa', decimals: 0 },
  temperatureC: { unit: '°C', decimals: 1 },
  rh: { unit: '%', decimals: 1 },
  slopePerDeg: { unit: '1/deg', decimals: 5 },
  cdPolar: { unit: '-', decimals: 5 },
  kInduced: { unit: '-', decimals: 4 },
  oswald: { unit: '-', decimals: 3 },
  xAc: { unit: 'c', decimals: 4 },
  epsilon: { unit: '-', sig: 3 },
  factor: { unit: '-', sig: 4 },
  uncertainty: { unit: '', sig: 2 },
  count: { unit: '', decimals: 0 },
  force: { unit: 'N', decimals: 3 },
  moment: { unit: 'N m', decimals: 4 },
  speedKt: { unit: 'kt', decimals: 1 },
  altitude: { unit: 'm', decimals: 0 },
};

/** A value of a quantity at its resolution, or with its standard uncertainty as "v ± u" (GUM §7.2.6). */
export function formatQuantity(quantity: Quantity, value: number | null | undefined, u?: number | null): string {
  const f = QUANTITY[quantity];
  if (quantity === 'reynolds') return millions(value, f.decimals);
  if (f.sig !== undefined) return significant(value, f.sig);
  return withUncertainty(value, u, f.decimals ?? 4);
}

/** A column or field header in the one style of the window: "α [deg]", "CL [–]" for a ratio, "point" without a unit. */
export function columnHeader(symbol: string, unit = ''): string {
  if (!unit) return symbol;
  return `${symbol} [${unit === '-' ? '–' : unit}]`;
}

/** A value with its unit for running text: "12.90 deg", "1.4 Pa"; a ratio, a count or "—" without one. */
export function withUnit(text: string, unit: string): string {
  if (text === DASH || !unit || unit === '-' || unit === '–') return text;
  return `${text} ${unit}`;
}

/**
 * The text of a plot's hover read-out, for the plot code to call: "0.5123 ± 0.0031 deg". Without an
 * uncertainty the value at `decimals`; with one, both rounded by GUM §7.2.6; then the unit (none for a ratio).
 */
export function readOutText(value: number, u: number | null | undefined, decimals: number, unit = ''): string {
  return withUnit(withUncertainty(value, u, decimals), unit);
}

/** A change with its sign, "+0.0123" / "-0.0123" / "0.0000" (differences against a baseline). */
export function signed(value: number | null | undefined, decimals: number): string {
  const s = fixed(value, decimals);
  return s !== DASH && !s.startsWith(MINUS) && Number(s) !== 0 ? `+${s}` : s;
}

export function mean(values: readonly (number | null)[]): number | null {
  const v = values.filter((x): x is number => x !== null && Number.isFinite(x));
  return v.length === 0 ? null : v.reduce((a, b) => a + b, 0) / v.length;
}
