/**
 * The reduction's result as the data contract defines it (docs/data-format.md, JSON output): the run,
 * one row per point with corrected and as-measured values, the fits, the factors and the warnings.
 */
import { formatNotice } from '../contract/messages.ts';
import type { FitBranch, FitResult, FitSystematic } from '../fits/characteristics.ts';
import { finiteOrNull } from '../physics/numbers.ts';
import { NO_FACTORS, type TunnelPoint, type WallFactors } from '../walls/types.ts';
import type { ReductionContext } from './context.ts';
import type { PointRecord } from './record.ts';

export interface PointResult {
  point: string;
  line: number;
  samples: number;
  alpha_deg: number | null;
  alpha_uncorrected_deg: number;
  q_pa: number | null;
  q_uncorrected_pa: number;
  v_mps: number | null;
  v_uncorrected_mps: number;
  mach: number | null;
  mach_uncorrected: number;
  reynolds: number | null;
  reynolds_uncorrected: number;
  rho_kgm3: number;
  mu_pas: number;
  p_static_pa: number;
  p_total_pa: number;
  t_static_k: number;
  t_total_k: number;
  rh_pct: number;
  cl: number | null;
  cd: number | null;
  cm: number | null;
  cl_uncorrected: number;
  cd_uncorrected: number;
  cm_uncorrected: number | null;
  cy: number | null;
  cy_uncorrected: number | null;
  c_roll: number | null;
  c_roll_uncorrected: number | null;
  c_yaw: number | null;
  c_yaw_uncorrected: number | null;
  ld: number | null;
  lift_n: number;
  drag_n: number;
  pitch_ref_nm: number | null;
  cl_scatter: number;
  eps_solid: number | null;
  eps_wake: number | null;
  /** Standard uncertainties (k = 1) of the corrected values; null without an uncertainty block in the setup. */
  u_q_pa: number | null;
  u_v_mps: number | null;
  u_alpha_deg: number | null;
  u_cl: number | null;
  u_cd: number | null;
  u_cm: number | null;
}

export interface ReductionResult {
  run: Record<string, unknown> & { name: string; configuration: string | null };
  points: PointResult[];
  fit: FitResult;
  /** Every sweep branch of the run (file order) with its own CLmax and slope; `fit` describes one of them. */
  fit_branches: FitBranch[];
  /** Systematic parts of the fitted characteristics: characteristic → input → shift at one standard uncertainty. */
  fit_systematic: FitSystematic;
  factors: WallFactors;
  /**
   * The wall corrections applied: `wake` is the wake model actually used (a Maskell request that fell
   * back says "classic"), `method` the registered method's id, `fallback` the reason when the request
   * could not be met.
   */
  corrections: { enabled: boolean; kind: '2d' | '3d'; wake: 'classic' | 'maskell' | null; method: string | null; fallback: string | null };
  warnings: string[];
}

/** The values of a point on the context's basis: corrected when the wall corrections ran, else as measured. */
export function valuesOf(p: PointRecord): TunnelPoint {
  return p.corrected ?? p.measured!.tunnel;
}

const WAKE_OF: Record<string, 'classic' | 'maskell' | undefined> = { '3d-classic': 'classic', '3d-maskell': 'maskell' };

/** Assemble the contract's result from a finished context. */
export function assembleResult(ctx: ReductionContext): ReductionResult {
  const { run } = ctx;
  const points = ctx.points.map((p) => pointRow(p));
  const meta = run.metadata;
  const fileStem = run.file.replace(/^.*[\\/]/, '').replace(/\.[^.]*$/, '');
  const wall = ctx.wall;
  return {
    run: {
      ...meta,
      name: meta['run'] ?? fileStem,
      configuration: meta['configuration'] ?? null,
      source_file: run.file.replace(/^.*[\\/]/, ''),
      tare_file: ctx.tareRun ? ctx.tareRun.file.replace(/^.*[\\/]/, '') : null,
      rows_read: run.rowsRead,
      rows_skipped: run.rowsSkipped,
    },
    points,
    fit: ctx.fit!,
    fit_branches: ctx.fitBranches ?? [],
    fit_systematic: ctx.fitSystematic ?? {},
    factors: wall ? wall.factors : NO_FACTORS,
    corrections: {
      enabled: ctx.correctionsOn,
      kind: ctx.setup.model.kind,
      wake: wall ? (WAKE_OF[wall.method] ?? null) : null,
      method: wall ? wall.method : null,
      fallback: wall?.fallback ? wall.fallback.reason : null,
    },
    warnings: ctx.notices.map(formatNotice),
  };
}

/** One row of the point table; one explicit literal per point (spreading made 5,000-point runs spend most of their time in GC). */
function pointRow(r: PointRecord): PointResult {
  const m = r.measured!;
  const u = m.tunnel;
  const k = r.corrected;
  const f = m.flow;
  const cl = k ? k.cl : u.cl;
  const cd = k ? k.cd : u.cd;
  const un = r.u;
  return {
    point: r.key,
    line: r.line,
    samples: r.samples,
    alpha_deg: k ? k.alphaDeg : u.alphaDeg,
    alpha_uncorrected_deg: u.alphaDeg,
    q_pa: k ? k.q : u.q,
    q_uncorrected_pa: u.q,
    v_mps: k ? k.V : u.V,
    v_uncorrected_mps: u.V,
    mach: k ? k.mach : u.mach,
    mach_uncorrected: u.mach,
    reynolds: k ? k.Re : u.Re,
    reynolds_uncorrected: u.Re,
    rho_kgm3: f.rho,
    mu_pas: f.mu,
    p_static_pa: f.p,
    p_total_pa: f.p0,
    t_static_k: f.T,
    t_total_k: f.T0,
    rh_pct: r.rh * 100,
    cl,
    cd,
    cm: finiteOrNull(k ? k.cm : u.cm),
    cl_uncorrected: u.cl,
    cd_uncorrected: u.cd,
    cm_uncorrected: finiteOrNull(u.cm),
    cy: finiteOrNull(k ? k.cy : u.cy),
    cy_uncorrected: finiteOrNull(u.cy),
    c_roll: finiteOrNull(k ? k.cRoll : u.cRoll),
    c_roll_uncorrected: finiteOrNull(u.cRoll),
    c_yaw: finiteOrNull(k ? k.cYaw : u.cYaw),
    c_yaw_uncorrected: finiteOrNull(u.cYaw),
    ld: finiteOrNull(cl / cd), // null for cd = 0 and when the ratio overflows (cd = 5e-324; fuzz finding)
    lift_n: m.lift,
    drag_n: m.drag,
    pitch_ref_nm: finiteOrNull(m.pitchRef),
    cl_scatter: r.clScatter,
    eps_solid: k ? k.epsSolid : null,
    eps_wake: k ? k.epsWake : null,
    // an uncertainty that overflows (model.area_m2 = 1e-300) cannot be determined: null, never Infinity (fuzz finding)
    u_q_pa: finiteOrNull(un?.u_q_pa ?? Number.NaN),
    u_v_mps: finiteOrNull(un?.u_v_mps ?? Number.NaN),
    u_alpha_deg: finiteOrNull(un?.u_alpha_deg ?? Number.NaN),
    u_cl: finiteOrNull(un?.u_cl ?? Number.NaN),
    u_cd: finiteOrNull(un?.u_cd ?? Number.NaN),
    u_cm: finiteOrNull(un?.u_cm ?? Number.NaN),
  };
}
