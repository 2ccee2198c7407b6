/**
 * Differences against a baseline run. The baseline curve is interpolated linearly in α at each angle of
 * the compared run that lies inside the baseline's α range; angles outside it get no difference (no
 * extrapolation). Points of the baseline at equal α are averaged first so the interpolation is defined.
 */
import type { PointResult } from '../../../core/reduce.ts';

export interface Curve {
  alpha: number[];
  value: number[];
}

/** A coefficient against α, sorted by α, equal angles merged by their mean; nulls dropped. */
export function curveOf(points: readonly PointResult[], pick: (p: PointResult) => number | null): Curve {
  const pairs = points
    .map((p) => [p.alpha_deg, pick(p)] as const)
    .filter((xy): xy is readonly [number, number] => xy[0] !== null && xy[1] !== null && Number.isFinite(xy[0]) && Number.isFinite(xy[1]))
    .sort((a, b) => a[0] - b[0]);
  const alpha: number[] = [];
  const value: number[] = [];
  let i = 0;
  while (i < pairs.length) {
    let j = i;
    let sum = 0;
    while (j < pairs.length && pairs[j]![0] === pairs[i]![0]) sum += pairs[j++]![1];
    alpha.push(pairs[i]![0]);
    value.push(sum / (j - i));
    i = j;
  }
  return { alpha, value };
}

/** Linear interpolation y(x) on a curve sorted by α; null outside its range. */
export function interpolate(curve: Curve, x: number): number | null {
  const a = curve.alpha;
  const n = a.length;
  if (n === 0 || x < a[0]! || x > a[n - 1]!) return null;
  if (n === 1) return curve.value[0]!;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (a[mid]! <= x) lo = mid;
    else hi = mid;
  }
  const t = (x - a[lo]!) / (a[hi]! - a[lo]!);
  return curve.value[lo]! + t * (curve.value[hi]! - curve.value[lo]!);
}

export type DeltaKey = 'cl' | 'cd' | 'cm';

export interface DeltaRow {
  alpha: number;
  value: number;
  baseline: number;
  delta: number;
}

/** Δ = run − baseline(α) at each of the run's angles inside the baseline's α range. */
export function deltas(run: readonly PointResult[], baseline: readonly PointResult[], key: DeltaKey): DeltaRow[] {
  const base = curveOf(baseline, (p) => p[key]);
  const own = curveOf(run, (p) => p[key]);
  const rows: DeltaRow[] = [];
  own.alpha.forEach((alpha, i) => {
    const b = interpolate(base, alpha);
    if (b === null) return;
    const value = own.value[i]!;
    rows.push({ alpha, value, baseline: b, delta: value - b });
  });
  return rows;
}
