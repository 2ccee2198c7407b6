/**
 * Differences against a baseline run, each with its standard uncertainty. The baseline curve is
 * interpolated linearly in α at each angle of the compared run that lies inside the baseline's α range;
 * angles outside it get no difference (no extrapolation). Points of the baseline at equal α are averaged
 * first so the interpolation is defined.
 */
import type { FitResult } from '../../../core/index.ts';
import type { PointResult, ReductionResult } from '../../../core/index.ts';
import { bracket as bracketIn } from '../../../core/index.ts';
import { uncertainty } from './numberFormat.ts';

export interface Curve {
  alpha: number[];
  value: number[];
  /** Standard uncertainty of each value (k = 1); null where a point carries none. */
  u: (number | null)[];
}

/**
 * A coefficient against α, sorted by α, equal angles merged by their mean; nulls dropped. The merged
 * value's uncertainty is the root-mean-square of the repeats' (not divided by √m: most of a point's
 * uncertainty is the instruments', which repeats share), null if any repeat has none.
 */
export function curveOf(points: readonly PointResult[], pick: (p: PointResult) => number | null, pickU: (p: PointResult) => number | null = () => null): Curve {
  const rows = points
    .map((p) => ({ a: p.alpha_deg, v: pick(p), u: pickU(p) }))
    .filter((r): r is { a: number; v: number; u: number | null } => r.a !== null && r.v !== null && Number.isFinite(r.a) && Number.isFinite(r.v))
    .sort((x, y) => x.a - y.a);
  const alpha: number[] = [];
  const value: number[] = [];
  const u: (number | null)[] = [];
  let i = 0;
  while (i < rows.length) {
    let j = i;
    let sum = 0;
    let sumU2: number | null = 0;
    while (j < rows.length && rows[j]!.a === rows[i]!.a) {
      const r = rows[j++]!;
      sum += r.v;
      sumU2 = sumU2 !== null && r.u !== null && Number.isFinite(r.u) ? sumU2 + r.u * r.u : null;
    }
    alpha.push(rows[i]!.a);
    value.push(sum / (j - i));
    u.push(sumU2 === null ? null : Math.sqrt(sumU2 / (j - i)));
    i = j;
  }
  return { alpha, value, u };
}

/** The neighbours of x on a sorted α list and the fraction of the way between them (core's one interpolation search); null outside. */
function bracket(a: readonly number[], x: number): { lo: number; hi: number; t: number } | null {
  if (a.length === 0) return null;
  const b = bracketIn(a, x);
  return b.outside ? null : b;
}

/** Linear interpolation y(x) on a curve sorted by α; null outside its range. */
export function interpolate(curve: Curve, x: number): number | null {
  const b = bracket(curve.alpha, x);
  if (!b) return null;
  return curve.value[b.lo]! + b.t * (curve.value[b.hi]! - curve.value[b.lo]!);
}

/**
 * The uncertainty of the interpolated value, interpolated linearly like the value:
 * u(x) = (1 − t)·u_lo + t·u_hi. That is the propagation for fully correlated neighbours, never less than
 * the uncorrelated √((1 − t)²u_lo² + t²u_hi²): the conservative choice, since the neighbours share the
 * instruments. Null outside the range or where a neighbour has none.
 */
export function interpolateUncertainty(curve: Curve, x: number): number | null {
  const b = bracket(curve.alpha, x);
  if (!b) return null;
  const lo = curve.u[b.lo] ?? null;
  const hi = curve.u[b.hi] ?? null;
  if (lo === null || hi === null) return null;
  return (1 - b.t) * lo + b.t * hi;
}

/**
 * Standard uncertainty of a difference of two independent quantities, y = a − b: by the GUM law of
 * propagation (JCGM 100:2008 eq. 10) with sensitivities +1 and −1, u(y) = √(u(a)² + u(b)²). Null when
 * either is unknown.
 */
export function differenceUncertainty(ua: number | null, ub: number | null): number | null {
  if (ua === null || ub === null || !Number.isFinite(ua) || !Number.isFinite(ub)) return null;
  return Math.hypot(ua, ub);
}

export type DeltaKey = 'cl' | 'cd' | 'cm';

export interface DeltaRow {
  alpha: number;
  value: number;
  baseline: number;
  delta: number;
  /** u(Δ) = √(u_run² + u_baseline²), k = 1, the runs taken as independent; null without uncertainties. */
  u: number | null;
}

const U_KEY = { cl: 'u_cl', cd: 'u_cd', cm: 'u_cm' } as const;

/** Δ = run − baseline(α) at each of the run's angles inside the baseline's α range, with u(Δ). */
export function deltas(run: readonly PointResult[], baseline: readonly PointResult[], key: DeltaKey): DeltaRow[] {
  const pickU = (p: PointResult) => p[U_KEY[key]] ?? null;
  const base = curveOf(baseline, (p) => p[key], pickU);
  const own = curveOf(run, (p) => p[key], pickU);
  const rows: DeltaRow[] = [];
  own.alpha.forEach((alpha, i) => {
    const b = interpolate(base, alpha);
    if (b === null) return;
    const value = own.value[i]!;
    rows.push({ alpha, value, baseline: b, delta: value - b, u: differenceUncertainty(own.u[i] ?? null, interpolateUncertainty(base, alpha)) });
  });
  return rows;
}

/** A fitted characteristic compared with the baseline's: Δ with u(Δ) from the two fits' standard errors. */
export interface FitDelta {
  key: keyof FitResult;
  label: string;
  unit: string;
  decimals: number;
  run: number | null;
  baseline: number | null;
  delta: number | null;
  /** √(se_run² + se_baseline²), the fits independent; null where a fit gives no standard error. */
  u: number | null;
  /** Why there is no u(Δ), where that needs saying. */
  note: string | null;
}

interface FitDeltaSpec {
  key: keyof FitResult;
  stderr: keyof FitResult | null;
  label: string;
  unit: string;
  decimals: number;
}

export const FIT_DELTAS: readonly FitDeltaSpec[] = [
  { key: 'cl_max', stderr: null, label: 'CLmax', unit: '–', decimals: 4 },
  { key: 'cl_alpha_per_deg', stderr: 'cl_alpha_stderr_per_deg', label: 'Lift-curve slope dCL/dα', unit: '1/deg', decimals: 5 },
  { key: 'alpha_zero_lift_deg', stderr: 'alpha_zero_lift_stderr_deg', label: 'Zero-lift angle α₀', unit: 'deg', decimals: 3 },
  { key: 'cd0', stderr: 'cd0_stderr', label: 'CD0', unit: '–', decimals: 5 },
  { key: 'k_induced', stderr: 'k_induced_stderr', label: 'k in CD = CD0 + k·CL²', unit: '–', decimals: 5 },
];

function numberOrNull(v: unknown): number | null {
  return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

/** u(CL) of the point with the highest CL (shown beside ΔCLmax, which has no standard error of its own). */
export function uClAtPeak(points: readonly PointResult[]): number | null {
  let best: PointResult | undefined;
  for (const p of points) if (p.cl !== null && (best === undefined || p.cl > best.cl!)) best = p;
  return best?.u_cl ?? null;
}

/** The fitted characteristics of a run against the baseline's, with the standard errors the fits give. */
export function fitDeltas(run: ReductionResult, baseline: ReductionResult): FitDelta[] {
  return FIT_DELTAS.map((spec) => {
    const a = numberOrNull(run.fit[spec.key]);
    const b = numberOrNull(baseline.fit[spec.key]);
    const delta = a !== null && b !== null ? a - b : null;
    let u: number | null = null;
    let note: string | null = null;
    if (spec.stderr) {
      u = delta === null ? null : differenceUncertainty(numberOrNull(run.fit[spec.stderr]), numberOrNull(baseline.fit[spec.stderr]));
    } else {
      const ur = uClAtPeak(run.points);
      const ub = uClAtPeak(baseline.points);
      note =
        ur !== null && ub !== null
          ? `no standard error from the fit; u(CL) at the highest points: ${uncertainty(ur)} (run), ${uncertainty(ub)} (baseline)`
          : 'no standard error from the fit';
    }
    return { key: spec.key, label: spec.label, unit: spec.unit, decimals: spec.decimals, run: a, baseline: b, delta, u, note };
  });
}

/**
 * Why a run cannot be compared with the baseline, or null when it can: a 2D section's coefficients are
 * per unit span and corrected as a section, a 3D model's are whole-model; subtracting one from the other
 * means nothing.
 */
export function incomparable(run: ReductionResult, baseline: ReductionResult, runName: string, baselineName: string): string | null {
  const kind = (r: ReductionResult) => (r.corrections.kind === '2d' ? '2D section' : '3D model');
  if (run.corrections.kind === baseline.corrections.kind) return null;
  return `${runName} is a ${kind(run)} and the baseline ${baselineName} a ${kind(baseline)}: their coefficients are not on the same basis, so no difference is formed. Choose a baseline of the same kind.`;
}

/**
 * The attached-flow branch of a run as CD against CL: the points up to the highest CL in α order (past
 * the stall CL is no longer single-valued), sorted by CL, equal CL merged by their mean.
 */
export function dragPolarBranch(points: readonly PointResult[]): Curve {
  const rows = points
    .filter((p) => p.alpha_deg !== null && p.cl !== null && p.cd !== null && Number.isFinite(p.cl) && Number.isFinite(p.cd))
    .sort((a, b) => a.alpha_deg! - b.alpha_deg!);
  let peak = -1;
  rows.forEach((p, i) => {
    if (peak < 0 || p.cl! > rows[peak]!.cl!) peak = i;
  });
  // curveOf sorts and merges by its "alpha" field: here that is CL
  return curveOf(
    rows.slice(0, peak + 1).map((p) => ({ ...p, alpha_deg: p.cl })),
    (p) => p.cd,
    (p) => p.u_cd ?? null,
  );
}

export interface MatchedLiftRow {
  cl: number;
  value: number;
  baseline: number;
  delta: number;
  u: number | null;
}

/**
 * ΔCD at constant lift: at each CL of the run's attached-flow branch that lies inside the baseline's,
 * ΔCD = CD_run(CL) − CD_baseline(CL), the baseline's drag polar interpolated linearly in CL (no
 * extrapolation); u(ΔCD) as for the differences at matched α. The usual way to compare the drag of two
 * configurations (Barlow, Rae & Pope, 3rd ed., §13: increments at constant CL).
 */
export function dragAtMatchedLift(run: readonly PointResult[], baseline: readonly PointResult[]): MatchedLiftRow[] {
  const base = dragPolarBranch(baseline);
  const own = dragPolarBranch(run);
  const rows: MatchedLiftRow[] = [];
  own.alpha.forEach((cl, i) => {
    const b = interpolate(base, cl);
    if (b === null) return;
    const value = own.value[i]!;
    rows.push({ cl, value, baseline: b, delta: value - b, u: differenceUncertainty(own.u[i] ?? null, interpolateUncertainty(base, cl)) });
  });
  return rows;
}
