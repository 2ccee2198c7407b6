/** Numbers as shown on screen (exports keep full precision). Conversion for display happens here, once. */

export const DASH = '—';

/** Fixed decimals; "—" for null, undefined or non-finite values. */
export function fixed(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return DASH;
  const s = value.toFixed(decimals);
  // no "-0.000"
  return /^-0\.?0*$/.test(s) ? s.slice(1) : s;
}

/** Significant digits, switching to exponent form for very large or small magnitudes. */
export function significant(value: number | null | undefined, digits = 4): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return DASH;
  if (value === 0) return '0';
  const mag = Math.abs(value);
  if (mag >= 1e6 || mag < 1e-4) return value.toExponential(digits - 1);
  return Number(value.toPrecision(digits)).toString();
}

/** Reynolds number in millions, the way test engineers quote it ("0.470" for 470 000). */
export function millions(value: number | null | undefined, decimals = 3): string {
  return value === null || value === undefined || !Number.isFinite(value) ? DASH : (value / 1e6).toFixed(decimals);
}

export function mean(values: readonly (number | null)[]): number | null {
  const v = values.filter((x): x is number => x !== null && Number.isFinite(x));
  return v.length === 0 ? null : v.reduce((a, b) => a + b, 0) / v.length;
}
