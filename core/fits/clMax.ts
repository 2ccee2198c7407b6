/**
 * Maximum lift of one branch (points ordered by rising α): the first local maximum of CL that is followed
 * by a drop, the stall. Refined by the parabola through the peak and its two neighbours only when the
 * parabola's vertex lies between those neighbours and at most 1 % above the measured peak; otherwise the
 * measured peak stands. A later maximum (post-stall recovery) never replaces it. Common practice; the
 * 1 % bound keeps a sharp stall (0.97, 0.98, then 0.60) from producing a vertex far above every point.
 */
import { parabolaVertex } from './leastSquares.ts';

/** How far above the measured peak a parabola's vertex may lie, as a fraction of the peak. */
export const VERTEX_ABOVE_PEAK_MAX = 0.01;
/** Smallest drop after the peak that counts as stall, in CL (common practice, above balance repeatability). */
export const MIN_STALL_DROP_CL = 0.02;
/** The drop must also exceed this many noise standard deviations. */
export const STALL_DROP_SIGMAS = 4;

/** Above this many points a branch is a fine or continuous sweep, whose CL is smoothed before the peak is sought. */
export const DENSE_POINTS = 60;

export interface ClMax {
  /** Index of the measured peak in the ordered arrays. */
  peak: number;
  /** Index of the first point below the peak by more than the drop (the stall angle). */
  stall: number;
  cl_max: number;
  alpha_cl_max_deg: number;
  method: 'parabola' | 'measured peak' | 'smoothed peak';
  /** Standard uncertainty from the points' random uncertainties, when given. */
  u: number | null;
  alpha_u: number | null;
}

export type ClMaxResult = ClMax | { reason: string };

/** The drop in CL that marks stall for a branch with noise level σ. */
export function stallDrop(sigma: number): number {
  return Math.max(MIN_STALL_DROP_CL, STALL_DROP_SIGMAS * sigma);
}

/**
 * CLmax of one branch. `uCl` / `uAlpha` are the points' random standard uncertainties (deg for α);
 * the uncertainty of a parabola vertex comes from first-order propagation through the vertex formula
 * (JCGM 100:2008 eq. 10, sensitivities by central differences).
 */
export function findClMax(alphaDeg: readonly number[], cl: readonly number[], drop: number, uCl?: readonly number[], uAlpha?: readonly number[], fixedMethod?: ClMax['method']): ClMaxResult {
  const n = alphaDeg.length;
  if (n < 3) return { reason: `only ${n} points` };
  if (n > DENSE_POINTS) return denseClMax(alphaDeg, cl, drop, uCl);
  let m = 0;
  let stall = -1;
  for (let i = 1; i < n; i++) {
    if (cl[i]! > cl[m]!) m = i;
    else if (cl[i]! < cl[m]! - drop) {
      stall = i;
      break;
    }
  }
  if (stall < 0) {
    return m === n - 1
      ? { reason: `no peak was reached: the highest CL is at the highest angle of the sweep (α = ${alphaDeg[m]!.toFixed(2)}°), so the sweep does not reach stall` }
      : { reason: `CL does not drop by more than ${drop.toFixed(3)} after its highest value (α = ${alphaDeg[m]!.toFixed(2)}°): no stall is seen` };
  }
  const peak = { peak: m, stall, cl_max: cl[m]!, alpha_cl_max_deg: alphaDeg[m]!, method: 'measured peak' as ClMax['method'] };
  const vertexOf = (a: readonly number[], c: readonly number[]) =>
    m > 0 && m < n - 1 ? parabolaVertex([a[m - 1]!, a[m]!, a[m + 1]!], [c[m - 1]!, c[m]!, c[m + 1]!]) : undefined;
  const v = vertexOf(alphaDeg, cl);
  const accept =
    fixedMethod !== undefined
      ? fixedMethod === 'parabola' && v !== undefined
      : v !== undefined && v.x >= alphaDeg[m - 1]! && v.x <= alphaDeg[m + 1]! && v.y >= cl[m]! && v.y - cl[m]! <= VERTEX_ABOVE_PEAK_MAX * Math.abs(cl[m]!);
  if (!accept) {
    return { ...peak, u: uCl ? uCl[m]! : null, alpha_u: uAlpha ? uAlpha[m]! : null };
  }
  let u: number | null = null;
  let alphaU: number | null = null;
  if (uCl) {
    let vy = 0;
    let vx = 0;
    for (const k of [m - 1, m, m + 1]) {
      for (const [arr, uu] of [
        ['cl', uCl[k]!],
        ['alpha', uAlpha ? uAlpha[k]! : 0],
      ] as const) {
        if (!(uu > 0)) continue;
        const h = arr === 'cl' ? 1e-6 : 1e-5;
        const shifted = (s: number) => {
          const a = [...alphaDeg];
          const c = [...cl];
          if (arr === 'cl') c[k] = c[k]! + s;
          else a[k] = a[k]! + s;
          return vertexOf(a, c)!;
        };
        const up = shifted(h);
        const dn = shifted(-h);
        vy += (((up.y - dn.y) / (2 * h)) * uu) ** 2;
        vx += (((up.x - dn.x) / (2 * h)) * uu) ** 2;
      }
    }
    u = Math.sqrt(vy);
    alphaU = Math.sqrt(vx);
  }
  return { ...peak, cl_max: v!.y, alpha_cl_max_deg: v!.x, method: 'parabola', u, alpha_u: alphaU };
}

/**
 * CLmax of a fine or continuous sweep (more than DENSE_POINTS points): the running maximum of single noisy
 * samples creeps up with their number and would both overstate CLmax and mistake a noise dip for stall,
 * so CL is first averaged over a centred window of k = ⌈n/DENSE_POINTS⌉ points (a moving average; its
 * noise is σ/√k) and the first-stall rule is applied to the averages; CLmax is the average at the peak
 * (method "smoothed peak"), its uncertainty the points' mean u over √k.
 */
function denseClMax(alphaDeg: readonly number[], cl: readonly number[], drop: number, uCl?: readonly number[]): ClMaxResult {
  const n = alphaDeg.length;
  const k = Math.ceil(n / DENSE_POINTS);
  const half = Math.floor(k / 2);
  const sm: number[] = [];
  const sa: number[] = [];
  let sum = 0;
  let suma = 0;
  // prefix sums for the centred moving average
  const pc = [0];
  const pa = [0];
  for (let i = 0; i < n; i++) {
    sum += cl[i]!;
    suma += alphaDeg[i]!;
    pc.push(sum);
    pa.push(suma);
  }
  for (let i = 0; i < n; i++) {
    const lo = Math.max(0, i - half);
    const hi = Math.min(n, lo + k);
    sm.push((pc[hi]! - pc[lo]!) / (hi - lo));
    sa.push((pa[hi]! - pa[lo]!) / (hi - lo));
  }
  let m = 0;
  let stall = -1;
  for (let i = 1; i < n; i++) {
    if (sm[i]! > sm[m]!) m = i;
    else if (sm[i]! < sm[m]! - drop) {
      stall = i;
      break;
    }
  }
  if (stall < 0) {
    return m >= n - 1 - half
      ? { reason: `no peak was reached: the highest CL is at the highest angles of the sweep (α = ${alphaDeg[n - 1]!.toFixed(2)}°), so the sweep does not reach stall` }
      : { reason: `CL does not drop by more than ${drop.toFixed(3)} after its highest value (α = ${sa[m]!.toFixed(2)}°): no stall is seen` };
  }
  let u: number | null = null;
  if (uCl) {
    const lo = Math.max(0, m - half);
    const hi = Math.min(n, lo + k);
    let s2 = 0;
    for (let i = lo; i < hi; i++) s2 += uCl[i]! ** 2;
    u = Math.sqrt(s2) / (hi - lo);
  }
  return { peak: m, stall, cl_max: sm[m]!, alpha_cl_max_deg: sa[m]!, method: 'smoothed peak', u, alpha_u: null };
}
