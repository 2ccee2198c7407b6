/**
 * Two-dimensional wall corrections for a wing section spanning a closed test section:
 * Allen & Vincenti, NACA Report 782 (1944), in the form of Barlow, Rae & Pope, Low-Speed Wind
 * Tunnel Testing, 3rd ed. (1999), §9.2–9.4.
 */
import { MAX_VALIDATED_EPSILON, RAD, type CorrectedPoint, type TunnelPoint } from './types.ts';

export interface Geometry2d {
  chord: number;
  /** Test-section height (normal to the span and the stream), m. */
  height: number;
  /** Test-section width (along the span), m. */
  width: number;
  /** Model volume, m³; null skips solid blockage. */
  volume: number | null;
  /** Solid-blockage shape factor K1 (0.74 for a wing spanning the tunnel, BRP §9.2). */
  k1: number;
}

/** Streamline-curvature parameter σ = (π²/48)(c/h)². Allen & Vincenti eq. (37); BRP eq. 9.9. */
export function sigma2d(chord: number, height: number): number {
  return ((Math.PI * Math.PI) / 48) * (chord / height) ** 2;
}

/** Solid blockage ε_sb = K1·V_model/C^1.5, C = width × height. BRP eq. 9.2. */
export function solidBlockage2d(g: Geometry2d): number {
  if (g.volume === null) return 0;
  return (g.k1 * g.volume) / Math.pow(g.width * g.height, 1.5);
}

/** Wake blockage ε_wb = (c/2h)·cd_u. BRP eq. 9.14 (Maskell's form for a 2D wake). */
export function wakeBlockage2d(chord: number, height: number, cdU: number): number {
  return (chord / (2 * height)) * cdU;
}

/**
 * Corrected point (BRP eqs. 9.30–9.36):
 * V = V_u(1+ε), q = q_u(1+2ε), Re = Re_u(1+ε), M = M_u(1+ε);
 * α = α_u + (57.3σ/2π)(cl_u + 4cm_u); cl = cl_u(1 − σ − 2ε); cm = cm_u(1 − 2ε) + σ·cl/4 (corrected cl, DESIGN §3.4);
 * cd = cd_u(1 − 3ε_sb − 2ε_wb). cm is about the quarter chord.
 */
export function correct2d(p: TunnelPoint, g: Geometry2d): CorrectedPoint {
  const sigma = sigma2d(g.chord, g.height);
  const epsSolid = solidBlockage2d(g);
  const epsWake = wakeBlockage2d(g.chord, g.height, p.cd);
  const eps = epsSolid + epsWake;
  const hasCm = Number.isFinite(p.cm);
  const alphaDeg = p.alphaDeg + ((RAD * sigma) / (2 * Math.PI)) * (p.cl + 4 * (hasCm ? p.cm : 0));
  const cl = p.cl * (1 - sigma - 2 * eps);
  const cm = hasCm ? p.cm * (1 - 2 * eps) + (sigma * cl) / 4 : Number.NaN;
  const cd = p.cd * (1 - 3 * epsSolid - 2 * epsWake);
  const qScale = 1 + 2 * eps;
  return {
    alphaDeg,
    cl,
    cd,
    cm,
    cy: p.cy / qScale,
    cRoll: p.cRoll / qScale,
    cYaw: p.cYaw / qScale,
    q: p.q * qScale,
    V: p.V * (1 + eps),
    mach: p.mach * (1 + eps),
    Re: p.Re * (1 + eps),
    epsSolid,
    epsWake,
  };
}

export function exceedsValidatedBlockage(p: CorrectedPoint): boolean {
  return p.epsSolid + p.epsWake > MAX_VALIDATED_EPSILON;
}
