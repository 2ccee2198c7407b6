/**
 * δ, τ1, τ2 of a model in any supported section and mounting, as numbers to use in the classic
 * formulas with the model's own S, V and the real section area C (docs/methods.md §7):
 * Δα = δ·(S/C)·CL, ε_sb = K·τ1·V/C^1.5, Δα_sc = τ2·δ·(S/C)·CL. A half model is solved as the
 * mirrored full model (S, V and C all doubled, so δ and τ2 carry over and τ1 scales by 1/√2); corner
 * fillets change C only (C = B·H − 2f²), the images being those of the plain rectangle (an
 * approximation, Barlow, Rae & Pope 3rd ed., as common practice for filleted sections).
 */
import { deltaSmallSpan, liftInterferenceDelta, solidBlockageTau1, streamlineCurvatureTau2, type Loading } from './imageSums.ts';
import { deltaRect, tau1Rect, tau2Rect } from './rectImages.ts';
import { deltaCirc, tau1Circ, tau2Circ } from './circular.ts';
import { hasFreeBoundary, imageProblem, sectionArea, type Mounting, type RectImageSection, type TunnelSection } from './sections.ts';

export interface SectionFactorInput {
  tunnel: TunnelSection;
  mounting: Mounting;
  /** Span (semi-span of a half model), m. */
  span: number;
  chord: number;
  loading: Loading;
}

export interface SectionFactors {
  delta: number;
  tau1: number;
  tau2: number;
  /** Real cross-section area C, m². */
  area: number;
  /** False where a free boundary lets the jet expand, so there is no wake blockage (see {@link wakeBlockageApplies}). */
  wakeBlockage: boolean;
}

const isPlainClosed = (s: RectImageSection) => s.spanLo === 'solid' && s.spanHi === 'solid' && s.liftLo === 'solid' && s.liftHi === 'solid';

/**
 * The factors by images. A closed rectangle uses the closed-form sums of imageSums.ts (unchanged
 * results for the classic section); other rectangles rectImages.ts; circles circular.ts.
 * τ2 is taken at l = c/4 behind the quarter chord with the vortex span of the loading (πb/4 elliptic, b uniform).
 */
export function sectionFactors(g: SectionFactorInput): SectionFactors {
  // ---- remembered per geometry: the image sums take tens of milliseconds, and every run of a campaign
  // (and every perturbed evaluation of its uncertainty) asks again for the same few geometries ----
  const key = JSON.stringify(g);
  const hit = remembered.get(key);
  if (hit) return { ...hit };
  const f = sectionFactorsByImages(g);
  if (remembered.size >= REMEMBERED_MAX) remembered.clear();
  remembered.set(key, f);
  return { ...f };
}
const REMEMBERED_MAX = 256;
const remembered = new Map<string, SectionFactors>();
// ---- end of the remembered factors ----

function sectionFactorsByImages(g: SectionFactorInput): SectionFactors {
  const p = imageProblem(g.tunnel, g.mounting, g.span);
  const l = g.chord / 4;
  const vortexSpan = g.loading === 'elliptic' ? (Math.PI / 4) * p.span : p.span;
  let delta: number;
  let tau1: number;
  let tau2: number;
  const sec = p.section;
  if (sec.shape === 'circular') {
    delta = deltaCirc(sec, p.span, g.loading);
    tau1 = tau1Circ(sec);
    tau2 = tau2Circ(sec, l);
  } else if (isPlainClosed(sec)) {
    const s = { B: sec.B, H: sec.H };
    delta = p.span > 0 ? liftInterferenceDelta(s, p.span, g.loading) : deltaSmallSpan(s);
    tau1 = solidBlockageTau1(s);
    tau2 = streamlineCurvatureTau2(s, vortexSpan, l);
  } else {
    delta = deltaRect(sec, p.span, g.loading);
    tau1 = tau1Rect(sec);
    tau2 = tau2Rect(sec, vortexSpan, l);
  }
  return { delta, tau1: tau1 / Math.sqrt(p.mirror), tau2, area: sectionArea(g.tunnel), wakeBlockage: wakeBlockageApplies(g.tunnel) };
}

/**
 * Wake blockage needs walls all round: the classic (S/4C)·CD (and Maskell's form) comes from continuity
 * far downstream in a closed duct. With a free boundary the jet's static pressure is the room's and the
 * wake's displacement widens the jet instead, so the image sum of the wake source gives no speed-up at
 * the model: wake blockage is zero (Glauert R&M 1566; Barlow, Rae & Pope 3rd ed., open-jet corrections,
 * "wake blockage is negligible in an open jet" — from memory). Approximate: the real open-jet effects of
 * nozzle blockage, jet expansion and collector (Mercker & Wiedemann, SAE 960671, 1996) are not modelled.
 */
export function wakeBlockageApplies(t: TunnelSection): boolean {
  return !hasFreeBoundary(t);
}

/**
 * 2D image factors of a wing spanning the width between the floor and the ceiling, relative to the
 * closed values of Allen & Vincenti (NACA Report 782): the curvature term σ comes from Σ' c_n/n² over
 * the bound vortex's images (c_n = (−1)^n closed → −π²/6; both free → π²/3, factor −2; one of each →
 * −π²/24, factor 1/4), the solid blockage from Σ' d_n/n² over the doublet images (closed π²/3; both free
 * −π²/6, factor −1/2; one of each −π²/24, factor −1/8). Wake blockage only between two solid walls.
 */
export function factors2dBySection(floor: 'solid' | 'free', ceiling: 'solid' | 'free'): { sigma: number; solid: number; wake: boolean } {
  if (floor === 'solid' && ceiling === 'solid') return { sigma: 1, solid: 1, wake: true };
  if (floor === 'free' && ceiling === 'free') return { sigma: -2, solid: -0.5, wake: false };
  return { sigma: 0.25, solid: -0.125, wake: false };
}
