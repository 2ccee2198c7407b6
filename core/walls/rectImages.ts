/**
 * Wall-interference factors of a rectangular section whose four boundaries are each a solid wall or a
 * free (constant-pressure) jet boundary, by the method of images (Glauert, ARC R&M 1566 (1933);
 * Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed. (1999), 3D boundary corrections;
 * AGARDograph 336 (1998) §3 for the image rules of open and slotted boundaries).
 *
 * Image rules. Reflecting across a boundary, a trailing (streamwise) vortex keeps its circulation at a
 * free boundary (zero tangential velocity) and reverses it at a solid wall (zero normal velocity); a
 * source-doublet keeps its sign at a solid wall and reverses it at a free boundary. Successive
 * reflections across the walls at y = ∓B/2 put the images of a point at y0 in columns m at
 * y_m = mB + (−1)^m·y0, with the product of the wall factors crossed; likewise rows n across z = ∓H/2.
 * Frame as in imageSums.ts: x downstream, y along the span, z in the lift direction, model at the centre.
 */
import type { Boundary, RectImageSection } from './sections.ts';
import { horseshoeW, type Loading, type Vec } from './imageSums.ts';

/** Reflection factor of a trailing vortex (−1 at a solid wall, +1 at a free boundary). */
const vortexFactor = (b: Boundary) => (b === 'solid' ? -1 : 1);
/** Reflection factor of a source-doublet (+1 at a solid wall, −1 at a free boundary). */
const doubletFactor = (b: Boundary) => (b === 'solid' ? 1 : -1);

/**
 * Factor of image number m in a row of reflections between walls with factors fLo (at −L/2) and fHi
 * (at +L/2): m > 0 crosses the high wall ⌈m/2⌉ times and the low wall ⌊m/2⌋ times, m < 0 the reverse.
 */
export function imageFactor(m: number, fLo: number, fHi: number): number {
  const a = Math.abs(m);
  const near = Math.ceil(a / 2);
  const far = Math.floor(a / 2);
  const [first, second] = m >= 0 ? [fHi, fLo] : [fLo, fHi];
  return (near % 2 === 0 ? 1 : first) * (far % 2 === 0 ? 1 : second);
}

type RowKind = 'alternating' | 'same' | 'mixed';
/** How a vertical row of trailing-vortex images alternates: both walls solid, both free, or one of each. */
function rowKind(s: RectImageSection): RowKind {
  if (s.liftLo !== s.liftHi) return 'mixed';
  return s.liftLo === 'solid' ? 'alternating' : 'same';
}

/**
 * Closed forms of G(y) = Σ_n c_n·y/(y² + n²H²), the row of images at lateral offset y
 * (Gradshteyn & Ryzhik 1.421.4 and 1.422.4, i.e. Σ y/(y²+n²h²) = (π/h)coth(πy/h) and
 * Σ (−1)^n y/(y²+n²h²) = (π/h)/sinh(πy/h)): c_n = (−1)^n → (π/H)/sinh(πy/H); c_n = 1 → (π/H)coth(πy/H);
 * one wall of each kind → the odd rows cancel in pairs and the even ones alternate, (π/2H)/sinh(πy/2H).
 * With `self` the n = 0 term 1/y is removed (by series near y = 0, to avoid cancellation).
 */
function rowSum(y: number, H: number, kind: RowKind, self = false): number {
  const h = kind === 'mixed' ? 2 * H : H;
  const k = Math.PI / h;
  const x = k * y;
  if (self) {
    if (Math.abs(x) < 1e-3) {
      // csch x − 1/x = −x/6 + 7x³/360; coth x − 1/x = x/3 − x³/45
      return kind === 'same' ? k * (x / 3 - (x * x * x) / 45) : k * (-x / 6 + (7 * x * x * x) / 360);
    }
    return (kind === 'same' ? k / Math.tanh(x) : k / Math.sinh(x)) - 1 / y;
  }
  return kind === 'same' ? k / Math.tanh(x) : k / Math.sinh(x);
}

/** dG/dy of {@link rowSum} (without the self term, y ≠ 0). */
function rowSumSlope(y: number, H: number, kind: RowKind): number {
  const h = kind === 'mixed' ? 2 * H : H;
  const k = Math.PI / h;
  const x = k * y;
  const sh = Math.sinh(x);
  return kind === 'same' ? (-k * k) / (sh * sh) : (-k * k * Math.cosh(x)) / (sh * sh);
}

/** d/dy (G(y) − 1/y) at y = 0: −π²/6H² (both solid), π²/3H² (both free), −π²/24H² (mixed). */
function selfSlopeAtZero(H: number, kind: RowKind): number {
  const h = kind === 'mixed' ? 2 * H : H;
  const k2 = (Math.PI / h) ** 2;
  return kind === 'same' ? k2 / 3 : -k2 / 6;
}

/**
 * Interference upwash (far-downstream value, per unit circulation) at the model centre of the images
 * of a trailing-vortex pair, +1 at y = +s and −1 at y = −s (the right and left legs of a horseshoe
 * with lift up). A vortex Γ at (y, z) induces w = −Γ·y/(2π(y² + z²)) at the centre; pairing the two
 * legs' images column by column makes every column's sum fall off exponentially, also where a row
 * of free-boundary images alone would not converge. Positive = upwash (closed sections).
 */
export function pairKernel(s: number, sec: RectImageSection): number {
  const kind = rowKind(sec);
  const fLo = vortexFactor(sec.spanLo);
  const fHi = vortexFactor(sec.spanHi);
  let t = 2 * rowSum(s, sec.H, kind, true); // column 0: the legs' own rows, the legs themselves excluded
  for (let m = 1; m < 100000; m++) {
    const sgn = m % 2 === 0 ? 1 : -1;
    let col = 0;
    let size = 0; // the terms' size without their factors: with one solid and one free side the odd columns cancel exactly
    for (const mm of [m, -m]) {
      const f = imageFactor(mm, fLo, fHi);
      const c = mm * sec.B;
      const d = rowSum(c + sgn * s, sec.H, kind) - rowSum(c - sgn * s, sec.H, kind);
      col += f * d;
      size += Math.abs(d);
    }
    t += col;
    if (size < 1e-17 * Math.abs(t) || size === 0) break;
  }
  return -t / (2 * Math.PI);
}

/**
 * δ for a vanishing span: the limit of δ = C·K_pair(s)/(8s) as s → 0 (uniform loading, below), i.e.
 * δ0 = (C/8)·dK_pair/ds at 0, summed column by column from the slopes of the row sums.
 * For a closed section this is the closed form of imageSums.ts (0.1368 for a square).
 */
export function deltaVanishingSpan(sec: RectImageSection): number {
  const kind = rowKind(sec);
  const fLo = vortexFactor(sec.spanLo);
  const fHi = vortexFactor(sec.spanHi);
  let t = 2 * selfSlopeAtZero(sec.H, kind);
  for (let m = 1; m < 100000; m++) {
    const sgn = m % 2 === 0 ? 1 : -1;
    let col = 0;
    let size = 0;
    for (const mm of [m, -m]) {
      const d = 2 * sgn * rowSumSlope(mm * sec.B, sec.H, kind);
      col += imageFactor(mm, fLo, fHi) * d;
      size += Math.abs(d);
    }
    t += col;
    if (size < 1e-17 * Math.abs(t) || size === 0) break;
  }
  const slope = -t / (2 * Math.PI);
  return (sec.B * sec.H * slope) / 8;
}

/**
 * Lift-interference factor δ (Δα = δ·(S/C)·CL, C = B·H of this image section) at the model centre.
 * Uniform loading: horseshoe of span b, Γ/V = CL·S/(2b), upwash at the bound vortex half the far
 * value: δ = K_pair(b/2)·C/(4b). Elliptic loading: pairs of strength −dΓ along the span,
 * δ = (C/(πb))·∫_0^{π/2} cos θ·K_pair((b/2)cos θ) dθ (Glauert R&M 1566; the same derivation as imageSums.ts).
 */
export function deltaRect(sec: RectImageSection, span: number, loading: Loading): number {
  const C = sec.B * sec.H;
  const s = span / 2;
  if (!(s > 1e-9 * sec.B)) return deltaVanishingSpan(sec);
  if (loading === 'uniform') return (pairKernel(s, sec) * C) / (4 * span);
  const N = 256; // Simpson's rule on a smooth integrand
  const h = Math.PI / 2 / N;
  let sum = 0;
  for (let i = 1; i <= N; i++) {
    const th = i * h;
    const w = i === N ? 1 : i % 2 === 1 ? 4 : 2;
    const c = Math.cos(th);
    const y = s * c;
    sum += w * c * (y < 1e-12 * sec.B ? 0 : pairKernel(y, sec));
  }
  // the θ = 0 end: cos 0 · K_pair(s)
  sum += pairKernel(s, sec);
  return ((C / (Math.PI * span)) * sum * h) / 3;
}

/**
 * Solid-blockage factor τ1 of the section: the images of the model's source-doublet (strength
 * U·K·V_model, K from the body's added mass, see shapeFactor.ts) change the axial speed at the model by
 * Σ ±V_model/(4π r³), so ε_sb = K·τ1·V_model/C^1.5 with τ1 = (C^1.5/4π)·Σ_{(m,n)≠0} d_m·d_n/((mB)² + (nH)²)^1.5,
 * d the doublet factors (+1 solid, −1 free). Negative for open jets (Glauert R&M 1566 §5).
 * Beyond |m|,|n| ≤ N a lattice of one sign adds its integral 2π/(C·R_disc); a sign-changing one adds ~0.
 */
export function tau1Rect(sec: RectImageSection): number {
  const { B, H } = sec;
  const dLo = doubletFactor(sec.spanLo);
  const dHi = doubletFactor(sec.spanHi);
  const eLo = doubletFactor(sec.liftLo);
  const eHi = doubletFactor(sec.liftHi);
  const N = 400;
  const row = new Array<number>(2 * N + 1);
  for (let n = -N; n <= N; n++) row[n + N] = imageFactor(n, eLo, eHi);
  let sum = 0;
  for (let m = -N; m <= N; m++) {
    const fm = imageFactor(m, dLo, dHi);
    const y2 = (m * B) ** 2;
    for (let n = -N; n <= N; n++) {
      if (m === 0 && n === 0) continue;
      const r2 = y2 + (n * H) ** 2;
      sum += (fm * row[n + N]!) / (r2 * Math.sqrt(r2));
    }
  }
  if (dLo === 1 && dHi === 1 && eLo === 1 && eHi === 1) {
    const R = ((2 * N + 1) * Math.sqrt(B * H)) / Math.sqrt(Math.PI);
    sum += (2 * Math.PI) / (B * H * R);
  }
  return (Math.pow(B * H, 1.5) / (4 * Math.PI)) * sum;
}

// the vortex-segment kernels (Biot–Savart) are imageSums.ts's: one copy serves both

/**
 * Streamline-curvature factor τ2 = δ(l)/δ(0) − 1 by Biot–Savart over the image horseshoes, as
 * imageSums.ts does for the closed section. The image horseshoe (m, n) carries lift sign
 * (−1)^m·f_m·g_n (a reflection across a side boundary swaps its legs), f, g the trailing-vortex factors.
 * The growth w(l) − w(0) of each image falls off like r⁻³, so the lattice is summed directly.
 */
export function tau2Rect(sec: RectImageSection, vortexSpan: number, l: number): number {
  const { B, H } = sec;
  const fLo = vortexFactor(sec.spanLo);
  const fHi = vortexFactor(sec.spanHi);
  const gLo = vortexFactor(sec.liftLo);
  const gHi = vortexFactor(sec.liftHi);
  const s = Math.max(vortexSpan, 1e-6 * B) / 2;
  const P0: Vec = [0, 0, 0];
  const P1: Vec = [l, 0, 0];
  const N = 120;
  let growth = 0;
  for (let m = -N; m <= N; m++) {
    const lm = (m % 2 === 0 ? 1 : -1) * imageFactor(m, fLo, fHi);
    for (let n = -N; n <= N; n++) {
      if (m === 0 && n === 0) continue;
      const sign = lm * imageFactor(n, gLo, gHi);
      growth += sign * (horseshoeW(P1, m * B, n * H, 2 * s) - horseshoeW(P0, m * B, n * H, 2 * s));
    }
  }
  const w0 = pairKernel(s, sec) / 2; // at the bound vortex, per unit circulation
  return growth / w0;
}
