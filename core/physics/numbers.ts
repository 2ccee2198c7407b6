/** Small numeric helpers shared by every layer of the engine. */

/** The value when it is a finite number, else null: results never carry NaN or Infinity (data-format rule "null, never a made-up number"). */
export function finiteOrNull(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

/** Largest value of a list without spreading it into arguments (a spread overflows the call stack above ~10⁵ values). NaN-free lists only; −Infinity for an empty list. */
export function maxOf(values: ArrayLike<number>): number {
  let m = -Infinity;
  for (let i = 0; i < values.length; i++) if (values[i]! > m) m = values[i]!;
  return m;
}

/** Smallest value of a list without spreading it into arguments; +Infinity for an empty list. */
export function minOf(values: ArrayLike<number>): number {
  let m = Infinity;
  for (let i = 0; i < values.length; i++) if (values[i]! < m) m = values[i]!;
  return m;
}

/** Indices that sort the values ascending (stable). */
export function sortedOrder(values: ArrayLike<number>): number[] {
  return Array.from({ length: values.length }, (_, i) => i).sort((x, y) => values[x]! - values[y]! || x - y);
}

/**
 * Linear interpolation in a table with strictly increasing abscissae xs (common practice):
 * y = y_lo + (x − x_lo)/(x_hi − x_lo)·(y_hi − y_lo). Outside the table the nearest end value is
 * returned and `clamped` says so; the caller decides whether that deserves a warning.
 * Returns the bracketing index and weight, so several ordinates can share one search.
 */
export function bracket(xs: ArrayLike<number>, x: number): { lo: number; hi: number; t: number; outside: boolean } {
  const n = xs.length;
  if (n === 0) throw new Error('bracket: empty table');
  if (n === 1 || x <= xs[0]!) return { lo: 0, hi: 0, t: 0, outside: n > 1 ? x < xs[0]! : x !== xs[0] };
  if (x >= xs[n - 1]!) return { lo: n - 1, hi: n - 1, t: 0, outside: x > xs[n - 1]! };
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (xs[mid]! <= x) lo = mid;
    else hi = mid;
  }
  return { lo, hi, t: (x - xs[lo]!) / (xs[hi]! - xs[lo]!), outside: false };
}

/** The ordinate ys at a bracket from {@link bracket}. */
export function interpolateAt(ys: ArrayLike<number>, b: { lo: number; hi: number; t: number }): number {
  return b.lo === b.hi ? ys[b.lo]! : ys[b.lo]! + b.t * (ys[b.hi]! - ys[b.lo]!);
}

/** Linear interpolation of ys over increasing xs at x, nearest end value outside (see {@link bracket}). */
export function interpolate(xs: ArrayLike<number>, ys: ArrayLike<number>, x: number): number {
  return interpolateAt(ys, bracket(xs, x));
}
