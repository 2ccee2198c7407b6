/**
 * Three-dimensional wall corrections for a model in a closed rectangular test section:
 * solid and wake blockage, lift interference and streamline curvature (Barlow, Rae & Pope,
 * Low-Speed Wind Tunnel Testing, 3rd ed. (1999), §10; Glauert, ARC R&M 1566 (1933);
 * Maskell, ARC R&M 3400 (1963)). The formulas, and which CL each uses, are in docs/methods.md §7.
 */
import { findLinearRange } from '../fits/characteristics.ts';
import { liftInterferenceDelta, solidBlockageTau1, streamlineCurvatureTau2, type Loading } from './imageSums.ts';
import { fitPolynomial } from '../fits/leastSquares.ts';
import { sortedOrder } from '../physics/numbers.ts';
import { MAX_VALIDATED_EPSILON, MAX_VALIDATED_SPAN_RATIO, RAD, type CorrectedPoint, type TunnelPoint, type WallFactors } from './types.ts';
import type { Setup } from '../setup/schema.ts';
import type { PreparedWall, WallInput, WallMethod } from './method.ts';

export interface Geometry3d {
  area: number;
  span: number;
  chord: number;
  width: number;
  height: number;
  volume: number | null;
  k: number;
  loading: Loading;
  wake: 'classic' | 'maskell';
  /** Values from the setup; null means computed here. */
  delta: number | null;
  tau1: number | null;
  tau2: number | null;
}

export interface Factors3d {
  delta: number;
  tau1: number;
  tau2: number;
}

/** δ, τ1, τ2 for this model and section: the setup's numbers where given, else computed by images. */
export function factors3d(g: Geometry3d): Factors3d {
  const section = { B: g.width, H: g.height };
  const vortexSpan = g.loading === 'elliptic' ? (Math.PI / 4) * g.span : g.span;
  return {
    delta: g.delta ?? liftInterferenceDelta(section, g.span, g.loading),
    tau1: g.tau1 ?? solidBlockageTau1(section),
    tau2: g.tau2 ?? streamlineCurvatureTau2(section, vortexSpan, g.chord / 4),
  };
}

/** Helmbold's finite-wing lift-curve slope a = 2πA/(2 + √(A² + 4)) per rad (Helmbold 1942; Anderson, Fundamentals of Aerodynamics, eq. 5.81 form). */
export function helmboldSlope(aspectRatio: number): number {
  return (2 * Math.PI * aspectRatio) / (2 + Math.sqrt(aspectRatio * aspectRatio + 4));
}

export interface Correction3dResult {
  points: CorrectedPoint[];
  factors: WallFactors;
  warnings: string[];
  /** What was fixed for the run: reused to correct perturbed points in the uncertainty propagation. */
  context: Context3d;
  /** Set when Maskell's wake blockage was asked for but the classic one had to be used, with the reason. */
  maskellFallback: string | null;
}

/** Run-level quantities of the 3D corrections: the factors, the solid blockage, the wake model, the curvature slope. */
export interface Context3d {
  factors: Factors3d;
  /** S/C */
  SC: number;
  epsSolid: number;
  /** Maskell's attached-flow polar CD0 + k·CL², or null for the classic wake blockage. */
  maskellPolar: { cd0: number; k: number } | null;
  /** Lift-curve slope used by the streamline-curvature terms, per rad. */
  slopePerRad: number;
}

/** Wake blockage of one point: classic (S/4C)·CD_u (BRP eq. 10.9) or Maskell (R&M 3400). */
export function wakeBlockage3d(p: TunnelPoint, ctx: Pick<Context3d, 'SC' | 'maskellPolar'>): number {
  const m = ctx.maskellPolar;
  if (!m) return (ctx.SC / 4) * p.cd;
  const separated = Math.max(0, p.cd - m.cd0 - m.k * p.cl * p.cl);
  return (ctx.SC / 4) * m.cd0 + ((5 * ctx.SC) / 4) * separated;
}

/** Blockage and lift interference of one point (no curvature term yet). CL_w is the blockage-corrected CL (docs/methods.md §7). */
function blockageAndUpwash(p: TunnelPoint, ctx: Pick<Context3d, 'SC' | 'maskellPolar' | 'epsSolid' | 'factors'>) {
  const epsWake = wakeBlockage3d(p, ctx);
  const eps = ctx.epsSolid + epsWake;
  const s2 = (1 + eps) * (1 + eps);
  const clW = p.cl / s2;
  const dAlphaUp = ctx.factors.delta * ctx.SC * clW; // rad, Glauert R&M 1566; BRP eq. 10.47
  return { epsWake, eps, s2, clW, alpha1: p.alphaDeg + dAlphaUp * RAD, dCdUp: ctx.factors.delta * ctx.SC * clW * clW };
}

/** The whole 3D correction of one point with the run's context (docs/methods.md §7). */
export function correctPoint3d(p: TunnelPoint, ctx: Context3d): CorrectedPoint {
  const { epsWake, eps, s2, clW, alpha1, dCdUp } = blockageAndUpwash(p, ctx);
  const dAlphaSc = ctx.factors.tau2 * ctx.factors.delta * ctx.SC * clW; // rad, BRP eq. 10.60
  const dClSc = -ctx.slopePerRad * dAlphaSc; // BRP eq. 10.61
  const dCmSc = -0.25 * dClSc; // BRP eq. 10.62
  return {
    alphaDeg: alpha1 + dAlphaSc * RAD,
    cl: clW + dClSc,
    cd: p.cd / s2 + dCdUp,
    cm: Number.isFinite(p.cm) ? p.cm / s2 + dCmSc : Number.NaN,
    cy: p.cy / s2,
    cRoll: p.cRoll / s2,
    cYaw: p.cYaw / s2,
    q: p.q * s2,
    V: p.V * (1 + eps),
    mach: p.mach * (1 + eps),
    Re: p.Re * (1 + eps),
    epsSolid: ctx.epsSolid,
    epsWake,
  };
}

/**
 * Correct every point of a run (the curvature term needs the run's lift-curve slope, and Maskell's
 * wake term its drag polar, so the whole run is corrected together).
 * @param scatter standard error of each point's CL from its sample scatter, for the linear-range rule
 */
export function correct3d(points: readonly TunnelPoint[], scatter: readonly number[], g: Geometry3d): Correction3dResult {
  const warnings: string[] = [];
  const f = factors3d(g);
  const C = g.width * g.height;
  const SC = g.area / C;
  if (g.span > MAX_VALIDATED_SPAN_RATIO * g.width) {
    warnings.push(
      `the span is ${(g.span / g.width).toFixed(2)} of the tunnel width, above the ${MAX_VALIDATED_SPAN_RATIO} for which the lift-interference correction is validated; results are given but treat them with caution`,
    );
  }
  let epsSolid = 0;
  if (g.volume === null) warnings.push('model.volume_m3 is not given: solid blockage is skipped (ε_solid = 0)');
  else epsSolid = (g.k * f.tau1 * g.volume) / Math.pow(C, 1.5); // BRP eq. 10.2

  let maskellPolar: Context3d['maskellPolar'] = null;
  let maskellFallback: string | null = null;
  if (g.wake === 'maskell') {
    const order = sortedOrder(points.map((p) => p.alphaDeg));
    const a = order.map((i) => points[i]!.alphaDeg);
    const cl = order.map((i) => points[i]!.cl);
    const range = findLinearRange(a, cl, order.map((i) => scatter[i]!));
    const polar = range
      ? fitPolynomial(cl.slice(range.from, range.to).map((c) => c * c), order.slice(range.from, range.to).map((i) => points[i]!.cd), 1)
      : undefined;
    if (!polar) {
      maskellFallback = 'Maskell wake blockage needs an attached-flow drag polar, and none could be fitted: the classic wake blockage is used instead';
      warnings.push(maskellFallback);
    } else maskellPolar = { cd0: polar[0]!, k: polar[1]! };
  }

  // lift-curve slope of the blockage- and upwash-corrected data, for the curvature terms
  const base = { factors: f, SC, epsSolid, maskellPolar };
  const first = points.map((p) => blockageAndUpwash(p, base));
  const order = sortedOrder(first.map((x) => x.alpha1));
  const range = findLinearRange(
    order.map((i) => first[i]!.alpha1),
    order.map((i) => first[i]!.clW),
    order.map((i) => scatter[i]!),
  );
  let slopePerRad: number;
  if (range) {
    slopePerRad = range.line.slope * RAD;
  } else {
    const ar = (g.span * g.span) / g.area;
    slopePerRad = helmboldSlope(ar);
    warnings.push(`no linear lift range for the streamline-curvature correction: the Helmbold slope for aspect ratio ${ar.toFixed(2)} (${(slopePerRad / RAD).toFixed(4)} per deg) is used`);
  }
  const context: Context3d = { ...base, slopePerRad };
  const out = points.map((p) => correctPoint3d(p, context));
  const overBlocked = out.filter((p) => p.epsSolid + p.epsWake > MAX_VALIDATED_EPSILON).length;
  if (overBlocked > 0) {
    warnings.push(`${overBlocked} point(s) have a total blockage ε above ${MAX_VALIDATED_EPSILON}, outside the range where these corrections are validated; results are given but treat them with caution`);
  }
  return {
    points: out,
    factors: { sigma: null, delta: f.delta, tau1: f.tau1, tau2: f.tau2, solid_blockage_k: g.k },
    warnings,
    context,
    maskellFallback,
  };
}

/** The 3D geometry of a setup (closed rectangular section). */
export function geometry3dOf(setup: Setup, wake: 'classic' | 'maskell'): Geometry3d {
  return {
    area: setup.model.area_m2,
    span: setup.model.span_m,
    chord: setup.model.chord_m,
    width: setup.tunnel.width_m,
    height: setup.tunnel.height_m,
    volume: setup.model.volume_m3,
    k: setup.corrections.solid_blockage_k,
    loading: setup.model.loading,
    wake,
    delta: setup.corrections.delta,
    tau1: setup.corrections.tau1,
    tau2: setup.corrections.tau2,
  };
}

function prepare3d(input: WallInput, wake: 'classic' | 'maskell'): PreparedWall {
  const res = correct3d(input.points, input.clScatter, geometry3dOf(input.setup, wake));
  const ctx = res.context;
  return {
    method: ctx.maskellPolar ? '3d-maskell' : '3d-classic',
    factors: res.factors,
    correct: (p) => correctPoint3d(p, ctx),
    warnings: res.warnings.map((message) => ({ message })),
    fallback: res.maskellFallback ? { requested: '3d-maskell', reason: res.maskellFallback } : null,
  };
}

const accepts3d = (setup: Setup): string | undefined =>
  setup.model.kind === '3d' ? undefined : 'the 3D corrections are for a model in the test section (model.kind "3d")';

/** 3D corrections with the classic wake blockage (S/4C)·CD_u: Barlow, Rae & Pope 3rd ed. §10; Glauert R&M 1566. */
export const classic3dMethod: WallMethod = {
  id: '3d-classic',
  label: '3D, closed rectangular section, classic wake blockage',
  source: 'Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed. (1999) §10; Glauert, ARC R&M 1566 (1933)',
  accepts: accepts3d,
  prepare: (input) => prepare3d(input, 'classic'),
};

/** 3D corrections with Maskell's separated-flow wake blockage (ARC R&M 3400); classic when no attached polar can be fitted. */
export const maskell3dMethod: WallMethod = {
  id: '3d-maskell',
  label: '3D, closed rectangular section, Maskell wake blockage',
  source: 'Maskell, ARC R&M 3400 (1963); Barlow, Rae & Pope 3rd ed. §10; Glauert, ARC R&M 1566 (1933)',
  accepts: accepts3d,
  prepare: (input) => prepare3d(input, 'maskell'),
};

