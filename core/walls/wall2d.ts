/**
 * Two-dimensional wall corrections for a wing section spanning a closed test section:
 * Allen & Vincenti, NACA Report 782 (1944), in the form of Barlow, Rae & Pope, Low-Speed Wind
 * Tunnel Testing, 3rd ed. (1999), §9.2–9.4.
 */
import { MAX_VALIDATED_EPSILON, RAD, type CorrectedPoint, type TunnelPoint } from './types.ts';
import { factors2dBySection } from './sectionFactors.ts';
import { tunnelSectionOf, type Boundary } from './sections.ts';
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
  /** Floor and ceiling boundaries (absent = solid); a free one scales σ and ε_sb by the image factors of sectionFactors.ts and removes wake blockage. */
  floor?: Boundary;
  ceiling?: Boundary;
  /** Leg of 45° corner fillets, m: C = B·H − 2f² in the solid blockage. */
  fillet?: number;
  /** Moment reference aft of the leading edge, chords (absent = 0.25). */
  momentRefXc?: number;
}

/** Image factors of this section relative to the closed one. */
function sectionScale(g: Geometry2d) {
  return factors2dBySection(g.floor ?? 'solid', g.ceiling ?? 'solid');
}

/** σ of the section: Allen & Vincenti's closed value times the image factor of the floor and ceiling. */
export function sigmaOfSection(g: Geometry2d): number {
  return sigma2d(g.chord, g.height) * sectionScale(g).sigma;
}

/** Streamline-curvature parameter σ = (π²/48)(c/h)². Allen & Vincenti eq. (37); BRP eq. 9.9. */
export function sigma2d(chord: number, height: number): number {
  return ((Math.PI * Math.PI) / 48) * (chord / height) ** 2;
}

/** Solid blockage ε_sb = K1·V_model/C^1.5, C = width × height. BRP eq. 9.2. */
export function solidBlockage2d(g: Geometry2d): number {
  if (g.volume === null) return 0;
  const f = g.fillet ?? 0;
  return (sectionScale(g).solid * g.k1 * g.volume) / Math.pow(g.width * g.height - 2 * f * f, 1.5);
}

/** Wake blockage ε_wb = (c/2h)·cd_u. BRP eq. 9.14 (Maskell's form for a 2D wake). */
export function wakeBlockage2d(chord: number, height: number, cdU: number): number {
  return (chord / (2 * height)) * cdU;
}

/**
 * Corrected point (BRP eqs. 9.30–9.36):
 * V = V_u(1+ε), q = q_u(1+2ε), Re = Re_u(1+ε), M = M_u(1+ε);
 * α = α_u + (57.3σ/2π)(cl_u + 4cm_u); cl = cl_u(1 − σ − 2ε); cm = cm_u(1 − 2ε) + σ·cl/4 (corrected cl, DESIGN §3.4);
 * cd = cd_u(1 − 3ε_sb − 2ε_wb). The cm terms are about the quarter chord: a moment about a reference at
 * x_ref/c is moved there first, cm_c/4 = cm_ref + cl·(0.25 − x_ref/c), and back after (drag's arm neglected,
 * as in the published formulas).
 */
export function correct2d(p: TunnelPoint, g: Geometry2d): CorrectedPoint {
  const sigma = sigmaOfSection(g);
  const epsSolid = solidBlockage2d(g);
  const epsWake = sectionScale(g).wake ? wakeBlockage2d(g.chord, g.height, p.cd) : 0;
  const eps = epsSolid + epsWake;
  const hasCm = Number.isFinite(p.cm);
  const shift = g.momentRefXc === undefined ? 0 : 0.25 - g.momentRefXc;
  const cmQc = shift === 0 ? p.cm : p.cm + p.cl * shift;
  const alphaDeg = p.alphaDeg + ((RAD * sigma) / (2 * Math.PI)) * (p.cl + 4 * (hasCm ? cmQc : 0));
  const cl = p.cl * (1 - sigma - 2 * eps);
  const cmQcCorr = hasCm ? cmQc * (1 - 2 * eps) + (sigma * cl) / 4 : Number.NaN;
  const cm = shift === 0 ? cmQcCorr : cmQcCorr - cl * shift;
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
/** Floor, ceiling and fillets of the setup's section, only where they differ from the closed plain rectangle. */
function sectionBoundaries2d(setup: Setup): Pick<Geometry2d, 'floor' | 'ceiling' | 'fillet'> {
  const t = tunnelSectionOf(setup.tunnel);
  if (t.shape !== 'rectangular') return {};
  return {
    ...(t.boundaries.floor !== 'solid' ? { floor: t.boundaries.floor } : {}),
    ...(t.boundaries.ceiling !== 'solid' ? { ceiling: t.boundaries.ceiling } : {}),
    ...(t.fillet > 0 ? { fillet: t.fillet } : {}),
  };
}

export function geometry2dOf(setup: Setup): Geometry2d {
  return {
    chord: setup.model.chord_m,
    height: setup.tunnel.height_m,
    width: setup.tunnel.width_m,
    volume: setup.model.volume_m3,
    k1: setup.corrections.solid_blockage_k,
    ...sectionBoundaries2d(setup),
    ...(setup.model.moment_ref_xc !== undefined && setup.model.moment_ref_xc !== 0.25 ? { momentRefXc: setup.model.moment_ref_xc } : {}),
  };
}

/** Allen & Vincenti's corrections for a wing section spanning the test section (NACA Report 782; BRP §9). */
export const wall2dMethod: WallMethod = {
  id: '2d',
  label: '2D wing spanning the section between solid side walls (Allen & Vincenti; free floor or ceiling by images)',
  source: 'Allen & Vincenti, NACA Report 782 (1944); Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed. (1999) §9',
  accepts: (setup) => (setup.model.kind === '2d' ? undefined : 'the 2D corrections are for a wing spanning the test section (model.kind "2d")'),
  prepare({ setup, points, hasPitch }) {
    const g = geometry2dOf(setup);
    const warnings: Notice[] = [];
    if (g.volume === null) warnings.push({ field: 'model.volume_m3', message: 'not given: solid blockage is skipped (ε_solid = 0)' });
    if (!hasPitch) warnings.push({ message: 'without a pitching moment the 2D angle correction uses the cl term alone' });
    if (g.floor === 'free' || g.ceiling === 'free') warnings.push({ message: 'free floor or ceiling: σ and the solid blockage come from the free-boundary images, and there is no wake blockage; nozzle and collector effects of open jets are not modelled' });
    const correct = (p: TunnelPoint) => correct2d(p, g);
    let over = 0;
    for (const p of points) if (exceedsValidatedBlockage(correct(p))) over++;
    if (over > 0) warnings.push({ message: `${over} point(s) have a total blockage ε above 0.1, outside the range where the 2D corrections are validated; results are given but treat them with caution` });
    return {
      method: '2d',
      factors: { sigma: sigmaOfSection(g), delta: null, tau1: null, tau2: null, solid_blockage_k: g.k1 },
      correct,
      warnings,
      fallback: null,
    };
  },
};
