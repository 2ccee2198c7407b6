/**
 * Wall-interference factors of a circular section, closed (solid wall) or open (free jet), radius R,
 * model on the axis (Glauert, ARC R&M 1566 (1933); Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing,
 * 3rd ed. (1999), 3D boundary corrections).
 */
import type { Loading } from './imageSums.ts';
import type { CircImageSection } from './sections.ts';
import { i0e, i1e, k0e, k1e } from './bessel.ts';

/**
 * Interference upwash (far-downstream value, per unit circulation) at the centre of the images of a
 * trailing pair +1 at y = +s, −1 at y = −s. In a circle a line vortex's image sits at the inverse
 * point R²/s, with the opposite circulation for a solid wall and the same for a free boundary (Milne-
 * Thomson's circle theorem; the images at the centre of the two legs cancel). Each image at R²/s
 * induces s/(2πR²) at the centre, so K_pair = ±s/(πR²).
 */
export function pairKernelCirc(s: number, sec: CircImageSection): number {
  return ((sec.boundary === 'solid' ? 1 : -1) * s) / (Math.PI * sec.R * sec.R);
}

/**
 * δ at the model centre: uniform loading C·K_pair(b/2)/(4b), elliptic (C/(πb))·∫ cos θ·K_pair dθ.
 * The kernel is linear in s, so both give exactly δ = 1/8 (closed) and −1/8 (open) for any span —
 * the classic vanishing-span values (Glauert R&M 1566; Barlow, Rae & Pope: 0.125 closed, −0.125 open
 * circular). Published span-averaged charts rise above 1/8 for large spans; this is the centre value,
 * consistent with the rectangular sections.
 */
export function deltaCirc(sec: CircImageSection, span: number, loading: Loading): number {
  const C = Math.PI * sec.R * sec.R;
  const s = span / 2;
  if (!(s > 0)) return sec.boundary === 'solid' ? 0.125 : -0.125;
  if (loading === 'uniform') return (C * pairKernelCirc(s, sec)) / (4 * span);
  // ∫_0^{π/2} cos θ·K_pair(s cos θ) dθ = K_pair(s)·π/4 for a linear kernel
  return (C / (Math.PI * span)) * pairKernelCirc(s, sec) * (Math.PI / 4);
}

/** ∫_0^∞ f(t) dt by Simpson's rule on [0, T] with n panels (f falling off like e^(−2t)). */
function simpson(f: (t: number) => number, T: number, n: number): number {
  const h = T / n;
  let sum = f(0) + f(T);
  for (let i = 1; i < n; i++) sum += (i % 2 === 1 ? 4 : 2) * f(i * h);
  return (sum * h) / 3;
}

/**
 * τ1 from the axisymmetric image field of a point doublet on the axis. Writing 1/r as
 * (2/π)∫ K0(kρ)cos(kx) dk and adding A(k)I0(kρ)cos(kx) to meet the wall condition (∂φ/∂ρ = 0 solid,
 * φ = 0 free) gives the axial interference speed at the doublet, u = ±(μ/(2π²R³))·J, with
 * J = ∫_0^∞ t²K1(t)/I1(t) dt (solid) or ∫_0^∞ t²K0(t)/I0(t) dt (free, negative sign). With μ = U·K·V
 * and C^1.5 = π^1.5·R³: τ1 = ±J/(2√π) (Glauert R&M 1566 §5; the method of Lamb, Hydrodynamics §§100–102).
 */
export function tau1Circ(sec: CircImageSection): number {
  if (sec.boundary === 'solid') {
    const J = simpson((t) => (t === 0 ? 2 : (t * t * k1e(t) * Math.exp(-2 * t)) / i1e(t)), 30, 6000);
    return J / (2 * Math.sqrt(Math.PI));
  }
  const J = simpson((t) => (t === 0 ? 0 : (t * t * k0e(t) * Math.exp(-2 * t)) / i0e(t)), 30, 6000);
  return -J / (2 * Math.sqrt(Math.PI));
}

/**
 * τ2 = w(l)/w(0) − 1 for a lifting element of vanishing span on the axis (a semi-infinite line of
 * vertical doublets from the bound vortex). Its cos θ image mode B(k)·I1(kρ)cos θ·cos(kx) meets the wall
 * condition with B ∝ k·K1′(kR)/I1′(kR) (solid) or k·K1(kR)/I1(kR) (free); integrating along the line,
 * w(x)/w(0) − 1 = −(1/π)∫_0^∞ t·K1′(t)/I1′(t)·sin(tλ) dt (solid) or (1/π)∫_0^∞ t·K1(t)/I1(t)·sin(tλ) dt
 * (free), λ = l/R; both tend to 1 far downstream. The t → 0 pole ∓2/t is integrated in closed form
 * with a factor e^(−t): ∫_0^∞ e^(−t)sin(tλ)/t dt = arctan λ. The span's effect on curvature is
 * neglected here (approximate for large spans; the rectangular sections include it).
 */
export function tau2Circ(sec: CircImageSection, l: number): number {
  const lam = l / sec.R;
  if (!(lam > 0)) return 0;
  const solid = sec.boundary === 'solid';
  /** t·K1′/I1′ (solid) or t·K1/I1 (free), whose t → 0 limit is ∓2/t. */
  const h = (t: number) => {
    const ratio = Math.exp(-2 * t);
    if (solid) {
      // K1′ = −K0 − K1/t, I1′ = I0 − I1/t (A&S 9.6.26), scaled
      const kp = -k0e(t) - k1e(t) / t;
      const ip = i0e(t) - i1e(t) / t;
      return (t * kp * ratio) / ip;
    }
    return (t * k1e(t) * ratio) / i1e(t);
  };
  const pole = solid ? -2 : 2;
  // integrand of the regular part: (h(t) − pole·e^(−t)/t)·sin(tλ); at t → 0 it tends to a finite limit
  const T = 40;
  const n = Math.max(4000, 2 * Math.ceil((T * lam * 40) / (2 * Math.PI)));
  const regular = simpson((t) => (t === 0 ? 0 : (h(t) - (pole * Math.exp(-t)) / t) * Math.sin(t * lam)), T, n);
  const integral = regular + pole * Math.atan(lam);
  return (solid ? -1 : 1) * (integral / Math.PI);
}
