import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { deltaRect, deltaVanishingSpan, imageFactor, pairKernel, tau1Rect, tau2Rect } from '../../core/walls/rectImages.ts';
import { deltaCirc, tau1Circ, tau2Circ } from '../../core/walls/circular.ts';
import { sectionFactors, factors2dBySection } from '../../core/walls/sectionFactors.ts';
import { checkMounting, imageProblem, sectionArea, type Boundaries, type RectImageSection, type TunnelSection } from '../../core/walls/sections.ts';
import { deltaSmallSpan, liftInterferenceDelta, solidBlockageTau1, streamlineCurvatureTau2, trailingKernel } from '../../core/walls/imageSums.ts';
import { prolateSpheroidK1, shapeFactorK } from '../../core/walls/shapeFactor.ts';
import { i0e, i1e, k0e, k1e } from '../../core/walls/bessel.ts';
import { correct3d } from '../../core/walls/wall3d.ts';
import { correct2d } from '../../core/walls/wall2d.ts';
import type { TunnelPoint } from '../../core/walls/types.ts';

/** Independent image sums (test/fixtures/walls/generate.py: rows by complex cot/csc, Bessel functions from scipy). */
const ref = JSON.parse(readFileSync(new URL('../fixtures/walls/reference.json', import.meta.url), 'utf8'));
const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-12);
const rect = (B: number, H: number, w: { spanLo: string; spanHi: string; liftLo: string; liftHi: string }): RectImageSection => ({
  shape: 'rectangular',
  B,
  H,
  ...(w as Omit<RectImageSection, 'shape' | 'B' | 'H'>),
});
const SOLID: Boundaries = { floor: 'solid', ceiling: 'solid', left: 'solid', right: 'solid' };
const FREE: Boundaries = { floor: 'free', ceiling: 'free', left: 'free', right: 'free' };
const tunnelRect = (width: number, height: number, boundaries: Boundaries = SOLID, fillet = 0): TunnelSection => ({
  shape: 'rectangular',
  width,
  height,
  boundaries,
  fillet,
});

describe('held-out values of δ at vanishing span', () => {
  it('closed circular section: δ = 0.125 (Glauert, ARC R&M 1566; Barlow, Rae & Pope 3rd ed.)', () => {
    const f = sectionFactors({
      tunnel: { shape: 'circular', diameter: 2, boundary: 'solid' },
      mounting: { kind: 'full' },
      span: 1e-6,
      chord: 0.1,
      loading: 'elliptic',
    });
    expect(f.delta).toBeCloseTo(0.125, 10);
    expect(deltaCirc({ shape: 'circular', R: 1, boundary: 'solid' }, 0, 'uniform')).toBe(0.125);
  });

  it('open circular jet: δ = −0.125 (Glauert, ARC R&M 1566; Barlow, Rae & Pope 3rd ed.)', () => {
    const f = sectionFactors({
      tunnel: { shape: 'circular', diameter: 2, boundary: 'free' },
      mounting: { kind: 'full' },
      span: 1e-6,
      chord: 0.1,
      loading: 'uniform',
    });
    expect(f.delta).toBeCloseTo(-0.125, 10);
  });

  it('closed square section: δ = 0.137 (DESIGN closed form; Barlow, Rae & Pope classic tabulated value), also from the generic image sum', () => {
    expect(deltaVanishingSpan(rect(1, 1, { spanLo: 'solid', spanHi: 'solid', liftLo: 'solid', liftHi: 'solid' }))).toBeCloseTo(0.1368, 4);
    for (const [B, H] of [
      [1, 1],
      [1.2, 0.9],
      [2, 1],
      [1, 1.6],
    ] as const) {
      expect(
        rel(deltaVanishingSpan(rect(B, H, { spanLo: 'solid', spanHi: 'solid', liftLo: 'solid', liftHi: 'solid' })), deltaSmallSpan({ B, H })),
      ).toBeLessThan(1e-12);
    }
  });

  it('open square jet: δ = −0.137, the closed value with the sign reversed (images of a square are self-similar under the swap; Barlow, Rae & Pope tabulate ±0.137 — from memory)', () => {
    expect(deltaVanishingSpan(rect(1, 1, { spanLo: 'free', spanHi: 'free', liftLo: 'free', liftHi: 'free' }))).toBeCloseTo(-0.1368, 4);
  });
});

describe('rectangular sections with solid and free boundaries against the independent image sum', () => {
  it('the generic sum reproduces the closed-section functions exactly (kernel, δ both loadings, τ1, τ2)', () => {
    const s = rect(1.2, 0.9, { spanLo: 'solid', spanHi: 'solid', liftLo: 'solid', liftHi: 'solid' });
    expect(rel(pairKernel(0.3, s), 2 * trailingKernel(0.3, { B: 1.2, H: 0.9 }))).toBeLessThan(1e-12);
    for (const L of ['uniform', 'elliptic'] as const) expect(rel(deltaRect(s, 0.9, L), liftInterferenceDelta({ B: 1.2, H: 0.9 }, 0.9, L))).toBeLessThan(1e-10);
    expect(rel(tau1Rect(s), solidBlockageTau1({ B: 1.2, H: 0.9 }))).toBeLessThan(1e-12);
    expect(rel(tau2Rect(s, 0.7, 0.06), streamlineCurvatureTau2({ B: 1.2, H: 0.9 }, 0.7, 0.06))).toBeLessThan(1e-12);
  });

  it(`δ matches the reference for ${ref.delta_rect.length} cases: six boundary sets, four shapes, span ratios 0.0005–0.75, both loadings`, () => {
    for (const c of ref.delta_rect) {
      const got = deltaRect(rect(c.B, c.H, ref.wallsets[c.walls]), c.span, c.loading);
      expect(Math.abs(got - c.delta), `${c.walls} ${c.B}×${c.H} b=${c.span} ${c.loading}`).toBeLessThan(2e-7);
    }
  });

  it('δ at vanishing span is the limit of the finite-span sum for every boundary set', () => {
    for (const w of Object.values(ref.wallsets) as { spanLo: string; spanHi: string; liftLo: string; liftHi: string }[]) {
      const s = rect(1.2, 0.9, w);
      expect(Math.abs(deltaVanishingSpan(s) - deltaRect(s, 1e-4, 'uniform'))).toBeLessThan(1e-7);
    }
  });

  it('τ1 matches the brute-force lattice of the reference, and is negative for open jets', () => {
    for (const c of ref.tau1_rect) {
      const got = tau1Rect(rect(c.B, c.H, ref.wallsets[c.walls]));
      expect(Math.abs(got - c.tau1), `${c.walls} ${c.B}×${c.H}`).toBeLessThan(2e-4 * Math.max(1, Math.abs(c.tau1)));
    }
    expect(tau1Rect(rect(1, 1, ref.wallsets.open))).toBeLessThan(0);
  });

  it('τ2 matches the reference built from the closed-form field of a lifting element of vanishing span', () => {
    for (const c of ref.tau2_rect) {
      // a square with one solid and one free wall on each axis has δ ≈ 0 at vanishing span, so the ratio τ2 is
      // ill-conditioned there (the correction uses the finite product τ2·δ); compare where δ is not tiny
      const d0 = deltaVanishingSpan(rect(c.B, c.H, ref.wallsets[c.walls]));
      if (Math.abs(d0) < 1e-3) continue;
      const got = tau2Rect(rect(c.B, c.H, ref.wallsets[c.walls]), 1e-4 * c.B, c.l);
      expect(Math.abs(got - c.tau2), `${c.walls} ${c.B}×${c.H} l=${c.l}`).toBeLessThan(2e-3 * Math.max(1, Math.abs(c.tau2)));
    }
  });

  it('counts reflections alternately across the two walls (image n > 0 crosses the high wall first)', () => {
    expect([1, 2, 3, -1, -2, -3].map((m) => imageFactor(m, -1, 1))).toEqual([1, -1, -1, -1, -1, 1]);
    expect([1, 2, 3, 4].map((m) => imageFactor(m, -1, -1))).toEqual([-1, 1, -1, 1]);
  });
});

describe('circular sections against the independent Bessel-function integrals (scipy)', () => {
  const closed = { shape: 'circular' as const, R: 1, boundary: 'solid' as const };
  const open = { ...closed, boundary: 'free' as const };

  it('τ1: closed 0.70617, open −0.18248', () => {
    expect(tau1Circ(closed)).toBeCloseTo(ref.circular.solid.tau1, 5);
    expect(tau1Circ(open)).toBeCloseTo(ref.circular.free.tau1, 5);
  });

  it('τ2 at five distances behind the wing, closed and open; 0 at the wing and 1 far downstream', () => {
    for (const [b, sec] of [
      ['solid', closed],
      ['free', open],
    ] as const) {
      for (const c of ref.circular[b].tau2) expect(Math.abs(tau2Circ(sec, c.lam) - c.tau2), `${b} λ=${c.lam}`).toBeLessThan(2e-5);
      expect(tau2Circ(sec, 0)).toBe(0);
      expect(tau2Circ(sec, 40)).toBeCloseTo(1, 2);
    }
  });

  it('δ at the centre is ±1/8 at every span and for both loadings (inverse-point images are linear in the vortex position)', () => {
    for (const b of ['solid', 'free'] as const) {
      for (const c of ref.circular[b].delta) {
        for (const L of ['uniform', 'elliptic'] as const) expect(deltaCirc(b === 'solid' ? closed : open, 2 * c.span_ratio, L)).toBeCloseTo(c.delta, 12);
      }
    }
  });

  it('the Bessel approximations match tabulated values (Abramowitz & Stegun Table 9.8: e^-x I0(1) = 0.4657596, e^x K1(2) = 1.0334768)', () => {
    expect(i0e(1)).toBeCloseTo(0.4657596, 6);
    expect(i1e(1)).toBeCloseTo(0.2079104, 6);
    expect(k0e(2)).toBeCloseTo(0.8415682, 6);
    expect(k1e(2)).toBeCloseTo(1.0334768, 6);
  });
});

describe('solid blockage: K and τ1 on one normalisation', () => {
  it('K = 1 + k1 from the added mass of a prolate spheroid: sphere 1.5, fineness 6 → 1.045, slender → 1 (Lamb, Hydrodynamics §373)', () => {
    expect(shapeFactorK(1)).toBe(1.5);
    expect(prolateSpheroidK1(1.0001)).toBeCloseTo(0.5, 3);
    expect(shapeFactorK(6)).toBeCloseTo(1.0452, 4);
    // Lamb's table of k1 for prolate spheroids: a/b = 2 → 0.210, a/b = 4 → 0.082, a/b = 10 → 0.021 (from memory)
    expect(prolateSpheroidK1(2)).toBeCloseTo(0.21, 2);
    expect(prolateSpheroidK1(4)).toBeCloseTo(0.082, 3);
    expect(prolateSpheroidK1(10)).toBeCloseTo(0.021, 3);
  });

  it('K·τ1 reproduces the published sphere blockage in a closed circular tunnel, ε = 0.797 (d/D)³ (Lock, ARC R&M 1275 (1929), as quoted in Glauert R&M 1566 §5 — from memory)', () => {
    const d = 0.2;
    const D = 1;
    const V = (Math.PI * d ** 3) / 6;
    const C = (Math.PI * D * D) / 4;
    const eps = (shapeFactorK(1) * tau1Circ({ shape: 'circular', R: D / 2, boundary: 'solid' }) * V) / C ** 1.5;
    expect(eps / (d / D) ** 3).toBeCloseTo(0.797, 3);
  });

  it('the sphere in an open circular jet gets the opposite sign, ε = −0.206 (d/D)³ (Glauert R&M 1566 §5 — from memory)', () => {
    const eps = (1.5 * tau1Circ({ shape: 'circular', R: 0.5, boundary: 'free' }) * (Math.PI / 6) * 0.2 ** 3) / (Math.PI / 4) ** 1.5;
    expect(eps / 0.2 ** 3).toBeCloseTo(-0.206, 3);
  });
});

describe('half models on a reflection plane', () => {
  it('δ of a floor-mounted half model equals the independent sum over its tip vortex images in the real section (uniform loading)', () => {
    for (const c of ref.half_model) {
      const f = sectionFactors({
        tunnel: tunnelRect(c.width, c.height, c.walls),
        mounting: { kind: 'half', wall: 'floor' },
        span: c.semispan,
        chord: 0.1,
        loading: 'uniform',
      });
      expect(Math.abs(f.delta - c.delta_uniform), JSON.stringify(c)).toBeLessThan(1e-8);
    }
  });

  it('is the mirrored full model: twice the span in the mirrored section, with span vertical for a floor mount', () => {
    const half = sectionFactors({ tunnel: tunnelRect(1.2, 0.9), mounting: { kind: 'half', wall: 'floor' }, span: 0.5, chord: 0.2, loading: 'elliptic' });
    // a full model of span 1.0 in a closed section 1.8 wide (the doubled height) and 1.2 high (the width)
    const full = sectionFactors({ tunnel: tunnelRect(1.8, 1.2), mounting: { kind: 'full' }, span: 1.0, chord: 0.2, loading: 'elliptic' });
    expect(half.delta).toBeCloseTo(full.delta, 12);
    expect(half.tau2).toBeCloseTo(full.tau2, 12);
    // ε = K·τ1·V/C^1.5 with the half model's V and the real C equals the mirrored model's 2V in 2C
    expect((half.tau1 * 1) / 1.08 ** 1.5).toBeCloseTo((full.tau1 * 2) / 2.16 ** 1.5, 12);
    const side = sectionFactors({ tunnel: tunnelRect(0.9, 1.2), mounting: { kind: 'half', wall: 'left' }, span: 0.5, chord: 0.2, loading: 'elliptic' });
    expect(side.delta).toBeCloseTo(full.delta, 12);
  });

  it('a half model on a free boundary, or in a circular section, is refused naming the field', () => {
    const e1 = checkMounting(tunnelRect(1.2, 0.9, { ...SOLID, floor: 'free' }), { kind: 'half', wall: 'floor' }, '3d', 0.4).errors;
    expect(e1[0]?.field).toBe('model.reflection_wall');
    const e2 = checkMounting({ shape: 'circular', diameter: 1, boundary: 'solid' }, { kind: 'half', wall: 'floor' }, '3d', 0.4).errors;
    expect(e2[0]?.field).toBe('model.mounting');
  });

  it('refuses a semi-span that reaches the opposite wall and cautions above 0.8 of it', () => {
    expect(checkMounting(tunnelRect(1.2, 0.9), { kind: 'half', wall: 'floor' }, '3d', 0.95).errors[0]?.field).toBe('model.span_m');
    const c = checkMounting(tunnelRect(1.2, 0.9), { kind: 'half', wall: 'floor' }, '3d', 0.8);
    expect(c.errors).toEqual([]);
    expect(c.cautions[0]?.message).toMatch(/semi-span is 0\.89 of the distance from the floor/);
  });
});

describe('corner fillets', () => {
  it('take 2f² from the section area and raise the wake blockage (S/4C)·CD by BH/C', () => {
    expect(sectionArea(tunnelRect(1.2, 0.9, SOLID, 0.15))).toBeCloseTo(1.08 - 0.045, 12);
    const p: TunnelPoint = {
      alphaDeg: 2,
      cl: 0.3,
      cd: 0.05,
      cm: Number.NaN,
      cy: Number.NaN,
      cRoll: Number.NaN,
      cYaw: Number.NaN,
      q: 600,
      V: 31,
      mach: 0.09,
      Re: 4.7e5,
    };
    const g = {
      area: 0.2,
      span: 0.9,
      chord: 0.22,
      width: 1.2,
      height: 0.9,
      volume: null,
      k: 1,
      loading: 'elliptic' as const,
      wake: 'classic' as const,
      delta: 0.12,
      tau1: 0.75,
      tau2: 0.1,
    };
    const plain = correct3d([p], [0], { ...g, section: tunnelRect(1.2, 0.9) }).points[0]!;
    const filleted = correct3d([p], [0], { ...g, section: tunnelRect(1.2, 0.9, SOLID, 0.15) }).points[0]!;
    expect(plain.epsWake).toBeCloseTo((0.2 / (4 * 1.08)) * 0.05, 14);
    expect(filleted.epsWake).toBeCloseTo((0.2 / (4 * 1.035)) * 0.05, 14);
  });

  it('refuses fillets that leave no flat wall, and cautions when they take over 10 % of the area', () => {
    expect(checkMounting(tunnelRect(1.2, 0.9, SOLID, 0.45), { kind: 'full' }, '3d', 0.5).errors[0]?.field).toBe('tunnel.fillet_m');
    expect(checkMounting(tunnelRect(1.2, 0.9, SOLID, 0.25), { kind: 'full' }, '3d', 0.5).cautions[0]?.field).toBe('tunnel.fillet_m');
  });
});

describe('free jets in the 3D correction', () => {
  const p: TunnelPoint = {
    alphaDeg: 4,
    cl: 0.5,
    cd: 0.04,
    cm: -0.02,
    cy: Number.NaN,
    cRoll: Number.NaN,
    cYaw: Number.NaN,
    q: 600,
    V: 31,
    mach: 0.09,
    Re: 4.7e5,
  };
  const g = {
    area: 0.2025,
    span: 0.9,
    chord: 0.225,
    width: 1.2,
    height: 0.9,
    volume: 0.0021,
    k: 1.045,
    loading: 'elliptic' as const,
    wake: 'classic' as const,
    delta: null,
    tau1: null,
    tau2: null,
  };

  it('an open jet has no wake blockage, a negative solid blockage and a negative angle correction, and says so', () => {
    const res = correct3d([p, { ...p, alphaDeg: 6 }], [0, 0], { ...g, section: tunnelRect(1.2, 0.9, FREE) });
    const k = res.points[0]!;
    expect(k.epsWake).toBe(0);
    expect(k.epsSolid).toBeLessThan(0);
    expect(res.factors.delta!).toBeLessThan(0);
    expect(k.alphaDeg).toBeLessThan(p.alphaDeg);
    expect(res.warnings.join('\n')).toMatch(/free boundary: wake blockage is taken as zero/);
  });

  it('a closed section given explicitly gives the same numbers as the classic geometry', () => {
    const a = correct3d([p, { ...p, alphaDeg: 6 }], [0, 0], g);
    const b = correct3d([p, { ...p, alphaDeg: 6 }], [0, 0], { ...g, section: tunnelRect(1.2, 0.9), mounting: { kind: 'full' } });
    expect(b.points).toEqual(a.points);
    expect(b.factors).toEqual(a.factors);
  });
});

describe('pitching moment about the actual reference and with the tail on', () => {
  const pts: TunnelPoint[] = [-2, 0, 2, 4, 6].map((a) => ({
    alphaDeg: a,
    cl: 0.08 * (a + 2),
    cd: 0.02,
    cm: -0.02,
    cy: Number.NaN,
    cRoll: Number.NaN,
    cYaw: Number.NaN,
    q: 600,
    V: 31,
    mach: 0.09,
    Re: 4.7e5,
  }));
  const g = {
    area: 0.2025,
    span: 0.9,
    chord: 0.225,
    width: 1.2,
    height: 0.9,
    volume: null,
    k: 1,
    loading: 'elliptic' as const,
    wake: 'classic' as const,
    delta: 0.12,
    tau1: 0.75,
    tau2: 0.1,
  };

  it('puts the curvature lift at the half chord: about 0.25c the term is −0.25·ΔCL_sc (BRP eq. 10.62), about 0.5c it vanishes, about 0.35c it is −0.15·ΔCL_sc', () => {
    const qc = correct3d(
      pts,
      pts.map(() => 0),
      g,
    ).points;
    const half = correct3d(
      pts,
      pts.map(() => 0),
      { ...g, momentRefXc: 0.5 },
    ).points;
    const x35 = correct3d(
      pts,
      pts.map(() => 0),
      { ...g, momentRefXc: 0.35 },
    ).points;
    qc.forEach((k, i) => {
      const base = pts[i]!.cm / (1 + k.epsSolid + k.epsWake) ** 2;
      const dClSc = (k.cm - base) / -0.25;
      expect(half[i]!.cm).toBeCloseTo(base, 14);
      expect(x35[i]!.cm).toBeCloseTo(base - 0.15 * dClSc, 14);
    });
  });

  it('with a tail arm and ∂Cm/∂α_t, removes the moment of the extra upwash at the tail: ΔCm_t = −(∂Cm/∂α_t)·δ·τ2(l_t)·(S/C)·CL_w', () => {
    const base = correct3d(
      pts,
      pts.map(() => 0),
      g,
    );
    const tail = correct3d(
      pts,
      pts.map(() => 0),
      { ...g, tailArm: 0.6, tailCmPerDeg: -0.02 },
    );
    const t2 = streamlineCurvatureTau2({ B: 1.2, H: 0.9 }, (Math.PI / 4) * 0.9, 0.6);
    tail.points.forEach((k, i) => {
      const clW = pts[i]!.cl / (1 + k.epsWake) ** 2;
      expect(k.cm - base.points[i]!.cm).toBeCloseTo(0.02 * (180 / Math.PI) * 0.12 * t2 * (0.2025 / 1.08) * clW, 12);
    });
    expect(tail.warnings.join('\n')).toMatch(/τ2 at the tail arm 0\.6 m/);
    expect(
      correct3d(
        pts,
        pts.map(() => 0),
        { ...g, tailArm: 0.6 },
      ).warnings.join('\n'),
    ).toMatch(/tail_cm_per_deg/);
  });
});

describe('2D models in sections with a free floor or ceiling', () => {
  const p: TunnelPoint = {
    alphaDeg: 4,
    cl: 0.5,
    cd: 0.012,
    cm: -0.05,
    cy: Number.NaN,
    cRoll: Number.NaN,
    cYaw: Number.NaN,
    q: 500,
    V: 29,
    mach: 0.085,
    Re: 6e5,
  };
  const g = { chord: 0.3, height: 0.9, width: 1.2, volume: 0.004, k1: 0.74 };

  it('scales σ by −2 and ε_sb by −1/2 between two free boundaries, by 1/4 and −1/8 with one of each, and drops the wake blockage (image sums Σ′c_n/n²)', () => {
    expect(factors2dBySection('free', 'free')).toEqual({ sigma: -2, solid: -0.5, wake: false });
    expect(factors2dBySection('solid', 'free')).toEqual({ sigma: 0.25, solid: -0.125, wake: false });
    // the sums themselves: Σ′(−1)^n/n² = −π²/6, Σ′1/n² = π²/3, one wall of each: Σ over even n of (−1)^(n/2)/n² = −π²/24
    let alt = 0,
      same = 0,
      mixed = 0;
    for (let n = 1; n < 200000; n++) {
      alt += (2 * (n % 2 ? -1 : 1)) / (n * n);
      same += 2 / (n * n);
      if (n % 2 === 0) mixed += (2 * ((n / 2) % 2 ? -1 : 1)) / (n * n);
    }
    expect(same / alt).toBeCloseTo(-2, 4);
    expect(mixed / alt).toBeCloseTo(0.25, 4);
    const closed = correct2d(p, g);
    const open = correct2d(p, { ...g, floor: 'free', ceiling: 'free' });
    expect(open.epsWake).toBe(0);
    expect(open.epsSolid).toBeCloseTo(-0.5 * closed.epsSolid, 14);
  });

  it('gives the same cm about another reference as about the quarter chord, moved by cl·Δx', () => {
    const qc = correct2d(p, g);
    const cmAt40 = p.cm + p.cl * (0.4 - 0.25); // the same loads about 0.40c: cm_a = cm_b + cl·(x_a − x_b)
    const k = correct2d({ ...p, cm: cmAt40 }, { ...g, momentRefXc: 0.4 });
    expect(k.alphaDeg).toBeCloseTo(qc.alphaDeg, 12);
    expect(k.cm).toBeCloseTo(qc.cm + qc.cl * (0.4 - 0.25), 12);
  });

  it('refuses a 2D model in a circular section or between free side boundaries', () => {
    expect(checkMounting({ shape: 'circular', diameter: 1, boundary: 'solid' }, { kind: 'full' }, '2d', undefined).errors[0]?.field).toBe('tunnel.section');
    expect(checkMounting(tunnelRect(1.2, 0.9, { ...SOLID, right: 'free' }), { kind: 'full' }, '2d', undefined).errors[0]?.field).toBe(
      'tunnel.boundaries.right',
    );
  });
});

describe('image problems', () => {
  it('maps a side-wall half model to a section twice as wide bounded by the opposite wall on both span ends', () => {
    const p = imageProblem(tunnelRect(1.2, 0.9, { floor: 'solid', ceiling: 'free', left: 'solid', right: 'free' }), { kind: 'half', wall: 'left' }, 0.5);
    expect(p).toEqual({
      section: { shape: 'rectangular', B: 2.4, H: 0.9, spanLo: 'free', spanHi: 'free', liftLo: 'solid', liftHi: 'free' },
      span: 1,
      mirror: 2,
    });
  });

  it('refuses a full model whose span does not fit and cautions above 0.8 of the width or diameter', () => {
    expect(checkMounting(tunnelRect(1.2, 0.9), { kind: 'full' }, '3d', 1.2).errors[0]?.field).toBe('model.span_m');
    expect(checkMounting({ shape: 'circular', diameter: 1, boundary: 'free' }, { kind: 'full' }, '3d', 0.85).cautions[0]?.message).toMatch(
      /0\.85 of the diameter/,
    );
  });
});
