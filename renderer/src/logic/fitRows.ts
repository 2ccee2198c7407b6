/**
 * The fitted characteristics as rows for display: label, unit, the value with its standard uncertainty
 * ("0.06578 ± 0.00013", GUM §7.2.6 rounding through numberFormat.ts), how it was found (CLmax method,
 * linear-range rule, Oswald source), a breakdown of the uncertainty into its random and systematic parts,
 * and for a value the engine could not determine, the reason in words. Fields shown inside another row
 * (standard errors, methods, reasons) are listed in FOLDED; keys the engine adds later still appear, under
 * their own name, so nothing it computes is hidden. Also the sweep branches of each run.
 */
import type { FitBranch, FitResult, ReductionResult } from '../../../core/index.ts';
import { DASH, fixed, significant, uncertainty, withUncertainty } from './numberFormat.ts';

export type FitGroup = 'lift' | 'maximum' | 'polar' | 'ld' | 'moment' | 'sweep';

export const GROUP_TITLES: Record<FitGroup, string> = {
  lift: 'Lift curve',
  maximum: 'Maximum lift',
  polar: 'Drag polar',
  ld: 'Lift-to-drag ratio',
  moment: 'Pitching moment',
  sweep: 'Sweep branches and fit basis',
};

export interface FitRowSpec {
  key: keyof FitResult;
  label: string;
  unit: string;
  /** Digits after the point without an uncertainty; null: three significant digits. */
  decimals: number | null;
  group?: FitGroup;
  /** A detail of the row above it (shown indented, left out of the printed summary). */
  detail?: boolean;
  /** Fields holding the random standard error and the combined standard uncertainty (random and systematic). */
  random?: keyof FitResult;
  combined?: keyof FitResult;
  /** How the value was found, in a few words shown under it (null when there is nothing to say). */
  note?: (result: ReductionResult) => string | null;
  /** The same at length, for the hover. */
  hint?: (result: ReductionResult) => string | null;
  /** Patterns of engine warnings that explain a null here, and the reason when none is found. */
  explainedBy: RegExp[];
  fallback: (kind: '2d' | '3d', result?: ReductionResult) => string;
  /** The reason in a few words for a narrow cell, when the full one is long (it then goes to the hover). */
  fallbackShort?: (result: ReductionResult) => string | null;
  /** Own text for the value (instead of the number formatting). */
  show?: (result: ReductionResult) => string | null;
}

// both of the engine's reasons for no lift line mention "lift-curve fits" (core/fits/characteristics.ts)
const LIFT_FIT = /lift-curve fits/;
const PITCH = /pitching-moment coefficients are not given|no "pitch" column/;

const CLMAX_METHOD: Record<string, [short: string, long: string]> = {
  parabola: ['parabola through the peak', 'CLmax is the vertex of the parabola through the highest point and its two neighbours'],
  'measured peak': ['highest point', 'CLmax is the highest measured point (a parabola through it would overshoot the points)'],
  'smoothed peak': ['smoothed peak', 'CLmax is the peak of the sweep averaged over a moving window (a fine or continuous sweep)'],
};

/** The method behind a CLmax, in a few words, or at length. */
export function clMaxMethodText(method: string | null, long = false): string | null {
  if (method === null) return null;
  const m = CLMAX_METHOD[method];
  return m ? m[long ? 1 : 0] : method;
}

/**
 * Why a branch has no CLmax, in an engineer's words: the engine's reason (core/fits/clMax.ts) reworded
 * where it is one of the known ones, else as the engine gives it.
 */
export function clMaxReasonText(reason: string | null): string {
  if (!reason) return 'not determined';
  let m = /^no peak was reached: the highest CL is at the highest angles? of the sweep \(α = (.+?)°\)/.exec(reason);
  if (m) return `not reached: CL is still rising at the highest angle of the sweep (α = ${m[1]}°); the sweep stops before the stall`;
  m = /^CL does not drop by more than (\S+) after its highest value \(α = (.+?)°\)/.exec(reason);
  if (m) return `no stall seen: after its highest value (α = ${m[2]}°) CL never falls by more than ${m[1]}, the drop that marks a stall for this scatter`;
  m = /^only (\d+) points?$/.exec(reason);
  if (m) return `too few points (${m[1]}) in this sweep branch to find a peak`;
  return reason;
}

/** The same in two or three words, for a narrow cell (the long form goes to the hover). */
export function clMaxReasonShort(reason: string | null): string {
  if (!reason) return 'not determined';
  if (/^no peak was reached/.test(reason)) return 'not reached (CL still rising)';
  if (/^CL does not drop/.test(reason)) return 'no stall seen';
  if (/^only \d+ points?$/.test(reason)) return 'too few points';
  return reason;
}

const CLMAX = /no peak was reached|CLmax/;

/** Why a run has no CLmax: the fit's own reason in words, else the engine warning about it. */
function clMaxNullReason(r?: ReductionResult): string {
  if (r?.fit.cl_max_reason) return clMaxReasonText(r.fit.cl_max_reason);
  const w = r?.warnings.find((text) => CLMAX.test(text));
  return w ? plainWarning(w) : 'not determined';
}

const LINEAR_SOURCE_SHORT = (r: ReductionResult): string | null => {
  const f = r.fit;
  if (f.linear_range_source === null || f.linear_range_deg === null) return null;
  const n = f.linear_range_points === null ? '' : `${f.linear_range_points} points, `;
  if (f.linear_range_source === 'setup alpha_range_deg') return `${n}set in the setup`;
  if (f.linear_range_source === 'setup linear_tolerance_cl') return `${n}setup tolerance`;
  return `${n}from the scatter`;
};

const LINEAR_SOURCE = (r: ReductionResult): string | null => {
  const f = r.fit;
  if (f.linear_range_source === null || f.linear_range_deg === null) return null;
  const n = f.linear_range_points === null ? '' : `${f.linear_range_points} points; `;
  if (f.linear_range_source === 'setup alpha_range_deg') return `${n}range set in the setup (fit.alpha_range_deg)`;
  const tol = f.linear_tolerance_cl === null ? '' : ` ±${fixed(f.linear_tolerance_cl, 4)} in CL`;
  if (f.linear_range_source === 'setup linear_tolerance_cl') return `${n}points within${tol} of the line, tolerance set in the setup (fit.linear_tolerance_cl)`;
  const sigma = f.noise_cl === null ? '' : ` (scatter σ of CL ${fixed(f.noise_cl, 4)})`;
  return `${n}found from the data: points within${tol} of the line, a tolerance from the run's own scatter${sigma}`;
};

const HYSTERESIS_NONE = (_kind: '2d' | '3d', r?: ReductionResult): string =>
  r && r.fit_branches.length < 2 ? 'single sweep' : 'no loop: the return sweep follows the rising one within the scatter, or does not overlap it';

export const FIT_ROWS: readonly FitRowSpec[] = [
  { key: 'cl_alpha_per_deg', group: 'lift', label: 'Lift-curve slope dCL/dα', unit: '1/deg', decimals: 5, random: 'cl_alpha_stderr_per_deg', combined: 'cl_alpha_u_per_deg', explainedBy: [LIFT_FIT], fallback: () => 'not determined' },
  { key: 'alpha_zero_lift_deg', group: 'lift', label: 'Zero-lift angle α₀', unit: 'deg', decimals: 2, random: 'alpha_zero_lift_stderr_deg', combined: 'alpha_zero_lift_u_deg', explainedBy: [LIFT_FIT], fallback: () => 'zero slope: no zero-lift angle' },
  { key: 'linear_range_deg', group: 'lift', label: 'Linear range of α', unit: 'deg', decimals: 2, note: LINEAR_SOURCE_SHORT, hint: LINEAR_SOURCE, explainedBy: [LIFT_FIT], fallback: () => 'not determined' },
  { key: 'linear_range_points', group: 'lift', detail: true, label: 'points in the linear range', unit: '–', decimals: 0, explainedBy: [LIFT_FIT], fallback: () => 'not determined' },
  {
    key: 'linear_tolerance_cl',
    group: 'lift',
    detail: true,
    label: 'residual tolerance',
    unit: '–',
    decimals: 4,
    note: (r) => (r.fit.linear_range_source === 'setup alpha_range_deg' ? 'largest residual' : null),
    hint: (r) =>
      r.fit.linear_range_source === 'setup alpha_range_deg'
        ? 'the range is set in the setup: this is the largest residual of its points from the line'
        : 'points of the linear range lie within this distance in CL of the fitted line',
    explainedBy: [LIFT_FIT],
    fallback: () => 'not determined',
  },
  { key: 'noise_cl', group: 'lift', detail: true, label: 'scatter σ of CL', unit: '–', decimals: null, explainedBy: [], fallback: () => 'not determined' },
  {
    key: 'cl_max',
    group: 'maximum',
    label: 'Maximum lift CLmax',
    unit: '–',
    decimals: 4,
    combined: 'cl_max_u',
    note: (r) => clMaxMethodText(r.fit.cl_max_method),
    hint: (r) => clMaxMethodText(r.fit.cl_max_method, true),
    explainedBy: [],
    fallback: (_k, r) => clMaxNullReason(r), fallbackShort: (r) => (r.fit.cl_max_reason ? clMaxReasonShort(r.fit.cl_max_reason) : null),
  },
  { key: 'alpha_cl_max_deg', group: 'maximum', label: 'α at CLmax', unit: 'deg', decimals: 2, combined: 'alpha_cl_max_u_deg', explainedBy: [], fallback: (_k, r) => clMaxNullReason(r), fallbackShort: (r) => (r.fit.cl_max_reason ? clMaxReasonShort(r.fit.cl_max_reason) : null) },
  { key: 'alpha_stall_deg', group: 'maximum', label: 'Stall angle (first drop after the peak)', unit: 'deg', decimals: 2, explainedBy: [], fallback: (_k, r) => clMaxNullReason(r), fallbackShort: (r) => (r.fit.cl_max_reason ? clMaxReasonShort(r.fit.cl_max_reason) : null) },
  { key: 'cd0', group: 'polar', label: 'CD0 in CD = CD0 + k·CL²', unit: '–', decimals: 5, random: 'cd0_stderr', combined: 'cd0_u', explainedBy: [LIFT_FIT], fallback: () => 'polar not fitted' },
  { key: 'k_induced', group: 'polar', label: 'k in CD = CD0 + k·CL²', unit: '–', decimals: 4, random: 'k_induced_stderr', combined: 'k_induced_u', explainedBy: [LIFT_FIT], fallback: () => 'polar not fitted' },
  {
    key: 'oswald_e',
    group: 'polar',
    label: 'Oswald efficiency e',
    unit: '–',
    decimals: 3,
    random: 'oswald_e_stderr',
    combined: 'oswald_e_u',
    note: (r) => (r.fit.oswald_e_source === 'cambered polar' ? 'cambered polar' : r.fit.oswald_e_source ? 'polar through CL = 0' : null),
    hint: (r) =>
      r.fit.oswald_e_source === 'cambered polar'
        ? 'from k of the cambered polar CD = CDmin + k·(CL − CL at CDmin)², whose minimum lies away from CL = 0'
        : r.fit.oswald_e_source
          ? 'from k of the polar CD = CD0 + k·CL²: e = 1/(π·A·k)'
          : null,
    explainedBy: [/Oswald/, LIFT_FIT],
    fallback: (k) => (k === '2d' ? 'not defined for a 2D section' : 'not determined'),
  },
  { key: 'polar_range_deg', group: 'polar', detail: true, label: 'α range of the polar fit', unit: 'deg', decimals: 2, explainedBy: [LIFT_FIT], fallback: () => 'polar not fitted' },
  { key: 'cd_min', group: 'polar', label: 'Minimum drag CDmin (cambered polar)', unit: '–', decimals: 5, explainedBy: [LIFT_FIT], fallback: () => 'the cambered polar has no minimum in the linear range' },
  { key: 'cl_min_drag', group: 'polar', label: 'CL at minimum drag', unit: '–', decimals: 4, random: 'cl_min_drag_stderr', explainedBy: [LIFT_FIT], fallback: () => 'the cambered polar has no minimum in the linear range' },
  { key: 'k_induced_cambered', group: 'polar', label: 'k of the cambered polar', unit: '–', decimals: 4, explainedBy: [LIFT_FIT], fallback: () => 'the cambered polar has no minimum in the linear range' },
  { key: 'ld_max', group: 'ld', label: 'Maximum lift-to-drag ratio (L/D)max', unit: '–', decimals: 2, combined: 'ld_max_u', explainedBy: [], fallback: () => 'no point with positive drag' },
  { key: 'cl_at_ld_max', group: 'ld', label: 'CL at (L/D)max', unit: '–', decimals: 4, explainedBy: [], fallback: () => 'no point with positive drag' },
  { key: 'cm_alpha_per_deg', group: 'moment', label: 'Pitching-moment slope dCm/dα', unit: '1/deg', decimals: 5, explainedBy: [PITCH, LIFT_FIT], fallback: () => 'not determined' },
  { key: 'cm_cl_slope', group: 'moment', label: 'dCm/dCL', unit: '–', decimals: 4, explainedBy: [PITCH, LIFT_FIT], fallback: () => 'not determined' },
  { key: 'x_ac_aft_of_ref_c', group: 'moment', label: 'Aerodynamic centre aft of the moment reference', unit: 'c', decimals: 4, explainedBy: [PITCH, LIFT_FIT], fallback: () => 'not determined' },
  {
    key: 'branch',
    group: 'sweep',
    label: 'Sweep branch fitted',
    unit: '',
    decimals: 0,
    show: (r) => (r.fit.branch === null ? null : `${r.fit.branch + 1} of ${Math.max(1, r.fit_branches.length)} (${directionText(r.fit.branch_direction ?? 'up')})`),
    explainedBy: [],
    fallback: () => 'no points to fit',
  },
  { key: 'hysteresis_alpha_range_deg', group: 'sweep', label: 'Hysteresis loop over α (rising vs return sweep)', unit: 'deg', decimals: 2, explainedBy: [], fallback: HYSTERESIS_NONE },
  {
    key: 'hysteresis_max_delta_cl',
    group: 'sweep',
    label: 'Hysteresis: largest ΔCL, rising − return',
    unit: '–',
    decimals: 4,
    note: (r) => (r.fit.hysteresis_alpha_at_max_deg === null ? null : `at α = ${fixed(r.fit.hysteresis_alpha_at_max_deg, 2)}°`),
    explainedBy: [],
    fallback: HYSTERESIS_NONE,
  },
  { key: 'weighted', group: 'sweep', label: 'Fits weighted by point uncertainties', unit: '', decimals: null, explainedBy: [], fallback: () => 'not stated' },
];

/** Fields shown inside another row's cell (its uncertainty, method, reason or note), never as rows of their own. */
export const FOLDED: ReadonlySet<keyof FitResult> = new Set<keyof FitResult>([
  'cl_alpha_stderr_per_deg',
  'cl_alpha_u_per_deg',
  'alpha_zero_lift_stderr_deg',
  'alpha_zero_lift_u_deg',
  'linear_range_source',
  'cl_max_method',
  'cl_max_reason',
  'cl_max_u',
  'alpha_cl_max_u_deg',
  'cd0_stderr',
  'cd0_u',
  'k_induced_stderr',
  'k_induced_u',
  'oswald_e_stderr',
  'oswald_e_u',
  'oswald_e_source',
  'cl_min_drag_stderr',
  'ld_max_u',
  'branch_direction',
  'hysteresis_alpha_at_max_deg',
]);

export interface FitCell {
  /** The value, with "± u" where it has a standard uncertainty; "—" when not determined. */
  text: string;
  /** Full-precision value(s) for export and copy; null when not determined. */
  value: number | boolean | [number, number] | null;
  /** Why there is no value (only when value is null). */
  reason: string | null;
  /** The same in a few words, where the reason is long. */
  short?: string;
  /** Standard uncertainty (k = 1) shown after "±". */
  u?: number;
  /** How the value was found, in a few words ("parabola through the peak"). */
  note?: string;
  /** The same at length, for the hover. */
  hint?: string;
  /** The uncertainty split into its random and systematic parts, for a hover. */
  breakdown?: string;
}

export function formatFitValue(spec: Pick<FitRowSpec, 'decimals'>, value: unknown, u?: number | null): string {
  if (Array.isArray(value)) return value.map((v) => formatFitValue(spec, v)).join(' to ');
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value !== 'number' || !Number.isFinite(value)) return DASH;
  if (spec.decimals === null) return significant(value, 3);
  return withUncertainty(value, u, spec.decimals);
}

/** An engine warning without its "run 101, branch 1 of 2 (up, α …):" prefix. */
function plainWarning(w: string): string {
  return w.replace(/^run .*?, branch \d+ of \d+ \([^)]*\): /, '').replace(/^CLmax is not given: /, '');
}

/** The engine warning that explains a null, else the row's own reason. */
export function nullReason(spec: FitRowSpec, result: ReductionResult): string {
  for (const pattern of spec.explainedBy) {
    const w = result.warnings.find((text) => pattern.test(text));
    if (w) return plainWarning(w);
  }
  return spec.fallback(result.corrections.kind, result);
}

/** Names of the systematic inputs (core/uncertainty/propagation.ts) in words. */
const SYSTEMATIC_NAMES: Record<string, string> = {
  'dp_pitot calibration': 'pitot Δp calibration',
  'p_static calibration': 'static-pressure calibration',
  't_total calibration': 'total-temperature calibration',
  'rh calibration': 'humidity calibration',
  'alpha offset': 'incidence zero (α offset)',
  area: 'reference area',
  chord: 'reference chord',
};

/**
 * "u = 0.00014 (k = 1); random 0.00013 (fit standard error); systematic 0.00005: reference area 0.00004, …".
 * The random part is the standard error field, or, where one field holds the combined u, what is left
 * after taking out the systematic shifts in quadrature (as core's fitDifference does).
 */
export function uncertaintyBreakdown(spec: FitRowSpec, result: ReductionResult): string | undefined {
  const fit = result.fit;
  const u = (spec.combined ? fit[spec.combined] : null) ?? (spec.random ? fit[spec.random] : null);
  if (typeof u !== 'number') return undefined;
  const sys = result.fit_systematic?.[spec.key] ?? {};
  const entries = Object.entries(sys).filter(([, v]) => Number.isFinite(v));
  const sysSq = entries.reduce((a, [, v]) => a + v * v, 0);
  const rnd = spec.random && spec.random !== spec.combined ? fit[spec.random] : Math.sqrt(Math.max(0, u * u - sysSq));
  const parts = [`u = ${uncertainty(u)} (standard uncertainty, k = 1)`];
  if (typeof rnd === 'number') parts.push(`random ${uncertainty(rnd)} (${spec.random && spec.random !== spec.combined ? 'standard error of the fit' : "from the points' random uncertainties"})`);
  if (entries.length > 0) {
    const list = entries
      .sort((a, b) => Math.abs(b[1]) - Math.abs(a[1]))
      .map(([k, v]) => `${SYSTEMATIC_NAMES[k] ?? k} ${uncertainty(Math.abs(v))}`)
      .join(', ');
    parts.push(`systematic ${uncertainty(Math.sqrt(sysSq))}: ${list}`);
  } else {
    parts.push('no systematic part (the setup gives no instrument calibration uncertainties)');
  }
  return parts.join('; ');
}

export function fitCell(spec: FitRowSpec, result: ReductionResult): FitCell {
  const value = result.fit[spec.key] as number | boolean | [number, number] | null;
  if (value === null || value === undefined) {
    const cell: FitCell = { text: DASH, value: null, reason: nullReason(spec, result) };
    const short = spec.fallbackShort?.(result);
    if (short && short !== cell.reason) cell.short = short;
    return cell;
  }
  const uRaw = (spec.combined ? result.fit[spec.combined] : null) ?? (spec.random ? result.fit[spec.random] : null);
  const u = typeof uRaw === 'number' && Number.isFinite(uRaw) && uRaw > 0 ? uRaw : undefined;
  const text = spec.show?.(result) ?? formatFitValue(spec, value, u);
  const cell: FitCell = { text, value, reason: null };
  if (u !== undefined) {
    cell.u = u;
    const b = uncertaintyBreakdown(spec, result);
    if (b) cell.breakdown = b;
  }
  const note = spec.note?.(result);
  if (note) cell.note = note;
  const hint = spec.hint?.(result);
  if (hint) cell.hint = hint;
  return cell;
}

/** The hover of a cell: why it is empty, or how it was found and its uncertainty's parts. */
export function cellTitle(cell: FitCell): string | undefined {
  if (cell.reason) return cell.reason;
  const parts = [cell.hint ?? cell.note, cell.breakdown].filter((x): x is string => !!x);
  return parts.length ? parts.join('\n') : undefined;
}

/** Row specs for every key of the fit, known ones first in their order, unknown ones after (never the folded ones). */
export function fitRowsFor(fit: FitResult): FitRowSpec[] {
  const known = new Set(FIT_ROWS.map((r) => r.key));
  const extra = (Object.keys(fit) as (keyof FitResult)[]).filter((k) => !known.has(k) && !FOLDED.has(k));
  return [...FIT_ROWS, ...extra.map((key) => ({ key, label: key, unit: '', decimals: null, group: 'sweep' as const, explainedBy: [], fallback: () => 'not determined' }))];
}

export function directionText(direction: 'up' | 'down'): string {
  return direction === 'up' ? 'α rising' : 'α falling';
}

/** One sweep branch of a run as a row of the branch table. */
export interface BranchRow {
  index: number;
  /** "1 of 2". */
  label: string;
  direction: string;
  /** The branch the run's characteristics describe. */
  fitted: boolean;
  points: number;
  alphaRange: string;
  clMax: string;
  /** Why there is no CLmax (words), else null; and the same in a few words. */
  clMaxReason: string | null;
  clMaxShort: string | null;
  alphaClMax: string;
  alphaStall: string;
  slope: string;
  alphaZeroLift: string;
  linearRange: string;
}

const range = (r: [number, number] | null, d: number) => (r === null ? DASH : `${fixed(r[0], d)} to ${fixed(r[1], d)}`);

/** The run's sweep branches in file order, the fitted one marked. */
export function branchRows(result: ReductionResult): BranchRow[] {
  const n = result.fit_branches.length;
  return result.fit_branches.map((b: FitBranch) => ({
    index: b.index,
    label: `${b.index + 1} of ${n}`,
    direction: directionText(b.direction),
    fitted: b.index === result.fit.branch,
    points: b.points,
    alphaRange: range(b.alpha_range_deg, 2),
    clMax: fixed(b.cl_max, 4),
    clMaxReason: b.cl_max === null ? clMaxReasonText(b.cl_max_reason) : null,
    clMaxShort: b.cl_max === null ? clMaxReasonShort(b.cl_max_reason) : null,
    alphaClMax: fixed(b.alpha_cl_max_deg, 2),
    alphaStall: fixed(b.alpha_stall_deg, 2),
    slope: withUncertainty(b.cl_alpha_per_deg, b.cl_alpha_stderr_per_deg, 5),
    alphaZeroLift: fixed(b.alpha_zero_lift_deg, 2),
    linearRange: range(b.linear_range_deg, 2),
  }));
}
