/**
 * Characteristic numbers of a polar (docs/methods.md §8): lift-curve slope over an automatically
 * found linear range, zero-lift angle, CLmax, stall angle, drag polar, (L/D)max, Cm slope.
 * Anything that cannot be determined is null, with a warning saying why; never a made-up number.
 */
import { fitLine, fitPolynomial, parabolaVertex, regressLine, type LineFit } from './leastSquares.ts';

export interface FitInput {
  alphaDeg: number[];
  cl: number[];
  cd: number[];
  /** NaN where no pitching moment was measured. */
  cm: number[];
  /** Standard error of each point's CL from its sample scatter (0 for single samples). */
  clScatter: number[];
  /** Standard uncertainties of CL and CD (setup `uncertainty` block): the fits are then weighted by 1/u². */
  clU?: number[];
  cdU?: number[];
  kind: '2d' | '3d';
  /** Aspect ratio b²/S (3D). */
  aspectRatio: number;
}

export interface FitResult {
  cl_alpha_per_deg: number | null;
  cl_alpha_stderr_per_deg: number | null;
  alpha_zero_lift_deg: number | null;
  cl_max: number | null;
  alpha_cl_max_deg: number | null;
  alpha_stall_deg: number | null;
  linear_range_deg: [number, number] | null;
  linear_range_points: number | null;
  linear_tolerance_cl: number | null;
  cd0: number | null;
  k_induced: number | null;
  oswald_e: number | null;
  cd_min: number | null;
  cl_min_drag: number | null;
  k_induced_cambered: number | null;
  ld_max: number | null;
  cl_at_ld_max: number | null;
  cm_alpha_per_deg: number | null;
  cm_cl_slope: number | null;
  x_ac_aft_of_ref_c: number | null;
  alpha_zero_lift_stderr_deg: number | null;
  cd0_stderr: number | null;
  k_induced_stderr: number | null;
  /** True when the lift line and the polar were weighted by the points' uncertainties. */
  weighted: boolean;
}

export const EMPTY_FIT: FitResult = {
  cl_alpha_per_deg: null,
  cl_alpha_stderr_per_deg: null,
  alpha_zero_lift_deg: null,
  cl_max: null,
  alpha_cl_max_deg: null,
  alpha_stall_deg: null,
  linear_range_deg: null,
  linear_range_points: null,
  linear_tolerance_cl: null,
  cd0: null,
  k_induced: null,
  oswald_e: null,
  cd_min: null,
  cl_min_drag: null,
  k_induced_cambered: null,
  ld_max: null,
  cl_at_ld_max: null,
  cm_alpha_per_deg: null,
  cm_cl_slope: null,
  x_ac_aft_of_ref_c: null,
  alpha_zero_lift_stderr_deg: null,
  cd0_stderr: null,
  k_induced_stderr: null,
  weighted: false,
};

/** Smallest tolerance on lift residuals, in CL (common practice: about the repeatability of a good balance). */
export const MIN_LINEAR_TOLERANCE = 0.01;
export const MIN_LINEAR_POINTS = 4;

export interface LinearRange {
  from: number;
  to: number; // exclusive
  line: LineFit;
  tolerance: number;
}

/**
 * Linear range rule: start from the three consecutive points (sorted by α) whose mean |CL| is smallest;
 * grow one point at a time toward the side whose line fit has the smaller largest residual, while every
 * residual stays within tol = max(0.01, 3·median scatter). Returns undefined with fewer than 4 points.
 */
export function findLinearRange(alpha: number[], cl: number[], scatter: number[]): LinearRange | undefined {
  const n = alpha.length;
  if (n < MIN_LINEAR_POINTS) return undefined;
  if (n > MAX_SEARCH_POINTS) return findLinearRangeDecimated(alpha, cl, scatter);
  const tolerance = Math.max(MIN_LINEAR_TOLERANCE, 3 * median(scatter));
  let best = 0;
  let bestMean = Infinity;
  for (let i = 0; i + 3 <= n; i++) {
    const m = (Math.abs(cl[i]!) + Math.abs(cl[i + 1]!) + Math.abs(cl[i + 2]!)) / 3;
    if (m < bestMean) {
      bestMean = m;
      best = i;
    }
  }
  let from = best;
  let to = best + 3;
  let line = fitLine(alpha, cl, from, to);
  if (!(line.maxResidual <= tolerance)) return undefined;
  for (;;) {
    const left = from > 0 ? fitLine(alpha, cl, from - 1, to) : undefined;
    const right = to < n ? fitLine(alpha, cl, from, to + 1) : undefined;
    const pick =
      left && right ? (left.maxResidual <= right.maxResidual ? 'left' : 'right') : left ? 'left' : right ? 'right' : undefined;
    if (pick === undefined) break;
    const cand = pick === 'left' ? left! : right!;
    if (!(cand.maxResidual <= tolerance)) break;
    line = cand;
    if (pick === 'left') from--;
    else to++;
  }
  if (to - from < MIN_LINEAR_POINTS) return undefined;
  return { from, to, line, tolerance };
}

/**
 * The growth rule costs O(n²); above this many points (a continuous sweep, or samples without a point
 * column) the range is searched on every k-th point and then applied to all points in its α span.
 */
export const MAX_SEARCH_POINTS = 2000;

function findLinearRangeDecimated(alpha: number[], cl: number[], scatter: number[]): LinearRange | undefined {
  const n = alpha.length;
  const step = Math.ceil(n / MAX_SEARCH_POINTS);
  const pick = <T>(v: T[]) => v.filter((_, i) => i % step === 0);
  const sub = findLinearRange(pick(alpha), pick(cl), pick(scatter));
  if (!sub) return undefined;
  const lo = alpha[sub.from * step]!;
  const hi = alpha[(sub.to - 1) * step]!;
  let from = sub.from * step;
  while (from > 0 && alpha[from - 1]! >= lo) from--;
  let to = (sub.to - 1) * step + 1;
  while (to < n && alpha[to]! <= hi) to++;
  return { from, to, line: fitLine(alpha, cl, from, to), tolerance: sub.tolerance };
}

/** All fits of one run; points must be sorted by α. */
export function fitPolar(input: FitInput): { fit: FitResult; warnings: string[] } {
  const warnings: string[] = [];
  const fit: FitResult = { ...EMPTY_FIT };
  const { alphaDeg: a, cl, cd, cm } = input;
  const n = a.length;
  const range = findLinearRange(a, cl, input.clScatter);
  if (!range) {
    warnings.push(
      n < MIN_LINEAR_POINTS
        ? `only ${n} points: the lift-curve fits need at least ${MIN_LINEAR_POINTS}`
        : `no linear lift range of at least ${MIN_LINEAR_POINTS} points was found (residual tolerance ${Math.max(MIN_LINEAR_TOLERANCE, 3 * median(input.clScatter)).toFixed(4)} in CL); lift-curve fits are not given`,
    );
  } else {
    const { from, to } = range;
    const weightsOf = (u: number[] | undefined) => (u && u.slice(from, to).every((x) => x > 0) ? u.map((x) => 1 / (x * x)) : undefined);
    const wl = weightsOf(input.clU);
    const wd = weightsOf(input.cdU);
    fit.weighted = wl !== undefined;
    const line = regressLine(a, cl, wl, from, to)!;
    fit.cl_alpha_per_deg = line.slope;
    fit.cl_alpha_stderr_per_deg = finiteOrNull(Math.sqrt(line.varSlope));
    if (line.slope !== 0) {
      const a0 = -line.intercept / line.slope;
      fit.alpha_zero_lift_deg = a0;
      // delta method on α0 = −intercept/slope (JCGM 100:2008 eq. 13)
      const v = (line.varIntercept + a0 * a0 * line.varSlope + 2 * a0 * line.covariance) / (line.slope * line.slope);
      fit.alpha_zero_lift_stderr_deg = finiteOrNull(Math.sqrt(v));
    }
    fit.linear_range_deg = [a[from]!, a[to - 1]!];
    fit.linear_range_points = to - from;
    fit.linear_tolerance_cl = range.tolerance;

    const clr = cl.slice(from, to);
    const cdr = cd.slice(from, to);
    const polar = regressLine(clr.map((c) => c * c), cdr, wd?.slice(from, to));
    if (polar) {
      fit.cd0 = polar.intercept;
      fit.k_induced = polar.slope;
      fit.cd0_stderr = finiteOrNull(Math.sqrt(polar.varIntercept));
      fit.k_induced_stderr = finiteOrNull(Math.sqrt(polar.varSlope));
      if (input.kind === '3d') {
        fit.oswald_e = polar.slope > 0 ? 1 / (Math.PI * input.aspectRatio * polar.slope) : null;
        if (fit.oswald_e === null) warnings.push('the drag polar has no positive CL² term; Oswald efficiency is not given');
      }
    }
    const cambered = fitPolynomial(clr, cdr, 2);
    if (cambered && cambered[2]! > 0) {
      fit.k_induced_cambered = cambered[2]!;
      fit.cl_min_drag = -cambered[1]! / (2 * cambered[2]!);
      fit.cd_min = cambered[0]! - (cambered[1]! * cambered[1]!) / (4 * cambered[2]!);
    }
    const cmOk = cm.slice(from, to).every(Number.isFinite);
    if (cmOk) {
      fit.cm_alpha_per_deg = fitLine(a, cm, from, to).slope;
      const dcmdcl = fitLine(clr, cm.slice(from, to)).slope;
      fit.cm_cl_slope = dcmdcl;
      // aerodynamic centre aft of the moment reference, 3D and 2D alike (for a section: x_ac/c = x_ref/c − dcm/dcl)
      fit.x_ac_aft_of_ref_c = -dcmdcl;
    }
  }

  // CLmax: vertex of the parabola through the highest point and its neighbours in α
  if (n >= 3) {
    let k = 0;
    for (let i = 1; i < n; i++) if (cl[i]! > cl[k]!) k = i;
    if (k === 0 || k === n - 1) {
      warnings.push(`the highest CL is at the ${k === 0 ? 'first' : 'last'} angle of the sweep (α = ${a[k]!.toFixed(2)}°): no peak was reached, so CLmax is not given`);
    } else {
      const v = parabolaVertex([a[k - 1]!, a[k]!, a[k + 1]!], [cl[k - 1]!, cl[k]!, cl[k + 1]!]);
      if (v) {
        fit.cl_max = v.y;
        fit.alpha_cl_max_deg = v.x;
      }
      const drop = range ? range.tolerance : MIN_LINEAR_TOLERANCE;
      for (let i = k + 1; i < n; i++) {
        if (cl[i]! < cl[k]! - drop) {
          fit.alpha_stall_deg = a[i]!;
          break;
        }
      }
    }
  }

  // (L/D)max from the points, refined by a parabola through its neighbours
  let best = -1;
  for (let i = 0; i < n; i++) if (cd[i]! > 0 && (best < 0 || cl[i]! / cd[i]! > cl[best]! / cd[best]!)) best = i;
  if (best >= 0) {
    fit.ld_max = cl[best]! / cd[best]!;
    fit.cl_at_ld_max = cl[best]!;
    if (best > 0 && best < n - 1 && cd[best - 1]! > 0 && cd[best + 1]! > 0) {
      const xs: [number, number, number] = [cl[best - 1]!, cl[best]!, cl[best + 1]!];
      const ys: [number, number, number] = [cl[best - 1]! / cd[best - 1]!, fit.ld_max, cl[best + 1]! / cd[best + 1]!];
      const v = xs[0] < xs[1] && xs[1] < xs[2] ? parabolaVertex(xs, ys) : undefined;
      if (v && v.x >= xs[0] && v.x <= xs[2]) {
        fit.ld_max = v.y;
        fit.cl_at_ld_max = v.x;
      }
    }
  }
  // Extreme but finite inputs (CD = 5e-324, CL near 1e308) can overflow a fit's arithmetic; a value that
  // is not a finite number cannot be determined, so it is null with a warning (fuzz finding).
  const overflowed: string[] = [];
  for (const key of Object.keys(fit) as (keyof FitResult)[]) {
    const v = fit[key];
    if ((typeof v === 'number' && !Number.isFinite(v)) || (Array.isArray(v) && !v.every(Number.isFinite))) {
      (fit as unknown as Record<string, unknown>)[key] = null;
      overflowed.push(key);
    }
  }
  if (overflowed.length > 0) warnings.push(`${overflowed.join(', ')} could not be computed (the values overflow); not given`);
  return { fit, warnings };
}

function finiteOrNull(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

function median(values: number[]): number {
  const v = values.filter(Number.isFinite).sort((x, y) => x - y);
  if (v.length === 0) return 0;
  const mid = v.length >> 1;
  return v.length % 2 === 1 ? v[mid]! : (v[mid - 1]! + v[mid]!) / 2;
}
