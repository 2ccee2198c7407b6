/**
 * View logic of the balance, upflow and repeatability parts of the window: pure functions from
 * reduction results and balance documents to what the panels show. The numbers come from core
 * (zeroLiftAngle, upflowFromPair, repeatability); nothing here computes physics of its own.
 */
import {
  quadraticTermNames,
  repeatability,
  upflowFromPair,
  zeroLiftAngle,
  type Balance,
  type ReductionResult,
  type RepeatResult,
  type UpflowResult,
} from '../../../core/index.ts';

export interface BalanceTable {
  /** Column heads: the arguments (outputs or loads), then their products. */
  columns: string[];
  /** One row per result (loads, or outputs): its name and coefficients (linear, then second-order). */
  rows: { name: string; unit: string; values: number[] }[];
  zeros: { name: string; value: number }[];
  form: string;
}

/** The balance's matrices as one table, in the document's term order. */
export function balanceTable(b: Balance): BalanceTable {
  const args = b.form === 'loads_from_outputs' ? b.outputs : (b.loads as string[]);
  const results = b.form === 'loads_from_outputs' ? (b.loads as string[]) : b.outputs;
  const q = b.doc.quadratic;
  return {
    form: b.form === 'loads_from_outputs' ? 'loads from outputs' : 'outputs from loads (solved by iteration)',
    columns: [...args, ...(q ? quadraticTermNames(args) : [])],
    rows: results.map((name, i) => ({
      name,
      unit: b.form === 'loads_from_outputs' ? b.doc.load_units[i]! : 'output',
      values: [...b.linear[i]!, ...(q ? q[i]! : [])],
    })),
    zeros: b.outputs.map((name, j) => ({ name, value: b.zeros[j]! })),
  };
}

export interface ResidualPlot {
  load: string;
  unit: string;
  /** (applied load, residual) per loading. */
  points: { x: number; y: number }[];
  sd: number | null;
  max: number | null;
}

/**
 * Residuals of each load against the applied load, from the `fit` block `calibrate` writes
 * (`applied`, `residuals`); empty when the document has none (a balance written by hand).
 */
export function residualPlots(b: Balance): ResidualPlot[] {
  const fit = b.doc.fit as { applied?: unknown; residuals?: unknown; residual_sd?: unknown; residual_max?: unknown } | undefined;
  const applied = fit?.applied;
  const residuals = fit?.residuals;
  if (!Array.isArray(applied) || !Array.isArray(residuals) || applied.length !== residuals.length) return [];
  const num = (v: unknown) => (typeof v === 'number' && Number.isFinite(v) ? v : null);
  return b.loads.map((load, k) => ({
    load,
    unit: b.doc.load_units[k]!,
    points: applied
      .map((f, i) => ({ x: num((f as unknown[])?.[k]), y: num((residuals[i] as unknown[])?.[k]) }))
      .filter((p): p is { x: number; y: number } => p.x !== null && p.y !== null),
    sd: Array.isArray(fit?.residual_sd) ? num(fit.residual_sd[k]) : null,
    max: Array.isArray(fit?.residual_max) ? num(fit.residual_max[k]) : null,
  }));
}

export type UpflowOutcome = { ok: true; value: UpflowResult; note: string | null } | { ok: false; reason: string };

/**
 * Upflow from an upright and an inverted run, both as measured (no wall corrections): zero-lift angles
 * over each run's own linear range, φ = (α0_inverted − α0_upright)/2. An upflow already applied by
 * the runs' setups shifts both runs' α alike and cancels; when the two setups apply different values
 * their half-difference is taken out.
 */
export function upflowFromRuns(upright: ReductionResult, inverted: ReductionResult, appliedUprightDeg = 0, appliedInvertedDeg = 0): UpflowOutcome {
  const angles = [];
  for (const [r, what] of [
    [upright, 'upright'],
    [inverted, 'inverted'],
  ] as const) {
    const range = r.fit.linear_range_deg;
    if (!range) return { ok: false, reason: `the ${what} run has no linear range of its lift curve` };
    const pts = r.points.filter((p) => p.alpha_uncorrected_deg >= range[0] - 1e-9 && p.alpha_uncorrected_deg <= range[1] + 1e-9);
    const z = zeroLiftAngle(
      pts.map((p) => p.alpha_uncorrected_deg),
      pts.map((p) => p.cl_uncorrected),
    );
    if (!z) return { ok: false, reason: `the ${what} run has too few points in its linear range` };
    angles.push(z);
  }
  const v = upflowFromPair(angles[0]!, angles[1]!);
  const shift = (appliedInvertedDeg - appliedUprightDeg) / 2;
  if (shift === 0)
    return {
      ok: true,
      value: v,
      note: appliedUprightDeg !== 0 ? `Both runs already have ${appliedUprightDeg}° applied; it cancels, so this is the whole upflow.` : null,
    };
  return {
    ok: true,
    value: { ...v, upflow_deg: v.upflow_deg - shift },
    note: `The two setups apply different upflows (${appliedUprightDeg}° upright, ${appliedInvertedDeg}° inverted); half their difference is taken out.`,
  };
}

/** A setup with `flow.upflow_deg` set (rounded to 1e-4°), everything else as it was. */
export function withUpflow(setup: unknown, upflowDeg: number): unknown {
  const s = JSON.parse(JSON.stringify(setup ?? {})) as Record<string, unknown>;
  const flow = (s['flow'] && typeof s['flow'] === 'object' ? s['flow'] : {}) as Record<string, unknown>;
  s['flow'] = { ...flow, upflow_deg: Number(upflowDeg.toFixed(4)) };
  return s;
}

export interface BandPoint {
  x: number;
  y: number;
  lo: number;
  hi: number;
}

export interface RepeatBand {
  stats: RepeatResult;
  /** The chosen run's CL–α, CD–CL and Cm–α with ± 2 pooled standard deviations of that coefficient. */
  cl: BandPoint[];
  cd: BandPoint[];
  cm: BandPoint[];
}

/** Repeatability of the chosen runs (core `repeatability`) and the band ± 2·s_pooled around the reference run. */
export function repeatBand(reference: ReductionResult, runs: readonly ReductionResult[], alphaTolDeg?: number): RepeatBand {
  const stats = repeatability(
    runs.map((r) => ({
      name: r.run.name,
      alphaDeg: r.points.map((p) => p.alpha_deg!),
      cl: r.points.map((p) => p.cl!),
      cd: r.points.map((p) => p.cd!),
      cm: r.points.map((p) => p.cm),
    })),
    alphaTolDeg,
  );
  const band = (s: number | null, pick: (p: ReductionResult['points'][number]) => { x: number; y: number | null }) =>
    s === null
      ? []
      : reference.points.flatMap((p) => {
          const { x, y } = pick(p);
          return y === null ? [] : [{ x, y, lo: y - 2 * s, hi: y + 2 * s }];
        });
  return {
    stats,
    cl: band(stats.pooled_sd_cl, (p) => ({ x: p.alpha_deg!, y: p.cl })),
    cd: band(stats.pooled_sd_cd, (p) => ({ x: p.cl!, y: p.cd })),
    cm: band(stats.pooled_sd_cm, (p) => ({ x: p.alpha_deg!, y: p.cm })),
  };
}
