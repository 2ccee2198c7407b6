/** Differences at constant lift (ΔCD at the same CL) and the refusal to difference a 2D section against a 3D model. */
import { describe, expect, it } from 'vitest';
import type { PointResult, ReductionResult } from '../../core/reduction/pipeline.ts';
import { dragAtMatchedLift, dragPolarBranch, incomparable } from '../../renderer/src/logic/delta.ts';

function polar(cd0: number, alphas: number[], stall: number[] = []): PointResult[] {
  // CL = 0.1·(α + 2) up to the stall, then falling: a parabolic polar CD = CD0 + 0.05·CL² (invented values)
  const pts = alphas.map((a) => ({ alpha_deg: a, cl: 0.1 * (a + 2), u_cd: null }));
  for (const [i, a] of stall.entries()) pts.push({ alpha_deg: a, cl: 0.1 * (alphas.at(-1)! + 2) - 0.2 * (i + 1), u_cd: null });
  return pts.map((p) => ({ ...p, cd: cd0 + 0.05 * p.cl * p.cl }) as unknown as PointResult);
}

describe('drag at matched lift', () => {
  it('finds a constant ΔCD for two parabolic polars that differ only in CD0', () => {
    const base = polar(0.02, [-4, -2, 0, 2, 4, 6, 8, 10]);
    const run = polar(0.025, [-3, -1, 1, 3, 5, 7, 9]);
    const rows = dragAtMatchedLift(run, base);
    expect(rows.length).toBe(7);
    // linear interpolation of a parabola over a 0.2 CL step overestimates by at most 0.05·0.1² = 0.0005
    for (const r of rows) expect(r.delta).toBeGreaterThan(0.005 - 0.0005 - 1e-12);
    for (const r of rows) expect(r.delta).toBeLessThanOrEqual(0.005 + 1e-12);
  });

  it('leaves out CL outside the baseline range (no extrapolation) and the post-stall branch', () => {
    const base = polar(0.02, [0, 2, 4, 6], [8, 10]);
    const branch = dragPolarBranch(base);
    expect(branch.alpha).toEqual([0.2, 0.4, 0.6, 0.8].map((x) => expect.closeTo(x, 12)) as unknown as number[]);
    const run = polar(0.03, [-4, 0, 4, 8]);
    expect(dragAtMatchedLift(run, base).map((r) => r.cl)).toEqual([0.2, 0.6].map((x) => expect.closeTo(x, 12)) as unknown as number[]);
  });

  it('gives nothing for runs without points', () => {
    expect(dragAtMatchedLift([], polar(0.02, [0, 2]))).toEqual([]);
    expect(dragAtMatchedLift(polar(0.02, [0, 2]), [])).toEqual([]);
  });
});

describe('2D against 3D', () => {
  const result = (kind: '2d' | '3d') => ({ corrections: { enabled: true, kind, wake: null } }) as unknown as ReductionResult;
  it('refuses to difference a 2D section against a 3D model, and says why', () => {
    expect(incomparable(result('2d'), result('3d'), '201', '101')).toMatch(/^201 is a 2D section and the baseline 101 a 3D model: .*not on the same basis/);
    expect(incomparable(result('3d'), result('2d'), '101', '201')).toMatch(/101 is a 3D model and the baseline 201 a 2D section/);
  });
  it('compares runs of the same kind', () => {
    expect(incomparable(result('3d'), result('3d'), 'a', 'b')).toBeNull();
    expect(incomparable(result('2d'), result('2d'), 'a', 'b')).toBeNull();
  });
});
