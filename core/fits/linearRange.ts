/**
 * The linear part of a lift curve, found from the data's own scatter. Points are one branch's,
 * ordered by rising α.
 */
import { fitLine, type LineFit } from './leastSquares.ts';
import { medianOf } from './sweepBranches.ts';

/** Fewest points of a linear range (common practice: a line through fewer says little about its slope). */
export const MIN_LINEAR_POINTS = 5;
/** Smallest residual tolerance, in CL, for data with no visible scatter (noise-free or rounded values). */
export const TOLERANCE_FLOOR_CL = 0.01;
/** The tolerance is this many noise standard deviations (a residual beyond 3.5 σ is rare in a dozen points). */
export const TOLERANCE_SIGMAS = 3.5;
/** Above this many points the window search runs on every k-th point (the search costs O(n³)). */
export const MAX_WINDOW_SEARCH = 120;

/**
 * Robust estimate of the point-to-point noise σ of y(x): each interior point's deviation from the chord
 * through its two neighbours, r_i = y_i − [y_{i−1} + t·(y_{i+1} − y_{i−1})], t = (x_i − x_{i−1})/(x_{i+1} − x_{i−1}),
 * has variance σ²·(1 + t² + (1 − t)²) where the curve is straight; σ = 1.4826·median|r_i/√(1 + t² + (1 − t)²)|
 * (median absolute deviation scaled for a normal distribution; Rousseeuw & Croux, JASA 88 (1993) 1273),
 * so the curved stall region, a minority of the points, does not inflate it. 0 with fewer than 3 points.
 */
export function robustNoise(x: readonly number[], y: readonly number[]): number {
  const z: number[] = [];
  for (let i = 1; i + 1 < x.length; i++) {
    const span = x[i + 1]! - x[i - 1]!;
    if (!(span > 0)) continue;
    const t = (x[i]! - x[i - 1]!) / span;
    const r = y[i]! - (y[i - 1]! + t * (y[i + 1]! - y[i - 1]!));
    z.push(Math.abs(r) / Math.sqrt(1 + t * t + (1 - t) * (1 - t)));
  }
  return z.length === 0 ? 0 : 1.4826 * medianOf(z);
}

/**
 * Robust noise σ of a curve that is smooth but curved everywhere, such as CD(α) along a parabolic polar:
 * third differences d_i = y_{i+2} − 3y_{i+1} + 3y_i − y_{i−1} cancel any quadratic exactly for equal
 * steps and have variance 20σ² for independent noise; σ = 1.4826·median|d_i|/√20 (as robustNoise).
 * With unequal steps the cancellation is approximate. 0 with fewer than 4 points.
 */
export function robustNoiseSmooth(y: readonly number[]): number {
  const d: number[] = [];
  for (let i = 1; i + 2 < y.length; i++) d.push(Math.abs(y[i + 2]! - 3 * y[i + 1]! + 3 * y[i]! - y[i - 1]!));
  return d.length === 0 ? 0 : (1.4826 * medianOf(d)) / Math.sqrt(20);
}

export interface NoiseSources {
  /** Robust residual estimate from the curve itself. */
  residual: number;
  /** Median standard error of a point's CL from its own samples. */
  sampleScatter: number;
  /** Median stated random standard uncertainty of CL (setup `uncertainty` block). */
  stated: number;
}

/** The noise level used for the tolerance: the largest of the three sources, each of which can only show scatter, never hide it. */
export function noiseLevel(s: NoiseSources): number {
  return Math.max(s.residual, s.sampleScatter, s.stated);
}

export interface LinearRange {
  /** Indices into the branch's α-ordered arrays, `to` exclusive. */
  from: number;
  to: number;
  line: LineFit;
  tolerance: number;
  /** Where the range came from. */
  source: 'data' | 'setup alpha_range_deg' | 'setup linear_tolerance_cl';
}

/**
 * The longest run of consecutive points (at least MIN_LINEAR_POINTS, up to `limit` exclusive, e.g. the
 * stall) whose straight-line fit has a positive slope and every residual within `tolerance`; among
 * equally long runs the one with the smallest residual sum of squares. Undefined when there is none.
 */
export function findLinearRange(alphaDeg: readonly number[], cl: readonly number[], tolerance: number, limit = alphaDeg.length): LinearRange | undefined {
  const n = Math.min(limit, alphaDeg.length);
  if (n < MIN_LINEAR_POINTS) return undefined;
  if (n > MAX_WINDOW_SEARCH) return decimated(alphaDeg, cl, tolerance, n);
  let best: { from: number; to: number; line: LineFit; sse: number } | undefined;
  for (let len = n; len >= MIN_LINEAR_POINTS && !best; len--) {
    for (let from = 0; from + len <= n; from++) {
      const line = fitLine(alphaDeg, cl, from, from + len);
      if (!(line.slope > 0) || !(line.maxResidual <= tolerance)) continue;
      let sse = 0;
      for (let i = from; i < from + len; i++) sse += (cl[i]! - line.intercept - line.slope * alphaDeg[i]!) ** 2;
      if (!best || sse < best.sse) best = { from, to: from + len, line, sse };
    }
  }
  return best && { from: best.from, to: best.to, line: best.line, tolerance, source: 'data' };
}

function decimated(alphaDeg: readonly number[], cl: readonly number[], tolerance: number, n: number): LinearRange | undefined {
  const step = Math.ceil(n / MAX_WINDOW_SEARCH);
  const idx: number[] = [];
  for (let i = 0; i < n; i += step) idx.push(i);
  const sub = findLinearRange(idx.map((i) => alphaDeg[i]!), idx.map((i) => cl[i]!), tolerance);
  if (!sub) return undefined;
  const from = idx[sub.from]!;
  const to = Math.min(n, idx[sub.to - 1]! + 1);
  return { from, to, line: fitLine(alphaDeg, cl, from, to), tolerance, source: 'data' };
}

/** The points whose α lies in [lo, hi] (setup `fit.alpha_range_deg`), as a range of the ordered arrays. */
export function rangeFromAlpha(alphaDeg: readonly number[], cl: readonly number[], lo: number, hi: number): LinearRange | undefined {
  const eps = 1e-9 * Math.max(1, Math.abs(lo), Math.abs(hi));
  const from = alphaDeg.findIndex((a) => a >= lo - eps);
  if (from < 0) return undefined;
  let to = from;
  while (to < alphaDeg.length && alphaDeg[to]! <= hi + eps) to++;
  if (to - from < 2) return undefined;
  const line = fitLine(alphaDeg, cl, from, to);
  return { from, to, line, tolerance: line.maxResidual, source: 'setup alpha_range_deg' };
}
