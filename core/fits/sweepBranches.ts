/**
 * Sweep branches: a run whose angle of attack reverses (up through stall and back down, or a repeat
 * sweep) is split into the stretches of the file in which α moves one way. Fits are made per branch
 * and never mix points of two branches, because the lift near and past stall depends on the
 * direction of the sweep (hysteresis). Common practice in low-speed testing (e.g. Barlow, Rae & Pope,
 * 3rd ed., §§ on stall hysteresis and repeat runs); the rules below are this project's.
 */

export interface Branch {
  /** 0-based branch number in file order. */
  index: number;
  direction: 'up' | 'down';
  /** Indices into the file-order point list, in file order. */
  points: number[];
}

/** Fewest points of a branch; shorter stretches (a repeat point, a back-step) join their neighbour. */
export const MIN_BRANCH_POINTS = 3;

/**
 * Split points given in file order into branches.
 * A step between consecutive points smaller than the jitter tolerance (the largest of 0.02°, a fifth of
 * the median step and four times the robust jitter of α itself) has no direction and continues the
 * current stretch (repeat points, encoder jitter).
 * The point where α turns ends the stretch it arrives in; the next stretch starts after it. A
 * stretch of fewer than MIN_BRANCH_POINTS points, or whose α travels no more than three tolerances,
 * joins the branch before it (the first one, the branch after it), and neighbours with the same
 * direction then merge.
 */
export function splitBranches(alphaDeg: readonly number[]): Branch[] {
  const n = alphaDeg.length;
  if (n === 0) return [];
  const steps: number[] = [];
  for (let i = 1; i < n; i++) steps.push(Math.abs(alphaDeg[i]! - alphaDeg[i - 1]!));
  // jitter of the angle itself (robust, from second differences in file order: var = 6σ² on a straight
  // sweep), so that a finely stepped or continuous sweep with encoder noise is not cut into many branches
  const d2: number[] = [];
  for (let i = 1; i + 1 < n; i++) d2.push(Math.abs(alphaDeg[i + 1]! - 2 * alphaDeg[i]! + alphaDeg[i - 1]!));
  const jitter = d2.length > 0 ? (1.4826 * medianOf(d2)) / Math.sqrt(6) : 0;
  const tol = Math.max(0.02, 0.2 * medianOf(steps.filter((s) => s > 0)), 4 * jitter);
  interface Stretch { dir: number; points: number[] }
  const stretches: Stretch[] = [];
  let cur: Stretch = { dir: 0, points: [0] };
  for (let i = 1; i < n; i++) {
    const d = alphaDeg[i]! - alphaDeg[i - 1]!;
    const s = Math.abs(d) <= tol ? 0 : Math.sign(d);
    if (s === 0 || cur.dir === 0 || s === cur.dir) {
      if (cur.dir === 0) cur.dir = s;
      cur.points.push(i);
    } else {
      stretches.push(cur);
      cur = { dir: s, points: [i] };
    }
  }
  stretches.push(cur);
  // one pass (linear in the number of points): a stretch with too few points, or too little travel in its
  // own direction to be a sweep of its own (noise on a fine sweep), joins the branch before it (the first
  // such, the one after it); a stretch with the direction of the branch before it continues that branch
  const travel = (st: Stretch) => (st.dir || 1) * (alphaDeg[st.points[st.points.length - 1]!]! - alphaDeg[st.points[0]!]!);
  const kept: Stretch[] = [];
  let pending: number[] = [];
  const append = (into: number[], from: readonly number[]) => {
    for (const i of from) into.push(i);
  };
  for (const st of stretches) {
    const last = kept[kept.length - 1];
    const short = st.points.length < MIN_BRANCH_POINTS || travel(st) <= 3 * tol;
    if (short && stretches.length > 1) {
      if (last) append(last.points, st.points);
      else append(pending, st.points);
    } else if (last && (last.dir === st.dir || st.dir === 0)) {
      append(last.points, st.points);
    } else {
      const points = pending;
      append(points, st.points);
      pending = [];
      kept.push({ dir: st.dir, points });
    }
  }
  if (kept.length === 0) kept.push({ dir: stretches[0]!.dir, points: pending });
  else if (pending.length > 0) kept[0]!.points = [...pending, ...kept[0]!.points];
  const out = kept;
  return out.map((s, index) => ({ index, direction: s.dir < 0 ? 'down' : 'up', points: s.points }));
}

/** The indices of a branch ordered by rising α (stable for equal angles). */
export function byRisingAlpha(alphaDeg: readonly number[], points: readonly number[]): number[] {
  return [...points].sort((i, j) => alphaDeg[i]! - alphaDeg[j]! || i - j);
}

export interface Hysteresis {
  up_branch: number;
  down_branch: number;
  /** α span over which the two branches' CL differ by more than the tolerance. */
  alpha_range_deg: [number, number];
  max_delta_cl: number;
  alpha_at_max_delta_deg: number;
  tolerance_cl: number;
}

/**
 * The hysteresis loop between a rising and a following falling branch: at each α of the falling
 * branch inside the common α span, ΔCL = CL_up(α) − CL_down(α) with CL_up interpolated linearly;
 * the loop is the α span where |ΔCL| exceeds `tol`. Undefined when the branches never differ by that.
 */
export function hysteresisLoop(
  alphaDeg: readonly number[],
  cl: readonly number[],
  up: Branch,
  down: Branch,
  tol: number,
): Hysteresis | undefined {
  const u = byRisingAlpha(alphaDeg, up.points);
  const [dLo, dHi] = extent(down.points.map((i) => alphaDeg[i]!));
  const lo = Math.max(alphaDeg[u[0]!]!, dLo);
  const hi = Math.min(alphaDeg[u[u.length - 1]!]!, dHi);
  let from = Infinity;
  let to = -Infinity;
  let max = 0;
  let at = Number.NaN;
  for (const i of down.points) {
    const a = alphaDeg[i]!;
    if (a < lo || a > hi) continue;
    const d = interpolate(alphaDeg, cl, u, a) - cl[i]!;
    if (Math.abs(d) > tol) {
      from = Math.min(from, a);
      to = Math.max(to, a);
      if (Math.abs(d) > Math.abs(max)) {
        max = d;
        at = a;
      }
    }
  }
  if (!(to >= from)) return undefined;
  return { up_branch: up.index, down_branch: down.index, alpha_range_deg: [from, to], max_delta_cl: max, alpha_at_max_delta_deg: at, tolerance_cl: tol };
}

function interpolate(x: readonly number[], y: readonly number[], order: number[], at: number): number {
  for (let k = 1; k < order.length; k++) {
    const a = order[k - 1]!;
    const b = order[k]!;
    if (at <= x[b]!) {
      const span = x[b]! - x[a]!;
      return span > 0 ? y[a]! + ((y[b]! - y[a]!) * (at - x[a]!)) / span : y[b]!;
    }
  }
  return y[order[order.length - 1]!]!;
}

/** Above this many values the median is taken of an evenly strided subset of about this size (the noise estimates need no more, and sorting a million values per estimate is slow). */
export const MEDIAN_SAMPLE = 20001;

export function medianOf(values: readonly number[]): number {
  const stride = Math.ceil(values.length / MEDIAN_SAMPLE);
  const picked = stride > 1 ? values.filter((_, i) => i % stride === 0) : values;
  const v = Float64Array.from(picked.filter(Number.isFinite)).sort();
  if (v.length === 0) return 0;
  const mid = v.length >> 1;
  return v.length % 2 === 1 ? v[mid]! : (v[mid - 1]! + v[mid]!) / 2;
}

/** [min, max] of the values, by a loop (a spread of a million arguments overflows the call stack). */
export function extent(values: readonly number[]): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}
