import { describe, expect, it } from 'vitest';
import { deltaSmallSpan, liftInterferenceDelta, solidBlockageTau1, streamlineCurvatureTau2, trailingKernel } from '../../core/walls/imageSums.ts';
import { correct2d, sigma2d } from '../../core/walls/wall2d.ts';
import { correct3d, factors3d, helmboldSlope } from '../../core/walls/wall3d.ts';
import type { TunnelPoint } from '../../core/walls/types.ts';

const RAD = 180 / Math.PI;
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('lift-interference factor δ (method of images)', () => {
  it('gives 0.1368 for a square closed section at vanishing span (docs/methods.md §7; Barlow, Rae & Pope 3rd ed. Table 10.x classic value 0.137)', () => {
    expect(deltaSmallSpan({ B: 1, H: 1 })).toBeCloseTo(0.1368, 4);
  });

  it('gives the same δ for a 2:1 duplex section as for a square one (Glauert R&M 1566; a property of the closed form, from memory)', () => {
    expect(deltaSmallSpan({ B: 2, H: 1 })).toBeCloseTo(deltaSmallSpan({ B: 1, H: 1 }), 10);
  });

  it('tends to the closed form as the span goes to zero, for both loadings and several shapes', () => {
    for (const s of [{ B: 1, H: 1 }, { B: 1.2, H: 0.9 }, { B: 2, H: 1 }, { B: 1, H: 1.5 }]) {
      const closed = deltaSmallSpan(s);
      expect(rel(liftInterferenceDelta(s, 1e-4 * s.B, 'uniform'), closed)).toBeLessThan(1e-6);
      expect(rel(liftInterferenceDelta(s, 1e-4 * s.B, 'elliptic'), closed)).toBeLessThan(1e-6);
    }
  });

  it('grows with span in a square section, and elliptic loading lies between vanishing span and uniform loading', () => {
    const sq = { B: 1, H: 1 };
    let last = deltaSmallSpan(sq);
    for (const k of [0.2, 0.4, 0.6, 0.8]) {
      const u = liftInterferenceDelta(sq, k, 'uniform');
      const e = liftInterferenceDelta(sq, k, 'elliptic');
      expect(u).toBeGreaterThan(last);
      expect(e).toBeGreaterThan(deltaSmallSpan(sq));
      expect(e).toBeLessThan(u);
      last = u;
    }
  });

  it('has an odd image kernel (a vortex mirrored across the centre line induces the opposite upwash)', () => {
    const s = { B: 1.2, H: 0.9 };
    expect(trailingKernel(-0.3, s)).toBeCloseTo(-trailingKernel(0.3, s), 14);
    expect(trailingKernel(0, s)).toBeCloseTo(0, 15);
  });

  it('returns the closed form for a zero span instead of dividing by zero', () => {
    expect(liftInterferenceDelta({ B: 1, H: 1 }, 0, 'uniform')).toBeCloseTo(0.1368, 4);
  });
});

describe('solid-blockage factor τ1 (image sum of a source doublet)', () => {
  it('sums the square lattice Σ (m² + n²)^(−3/2) to 4·ζ(3/2)·β(3/2) = 9.0336 (Zucker, J. Phys. A 7 (1974) 1568; from memory)', () => {
    expect(solidBlockageTau1({ B: 1, H: 1 }) * 4 * Math.PI).toBeCloseTo(9.0336, 3);
  });

  it('depends only on the section shape, not its size', () => {
    expect(solidBlockageTau1({ B: 2.4, H: 1.8 })).toBeCloseTo(solidBlockageTau1({ B: 1.2, H: 0.9 }), 9);
  });
});

describe('streamline-curvature factor τ2', () => {
  it('is zero at the bound vortex and approaches 1 far downstream, where the trailing images act as infinite lines (twice the upwash)', () => {
    const s = { B: 1, H: 1 };
    expect(streamlineCurvatureTau2(s, 0.01, 1e-6)).toBeCloseTo(0, 4);
    expect(streamlineCurvatureTau2(s, 0.01, 20)).toBeCloseTo(1, 2);
  });

  it('grows monotonically with the distance behind the wing', () => {
    const s = { B: 1.2, H: 0.9 };
    const v = [0.05, 0.1, 0.2, 0.4].map((l) => streamlineCurvatureTau2(s, 0.3, l));
    for (let i = 1; i < v.length; i++) expect(v[i]!).toBeGreaterThan(v[i - 1]!);
  });
});

describe('2D corrections (Allen & Vincenti, NACA Report 782; Barlow, Rae & Pope 3rd ed. §9)', () => {
  const g = { chord: 0.3, height: 0.9, width: 1.2, volume: 0.0042, k1: 0.74 };
  const measured: TunnelPoint = { alphaDeg: 6, cl: 0.8, cd: 0.012, cm: -0.05, cy: Number.NaN, cRoll: Number.NaN, cYaw: Number.NaN, q: 500, V: 29, mach: 0.085, Re: 6e5 };

  it('computes σ = (π²/48)(c/h)²', () => {
    expect(sigma2d(0.3, 0.9)).toBeCloseTo((Math.PI ** 2 / 48) / 9, 14);
    expect(sigma2d(0, 0.9)).toBe(0);
  });

  it('applies each published term (written out here independently)', () => {
    const sigma = (Math.PI ** 2 / 48) * (0.3 / 0.9) ** 2;
    const esb = (0.74 * 0.0042) / Math.pow(1.2 * 0.9, 1.5);
    const ewb = (0.3 / (2 * 0.9)) * 0.012;
    const e = esb + ewb;
    const k = correct2d(measured, g);
    expect(k.epsSolid).toBeCloseTo(esb, 14);
    expect(k.epsWake).toBeCloseTo(ewb, 14);
    expect(k.alphaDeg).toBeCloseTo(6 + ((57.29578 * sigma) / (2 * Math.PI)) * (0.8 + 4 * -0.05), 5);
    expect(k.cl).toBeCloseTo(0.8 * (1 - sigma - 2 * e), 14);
    expect(k.cm).toBeCloseTo(-0.05 * (1 - 2 * e) + (sigma * k.cl) / 4, 14);
    expect(k.cd).toBeCloseTo(0.012 * (1 - 3 * esb - 2 * ewb), 14);
    expect(k.q).toBeCloseTo(500 * (1 + 2 * e), 10);
    expect(k.V).toBeCloseTo(29 * (1 + e), 10);
    expect(k.Re).toBeCloseTo(6e5 * (1 + e), 4);
  });

  it('skips solid blockage without a volume, and leaves a missing moment missing', () => {
    const k = correct2d({ ...measured, cm: Number.NaN }, { ...g, volume: null });
    expect(k.epsSolid).toBe(0);
    expect(k.cm).toBeNaN();
  });

  it('round-trips: free-air values made "measured" by inverting the corrections come back within 0.1 %', () => {
    const sigma = sigma2d(g.chord, g.height);
    const esb = (g.k1 * g.volume) / Math.pow(g.width * g.height, 1.5);
    const kw = g.chord / (2 * g.height);
    for (const free of [{ a: -2, cl: -0.1, cd: 0.009, cm: -0.04 }, { a: 4, cl: 0.6, cd: 0.011, cm: -0.045 }, { a: 10, cl: 1.2, cd: 0.02, cm: -0.03 }]) {
      // cd = cd_u(1 − 3ε_sb) − 2·kw·cd_u²: the smaller root of the quadratic
      const A = 2 * kw;
      const B = -(1 - 3 * esb);
      const cdU = (-B - Math.sqrt(B * B - 4 * A * free.cd)) / (2 * A);
      const e = esb + kw * cdU;
      const clU = free.cl / (1 - sigma - 2 * e);
      const cmU = (free.cm - (sigma * free.cl) / 4) / (1 - 2 * e);
      const aU = free.a - ((RAD * sigma) / (2 * Math.PI)) * (clU + 4 * cmU);
      const k = correct2d({ ...measured, alphaDeg: aU, cl: clU, cd: cdU, cm: cmU }, g);
      expect(Math.abs(k.alphaDeg - free.a)).toBeLessThan(1e-9);
      expect(rel(k.cl, free.cl)).toBeLessThan(1e-3);
      expect(rel(k.cd, free.cd)).toBeLessThan(1e-3);
      expect(rel(k.cm, free.cm)).toBeLessThan(1e-3);
    }
  });
});

describe('3D corrections (Barlow, Rae & Pope 3rd ed. §10; Glauert R&M 1566)', () => {
  const g = { area: 0.2025, span: 0.9, chord: 0.225, width: 1.2, height: 0.9, volume: 0.0021, k: 0.96, loading: 'elliptic' as const, wake: 'classic' as const, delta: null, tau1: null, tau2: null };

  it('uses the setup factors when given, and computes them otherwise', () => {
    expect(factors3d({ ...g, delta: 0.125, tau1: 0.8, tau2: 0.2 })).toEqual({ delta: 0.125, tau1: 0.8, tau2: 0.2 });
    const f = factors3d(g);
    expect(f.delta).toBeCloseTo(liftInterferenceDelta({ B: 1.2, H: 0.9 }, 0.9, 'elliptic'), 12);
    expect(f.tau1).toBeCloseTo(solidBlockageTau1({ B: 1.2, H: 0.9 }), 12);
  });

  it('gives the Helmbold slope tending to 2π for a very long wing and to πA/2 for a very short one (Helmbold 1942)', () => {
    expect(helmboldSlope(1e6)).toBeCloseTo(2 * Math.PI, 4);
    expect(helmboldSlope(1e-4) / ((Math.PI * 1e-4) / 2)).toBeCloseTo(1, 4);
  });

  it('round-trips: free-air values made "measured" by inverting the corrections come back within 0.1 %', () => {
    const f = factors3d(g);
    const C = g.width * g.height;
    const SC = g.area / C;
    const esb = (g.k * f.tau1 * g.volume) / Math.pow(C, 1.5);
    const slopeFree = 0.07; // per deg, free air
    const alphas = [-4, -2, 0, 2, 4, 6, 8];
    const free = alphas.map((a) => ({ a, cl: slopeFree * (a + 2), cd: 0.012 + 0.07 * (slopeFree * (a + 2)) ** 2, cm: -0.03 - 0.01 * slopeFree * (a + 2) }));
    // slope a of CL_w against α1 = α_u + Δα_up: find it by iterating on the inverted points
    let aRad = slopeFree * RAD;
    let tunnel: TunnelPoint[] = [];
    for (let iter = 0; iter < 30; iter++) {
      const kk = 1 - aRad * f.tau2 * f.delta * SC;
      const rows = free.map((p) => {
        const clW = p.cl / kk;
        const dSc = f.tau2 * f.delta * SC * clW;
        const alpha1 = p.a - dSc * RAD;
        const cdBlocked = p.cd - f.delta * SC * clW * clW; // = CD_u/(1+ε)²
        let eps = esb;
        for (let j = 0; j < 50; j++) eps = esb + (SC / 4) * cdBlocked * (1 + eps) ** 2;
        const s2 = (1 + eps) ** 2;
        const cmU = (p.cm - 0.25 * aRad * dSc) * s2;
        return { alpha1, clW, pt: { alphaDeg: alpha1 - f.delta * SC * clW * RAD, cl: clW * s2, cd: cdBlocked * s2, cm: cmU, cy: Number.NaN, cRoll: Number.NaN, cYaw: Number.NaN, q: 600, V: 31, mach: 0.09, Re: 4.7e5 } };
      });
      const n = rows.length;
      const mx = rows.reduce((s, r) => s + r.alpha1, 0) / n;
      const my = rows.reduce((s, r) => s + r.clW, 0) / n;
      const next = (rows.reduce((s, r) => s + (r.alpha1 - mx) * (r.clW - my), 0) / rows.reduce((s, r) => s + (r.alpha1 - mx) ** 2, 0)) * RAD;
      tunnel = rows.map((r) => r.pt);
      if (Math.abs(next - aRad) < 1e-13) break;
      aRad = next;
    }
    const res = correct3d(tunnel, tunnel.map(() => 0), g);
    res.points.forEach((k, i) => {
      const p = free[i]!;
      expect(Math.abs(k.alphaDeg - p.a)).toBeLessThan(1e-6);
      if (Math.abs(p.cl) > 1e-9) expect(rel(k.cl, p.cl)).toBeLessThan(1e-3);
      expect(rel(k.cd, p.cd)).toBeLessThan(1e-3);
      expect(rel(k.cm, p.cm)).toBeLessThan(1e-3);
    });
    expect(res.factors.sigma).toBeNull();
  });

  it('warns when the span exceeds 0.8 of the width or the blockage exceeds 0.1, and still gives numbers', () => {
    const p: TunnelPoint = { alphaDeg: 4, cl: 0.5, cd: 0.9, cm: 0, cy: Number.NaN, cRoll: Number.NaN, cYaw: Number.NaN, q: 600, V: 31, mach: 0.09, Re: 4.7e5 };
    const res = correct3d([p, { ...p, alphaDeg: 6 }], [0, 0], { ...g, span: 1.1, area: 0.5, volume: 0.05 });
    expect(res.warnings.join('\n')).toMatch(/span is 0\.92 of the tunnel width/);
    expect(res.warnings.join('\n')).toMatch(/blockage ε above 0\.1/);
    expect(Number.isFinite(res.points[0]!.cl)).toBe(true);
  });

  it('skips solid blockage with a warning when the volume is not given', () => {
    const p: TunnelPoint = { alphaDeg: 4, cl: 0.5, cd: 0.03, cm: 0, cy: Number.NaN, cRoll: Number.NaN, cYaw: Number.NaN, q: 600, V: 31, mach: 0.09, Re: 4.7e5 };
    const res = correct3d([p], [0], { ...g, volume: null });
    expect(res.points[0]!.epsSolid).toBe(0);
    expect(res.warnings.join('\n')).toContain('solid blockage is skipped');
  });

  it('subtracts the attached-flow polar in Maskell wake blockage, so attached points get only the CD0 term', () => {
    const pts: TunnelPoint[] = [-4, -2, 0, 2, 4, 6, 8, 12, 14].map((a) => {
      const cl = 0.07 * (a + 2) - (a > 8 ? 0.01 * (a - 8) ** 2 : 0);
      const sep = a > 8 ? 0.02 * (a - 8) : 0;
      return { alphaDeg: a, cl, cd: 0.012 + 0.06 * cl * cl + sep, cm: 0, cy: Number.NaN, cRoll: Number.NaN, cYaw: Number.NaN, q: 600, V: 31, mach: 0.09, Re: 4.7e5 };
    });
    const res = correct3d(pts, pts.map(() => 0), { ...g, wake: 'maskell' });
    const SC4 = g.area / (4 * g.width * g.height);
    expect(res.points[2]!.epsWake).toBeCloseTo(SC4 * 0.012, 6);
    expect(res.points[8]!.epsWake).toBeGreaterThan(SC4 * 0.012 + 5 * SC4 * 0.1);
  });
});
