/**
 * Characteristic numbers of a run (docs/methods.md, fits): the run is split into sweep branches, and each
 * branch gets its lift-curve slope over a linear range found from its own scatter, zero-lift angle, CLmax
 * at the first stall, drag polar, (L/D)max and Cm slope. `fit` describes the first rising branch. Standard
 * errors come from the points' random scatter; the terms common to every point (calibrations, reference
 * area and chord, the incidence zero) are propagated to each characteristic afterwards. Anything that
 * cannot be determined is null, with a warning naming the run and the branch; never a made-up number.
 */
import { fitLine, regressLineEV } from './leastSquares.ts';
import { byRisingAlpha, extent, hysteresisLoop, medianOf, splitBranches, type Branch } from './sweepBranches.ts';
import { findLinearRange as findLinearRangeWithin, MIN_LINEAR_POINTS, noiseLevel, rangeFromAlpha, robustNoise, robustNoiseSmooth, TOLERANCE_FLOOR_CL, TOLERANCE_SIGMAS, type LinearRange } from './linearRange.ts';
import { findClMax, stallDrop, type ClMax } from './clMax.ts';
import { dragPolar, ldMax } from './polar.ts';

export { MIN_LINEAR_POINTS, type LinearRange } from './linearRange.ts';

export interface FitInput {
  alphaDeg: number[];
  cl: number[];
  cd: number[];
  /** NaN where no pitching moment was measured. */
  cm: number[];
  /** Standard error of each point's CL from its sample scatter (0 for single samples). */
  clScatter: number[];
  /** Standard uncertainties of CL and CD; taken as random (point to point) when `random` is not given. */
  clU?: number[];
  cdU?: number[];
  /** Random standard uncertainties of each point (α in deg): the weights of the fits. */
  random?: { alphaDeg: number[]; cl: number[]; cd: number[] };
  /** Shifts of every point by each input common to all points (one standard uncertainty each). */
  systematic?: SystematicInput[];
  kind: '2d' | '3d';
  /** Aspect ratio b²/S (3D). */
  aspectRatio: number;
  /** Run name for the warnings. */
  runName?: string;
  /** Setup `fit.linear_tolerance_cl`. */
  linearToleranceCl?: number | null;
  /** Setup `fit.alpha_range_deg`. */
  alphaRangeDeg?: [number, number] | null;
}

/** One systematic input's shift of every point (file order), at one standard uncertainty. */
export interface SystematicInput {
  input: string;
  alphaDeg: number[];
  cl: number[];
  cd: number[];
  cm: number[];
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
  /** Branch described (0-based, file order) and its direction. */
  branch: number | null;
  branch_direction: 'up' | 'down' | null;
  /** 'parabola' or 'measured peak'; and why CLmax is null when it is. */
  cl_max_method: string | null;
  cl_max_reason: string | null;
  /** Noise level σ of CL used for the linear-range tolerance and the stall drop. */
  noise_cl: number | null;
  /** 'data', 'setup alpha_range_deg' or 'setup linear_tolerance_cl'. */
  linear_range_source: string | null;
  /** α span of the points the drag polar was fitted to (the linear lift range, less any points where drag already departs from the polar). */
  polar_range_deg: [number, number] | null;
  cl_min_drag_stderr: number | null;
  oswald_e_stderr: number | null;
  /** 'cambered polar' or 'polar through CL = 0'. */
  oswald_e_source: string | null;
  /** Combined standard uncertainties (k = 1): random part (the standard error) and systematic part together. */
  cl_alpha_u_per_deg: number | null;
  alpha_zero_lift_u_deg: number | null;
  cl_max_u: number | null;
  alpha_cl_max_u_deg: number | null;
  cd0_u: number | null;
  k_induced_u: number | null;
  oswald_e_u: number | null;
  ld_max_u: number | null;
  /** Hysteresis between the rising branch and the falling branch after it: α span of the loop and largest ΔCL = CL_up − CL_down. */
  hysteresis_alpha_range_deg: [number, number] | null;
  hysteresis_max_delta_cl: number | null;
  hysteresis_alpha_at_max_deg: number | null;
}

/** One sweep branch with its own characteristics (JSON `fit_branches`, file order). */
export interface FitBranch {
  index: number;
  direction: 'up' | 'down';
  points: number;
  alpha_range_deg: [number, number];
  cl_max: number | null;
  alpha_cl_max_deg: number | null;
  alpha_stall_deg: number | null;
  cl_max_reason: string | null;
  cl_alpha_per_deg: number | null;
  cl_alpha_stderr_per_deg: number | null;
  alpha_zero_lift_deg: number | null;
  linear_range_deg: [number, number] | null;
}

/** Systematic contributions: characteristic → input → signed shift at one standard uncertainty of the input. */
export type FitSystematic = Record<string, Record<string, number>>;

export interface FitOutcome {
  fit: FitResult;
  fit_branches: FitBranch[];
  fit_systematic: FitSystematic;
  warnings: string[];
  /** Sweep branch of each input point (file order). */
  pointBranch: number[];
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
  branch: null,
  branch_direction: null,
  cl_max_method: null,
  cl_max_reason: null,
  noise_cl: null,
  linear_range_source: null,
  polar_range_deg: null,
  cl_min_drag_stderr: null,
  oswald_e_stderr: null,
  oswald_e_source: null,
  cl_alpha_u_per_deg: null,
  alpha_zero_lift_u_deg: null,
  cl_max_u: null,
  alpha_cl_max_u_deg: null,
  cd0_u: null,
  k_induced_u: null,
  oswald_e_u: null,
  ld_max_u: null,
  hysteresis_alpha_range_deg: null,
  hysteresis_max_delta_cl: null,
  hysteresis_alpha_at_max_deg: null,
};


/**
 * The linear lift range of points ordered by rising α, with the tolerance from their own scatter (robust
 * residual estimate and the points' sample scatter); for callers outside the fits, such as the lift slope
 * the streamline-curvature correction needs.
 */
export function findLinearRange(alphaDeg: number[], cl: number[], scatter: number[]): LinearRange | undefined {
  if (alphaDeg.length < MIN_LINEAR_POINTS || !cl.every(Number.isFinite)) return undefined;
  const noise = branchNoise(alphaDeg, cl, scatter);
  const cm = findClMax(alphaDeg, cl, stallDrop(noise));
  return findLinearRangeWithin(alphaDeg, cl, Math.max(TOLERANCE_FLOOR_CL, TOLERANCE_SIGMAS * noise), 'reason' in cm ? alphaDeg.length : cm.peak);
}

/**
 * Noise level σ of one branch's CL (points ordered by rising α), in two passes: a first robust estimate
 * over all points finds the stall; the robust estimate is then taken again over the points up to the
 * stall only, because the curvature at and past stall would otherwise pass for scatter. The sample
 * scatter and the stated random uncertainties can only raise it (linearRange.ts, noiseLevel).
 */
export function branchNoise(a: number[], cl: number[], scatter: number[], uCl?: number[]): number {
  const other = { sampleScatter: medianOf(scatter), stated: uCl ? medianOf(uCl) : 0 };
  const first = noiseLevel({ residual: robustNoise(a, cl), ...other });
  const cm = findClMax(a, cl, stallDrop(first));
  if ('reason' in cm || cm.peak + 1 < MIN_LINEAR_POINTS) return first;
  return noiseLevel({ residual: robustNoise(a.slice(0, cm.peak + 1), cl.slice(0, cm.peak + 1)), ...other });
}

/** A linear range shorter than this, or spanning less CL than SHORT_SPAN_CL, gets a warning. */
export const SHORT_RANGE_POINTS = 6;
export const SHORT_SPAN_CL = 0.2;

/** One branch's points ordered by rising α. */
interface BranchData {
  a: number[];
  cl: number[];
  cd: number[];
  cm: number[];
  scatter: number[];
  uA?: number[];
  uCl?: number[];
  uCd?: number[];
}

interface Fixed {
  range: { from: number; to: number } | null;
  clMaxMethod: ClMax['method'] | null;
  /** The σ of the unshifted data, so the stall drop does not move with a systematic shift. */
  noise: number;
  polarRange: { from: number; to: number } | null;
}

interface BranchOutcome {
  fit: FitResult;
  range: LinearRange | undefined;
  clMax: ClMax | undefined;
  noise: number;
  warnings: string[];
  polarRange: { from: number; to: number } | null;
}

/** Characteristics of one branch. With `fixed`, the range, CLmax method and noise are those of the unshifted data (for the systematic propagation). */
function analyseBranch(d: BranchData, input: FitInput, fixed?: Fixed): BranchOutcome {
  const warnings: string[] = [];
  const fit: FitResult = { ...EMPTY_FIT };
  const n = d.a.length;
  const noise = fixed?.noise ?? branchNoise(d.a, d.cl, d.scatter, d.uCl);
  fit.noise_cl = noise;

  // CLmax first: the linear range is looked for below the stall
  const cm = findClMax(d.a, d.cl, stallDrop(noise), d.uCl, d.uA, fixed?.clMaxMethod ?? undefined);
  const clMax = 'reason' in cm ? undefined : cm;
  if (clMax) {
    fit.cl_max = clMax.cl_max;
    fit.alpha_cl_max_deg = clMax.alpha_cl_max_deg;
    fit.alpha_stall_deg = d.a[clMax.stall]!;
    fit.cl_max_method = clMax.method;
    fit.cl_max_u = clMax.u;
    fit.alpha_cl_max_u_deg = clMax.alpha_u;
  } else {
    fit.cl_max_reason = (cm as { reason: string }).reason;
    warnings.push(`CLmax is not given: ${fit.cl_max_reason}`);
  }

  let range: LinearRange | undefined;
  const limit = clMax ? clMax.peak : n;
  const override = input.alphaRangeDeg ?? null;
  if (fixed) {
    range = fixed.range ? { from: fixed.range.from, to: fixed.range.to, line: fitLine(d.a, d.cl, fixed.range.from, fixed.range.to), tolerance: 0, source: 'data' } : undefined;
  } else if (override) {
    range = rangeFromAlpha(d.a, d.cl, override[0], override[1]);
    if (!range || range.to - range.from < MIN_LINEAR_POINTS) {
      warnings.push(`setup fit.alpha_range_deg [${override[0]}, ${override[1]}] holds ${range ? range.to - range.from : 0} points; the lift-curve fits need at least ${MIN_LINEAR_POINTS}, so they are not given`);
      range = undefined;
    }
  } else {
    const tol = input.linearToleranceCl ?? Math.max(TOLERANCE_FLOOR_CL, TOLERANCE_SIGMAS * noise);
    range = findLinearRangeWithin(d.a, d.cl, tol, limit);
    if (range && input.linearToleranceCl != null) range.source = 'setup linear_tolerance_cl';
    if (!range) {
      warnings.push(
        limit < MIN_LINEAR_POINTS
          ? `only ${limit} points below the stall: the lift-curve fits need at least ${MIN_LINEAR_POINTS}`
          : `no run of at least ${MIN_LINEAR_POINTS} points lies on a straight line within ${tol.toFixed(4)} in CL (${input.linearToleranceCl != null ? 'setup fit.linear_tolerance_cl' : `${TOLERANCE_SIGMAS} × the scatter σ = ${noise.toFixed(4)}`}); lift-curve fits are not given (set fit.alpha_range_deg to choose a range)`,
      );
    }
  }

  // stall angle: the first angle past the peak where CL lies below it by more than the linear range's
  // residual tolerance (the drop that marks stall when there is no range)
  if (clMax) {
    const drop = range && range.source !== 'setup alpha_range_deg' ? range.tolerance : stallDrop(noise);
    for (let i = clMax.peak + 1; i < n; i++) {
      if (d.cl[i]! < d.cl[clMax.peak]! - drop) {
        fit.alpha_stall_deg = d.a[i]!;
        break;
      }
    }
  }
  let polarRange: { from: number; to: number } | null = fixed?.polarRange ?? null;
  if (range) {
    const { from, to } = range;
    const a = d.a.slice(from, to);
    const cl = d.cl.slice(from, to);
    polarRange = fitOverRange(fit, d, from, to, input, noise, polarRange ?? undefined, warnings, !fixed);
    fit.linear_range_deg = [a[0]!, a[a.length - 1]!];
    fit.linear_range_points = to - from;
    fit.linear_tolerance_cl = fixed ? null : range.tolerance;
    fit.linear_range_source = range.source;
    const [clLo, clHi] = extent(cl);
    const span = clHi - clLo;
    if (!fixed && (to - from < SHORT_RANGE_POINTS || span < SHORT_SPAN_CL)) {
      warnings.push(`the linear lift range is short (${to - from} points, α ${a[0]!.toFixed(2)}° to ${a[a.length - 1]!.toFixed(2)}°, ΔCL ${span.toFixed(3)}): the slope and the drag polar rest on little data`);
    }
    // Range selection: where the range ends is itself chosen from noisy data, and a point of incipient
    // stall just inside the tolerance biases the slope by about one standard error. The change of each
    // characteristic when the range (or the polar's range) loses its first or its last point, beyond what
    // noise alone would give for two nested fits, is added in quadrature to its standard error (the larger
    // of the two ends; a sensitivity check made part of the stated uncertainty so that the 2-standard-error
    // interval keeps its coverage, checked by Monte Carlo in test/reference/fitCoverage.test.ts). The zero-lift
    // angle lies inside the range, where the ends hardly move it, and keeps its own standard error.
    if (!fixed && range.source !== 'setup alpha_range_deg') {
      const keys = [
        ['cl_alpha_per_deg', 'cl_alpha_stderr_per_deg', 'lift'],
        ['cd0', 'cd0_stderr', 'polar'],
        ['k_induced', 'k_induced_stderr', 'polar'],
      ] as const;
      const worst: Record<string, number> = {};
      const pr = polarRange!;
      const trials: { f: number; t: number; polar: { from: number; to: number } | undefined; which: 'lift' | 'polar' }[] = [
        { f: from + 1, t: to, polar: pr, which: 'lift' },
        { f: from, t: to - 1, polar: pr.to > to - 1 ? { from: pr.from, to: to - 1 } : pr, which: 'lift' },
        { f: from, t: to, polar: { from: pr.from + 1, to: pr.to }, which: 'polar' },
        { f: from, t: to, polar: { from: pr.from, to: pr.to - 1 }, which: 'polar' },
      ];
      for (const tr of trials) {
        if (tr.t - tr.f < MIN_LINEAR_POINTS || (tr.polar && tr.polar.to - tr.polar.from < MIN_LINEAR_POINTS)) continue;
        const alt: FitResult = { ...EMPTY_FIT };
        fitOverRange(alt, d, tr.f, tr.t, input, noise, tr.polar, [], false);
        for (const [k, se, which] of keys) {
          if (which !== tr.which) continue;
          const v0 = fit[k];
          const v1 = alt[k];
          const s0 = fit[se];
          const s1 = alt[se];
          if (typeof v0 !== 'number' || typeof v1 !== 'number' || typeof s0 !== 'number' || typeof s1 !== 'number') continue;
          // of two nested least-squares estimates the difference has variance s1² − s0² from noise alone;
          // only the excess over that is a sign that the end point bends away from the line
          // (for the polar the whole change counts: drag departs from the polar gradually, and a point that
          // is already off it by less than the tolerance still biases k; Monte Carlo showed the excess alone
          // left k's interval short)
          const excess = which === 'polar' ? (v1 - v0) ** 2 : Math.max(0, (v1 - v0) ** 2 - Math.max(0, s1 * s1 - s0 * s0));
          worst[k] = Math.max(worst[k] ?? 0, Math.sqrt(excess));
        }
      }
      for (const [k, se] of keys) {
        const v = fit[se];
        if (typeof v === 'number' && worst[k] !== undefined) fit[se] = Math.hypot(v, worst[k]!);
      }
    }
  }

  const ld = ldMax(d.cl, d.cd, d.uCl, d.uCd);
  if (ld) {
    fit.ld_max = ld.ld_max;
    fit.cl_at_ld_max = ld.cl_at_ld_max;
    fit.ld_max_u = ld.u;
  }
  return { fit, range, clMax, noise, warnings, polarRange };
}

/** Smallest tolerance on drag-polar residuals, in CD (common practice: a few drag counts). */
export const POLAR_TOLERANCE_FLOOR_CD = 0.0005;

/**
 * Lift line, drag polar and Cm slope over the points [from, to) of a branch, written into `fit`. The polar
 * drops end points of that range, the worse end first, while one lies more than 3.5 σ of the drag's own
 * scatter (at least POLAR_TOLERANCE_FLOOR_CD) off the polar: drag rises before the lift curve bends at a
 * trailing-edge stall, and such points would bias CD0 and k. Returns the polar's range (indices of the branch).
 */
function fitOverRange(fit: FitResult, d: BranchData, from: number, to: number, input: FitInput, noise: number, polarFixed: { from: number; to: number } | undefined, warnings: string[], searchPolar: boolean): { from: number; to: number } {
  const sl = <T>(v: T[] | undefined, f = from, t = to) => v?.slice(f, t);
  const a = d.a.slice(from, to);
  const cl = d.cl.slice(from, to);
  const uCl = statedOrUndefined(sl(d.uCl));
  const uA = sl(d.uA);
  fit.weighted = uCl !== undefined;
  const line = regressLineEV(a, cl, uCl, uCl ? uA : undefined, robustNoise(a, cl));
  if (line) {
    fit.cl_alpha_per_deg = line.slope;
    fit.cl_alpha_stderr_per_deg = finiteOrNull(Math.sqrt(line.varSlope));
    if (line.slope !== 0) {
      const a0 = -line.intercept / line.slope;
      fit.alpha_zero_lift_deg = a0;
      // delta method on α0 = −intercept/slope (JCGM 100:2008 eq. 13)
      const v = (line.varIntercept + a0 * a0 * line.varSlope + 2 * a0 * line.covariance) / (line.slope * line.slope);
      fit.alpha_zero_lift_stderr_deg = finiteOrNull(Math.sqrt(v));
    }
  }
  let pr = polarFixed ?? { from, to };
  const cdr = d.cd.slice(from, to);
  const uCdr = statedOrUndefined(sl(d.uCd));
  const sigmaCd = robustNoiseSmooth(cdr);
  if (!polarFixed && searchPolar) {
    const cd = cdr;
    const sigma = Math.max(sigmaCd, uCdr ? medianOf(uCdr) : 0);
    const tol = Math.max(POLAR_TOLERANCE_FLOOR_CD, TOLERANCE_SIGMAS * sigma);
    // trim the end point with the larger residual while it lies outside the tolerance
    let f0 = 0;
    let t0 = cd.length;
    while (t0 - f0 > MIN_LINEAR_POINTS) {
      const x = cl.slice(f0, t0).map((c) => c * c);
      const line = fitLine(x, cd.slice(f0, t0));
      const rFirst = Math.abs(cd[f0]! - line.intercept - line.slope * x[0]!);
      const rLast = Math.abs(cd[t0 - 1]! - line.intercept - line.slope * x[x.length - 1]!);
      if (Math.max(rFirst, rLast) <= tol) break;
      if (rLast >= rFirst) t0--;
      else f0++;
    }
    pr = { from: from + f0, to: from + t0 };
  }
  const pcl = d.cl.slice(pr.from, pr.to);
  const pcd = d.cd.slice(pr.from, pr.to);
  const polar = dragPolar(pcl, pcd, input.kind, input.aspectRatio, statedOrUndefined(sl(d.uCl, pr.from, pr.to)), statedOrUndefined(sl(d.uCd, pr.from, pr.to)), sigmaCd);
  fit.polar_range_deg = [d.a[pr.from]!, d.a[pr.to - 1]!];
  if (polar) {
    fit.cd0 = polar.cd0;
    fit.k_induced = polar.k;
    fit.cd0_stderr = polar.cd0_stderr;
    fit.k_induced_stderr = polar.k_stderr;
    fit.oswald_e = polar.oswald_e;
    fit.oswald_e_stderr = polar.oswald_e_stderr;
    fit.oswald_e_source = polar.oswald_source;
    if (polar.cambered) {
      fit.cd_min = polar.cambered.cd_min;
      fit.cl_min_drag = polar.cambered.cl_min_drag;
      fit.cl_min_drag_stderr = polar.cambered.cl_min_drag_stderr;
      fit.k_induced_cambered = polar.cambered.k;
    }
    warnings.push(...polar.warnings);
  }
  const cmr = d.cm.slice(from, to);
  if (cmr.every(Number.isFinite)) {
    fit.cm_alpha_per_deg = fitLine(a, cmr).slope;
    const dcmdcl = fitLine(cl, cmr).slope;
    fit.cm_cl_slope = dcmdcl;
    // aerodynamic centre aft of the moment reference, 3D and 2D alike (for a section: x_ac/c = x_ref/c − dcm/dcl)
    fit.x_ac_aft_of_ref_c = -dcmdcl;
  }
  return pr;
}

/** Characteristics whose systematic part is propagated, with the field holding their random part and the combined u. */
const PROPAGATED: readonly { key: keyof FitResult; random: keyof FitResult | null; combined: keyof FitResult | null }[] = [
  { key: 'cl_alpha_per_deg', random: 'cl_alpha_stderr_per_deg', combined: 'cl_alpha_u_per_deg' },
  { key: 'alpha_zero_lift_deg', random: 'alpha_zero_lift_stderr_deg', combined: 'alpha_zero_lift_u_deg' },
  { key: 'cl_max', random: 'cl_max_u', combined: 'cl_max_u' },
  { key: 'alpha_cl_max_deg', random: 'alpha_cl_max_u_deg', combined: 'alpha_cl_max_u_deg' },
  { key: 'cd0', random: 'cd0_stderr', combined: 'cd0_u' },
  { key: 'k_induced', random: 'k_induced_stderr', combined: 'k_induced_u' },
  { key: 'oswald_e', random: 'oswald_e_stderr', combined: 'oswald_e_u' },
  { key: 'ld_max', random: 'ld_max_u', combined: 'ld_max_u' },
  { key: 'cd_min', random: null, combined: null },
  { key: 'cl_min_drag', random: null, combined: null },
  { key: 'cm_alpha_per_deg', random: null, combined: null },
];

/**
 * All fits of one run. Points come in FILE ORDER: the run is split into sweep branches
 * (sweepBranches.ts) and every fit uses the points of one branch only. `fit` is the first rising
 * branch that has a linear range (else the first rising branch, else the first branch).
 */
export function fitPolar(input: FitInput): FitOutcome {
  const n = input.alphaDeg.length;
  const run = input.runName ? `run ${input.runName}` : 'the run';
  const branches = splitBranches(input.alphaDeg);
  const random = input.random ?? (input.clU ? { alphaDeg: new Array<number>(n).fill(0), cl: input.clU, cd: input.cdU ?? new Array<number>(n).fill(0) } : undefined);
  const dataOf = (b: Branch, shift?: SystematicInput): BranchData => {
    const order = byRisingAlpha(input.alphaDeg, b.points);
    const pick = (v: number[], s?: number[]) => order.map((i) => v[i]! + (s ? s[i]! : 0));
    return {
      a: pick(input.alphaDeg, shift?.alphaDeg),
      cl: pick(input.cl, shift?.cl),
      cd: pick(input.cd, shift?.cd),
      cm: pick(input.cm, shift?.cm),
      scatter: pick(input.clScatter),
      uA: random ? pick(random.alphaDeg) : undefined,
      uCl: random ? pick(random.cl) : undefined,
      uCd: random ? pick(random.cd) : undefined,
    };
  };
  if (n === 0 || branches.length === 0) {
    return { fit: { ...EMPTY_FIT }, fit_branches: [], fit_systematic: {}, warnings: [`${run}: no points to fit`], pointBranch: [] };
  }
  const outcomes = branches.map((b) => analyseBranch(dataOf(b), input));
  const ups = branches.filter((b) => b.direction === 'up');
  const main = (branches.length === 1 ? branches[0] : ups.find((b) => outcomes[b.index]!.range) ?? ups[0] ?? branches[0])!;
  const out = outcomes[main.index]!;
  const fit: FitResult = { ...out.fit, branch: main.index, branch_direction: main.direction };
  const label = (b: Branch) => {
    const al = b.points.map((i) => input.alphaDeg[i]!);
    const [lo, hi] = extent(al);
    return `branch ${b.index + 1} of ${branches.length} (${b.direction}, α ${lo.toFixed(1)}° to ${hi.toFixed(1)}°)`;
  };
  const warnings = out.warnings.map((w) => `${run}, ${label(main)}: ${w}`);
  if (branches.length > 1) {
    warnings.unshift(
      `${run}: α reverses in the file (a return sweep): ${branches.length} sweep branches (${branches.map((b) => `${b.index + 1} ${b.direction}`).join(', ')}) are fitted separately, never mixed; the fit shown is ${label(main)}; see fit_branches for the others`,
    );
    if (main.direction !== 'up') warnings.push(`${run}: no branch rises through a linear range; the fit shown is ${label(main)}`);
  }

  // systematic terms: each input's shift of every point, refitted with the same range and CLmax method
  const fitSystematic: FitSystematic = {};
  for (const s of input.systematic ?? []) {
    const shifted = analyseBranch(dataOf(main, s), input, {
      range: out.range ? { from: out.range.from, to: out.range.to } : null,
      clMaxMethod: out.clMax?.method ?? null,
      noise: out.noise,
      polarRange: out.polarRange,
    }).fit;
    for (const p of PROPAGATED) {
      const v0 = fit[p.key];
      const v1 = shifted[p.key];
      if (typeof v0 !== 'number' || typeof v1 !== 'number') continue;
      (fitSystematic[p.key] ??= {})[s.input] = v1 - v0;
    }
  }
  for (const p of PROPAGATED) {
    if (!p.combined) continue;
    const rnd = fit[p.random!];
    const sys = fitSystematic[p.key];
    if (typeof rnd !== 'number' && !sys) continue;
    if (typeof fit[p.key] !== 'number') continue;
    const sysSq = sys ? Object.values(sys).reduce((acc, v) => acc + v * v, 0) : 0;
    (fit as unknown as Record<string, number | null>)[p.combined] = finiteOrNull(Math.sqrt((typeof rnd === 'number' ? rnd * rnd : 0) + sysSq));
  }

  // hysteresis between the described rising branch and the falling branch after it
  const down = main.direction === 'up' ? branches.find((b) => b.index > main.index && b.direction === 'down') : undefined;
  if (down) {
    const h = hysteresisLoop(input.alphaDeg, input.cl, main, down, stallDrop(out.noise));
    if (h) {
      fit.hysteresis_alpha_range_deg = h.alpha_range_deg;
      fit.hysteresis_max_delta_cl = h.max_delta_cl;
      fit.hysteresis_alpha_at_max_deg = h.alpha_at_max_delta_deg;
    }
  }

  const fitBranches: FitBranch[] = branches.map((b) => {
    const f = outcomes[b.index]!.fit;
    const al = b.points.map((i) => input.alphaDeg[i]!);
    return {
      index: b.index,
      direction: b.direction,
      points: b.points.length,
      alpha_range_deg: extent(al),
      cl_max: f.cl_max,
      alpha_cl_max_deg: f.alpha_cl_max_deg,
      alpha_stall_deg: f.alpha_stall_deg,
      cl_max_reason: f.cl_max_reason,
      cl_alpha_per_deg: f.cl_alpha_per_deg,
      cl_alpha_stderr_per_deg: f.cl_alpha_stderr_per_deg,
      alpha_zero_lift_deg: f.alpha_zero_lift_deg,
      linear_range_deg: f.linear_range_deg,
    };
  });

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
  if (overflowed.length > 0) warnings.push(`${run}, ${label(main)}: ${overflowed.join(', ')} could not be computed (the values overflow); not given`);
  for (const b of fitBranches) {
    for (const k of Object.keys(b) as (keyof FitBranch)[]) {
      const v = b[k];
      if ((typeof v === 'number' && !Number.isFinite(v)) || (Array.isArray(v) && !v.every(Number.isFinite))) (b as unknown as Record<string, unknown>)[k] = null;
    }
  }
  const pointBranch = new Array<number>(n).fill(0);
  for (const b of branches) for (const i of b.points) pointBranch[i] = b.index;
  return { fit, fit_branches: fitBranches, fit_systematic: fitSystematic, warnings, pointBranch };
}

/** Stated uncertainties usable as weights: every one positive and finite; else undefined (unweighted fit). */
function statedOrUndefined(u: number[] | undefined): number[] | undefined {
  return u && u.length > 0 && u.every((x) => Number.isFinite(x) && x > 0) ? u : undefined;
}

function finiteOrNull(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

export interface FitDifference {
  key: string;
  difference: number | null;
  /** Standard uncertainty of the difference. */
  u: number | null;
  /** Systematic inputs shared by the two runs, whose common part cancels in the difference. */
  cancelled: string[];
  /** Systematic inputs that stay (not shared, or present in one run only). */
  kept: string[];
}

/**
 * Difference of one characteristic between a run and its baseline. Random parts add in quadrature; for a
 * systematic input shared by both runs (same instrument, same model; `shared` lists them, default: every
 * input both runs carry) the two shifts are fully correlated, so u² gets (s_run − s_base)² instead of
 * s_run² + s_base² (JCGM 100:2008 §5.2, correlation coefficient 1). The reference area and chord of one
 * model, a q calibration and the incidence zero then cancel to first order.
 */
export function fitDifference(
  key: keyof FitResult,
  run: { fit: FitResult; fit_systematic?: FitSystematic },
  base: { fit: FitResult; fit_systematic?: FitSystematic },
  shared?: readonly string[],
): FitDifference {
  const a = run.fit[key];
  const b = base.fit[key];
  const spec = PROPAGATED.find((p) => p.key === key);
  const difference = typeof a === 'number' && typeof b === 'number' ? a - b : null;
  const sa = run.fit_systematic?.[key] ?? {};
  const sb = base.fit_systematic?.[key] ?? {};
  const inputs = [...new Set([...Object.keys(sa), ...Object.keys(sb)])];
  const isShared = (i: string) => (shared ? shared.includes(i) : i in sa && i in sb);
  const cancelled = inputs.filter(isShared);
  const kept = inputs.filter((i) => !isShared(i));
  let u: number | null = null;
  // where one field holds the combined u (cl_max_u, ld_max_u), its random part is what remains after
  // taking out the run's own systematic shifts
  const randomPart = (r: { fit: FitResult }, sys: Record<string, number>): number | null => {
    const v = spec?.random ? r.fit[spec.random] : null;
    if (typeof v !== 'number') return null;
    if (spec!.random !== spec!.combined) return v;
    return Math.sqrt(Math.max(0, v * v - Object.values(sys).reduce((acc, x) => acc + x * x, 0)));
  };
  const ra = randomPart(run, sa);
  const rb = randomPart(base, sb);
  if (difference !== null && ra !== null && rb !== null) {
    let v = ra * ra + rb * rb;
    for (const i of cancelled) v += ((sa[i] ?? 0) - (sb[i] ?? 0)) ** 2;
    for (const i of kept) v += (sa[i] ?? 0) ** 2 + (sb[i] ?? 0) ** 2;
    u = Math.sqrt(v);
  }
  return { key, difference, u, cancelled, kept };
}
