/**
 * The fitted characteristics as rows for display and export: label, unit, value, and for a value the
 * engine could not determine, the reason (from the run's warnings where one applies). Keys the engine
 * adds later still appear, under their own name, so nothing it computes is hidden.
 */
import type { FitResult } from '../../../core/index.ts';
import type { ReductionResult } from '../../../core/index.ts';
import { DASH, fixed, significant } from './numberFormat.ts';

export interface FitRowSpec {
  key: keyof FitResult;
  label: string;
  unit: string;
  decimals: number | null; // null: significant digits
  /** Patterns of engine warnings that explain a null here, and the reason when none is found. */
  explainedBy: RegExp[];
  fallback: (kind: '2d' | '3d') => string;
}

// both of the engine's reasons for no lift line mention "lift-curve fits" (core/fit.ts)
const LIFT_FIT = /lift-curve fits/;
const CLMAX = /no peak was reached|CLmax/;
const PITCH = /pitching-moment coefficients are not given|no "pitch" column/;

export const FIT_ROWS: readonly FitRowSpec[] = [
  { key: 'cl_alpha_per_deg', label: 'Lift-curve slope dCL/dα', unit: '1/deg', decimals: 5, explainedBy: [LIFT_FIT], fallback: () => 'not determined' },
  { key: 'cl_alpha_stderr_per_deg', label: '  standard error of the slope', unit: '1/deg', decimals: null, explainedBy: [LIFT_FIT], fallback: () => 'too few points in the linear range for a standard error' },
  { key: 'alpha_zero_lift_deg', label: 'Zero-lift angle α₀', unit: 'deg', decimals: 3, explainedBy: [LIFT_FIT], fallback: () => 'zero slope: no zero-lift angle' },
  { key: 'alpha_zero_lift_stderr_deg', label: '  standard error of α₀', unit: 'deg', decimals: null, explainedBy: [LIFT_FIT], fallback: () => 'too few points for a standard error' },
  { key: 'linear_range_deg', label: 'Linear range of α', unit: 'deg', decimals: 2, explainedBy: [LIFT_FIT], fallback: () => 'not determined' },
  { key: 'linear_range_points', label: '  points in the linear range', unit: '–', decimals: 0, explainedBy: [LIFT_FIT], fallback: () => 'not determined' },
  { key: 'linear_tolerance_cl', label: '  residual tolerance', unit: 'CL', decimals: 4, explainedBy: [LIFT_FIT], fallback: () => 'not determined' },
  { key: 'cl_max', label: 'Maximum lift CLmax', unit: '–', decimals: 4, explainedBy: [CLMAX], fallback: () => 'no peak within the sweep' },
  { key: 'alpha_cl_max_deg', label: 'α at CLmax', unit: 'deg', decimals: 2, explainedBy: [CLMAX], fallback: () => 'no peak within the sweep' },
  { key: 'alpha_stall_deg', label: 'Stall angle (first drop after the peak)', unit: 'deg', decimals: 2, explainedBy: [CLMAX], fallback: () => 'CL does not drop after the peak within the sweep' },
  { key: 'cd0', label: 'CD0 in CD = CD0 + k·CL²', unit: '–', decimals: 5, explainedBy: [LIFT_FIT], fallback: () => 'polar not fitted' },
  { key: 'cd0_stderr', label: '  standard error of CD0', unit: '–', decimals: null, explainedBy: [LIFT_FIT], fallback: () => 'too few points for a standard error' },
  { key: 'k_induced', label: 'k in CD = CD0 + k·CL²', unit: '–', decimals: 5, explainedBy: [LIFT_FIT], fallback: () => 'polar not fitted' },
  { key: 'k_induced_stderr', label: '  standard error of k', unit: '–', decimals: null, explainedBy: [LIFT_FIT], fallback: () => 'too few points for a standard error' },
  { key: 'oswald_e', label: 'Oswald efficiency e', unit: '–', decimals: 3, explainedBy: [/Oswald/, LIFT_FIT], fallback: (k) => (k === '2d' ? 'not defined for a 2D section' : 'not determined') },
  { key: 'cd_min', label: 'Minimum drag CDmin (cambered polar)', unit: '–', decimals: 5, explainedBy: [LIFT_FIT], fallback: () => 'the cambered polar has no minimum in the linear range' },
  { key: 'cl_min_drag', label: 'CL at minimum drag', unit: '–', decimals: 4, explainedBy: [LIFT_FIT], fallback: () => 'the cambered polar has no minimum in the linear range' },
  { key: 'k_induced_cambered', label: 'k of the cambered polar', unit: '–', decimals: 5, explainedBy: [LIFT_FIT], fallback: () => 'the cambered polar has no minimum in the linear range' },
  { key: 'ld_max', label: 'Maximum lift-to-drag ratio (L/D)max', unit: '–', decimals: 2, explainedBy: [], fallback: () => 'no point with positive drag' },
  { key: 'cl_at_ld_max', label: 'CL at (L/D)max', unit: '–', decimals: 4, explainedBy: [], fallback: () => 'no point with positive drag' },
  { key: 'cm_alpha_per_deg', label: 'Pitching-moment slope dCm/dα', unit: '1/deg', decimals: 5, explainedBy: [PITCH, LIFT_FIT], fallback: () => 'not determined' },
  { key: 'cm_cl_slope', label: 'dCm/dCL', unit: '–', decimals: 4, explainedBy: [PITCH, LIFT_FIT], fallback: () => 'not determined' },
  { key: 'weighted', label: 'Fits weighted by point uncertainties', unit: '', decimals: null, explainedBy: [], fallback: () => 'not stated' },
  { key: 'x_ac_aft_of_ref_c', label: 'Aerodynamic centre aft of the moment reference', unit: 'c', decimals: 4, explainedBy: [PITCH, LIFT_FIT], fallback: () => 'not determined' },
];

export interface FitCell {
  text: string;
  /** Full-precision value(s) for export and copy; null when not determined. */
  value: number | boolean | [number, number] | null;
  /** Why there is no value (only when value is null). */
  reason: string | null;
}

export function formatFitValue(spec: Pick<FitRowSpec, 'decimals'>, value: unknown): string {
  if (Array.isArray(value)) return value.map((v) => formatFitValue(spec, v)).join(' to ');
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value !== 'number') return DASH;
  return spec.decimals === null ? significant(value, 3) : fixed(value, spec.decimals);
}

/** The engine warning that explains a null, else the row's own reason. */
export function nullReason(spec: FitRowSpec, result: ReductionResult): string {
  for (const pattern of spec.explainedBy) {
    const w = result.warnings.find((text) => pattern.test(text));
    if (w) return w;
  }
  return spec.fallback(result.corrections.kind);
}

export function fitCell(spec: FitRowSpec, result: ReductionResult): FitCell {
  const value = result.fit[spec.key] as number | boolean | [number, number] | null;
  if (value === null || value === undefined) return { text: DASH, value: null, reason: nullReason(spec, result) };
  return { text: formatFitValue(spec, value), value, reason: null };
}

/** Row specs for every key of the fit, known ones first in their order, unknown ones after. */
export function fitRowsFor(fit: FitResult): FitRowSpec[] {
  const known = new Set(FIT_ROWS.map((r) => r.key));
  const extra = (Object.keys(fit) as (keyof FitResult)[]).filter((k) => !known.has(k));
  return [...FIT_ROWS, ...extra.map((key) => ({ key, label: key, unit: '', decimals: null, explainedBy: [], fallback: () => 'not determined' }))];
}
