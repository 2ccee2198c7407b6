/**
 * Three-dimensional wall corrections for a model in a closed rectangular test section:
 * solid and wake blockage, lift interference and streamline curvature (Barlow, Rae & Pope,
 * Low-Speed Wind Tunnel Testing, 3rd ed. (1999), §10; Glauert, ARC R&M 1566 (1933);
 * Maskell, ARC R&M 3400 (1963)). The formulas, and which CL each uses, are in docs/methods.md §7.
 */
import { findLinearRange } from './fit.ts';
import { liftInterferenceDelta, solidBlockageTau1, streamlineCurvatureTau2, type Loading } from './images.ts';
import { fitPolynomial } from './leastsquares.ts';
import { MAX_VALIDATED_EPSILON, MAX_VALIDATED_SPAN_RATIO, RAD, type CorrectedPoint, type TunnelPoint, type WallFactors } from './walls.ts';

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
}

/**
 * Correct every point of a run (the curvature term needs the run's lift-curve slope, and Maskell's
 * wake term its drag polar, so the whole run is corrected together).
 * @param scatter standard error of each point's CL from its sample scatter, for the linear-range rule
 */
export function correct3d(points: TunnelPoint[], scatter: number[], g: Geometry3d): Correction3dResult {
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

  // wake blockage, classic (BRP eq. 10.9) or Maskell (R&M 3400)
  const epsWake = points.map((p) => (SC / 4) * p.cd);
  if (g.wake === 'maskell') {
    const order = sortedOrder(points.map((p) => p.alphaDeg));
    const a = order.map((i) => points[i]!.alphaDeg);
    const cl = order.map((i) => points[i]!.cl);
    const range = findLinearRange(a, cl, order.map((i) => scatter[i]!));
    const polar = range
      ? fitPolynomial(cl.slice(range.from, range.to).map((c) => c * c), order.slice(range.from, range.to).map((i) => points[i]!.cd), 1)
      : undefined;
    if (!polar) {
      warnings.push('Maskell wake blockage needs an attached-flow drag polar, and none could be fitted: the classic wake blockage is used instead');
    } else {
      const [cd0, k] = polar as [number, number];
      points.forEach((p, i) => {
        const separated = Math.max(0, p.cd - cd0 - k * p.cl * p.cl);
        epsWake[i] = (SC / 4) * cd0 + ((5 * SC) / 4) * separated;
      });
    }
  }

  // blockage and lift interference; CL_w is the blockage-corrected CL (docs/methods.md §7)
  const first = points.map((p, i) => {
    const eps = epsSolid + epsWake[i]!;
    const s2 = (1 + eps) * (1 + eps);
    const clW = p.cl / s2;
    const dAlphaUp = f.delta * SC * clW; // rad, Glauert R&M 1566; BRP eq. 10.47
    return { p, eps, s2, clW, alpha1: p.alphaDeg + dAlphaUp * RAD, dCdUp: f.delta * SC * clW * clW };
  });

  // lift-curve slope of the blockage- and upwash-corrected data, for the curvature terms
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

  let overBlocked = 0;
  const out = first.map(({ p, eps, s2, clW, alpha1, dCdUp }, i): CorrectedPoint => {
    if (eps > MAX_VALIDATED_EPSILON) overBlocked++;
    const dAlphaSc = f.tau2 * f.delta * SC * clW; // rad, BRP eq. 10.60
    const dClSc = -slopePerRad * dAlphaSc; // BRP eq. 10.61
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
      epsSolid,
      epsWake: epsWake[i]!,
    };
  });
  if (overBlocked > 0) {
    warnings.push(`${overBlocked} point(s) have a total blockage ε above ${MAX_VALIDATED_EPSILON}, outside the range where these corrections are validated; results are given but treat them with caution`);
  }
  return {
    points: out,
    factors: { sigma: null, delta: f.delta, tau1: f.tau1, tau2: f.tau2, solid_blockage_k: g.k },
    warnings,
  };
}

/** Indices that sort the values ascending (stable). */
export function sortedOrder(values: number[]): number[] {
  return values.map((v, i) => ({ v, i })).sort((x, y) => x.v - y.v || x.i - y.i).map((x) => x.i);
}
