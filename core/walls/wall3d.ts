/**
 * Three-dimensional wall corrections for a model in a closed rectangular test section:
 * solid and wake blockage, lift interference and streamline curvature (Barlow, Rae & Pope,
 * Low-Speed Wind Tunnel Testing, 3rd ed. (1999), §10; Glauert, ARC R&M 1566 (1933);
 * Maskell, ARC R&M 3400 (1963)). The formulas, and which CL each uses, are in docs/methods.md §7.
 */
import { findLinearRange } from '../fits/characteristics.ts';
import { type Loading } from './imageSums.ts';
import { fitPolynomial } from '../fits/leastSquares.ts';
import { sortedOrder } from '../physics/numbers.ts';
import { MAX_VALIDATED_EPSILON, MAX_VALIDATED_SPAN_RATIO, RAD, type CorrectedPoint, type TunnelPoint, type WallFactors } from './types.ts';
import { sectionFactors, wakeBlockageApplies } from './sectionFactors.ts';
import { hasFreeBoundary, imageProblem, mountingOf, sectionArea, tunnelSectionOf, type Mounting, type TunnelSection } from './sections.ts';
import { tau2Rect } from './rectImages.ts';
import { tau2Circ } from './circular.ts';
import { streamlineCurvatureTau2 } from './imageSums.ts';
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
  /** Section shape and boundaries; absent = closed rectangle width × height without fillets. */
  section?: TunnelSection;
  /** Full model (default) or half model on a reflection wall (span = semi-span, area = half-model area). */
  mounting?: Mounting;
  /** Chordwise position of the moment reference centre aft of the reference chord's leading edge, in chords (default 0.25). */
  momentRefXc?: number;
  /** Distance from the wing's quarter chord back to the tail's quarter chord, m; null/absent = no tail-on correction. */
  tailArm?: number | null;
  /** ∂Cm/∂α_tail, per degree of tail angle (from runs at two tail incidences); needed for the tail-on moment term. */
  tailCmPerDeg?: number | null;
}

export interface Factors3d {
  delta: number;
  tau1: number;
  tau2: number;
}

/** The section of a geometry: the given one, or the classic closed rectangle. */
export function sectionOf(g: Pick<Geometry3d, 'section' | 'width' | 'height'>): TunnelSection {
  return g.section ?? { shape: 'rectangular', width: g.width, height: g.height, boundaries: { floor: 'solid', ceiling: 'solid', left: 'solid', right: 'solid' }, fillet: 0 };
}

/** δ, τ1, τ2 for this model, section and mounting: the setup's numbers where given, else computed by images (sectionFactors.ts). */
export function factors3d(g: Geometry3d): Factors3d {
  if (g.delta !== null && g.tau1 !== null && g.tau2 !== null) return { delta: g.delta, tau1: g.tau1, tau2: g.tau2 };
  const f = sectionFactors({ tunnel: sectionOf(g), mounting: g.mounting ?? { kind: 'full' }, span: g.span, chord: g.chord, loading: g.loading });
  return { delta: g.delta ?? f.delta, tau1: g.tau1 ?? f.tau1, tau2: g.tau2 ?? f.tau2 };
}

/**
 * τ2 at the tail, a distance l_t behind the wing's quarter chord, from the same images as the wing's τ2:
 * the extra angle the walls induce at the tail is Δα_t = δ·τ2(l_t)·(S/C)·CL_w (Barlow, Rae & Pope 3rd ed.,
 * tail-on corrections in the 3D chapter; the chart there is read off as this image sum — from memory).
 */
export function tailTau2(g: Geometry3d, tailArm: number): number {
  const p = imageProblem(sectionOf(g), g.mounting ?? { kind: 'full' }, g.span);
  const vortexSpan = g.loading === 'elliptic' ? (Math.PI / 4) * p.span : p.span;
  const sec = p.section;
  if (sec.shape === 'circular') return tau2Circ(sec, tailArm);
  if (sec.spanLo === 'solid' && sec.spanHi === 'solid' && sec.liftLo === 'solid' && sec.liftHi === 'solid') {
    return streamlineCurvatureTau2({ B: sec.B, H: sec.H }, vortexSpan, tailArm);
  }
  return tau2Rect(sec, vortexSpan, tailArm);
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
  /** False where a free boundary removes wake blockage (sectionFactors.ts). Absent = true. */
  wake?: boolean;
  /** Moment reference aft of the leading edge, chords (absent = 0.25, the quarter chord). */
  momentRefXc?: number;
  /** Tail-on term: ΔCm_t = −(∂Cm/∂α_t)·δ·τ2(l_t)·(S/C)·CL_w (per rad of Δα, converted); null = not applied. */
  tail?: { tau2: number; cmPerRad: number } | null;
}

/** Wake blockage of one point: classic (S/4C)·CD_u (BRP eq. 10.9) or Maskell (R&M 3400). */
export function wakeBlockage3d(p: TunnelPoint, ctx: Pick<Context3d, 'SC' | 'maskellPolar' | 'wake'>): number {
  if (ctx.wake === false) return 0;
  const m = ctx.maskellPolar;
  if (!m) return (ctx.SC / 4) * p.cd;
  const separated = Math.max(0, p.cd - m.cd0 - m.k * p.cl * p.cl);
  return (ctx.SC / 4) * m.cd0 + ((5 * ctx.SC) / 4) * separated;
}

/** Blockage and lift interference of one point (no curvature term yet). CL_w is the blockage-corrected CL (docs/methods.md §7). */
function blockageAndUpwash(p: TunnelPoint, ctx: Pick<Context3d, 'SC' | 'maskellPolar' | 'epsSolid' | 'factors' | 'wake'>) {
  const epsWake = wakeBlockage3d(p, ctx);
  const eps = ctx.epsSolid + epsWake;
  const s2 = (1 + eps) * (1 + eps);
  const clW = p.cl / s2;
  const dAlphaUp = ctx.factors.delta * ctx.SC * clW; // rad, Glauert R&M 1566; BRP eq. 10.47
  return { epsWake, eps, s2, clW, alpha1: p.alphaDeg + dAlphaUp * RAD, dCdUp: ctx.factors.delta * ctx.SC * clW * clW };
}

/**
 * The whole 3D correction of one point with the run's context (docs/methods.md §7).
 * Curvature moment: the lift increment ΔCL_sc is that of an equivalent camber, whose load acts at the
 * half chord (thin-aerofoil theory, e.g. Abbott & von Doenhoff §4.3: a circular-arc camber line has its
 * centre of pressure at c/2), so about a reference at x_ref/c aft of the leading edge
 * ΔCm_sc = −(0.5 − x_ref/c)·ΔCL_sc; at the quarter chord this is BRP eq. 10.62, −0.25·ΔCL_sc.
 * Tail on: ΔCm_t = −(∂Cm/∂α_t)·Δα_t removes the moment of the walls' extra upwash at the tail.
 */
export function correctPoint3d(p: TunnelPoint, ctx: Context3d): CorrectedPoint {
  const { epsWake, eps, s2, clW, alpha1, dCdUp } = blockageAndUpwash(p, ctx);
  const dAlphaSc = ctx.factors.tau2 * ctx.factors.delta * ctx.SC * clW; // rad, BRP eq. 10.60
  const dClSc = -ctx.slopePerRad * dAlphaSc; // BRP eq. 10.61
  const arm = ctx.momentRefXc === undefined ? 0.25 : 0.5 - ctx.momentRefXc;
  const dCmTail = ctx.tail ? -ctx.tail.cmPerRad * ctx.factors.delta * ctx.tail.tau2 * ctx.SC * clW : 0;
  const dCmSc = -arm * dClSc + dCmTail; // BRP eq. 10.62 at the quarter chord
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
  const section = sectionOf(g);
  const C = sectionArea(section);
  const SC = g.area / C;
  const wake = wakeBlockageApplies(section);
  if (!g.section && g.span > MAX_VALIDATED_SPAN_RATIO * g.width) {
    warnings.push(
      `the span is ${(g.span / g.width).toFixed(2)} of the tunnel width, above the ${MAX_VALIDATED_SPAN_RATIO} for which the lift-interference correction is validated; results are given but treat them with caution`,
    );
  }
  if (!wake) {
    warnings.push(
      'the section has a free boundary: wake blockage is taken as zero (the jet can expand) and the solid blockage comes from the free-jet images; nozzle, jet-expansion and collector effects of open jets are not modelled',
    );
  }
  let epsSolid = 0;
  if (g.volume === null) warnings.push('model.volume_m3 is not given: solid blockage is skipped (ε_solid = 0)');
  else epsSolid = (g.k * f.tau1 * g.volume) / Math.pow(C, 1.5); // BRP eq. 10.2

  let maskellPolar: Context3d['maskellPolar'] = null;
  let maskellFallback: string | null = null;
  if (g.wake === 'maskell' && !wake) warnings.push("Maskell's wake blockage is derived for closed sections; with a free boundary no wake blockage is applied");
  if (g.wake === 'maskell' && wake) {
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
  let tail: Context3d['tail'] = null;
  if (g.tailArm != null) {
    if (g.tailCmPerDeg == null) {
      warnings.push('model.tail_arm_m is given without model.tail_cm_per_deg (∂Cm/∂α at the tail, from runs at two tail incidences): the tail-on moment correction is not applied');
    } else {
      const t2 = tailTau2(g, g.tailArm);
      tail = { tau2: t2, cmPerRad: g.tailCmPerDeg * RAD };
      warnings.push(`tail on: τ2 at the tail arm ${g.tailArm} m is ${t2.toFixed(4)}; the walls' extra angle at the tail is ${(f.delta * t2 * SC * RAD).toFixed(4)}°·CL`);
    }
  }
  const base = { factors: f, SC, epsSolid, maskellPolar, wake, momentRefXc: g.momentRefXc, tail };
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
    section: tunnelSectionOf(setup.tunnel),
    mounting: mountingOf(setup.model),
    ...(setup.model.moment_ref_xc !== undefined && setup.model.moment_ref_xc !== 0.25 ? { momentRefXc: setup.model.moment_ref_xc } : {}),
    tailArm: setup.model.tail_arm_m ?? null,
    tailCmPerDeg: setup.model.tail_cm_per_deg ?? null,
  };
}

/** True when the setup's section has a free boundary (an open or partly open jet). */
export function isFreeJet(setup: Setup): boolean {
  return hasFreeBoundary(tunnelSectionOf(setup.tunnel));
}

function prepare3d(input: WallInput, wake: 'classic' | 'maskell'): PreparedWall {
  const free = isFreeJet(input.setup);
  const res = correct3d(input.points, input.clScatter, geometry3dOf(input.setup, free ? 'classic' : wake));
  const ctx = res.context;
  const freeFallback = wake === 'maskell' && free ? "Maskell's wake blockage is derived for closed sections; this section has a free boundary, so the free-jet corrections (no wake blockage) are used" : null;
  return {
    method: free ? '3d-free-jet' : ctx.maskellPolar ? '3d-maskell' : '3d-classic',
    factors: res.factors,
    correct: (p) => correctPoint3d(p, ctx),
    warnings: [...(freeFallback ? [freeFallback] : []), ...res.warnings].map((message) => ({ message })),
    fallback: freeFallback ? { requested: '3d-maskell', reason: freeFallback } : res.maskellFallback ? { requested: '3d-maskell', reason: res.maskellFallback } : null,
  };
}

const accepts3d = (setup: Setup): string | undefined =>
  setup.model.kind === '3d' ? undefined : 'the 3D corrections are for a model in the test section (model.kind "3d")';

/**
 * 3D corrections in a section with at least one free boundary (open jet, jet over a ground board, open
 * circular jet): lift interference, solid blockage and curvature by the free-jet images (sectionFactors.ts),
 * no wake blockage (Glauert R&M 1566; Barlow, Rae & Pope 3rd ed., open-jet boundary corrections).
 */
export const freeJet3dMethod: WallMethod = {
  id: '3d-free-jet',
  label: '3D, section with a free boundary (open or partly open jet), full or half model',
  source: 'Glauert, ARC R&M 1566 (1933); Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed. (1999), 3D boundary corrections for open jets',
  accepts: (setup) => accepts3d(setup) ?? (isFreeJet(setup) ? undefined : 'every boundary of this section is solid: the closed-section methods apply'),
  prepare: (input) => prepare3d(input, 'classic'),
};

/** 3D corrections with the classic wake blockage (S/4C)·CD_u: Barlow, Rae & Pope 3rd ed. §10; Glauert R&M 1566. */
export const classic3dMethod: WallMethod = {
  id: '3d-classic',
  label: '3D, closed section (rectangular, filleted or circular; full or half model), classic wake blockage',
  source: 'Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed. (1999) §10; Glauert, ARC R&M 1566 (1933)',
  accepts: accepts3d,
  prepare: (input) => prepare3d(input, 'classic'),
};

/** 3D corrections with Maskell's separated-flow wake blockage (ARC R&M 3400); classic when no attached polar can be fitted. */
export const maskell3dMethod: WallMethod = {
  id: '3d-maskell',
  label: '3D, closed section (rectangular, filleted or circular; full or half model), Maskell wake blockage',
  source: 'Maskell, ARC R&M 3400 (1963); Barlow, Rae & Pope 3rd ed. §10; Glauert, ARC R&M 1566 (1933)',
  accepts: accepts3d,
  prepare: (input) => prepare3d(input, 'maskell'),
};

