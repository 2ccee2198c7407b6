/**
 * Repeatability from repeat runs: the scatter between runs of one configuration at matched angles of
 * attack, pooled over the angles in the manner of ISO 5725-2:1994 §7.4 (repeatability variance pooled
 * over cells): s_r² = Σ_k (n_k − 1)·s_k² / Σ_k (n_k − 1), where s_k is the sample standard deviation
 * (n_k − 1 in the denominator) of the n_k runs' values at angle k.
 *
 * Matching: the points of all runs are sorted by α and grouped into angles, each group spanning at
 * most `alphaTolDeg` from its first point. Each run contributes its value interpolated linearly in α
 * to the group's mean α (between its own two nearest points), so small differences of the set angle
 * between runs are not counted as scatter (common practice, no published source). A run with no point in a group is left out
 * of it; groups with fewer than two runs add nothing to the pooled value.
 */

export interface RepeatPoint {
  alpha_deg: number;
  n_runs: number;
  sd_cl: number | null;
  sd_cd: number | null;
  sd_cm: number | null;
}

export interface RepeatResult {
  pooled_sd_cl: number | null;
  pooled_sd_cd: number | null;
  pooled_sd_cm: number | null;
  /** Degrees of freedom of the pooled values, Σ(n_k − 1) (for CL and CD; Cm may have fewer). */
  degrees_of_freedom: number;
  alpha_tol_deg: number;
  points: RepeatPoint[];
  warnings: string[];
}

/** One run's points: α (degrees) and the coefficients (Cm NaN or null when not measured). */
export interface RepeatRun {
  name: string;
  alphaDeg: readonly number[];
  cl: readonly number[];
  cd: readonly number[];
  cm: readonly (number | null)[];
}

export const DEFAULT_REPEAT_ALPHA_TOL_DEG = 0.2;

export function repeatability(runs: readonly RepeatRun[], alphaTolDeg = DEFAULT_REPEAT_ALPHA_TOL_DEG): RepeatResult {
  const warnings: string[] = [];
  const all = runs.flatMap((r, ri) => r.alphaDeg.map((a) => ({ a, ri })));
  all.sort((x, y) => x.a - y.a);
  const groups: { a: number; ri: number }[][] = [];
  for (const p of all) {
    const g = groups[groups.length - 1];
    if (g && p.a - g[0]!.a <= alphaTolDeg) g.push(p);
    else groups.push([p]);
  }
  const sorted = runs.map(sortedRun);
  const acc = { cl: { ss: 0, dof: 0 }, cd: { ss: 0, dof: 0 }, cm: { ss: 0, dof: 0 } };
  let dof = 0;
  const points: RepeatPoint[] = [];
  let doubled = 0;
  for (const g of groups) {
    const alpha = g.reduce((s, p) => s + p.a, 0) / g.length;
    const members = [...new Set(g.map((p) => p.ri))];
    if (members.length < g.length) doubled++;
    const values = (key: 'cl' | 'cd' | 'cm') => members.map((ri) => interpolate(sorted[ri]!, key, alpha)).filter((v) => Number.isFinite(v));
    const sd = (key: 'cl' | 'cd' | 'cm') => {
      const v = values(key);
      if (v.length < 2) return null;
      const m = v.reduce((s, x) => s + x, 0) / v.length;
      const ss = v.reduce((s, x) => s + (x - m) ** 2, 0);
      acc[key].ss += ss;
      acc[key].dof += v.length - 1;
      return Math.sqrt(ss / (v.length - 1));
    };
    const point: RepeatPoint = { alpha_deg: alpha, n_runs: members.length, sd_cl: sd('cl'), sd_cd: sd('cd'), sd_cm: sd('cm') };
    if (members.length >= 2) dof += members.length - 1;
    points.push(point);
  }
  if (doubled > 0)
    warnings.push(
      `${doubled} angle(s) hold more than one point of the same run (a return sweep, or points closer than ${alphaTolDeg}°): each run counts once there, at its interpolated value`,
    );
  const lone = points.filter((p) => p.n_runs < 2).length;
  if (lone > 0) warnings.push(`${lone} angle(s) were reached by one run only and add nothing to the pooled scatter`);
  const pooled = (key: 'cl' | 'cd' | 'cm') => (acc[key].dof > 0 ? Math.sqrt(acc[key].ss / acc[key].dof) : null);
  if (runs.length < 2) warnings.push('repeatability needs at least two runs');
  return {
    pooled_sd_cl: pooled('cl'),
    pooled_sd_cd: pooled('cd'),
    pooled_sd_cm: pooled('cm'),
    degrees_of_freedom: dof,
    alpha_tol_deg: alphaTolDeg,
    points,
    warnings,
  };
}

interface SortedRun {
  a: number[];
  cl: number[];
  cd: number[];
  cm: number[];
}

/** A run's points sorted by α, points at the same α averaged. */
function sortedRun(r: RepeatRun): SortedRun {
  const idx = r.alphaDeg.map((_, i) => i).sort((i, j) => r.alphaDeg[i]! - r.alphaDeg[j]!);
  const out: SortedRun = { a: [], cl: [], cd: [], cm: [] };
  let count = 0;
  for (const i of idx) {
    const a = r.alphaDeg[i]!;
    const cm = r.cm[i] ?? Number.NaN;
    const last = out.a.length - 1;
    if (last >= 0 && a === out.a[last]) {
      count++;
      out.cl[last] = out.cl[last]! + (r.cl[i]! - out.cl[last]!) / count;
      out.cd[last] = out.cd[last]! + (r.cd[i]! - out.cd[last]!) / count;
      out.cm[last] = out.cm[last]! + (cm - out.cm[last]!) / count;
    } else {
      count = 1;
      out.a.push(a);
      out.cl.push(r.cl[i]!);
      out.cd.push(r.cd[i]!);
      out.cm.push(cm);
    }
  }
  return out;
}

/**
 * A run's coefficient at α, linear between its two nearest points; just beyond its first or last point
 * (never farther than the matching tolerance) the end segment is extended. A single point is its own value.
 */
function interpolate(r: SortedRun, key: 'cl' | 'cd' | 'cm', alpha: number): number {
  const a = r.a;
  const y = r[key];
  if (a.length === 1) return y[0]!;
  let hi = 1;
  while (hi < a.length - 1 && a[hi]! < alpha) hi++;
  const lo = hi - 1;
  const t = (alpha - a[lo]!) / (a[hi]! - a[lo]!);
  return y[lo]! + t * (y[hi]! - y[lo]!);
}
