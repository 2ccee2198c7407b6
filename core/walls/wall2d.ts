/**
 * Two-dimensional wall corrections for a wing section spanning a closed test section:
 * Allen & Vincenti, NACA Report 782 (1944), in the form of Barlow, Rae & Pope, Low-Speed Wind
 * Tunnel Testing, 3rd ed. (1999), §9.2–9.4.
 */
import { MAX_VALIDATED_EPSILON, RAD, type CorrectedPoint, type TunnelPoint } from './types.ts';
import type { Notice } from '../contract/messages.ts';
import type { Setup } from '../setup/schema.ts';
import type { WallMethod } from './method.ts';

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

/** The 2D geometry of a setup. */
export function geometry2dOf(setup: Setup): Geometry2d {
  return {
    chord: setup.model.chord_m,
    height: setup.tunnel.height_m,
    width: setup.tunnel.width_m,
    volume: setup.model.volume_m3,
    k1: setup.corrections.solid_blockage_k,
  };
}

/** Allen & Vincenti's corrections for a wing section spanning the test section (NACA Report 782; BRP §9). */
export const wall2dMethod: WallMethod = {
  id: '2d',
  label: '2D wing spanning a closed section (Allen & Vincenti)',
  source: 'Allen & Vincenti, NACA Report 782 (1944); Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed. (1999) §9',
  accepts: (setup) => (setup.model.kind === '2d' ? undefined : 'the 2D corrections are for a wing spanning the test section (model.kind "2d")'),
  prepare({ setup, points, hasPitch }) {
    const g = geometry2dOf(setup);
    const warnings: Notice[] = [];
    if (g.volume === null) warnings.push({ field: 'model.volume_m3', message: 'not given: solid blockage is skipped (ε_solid = 0)' });
    if (!hasPitch) warnings.push({ message: 'without a pitching moment the 2D angle correction uses the cl term alone' });
    const correct = (p: TunnelPoint) => correct2d(p, g);
    let over = 0;
    for (const p of points) if (exceedsValidatedBlockage(correct(p))) over++;
    if (over > 0) warnings.push({ message: `${over} point(s) have a total blockage ε above 0.1, outside the range where the 2D corrections are validated; results are given but treat them with caution` });
    return {
      method: '2d',
      factors: { sigma: sigma2d(g.chord, g.height), delta: null, tau1: null, tau2: null, solid_blockage_k: g.k1 },
      correct,
      warnings,
      fallback: null,
    };
  },
};
