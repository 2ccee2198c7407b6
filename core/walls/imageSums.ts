/**
 * Wall-interference factors of a closed rectangular test section by the method of images
 * (Glauert, ARC R&M 1566, 1933; Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed., 1999, §10).
 *
 * Frame: x downstream, y across the width B (along the span), z up across the height H; the model
 * at the section's centre. The walls reflect the model's lifting system into images at (mB, nH)
 * whose lift has the sign (−1)^n: side walls mirror lift unchanged, floor and ceiling reverse it.
 */

export interface Section {
  /** Width along the span, m. */
  B: number;
  /** Height, m. */
  H: number;
}

export type Loading = 'elliptic' | 'uniform';

/**
 * Closed form of δ for a vanishingly small span in a closed rectangular section (docs/methods.md §7;
 * Glauert R&M 1566): δ = (πH/8B)·[1/3 + 2·Σ_{n≥1} (−1)^{n+1}/sinh²(nπH/B)].
 */
export function deltaSmallSpan({ B, H }: Section): number {
  let sum = 0;
  for (let n = 1; n < 200; n++) {
    const term = 1 / Math.sinh((n * Math.PI * H) / B) ** 2;
    sum += n % 2 === 1 ? term : -term;
    if (term < 1e-17) break;
  }
  return ((Math.PI * H) / (8 * B)) * (1 / 3 + 2 * sum);
}

/**
 * Interference upwash at the model centre (per unit circulation, far-downstream value) of the images of
 * one infinite trailing vortex at lateral position y0, the vortex itself excluded.
 * Each image column m (lateral position y_m = mB + (−1)^m y0, sign (−1)^m) is summed over its
 * alternating vertical images in closed form, Σ_n (−1)^n y/(y² + n²H²) = (π/H)/sinh(πy/H)
 * (Gradshteyn & Ryzhik 1.422.4 / 1.217), and the columns, whose terms fall off exponentially, directly.
 */
export function trailingKernel(y0: number, { B, H }: Section): number {
  const k = Math.PI / H;
  let t: number;
  const x = k * y0;
  if (Math.abs(x) < 1e-3) {
    // (π/H)csch(πy/H) − 1/y by its series, to avoid cancellation: −(k²y/6)(1 − 7(ky)²/60)
    t = -((k * x) / 6) * (1 - (7 * x * x) / 60);
  } else {
    t = k / Math.sinh(x) - 1 / y0;
  }
  for (let m = 1; m < 10000; m++) {
    const sign = m % 2 === 0 ? 1 : -1;
    const yp = m * B + sign * y0;
    const ym = -m * B + sign * y0;
    const term = sign * (k / Math.sinh(k * yp) + k / Math.sinh(k * ym));
    t += term;
    if (Math.abs(k / Math.sinh(k * (m * B - Math.abs(y0)))) < 1e-16 * Math.abs(t || 1)) break;
  }
  return -t / (2 * Math.PI);
}

/**
 * Lift-interference factor δ at the model centre, Δα = δ·(S/C)·CL (Glauert R&M 1566).
 * Uniform loading: a horseshoe of span b, Γ/V = CL·S/(2b), upwash Γ·K(b/2) at the bound vortex
 * (half the far-downstream value for each of the two legs), so δ = K(b/2)·C/(2b).
 * Elliptic loading: Γ(y) = Γ0√(1 − (2y/b)²), Γ0/V = 2CL·S/(πb); with y = (b/2)cos θ the sheet gives
 * upwash Γ0·∫_0^{π/2} cos θ·K((b/2)cos θ) dθ, so δ = (2C/(πb))·∫_0^{π/2} cos θ·K dθ.
 * As b → 0 both tend to {@link deltaSmallSpan}.
 */
export function liftInterferenceDelta(section: Section, span: number, loading: Loading): number {
  const C = section.B * section.H;
  const s = span / 2;
  if (!(s > 0)) return deltaSmallSpan(section);
  if (loading === 'uniform') return (trailingKernel(s, section) * C) / (2 * span);
  // Simpson's rule on a smooth integrand; 256 panels give ~1e-10 relative accuracy
  const N = 256;
  const h = Math.PI / 2 / N;
  let sum = 0;
  for (let i = 0; i <= N; i++) {
    const th = i * h;
    const w = i === 0 || i === N ? 1 : i % 2 === 1 ? 4 : 2;
    const c = Math.cos(th);
    const y = s * c;
    sum += w * c * (y === 0 ? 0 : trailingKernel(y, section));
  }
  const integral = (sum * h) / 3;
  return ((2 * C) / (Math.PI * span)) * integral;
}

/**
 * Solid-blockage tunnel factor τ1 from the image sum of the model's source-doublet (of strength
 * U·V_model) in a closed rectangular section: the images, all of one sign, raise the axial speed at
 * the model by Σ V_model/(4π r³), so ε_sb = K·τ1·V_model/C^1.5 with
 * τ1 = (C^1.5/4π)·Σ_{(m,n)≠0} ((mB)² + (nH)²)^(−3/2) (Glauert R&M 1566 §5; Barlow, Rae & Pope §10.1).
 * The lattice tail beyond |m|,|n| ≤ N is added as its integral, 2π/(B·H·R) for the disc radius R.
 */
export function solidBlockageTau1({ B, H }: Section): number {
  const N = 400;
  let sum = 0;
  for (let m = -N; m <= N; m++) {
    const y2 = (m * B) ** 2;
    for (let n = -N; n <= N; n++) {
      if (m === 0 && n === 0) continue;
      const r2 = y2 + (n * H) ** 2;
      const r = Math.sqrt(r2);
      sum += 1 / (r2 * r);
    }
  }
  // lattice points outside the square |m|,|n| ≤ N: approximate by the integral over the region
  // outside a disc of the same area (R = (2N+1)·√(BH)/√π), density 1/(BH)
  const R = ((2 * N + 1) * Math.sqrt(B * H)) / Math.sqrt(Math.PI);
  sum += (2 * Math.PI) / (B * H * R);
  const C = B * H;
  return (Math.pow(C, 1.5) / (4 * Math.PI)) * sum;
}

export type Vec = [number, number, number];

/** z-velocity at point P of a straight vortex segment A→B of unit strength (Biot–Savart; Katz & Plotkin, Low-Speed Aerodynamics, 2nd ed., eq. 10.115). */
function segmentW(P: Vec, A: Vec, Bp: Vec): number {
  const r1: Vec = [P[0] - A[0], P[1] - A[1], P[2] - A[2]];
  const r2: Vec = [P[0] - Bp[0], P[1] - Bp[1], P[2] - Bp[2]];
  const cx = r1[1] * r2[2] - r1[2] * r2[1];
  const cy = r1[2] * r2[0] - r1[0] * r2[2];
  const cz = r1[0] * r2[1] - r1[1] * r2[0];
  const c2 = cx * cx + cy * cy + cz * cz;
  if (c2 < 1e-24) return 0;
  const r0: Vec = [Bp[0] - A[0], Bp[1] - A[1], Bp[2] - A[2]];
  const n1 = Math.hypot(r1[0], r1[1], r1[2]);
  const n2 = Math.hypot(r2[0], r2[1], r2[2]);
  const k = (r0[0] * (r1[0] / n1 - r2[0] / n2) + r0[1] * (r1[1] / n1 - r2[1] / n2) + r0[2] * (r1[2] / n1 - r2[2] / n2)) / (4 * Math.PI * c2);
  return k * cz;
}

/** z-velocity at P of a semi-infinite vortex of unit strength starting at A and running to +∞ along x. */
function trailingW(P: Vec, A: Vec): number {
  const ry = P[1] - A[1];
  const rz = P[2] - A[2];
  const rx = P[0] - A[0];
  const d2 = ry * ry + rz * rz;
  if (d2 < 1e-24) return 0;
  const r = Math.sqrt(rx * rx + d2);
  // e = x̂: e × r = (0, −rz, ry); w component is ry
  return (ry / (4 * Math.PI * d2)) * (1 + rx / r);
}

/** Upwash at P of a unit horseshoe of span bv centred at (0, yc, zc): bound vortex along +y (lift up), legs to +∞. */
export function horseshoeW(P: Vec, yc: number, zc: number, bv: number): number {
  const s = bv / 2;
  const left: Vec = [0, yc - s, zc];
  const right: Vec = [0, yc + s, zc];
  return segmentW(P, left, right) + trailingW(P, right) - trailingW(P, left);
}

/**
 * Streamline-curvature factor τ2 = δ(l)/δ(0) − 1: how much the images' upwash grows a distance l
 * downstream of the bound vortex (Barlow, Rae & Pope 3rd ed. §10.4, where l = c/4 is used for the
 * wing's own curvature correction — from memory). The growth Σ[w(l) − w(0)] over image horseshoes of
 * vortex span bv converges absolutely and is summed directly; δ(0) comes from {@link trailingKernel}.
 */
export function streamlineCurvatureTau2(section: Section, vortexSpan: number, l: number): number {
  const { B, H } = section;
  const s = Math.max(vortexSpan, 1e-6 * B) / 2;
  const P0: Vec = [0, 0, 0];
  const P1: Vec = [l, 0, 0];
  const N = 120;
  let growth = 0;
  for (let m = -N; m <= N; m++) {
    for (let n = -N; n <= N; n++) {
      if (m === 0 && n === 0) continue;
      const sign = n % 2 === 0 ? 1 : -1;
      const yc = m * B;
      const zc = n * H;
      growth += sign * (horseshoeW(P1, yc, zc, 2 * s) - horseshoeW(P0, yc, zc, 2 * s));
    }
  }
  const w0 = trailingKernel(s, section); // per unit circulation, at the bound vortex
  return growth / w0;
}
