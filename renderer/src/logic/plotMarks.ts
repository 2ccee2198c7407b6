/**
 * What the plots draw beyond the points, worked out from a run's result without drawing anything:
 * - the sweep branch of each point (α rising, or falling on a return sweep), so the falling stretches
 *   can be drawn as thin lines with arrowheads along them;
 * - on request, the fitted CLmax (with its standard uncertainty where the fit gives one), the fitted
 *   lift line over its linear range and the fitted drag polar over the range it was fitted to.
 * Nothing here invents a value: where the fit gives none, the mark is left out and a note says why.
 */
import type { FitResult, PointResult, ReductionResult } from '../../../core/index.ts';
import type { PlotPoint } from './errorBars.ts';

export type Direction = 'up' | 'down';

/** The sweep branches of a run's points, for a run that is not one plain rising sweep. */
export interface SweepInfo {
  /** Branch of each plotted point (parallel to the series' points). */
  branchOf: number[];
  /** Direction of each branch (file order). */
  directions: Direction[];
}

/**
 * Branch of each result point (file order), from the result's `fit_branches`: the reduction splits a
 * run into stretches of the file in which α moves one way and lists them in file order with their point
 * counts (docs/data-format.md, fits), so the first `points` points belong to the first branch, and so on.
 * Null when the run is a single rising sweep (nothing to show), and when the counts do not add up to the
 * points (then the branches are not drawn at all rather than drawn wrongly).
 */
export function pointBranches(result: Pick<ReductionResult, 'points' | 'fit_branches'>): { branchOf: number[]; directions: Direction[] } | null {
  const branches = result.fit_branches ?? [];
  if (branches.length === 0 || (branches.length === 1 && branches[0]!.direction === 'up')) return null;
  const total = branches.reduce((n, b) => n + b.points, 0);
  if (total !== result.points.length) return null;
  const branchOf: number[] = [];
  branches.forEach((b, k) => {
    for (let i = 0; i < b.points; i++) branchOf.push(k);
  });
  return { branchOf, directions: branches.map((b) => b.direction) };
}

/** How a branch is named in read-outs: "rising sweep", "return sweep" (falling after another branch) or "falling sweep". */
export function branchName(directions: readonly Direction[], branch: number): string {
  const d = directions[branch];
  const name = d === 'up' ? 'rising sweep' : branch > 0 ? 'return sweep' : 'falling sweep';
  return directions.length > 1 ? `${name} (branch ${branch + 1} of ${directions.length})` : name;
}

/**
 * Whether the segment from plotted point i − 1 to point i is drawn as part of a falling branch. A
 * segment belongs to the branch of its end point: the segment from the highest angle to the first
 * point of the return sweep is already travelled downwards.
 */
export function segmentFalls(sweep: SweepInfo, i: number): boolean {
  const b = sweep.branchOf[i];
  return b !== undefined && sweep.directions[b] === 'down';
}

/**
 * Where the arrowheads go: one per branch (given as the index i of the segment i − 1 → i). On a run that
 * turns, the arrows sit where the branches part, near the turn: three quarters of the way along the
 * first branch, a quarter of the way along the last, halfway along any between; a single branch gets
 * its arrow halfway. A branch of a single plotted point gets the segment that reaches it.
 */
export function arrowSegments(branchOf: readonly number[]): number[] {
  const out: number[] = [];
  const count = new Set(branchOf).size;
  let start = 0;
  let k = 0;
  for (let i = 1; i <= branchOf.length; i++) {
    if (i < branchOf.length && branchOf[i] === branchOf[start]) continue;
    // points start … i − 1 form one branch; its own segments end at start + 1 … i − 1
    const segments = i - 1 - start;
    const f = count === 1 ? 0.5 : k === 0 ? 0.75 : k === count - 1 ? 0.25 : 0.5;
    const seg = segments > 0 ? start + Math.min(segments, Math.max(1, Math.round(f * segments))) : start;
    if (seg >= 1) out.push(seg);
    start = i;
    k++;
  }
  return out;
}

/** The fitted CLmax of a run: α and CL with their standard uncertainties where the fit gives them. */
export interface ClMaxMark {
  x: number;
  y: number;
  xu: number | null;
  yu: number | null;
  /** Read-out: "CLmax 1.234 ± 0.012 at α 13.10 ± 0.20 deg (parabola, rising sweep)". */
  text: string;
}

/** A fitted curve over the range that was fitted. */
export interface FitLine {
  points: PlotPoint[];
  /** The equation and range, for read-outs and notes. */
  text: string;
}

export interface SeriesMarks {
  clMax?: ClMaxMark;
  fitLine?: FitLine;
  /** Why a mark that was asked for is not drawn for this run (from the fit, never guessed). */
  notes: string[];
}

const fin = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);
const pm = (v: number, u: number | null, d: number) => (u !== null ? `${v.toFixed(d)} ± ${u.toFixed(d)}` : v.toFixed(d));

/** The fit's CLmax, or why there is none (the fit's own reason). */
export function clMaxMark(fit: FitResult): ClMaxMark | { reason: string } {
  if (!fin(fit.cl_max) || !fin(fit.alpha_cl_max_deg)) return { reason: fit.cl_max_reason ?? 'the fit gives no CLmax' };
  const xu = fin(fit.alpha_cl_max_u_deg) ? fit.alpha_cl_max_u_deg : null;
  const yu = fin(fit.cl_max_u) ? fit.cl_max_u : null;
  const how = [fit.cl_max_method, fit.branch_direction === 'down' ? 'falling sweep' : fit.branch_direction === 'up' ? 'rising sweep' : null]
    .filter(Boolean)
    .join(', ');
  return {
    x: fit.alpha_cl_max_deg,
    y: fit.cl_max,
    xu,
    yu,
    text: `CLmax ${pm(fit.cl_max, yu, 4)} at α ${pm(fit.alpha_cl_max_deg, xu, 2)} deg${how ? ` (${how})` : ''}`,
  };
}

/**
 * The fitted lift line CL = a·(α − α0) over the fit's linear range: its two ends, at the first and last
 * angle of the range. Null when the fit has no slope, zero-lift angle or range.
 */
export function liftLine(fit: FitResult): FitLine | null {
  const a = fit.cl_alpha_per_deg;
  const a0 = fit.alpha_zero_lift_deg;
  const r = fit.linear_range_deg;
  if (!fin(a) || !fin(a0) || !r || !fin(r[0]) || !fin(r[1])) return null;
  const at = (alpha: number): PlotPoint => ({ x: alpha, y: a * (alpha - a0) });
  const sign = a0 < 0 ? '+' : '−';
  return {
    points: [at(r[0]), at(r[1])],
    text: `fitted lift line CL = ${a.toFixed(4)}/deg · (α ${sign} ${Math.abs(a0).toFixed(2)}°), α ${r[0].toFixed(1)}° to ${r[1].toFixed(1)}°`,
  };
}

/** Points along a fitted polar curve. */
export const POLAR_STEPS = 24;

/**
 * The fitted drag polar over the CL span of the points it was fitted to (the fit's branch, α within
 * `polar_range_deg`): the cambered polar CD = CDmin + k′·(CL − CL_mindrag)² where the fit reports it,
 * except for a 3D run whose Oswald factor came from the polar through CL = 0 (CL_mindrag not told apart
 * from zero), which gets CD = CD0 + k·CL², the polar the fit used. Null when the fit has no polar.
 */
export function polarCurve(fit: FitResult, points: readonly PointResult[], branchOf: readonly number[] | null): FitLine | null {
  const range = fit.polar_range_deg;
  if (!range) return null;
  const cambered = fin(fit.cd_min) && fin(fit.cl_min_drag) && fin(fit.k_induced_cambered) && fit.oswald_e_source !== 'polar through CL = 0';
  const plain = fin(fit.cd0) && fin(fit.k_induced);
  if (!cambered && !plain) return null;
  const [lo, hi] = [Math.min(range[0], range[1]), Math.max(range[0], range[1])];
  let clLo = Infinity;
  let clHi = -Infinity;
  points.forEach((p, i) => {
    if (branchOf && fit.branch !== null && branchOf[i] !== fit.branch) return;
    if (!fin(p.alpha_deg) || !fin(p.cl) || p.alpha_deg < lo || p.alpha_deg > hi) return;
    clLo = Math.min(clLo, p.cl);
    clHi = Math.max(clHi, p.cl);
  });
  if (!(clHi > clLo)) return null;
  const cd = cambered
    ? (cl: number) => fit.cd_min! + fit.k_induced_cambered! * (cl - fit.cl_min_drag!) ** 2
    : (cl: number) => fit.cd0! + fit.k_induced! * cl * cl;
  const out: PlotPoint[] = [];
  for (let s = 0; s <= POLAR_STEPS; s++) {
    const cl = s === POLAR_STEPS ? clHi : clLo + ((clHi - clLo) * s) / POLAR_STEPS;
    out.push({ x: cd(cl), y: cl });
  }
  const eq = cambered
    ? `CD = ${fit.cd_min!.toFixed(5)} + ${fit.k_induced_cambered!.toFixed(4)}·(CL ${fit.cl_min_drag! < 0 ? '+' : '−'} ${Math.abs(fit.cl_min_drag!).toFixed(3)})²`
    : `CD = ${fit.cd0!.toFixed(5)} + ${fit.k_induced!.toFixed(4)}·CL²`;
  return { points: out, text: `fitted drag polar ${eq}, CL ${clLo.toFixed(2)} to ${clHi.toFixed(2)}` };
}

/** What the user asked to be marked. */
export interface MarkChoice {
  clMax: boolean;
  fitLines: boolean;
}

/**
 * The marks of one run on one plot: CLmax and the lift line on the lift curve, the polar on the drag
 * polar; nothing on the other plots. `notes` say what was asked for and cannot be drawn.
 */
export function marksFor(
  plot: string,
  result: Pick<ReductionResult, 'fit' | 'points'>,
  choice: MarkChoice,
  branchOf: readonly number[] | null,
): SeriesMarks | undefined {
  const marks: SeriesMarks = { notes: [] };
  if (plot === 'cl-alpha' && choice.clMax) {
    const m = clMaxMark(result.fit);
    if ('reason' in m) marks.notes.push(`no CLmax: ${m.reason}`);
    else marks.clMax = m;
  }
  if (plot === 'cl-alpha' && choice.fitLines) {
    const line = liftLine(result.fit);
    if (line) marks.fitLine = line;
    else marks.notes.push("no fitted lift line: no linear range was found (see the run's warnings)");
  }
  if (plot === 'cd-cl' && choice.fitLines) {
    const curve = polarCurve(result.fit, result.points, branchOf);
    if (curve) marks.fitLine = curve;
    else marks.notes.push("no fitted drag polar: the fit gives none (see the run's warnings)");
  }
  return marks.clMax || marks.fitLine || marks.notes.length ? marks : undefined;
}

/** One entry of the key that explains the marks (legend on screen, in the PNG and in the SVG). */
export interface KeyEntry {
  kind: 'return' | 'clmax' | 'fit';
  text: string;
}

/** The key entries the shown series need, in a fixed order. */
export function markKey(series: readonly { sweep?: SweepInfo; marks?: SeriesMarks }[], plot: string): KeyEntry[] {
  const out: KeyEntry[] = [];
  if (series.some((s) => s.sweep?.directions.includes('down'))) out.push({ kind: 'return', text: 'return sweep (α falling)' });
  const peaks = series.flatMap((s) => (s.marks?.clMax ? [s.marks.clMax] : []));
  if (peaks.length)
    out.push({ kind: 'clmax', text: peaks.some((m) => m.xu !== null || m.yu !== null) ? 'fitted CLmax, ± one standard uncertainty' : 'fitted CLmax' });
  if (series.some((s) => s.marks?.fitLine)) out.push({ kind: 'fit', text: plot === 'cd-cl' ? 'fitted drag polar' : 'fitted lift line (linear range)' });
  return out;
}

/** Notes for the marks not drawn, one line per run: "201 · section (2D): no CLmax: …". */
export function markNotes(series: readonly { label: string; marks?: SeriesMarks }[]): string[] {
  return series.flatMap((s) => (s.marks?.notes ?? []).map((n) => `${s.label}: ${n}`));
}
