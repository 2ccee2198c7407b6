import { describe, expect, it } from 'vitest';
import type { Channel } from '../../core/formats/channels.ts';
import type { PointGeometry, PointInputs } from '../../core/reduction/pointChain.ts';
import { evaluate, propagatePoint, type Correct } from '../../core/uncertainty/propagation.ts';

/**
 * The split of a point's uncertainty into its random part (weights of the fits) and the systematic
 * shifts common to every point (propagated to the characteristics afterwards), JCGM 100:2008 §5.
 */
const DEG = Math.PI / 180;
const g: PointGeometry = { area: 0.2025, chord: 0.225, span: 0.9, gamma: 1.4, axes: 'wind', offset: { x: 0, z: 0 } };
const identity: Correct = (t) => t;
const x: PointInputs = { alpha: 6 * DEG, dp: 613, p: 99000, T0: 292, rh: 0.5, force1: 0.6 * 610 * g.area, force2: 0.03 * 610 * g.area, side: Number.NaN, pitch: Number.NaN, roll: Number.NaN, yaw: Number.NaN };
const sd: Partial<Record<Channel, number>> = { lift: 0.8, drag: 0.1, dp_pitot: 4 };
const spread = { n: 25, sd: (ch: Channel) => sd[ch] ?? 0 };

describe('random and systematic parts of a point uncertainty', () => {
  it('edge case: with no instrument terms every part is random (the sample scatter) and there is no systematic shift', () => {
    const u = propagatePoint(x, g, {}, spread, identity);
    expect(u.systematic).toEqual([]);
    expect(u.random.cl).toBeCloseTo(u.u_cl, 14);
  });

  it('adds up: u² = random² + Σ systematic shifts², the pitot calibration counted once as systematic and its scatter as random', () => {
    const u = propagatePoint(x, g, { dp_pitot_pa: 1.5, force_n: 0.1, alpha_deg: 0.02, area_rel: 0.003, chord_rel: 0.002, alpha_offset_deg: 0.05 }, spread, identity);
    const names = u.systematic.map((s) => s.input).sort();
    expect(names).toEqual(['alpha offset', 'area', 'chord', 'dp_pitot calibration']);
    for (const k of ['cl', 'cd'] as const) {
      const sys = u.systematic.reduce((s, t) => s + t[k] ** 2, 0);
      expect(Math.hypot(u.random[k], Math.sqrt(sys))).toBeCloseTo(k === 'cl' ? u.u_cl : u.u_cd, 12);
    }
    // CL = L/(qS): a relative area error u_S/S moves CL by −CL·u_S/S (first order)
    const area = u.systematic.find((s) => s.input === 'area')!;
    expect(area.cl / evaluate(x, g, identity).cl).toBeCloseTo(-0.003, 8);
    // the incidence zero shifts α by its own size and leaves CL alone (wind-axis balance)
    const off = u.systematic.find((s) => s.input === 'alpha offset')!;
    expect(off.alphaDeg).toBeCloseTo(0.05, 9);
    expect(Math.abs(off.cl)).toBeLessThan(1e-9);
    // the set angle's reading stays random
    expect(u.random.alphaDeg).toBeCloseTo(0.02, 9);
  });
});
