import { describe, expect, it } from 'vitest';
import type { Channel } from '../../core/formats/channels.ts';
import type { PointGeometry as MeasureGeometry, PointInputs } from '../../core/reduction/pointChain.ts';
import { evaluate, propagatePoint, type Correct, type UncertaintySpec } from '../../core/uncertainty/propagation.ts';
import { correct2d } from '../../core/walls/wall2d.ts';
import { correct3d, correctPoint3d } from '../../core/walls/wall3d.ts';
import { evaluatePoint as measure } from '../../core/reduction/pointChain.ts';
import { normal } from '../support/random.ts';


const DEG = Math.PI / 180;
const spec: UncertaintySpec = { dp_pitot_pa: 1.5, p_static_pa: 30, t_total_c: 0.3, rh_pct: 3, force_n: 0.15, moment_nm: 0.02, alpha_deg: 0.03, area_rel: 0.003, chord_rel: 0.002 };
const g3: MeasureGeometry = { area: 0.2025, chord: 0.225, span: 0.9, gamma: 1.4, axes: 'wind', offset: { x: 0.02, z: 0 } };
const sampleSd: Partial<Record<Channel, number>> = { lift: 0.8, drag: 0.1, dp_pitot: 4, pitch: 0.05, alpha: 0.002 * DEG };
const spread = { n: 50, sd: (ch: Channel) => sampleSd[ch] ?? 0 };

function point(alphaDeg: number, cl: number, cd: number, cm: number): PointInputs {
  const q = 610;
  return { alpha: alphaDeg * DEG, dp: 613, p: 99000, T0: 292, rh: 0.5, force1: cl * q * g3.area, force2: cd * q * g3.area, side: Number.NaN, pitch: cm * q * g3.area * g3.chord, roll: Number.NaN, yaw: Number.NaN };
}

/** JCGM 101:2008 §7: draw every input from its distribution, reduce, take the standard deviation of the outputs. */
function monteCarlo(x: PointInputs, g: MeasureGeometry, correct: Correct, draws: number, seed: number) {
  const z = normal(seed);
  const rnd = (ch: Channel) => (sampleSd[ch] ?? 0) / Math.sqrt(spread.n);
  const u = {
    alpha: Math.hypot(spec.alpha_deg! * DEG, rnd('alpha')),
    dp: Math.hypot(spec.dp_pitot_pa!, rnd('dp_pitot')),
    p: spec.p_static_pa!,
    T0: spec.t_total_c!,
    rh: spec.rh_pct! / 100,
    force1: Math.hypot(spec.force_n!, rnd('lift')),
    force2: Math.hypot(spec.force_n!, rnd('drag')),
    pitch: Math.hypot(spec.moment_nm!, rnd('pitch')),
  };
  const out = { cl: [] as number[], cd: [] as number[], cm: [] as number[], q: [] as number[] };
  for (let i = 0; i < draws; i++) {
    const xi: PointInputs = { ...x };
    for (const k of Object.keys(u) as (keyof typeof u)[]) xi[k] = x[k] + u[k] * z();
    const gi = { ...g, area: g.area * (1 + spec.area_rel! * z()), chord: g.chord * (1 + spec.chord_rel! * z()) };
    const r = evaluate(xi, gi, correct);
    out.cl.push(r.cl);
    out.cd.push(r.cd);
    out.cm.push(r.cm);
    out.q.push(r.q);
  }
  const sd = (v: number[]) => {
    const m = v.reduce((s, x) => s + x, 0) / v.length;
    return Math.sqrt(v.reduce((s, x) => s + (x - m) ** 2, 0) / (v.length - 1));
  };
  return { cl: sd(out.cl), cd: sd(out.cd), cm: sd(out.cm), q: sd(out.q) };
}

const identity: Correct = (t) => t;

describe('GUM first-order uncertainty against Monte Carlo (JCGM 101:2008)', () => {
  it('is zero when every instrument is perfect and the point has one sample', () => {
    const u = propagatePoint(point(4, 0.4, 0.02, -0.04), g3, {}, { n: 1, sd: () => 0 }, identity);
    expect(u).toEqual({ u_q_pa: 0, u_v_mps: 0, u_alpha_deg: 0, u_cl: 0, u_cd: 0, u_cm: 0, random: { alphaDeg: 0, cl: 0, cd: 0, cm: 0 }, systematic: [] });
  });

  it('gives u_cm null without a pitching moment', () => {
    expect(propagatePoint({ ...point(4, 0.4, 0.02, 0), pitch: Number.NaN }, g3, spec, spread, identity).u_cm).toBeNull();
  });

  it('makes q as uncertain as the impact pressure at low speed (q ≈ Δp)', () => {
    const u = propagatePoint(point(4, 0.4, 0.02, -0.04), g3, { dp_pitot_pa: 2 }, { n: 1, sd: () => 0 }, identity);
    expect(u.u_q_pa).toBeCloseTo(2 * (1 - 613 / (1.4 * 99000)), 3); // Δp = q(1 + M²/4 + ...) with M² = 2q/(γp) (NACA Report 1135 eq. 47), so dq/dΔp ≈ 1 − Δp/(γp)
  });

  for (const [label, correct] of [
    ['uncorrected', identity],
    ['2D-corrected', (t: Parameters<Correct>[0]) => correct2d(t, { chord: 0.225, height: 0.9, width: 1.2, volume: 0.002, k1: 0.74 })],
  ] as const) {
    it(`agrees within 5 % for CL, CD and Cm at attached-flow points (${label})`, () => {
      for (const [a, cl, cd, cm] of [
        [0, 0.15, 0.014, -0.04],
        [4, 0.44, 0.027, -0.05],
        [8, 0.73, 0.05, -0.06],
      ] as const) {
        const x = point(a, cl, cd, cm);
        const gum = propagatePoint(x, g3, spec, spread, correct);
        const mc = monteCarlo(x, g3, correct, 20000, 1000 + a);
        expect(Math.abs(gum.u_cl / mc.cl - 1)).toBeLessThan(0.05);
        expect(Math.abs(gum.u_cd / mc.cd - 1)).toBeLessThan(0.05);
        expect(Math.abs(gum.u_cm! / mc.cm - 1)).toBeLessThan(0.05);
        expect(Math.abs(gum.u_q_pa / mc.q - 1)).toBeLessThan(0.05);
      }
    });
  }

  it('agrees within 5 % through the 3D corrections with the run context held fixed', () => {
    const pts = [-4, -2, 0, 2, 4, 6, 8].map((a) => point(a, 0.073 * (a + 2), 0.012 + 0.08 * (0.073 * (a + 2)) ** 2, -0.04 - 0.01 * a));
    const tunnel = pts.map((x) => measure(x, g3).tunnel);
    const res = correct3d(tunnel, tunnel.map(() => 0), { area: 0.2025, span: 0.9, chord: 0.225, width: 1.2, height: 0.9, volume: 0.0021, k: 0.96, loading: 'elliptic', wake: 'classic', delta: null, tau1: null, tau2: null });
    const correct: Correct = (t) => correctPoint3d(t, res.context);
    for (const i of [2, 4, 6]) {
      const gum = propagatePoint(pts[i]!, g3, spec, spread, correct);
      const mc = monteCarlo(pts[i]!, g3, correct, 20000, 77 + i);
      expect(Math.abs(gum.u_cl / mc.cl - 1)).toBeLessThan(0.05);
      expect(Math.abs(gum.u_cd / mc.cd - 1)).toBeLessThan(0.05);
      expect(Math.abs(gum.u_cm! / mc.cm - 1)).toBeLessThan(0.05);
    }
  });
});
