/**
 * The Characteristics view's rows (renderer/src/logic/fitRows.ts) on runs reduced by core: a CLmax
 * that is null says why in words, a present one says how it was found and carries its standard
 * uncertainty rounded by GUM §7.2.6 with a random/systematic breakdown, the linear range says how it was
 * chosen, and every sweep branch is listed. Runs are the invented sample runs (cut or swept back).
 */
import { describe, expect, it } from 'vitest';
import { readRunText } from '../../core/formats/runFile.ts';
import { readSetup, reduceRun } from '../../core/reduction/engine.ts';
import type { ReductionResult } from '../../core/reduction/pipeline.ts';
import {
  branchRows,
  cellTitle,
  clMaxReasonShort,
  clMaxReasonText,
  fitCell,
  FIT_ROWS,
  fitRowsFor,
  FOLDED,
  uncertaintyBreakdown,
} from '../../renderer/src/logic/fitRows.ts';
import { uncertainty, withUncertainty } from '../../renderer/src/logic/numberFormat.ts';
import { sample, TEST_UNCERTAINTY } from './support.ts';

const SETUP_3D = JSON.parse(sample('setup-3d.json')) as Record<string, unknown>;
const TARE = sample('windoff-tare.csv');

function reduce(file: string, text: string, setup: unknown = SETUP_3D): ReductionResult {
  const s = readSetup('setup.json', JSON.stringify(setup));
  if (!s.ok) throw new Error(JSON.stringify(s.errors));
  const r = reduceRun({ run: readRunText(file, text), setup: s.value, tare: readRunText('windoff-tare.csv', TARE) });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

const row = (key: string) => FIT_ROWS.find((r) => r.key === key)!;
const lines = () => sample('run-101-clean.csv').trimEnd().split('\n');
const headerAt = () => lines().findIndex((l) => l.startsWith('alpha'));

/** Run 101 up to α = 10°: CL still rising at the last point. */
function noStall(): string {
  const l = lines();
  const h = headerAt();
  return [...l.slice(0, h + 1), ...l.slice(h + 1).filter((x) => Number(x.split(',')[0]) < 10.5)].join('\n') + '\n';
}

/** Run 101 up, then back down with 10 N less lift between 10.5° and 13.5° (late reattachment). */
function returnSweep(): string {
  const l = lines();
  const h = headerAt();
  const up = l.slice(h + 1);
  const down = up
    .slice(0, -1)
    .reverse()
    .map((x) => {
      const c = x.split(',');
      const a = Number(c[0]) + 0.03;
      c[0] = a.toFixed(3);
      if (a > 10.5 && a < 13.5) c[5] = (Number(c[5]) - 10).toFixed(3);
      return c.join(',');
    });
  return [...l.slice(0, h + 1), ...up, ...down].join('\n') + '\n';
}

describe('CLmax: the reason in words when there is none', () => {
  it('edge cases of the wording: no reason, too few points, no drop, an unknown reason passed on as it is', () => {
    expect(clMaxReasonText(null)).toBe('not determined');
    expect(clMaxReasonText('only 2 points')).toBe('too few points (2) in this sweep branch to find a peak');
    expect(clMaxReasonText('CL does not drop by more than 0.020 after its highest value (α = 12.00°): no stall is seen')).toBe(
      'no stall seen: after its highest value (α = 12.00°) CL never falls by more than 0.020, the drop that marks a stall for this scatter',
    );
    expect(clMaxReasonText('something new')).toBe('something new');
    expect(clMaxReasonShort('only 2 points')).toBe('too few points');
    expect(clMaxReasonShort(null)).toBe('not determined');
  });

  it('a run cut before the stall shows "—" and says the peak was not reached, at which angle, for CLmax, its α and the stall angle', () => {
    const r = reduce('run-107.csv', noStall());
    expect(r.fit.cl_max).toBeNull();
    for (const key of ['cl_max', 'alpha_cl_max_deg', 'alpha_stall_deg']) {
      const c = fitCell(row(key), r);
      expect(c.text).toBe('—');
      expect(c.value).toBeNull();
      expect(c.reason).toMatch(/^not reached: CL is still rising at the highest angle of the sweep \(α = \d+\.\d\d°\); the sweep stops before the stall$/);
      expect(c.short).toBe('not reached (CL still rising)');
      expect(cellTitle(c)).toBe(c.reason);
    }
    // the lift curve is still fitted below the last point
    expect(fitCell(row('cl_alpha_per_deg'), r).value).not.toBeNull();
  });
});

describe('values with their uncertainty and how they were found', () => {
  it('CLmax without instrument uncertainties: the value at its default resolution and the method', () => {
    const r = reduce('run-101.csv', sample('run-101-clean.csv'));
    const c = fitCell(row('cl_max'), r);
    expect(r.fit.cl_max_method).toBe('parabola');
    expect(c.text).toBe(r.fit.cl_max!.toFixed(4));
    expect(c.u).toBeUndefined();
    expect(c.note).toBe('parabola through the peak');
    expect(c.hint).toBe('CLmax is the vertex of the parabola through the highest point and its two neighbours');
  });

  it('with instrument uncertainties: "v ± u" rounded to u\'s second significant digit (GUM §7.2.6), the hover splitting random and systematic parts', () => {
    const r = reduce('run-101.csv', sample('run-101-clean.csv'), { ...SETUP_3D, uncertainty: TEST_UNCERTAINTY });
    const slope = fitCell(row('cl_alpha_per_deg'), r);
    expect(slope.u).toBe(r.fit.cl_alpha_u_per_deg);
    expect(slope.text).toBe(withUncertainty(r.fit.cl_alpha_per_deg, r.fit.cl_alpha_u_per_deg, 5));
    expect(slope.text).toMatch(/^0\.0\d+ ± 0\.000\d\d$/);
    // combined² = random² + Σ systematic² (how core combines them)
    const sys = Object.values(r.fit_systematic['cl_alpha_per_deg']!);
    expect(sys.length).toBeGreaterThan(0);
    expect(Math.hypot(r.fit.cl_alpha_stderr_per_deg!, ...sys)).toBeCloseTo(r.fit.cl_alpha_u_per_deg!, 12);
    expect(slope.breakdown).toBe(uncertaintyBreakdown(row('cl_alpha_per_deg'), r));
    expect(slope.breakdown).toContain(`u = ${uncertainty(r.fit.cl_alpha_u_per_deg)} (standard uncertainty, k = 1)`);
    expect(slope.breakdown).toContain(`random ${uncertainty(r.fit.cl_alpha_stderr_per_deg)} (standard error of the fit)`);
    expect(slope.breakdown).toContain(`systematic ${uncertainty(Math.hypot(...sys))}: `);
    expect(slope.breakdown).toMatch(/reference area|reference chord|pitot Δp calibration/);
    expect(slope.breakdown).not.toMatch(/dp_pitot|_calibration/);

    // CLmax keeps its combined u in one field: the random part is what is left after the systematic shifts
    const clmax = fitCell(row('cl_max'), r);
    expect(clmax.u).toBe(r.fit.cl_max_u);
    expect(clmax.text).toBe(withUncertainty(r.fit.cl_max, r.fit.cl_max_u, 4));
    const sysMax = Object.values(r.fit_systematic['cl_max'] ?? {});
    const randomMax = Math.sqrt(Math.max(0, r.fit.cl_max_u! ** 2 - sysMax.reduce((a, v) => a + v * v, 0)));
    expect(clmax.breakdown).toContain(`random ${uncertainty(randomMax)} (from the points' random uncertainties)`);
    expect(cellTitle(clmax)).toBe(`${clmax.hint}\n${clmax.breakdown}`);
  });

  it('says when a value has no systematic part, and gives no breakdown where there is no uncertainty', () => {
    const r = reduce('run-101.csv', sample('run-101-clean.csv'));
    expect(uncertaintyBreakdown(row('cl_alpha_per_deg'), r)).toMatch(/; no systematic part \(the setup gives no instrument calibration uncertainties\)$/);
    // a characteristic with no uncertainty field at all has no breakdown
    expect(uncertaintyBreakdown(row('cd_min'), r)).toBeUndefined();
  });

  it('says how the linear range was chosen: from the scatter, or set in the setup', () => {
    const r = reduce('run-101.csv', sample('run-101-clean.csv'));
    const c = fitCell(row('linear_range_deg'), r);
    expect(c.note).toBe(`${r.fit.linear_range_points} points, from the scatter`);
    expect(c.hint).toMatch(
      /found from the data: points within ±0\.\d{4} in CL of the line, a tolerance from the run's own scatter \(scatter σ of CL 0\.\d{4}\)$/,
    );
    const set = reduce('run-101.csv', sample('run-101-clean.csv'), { ...SETUP_3D, fit: { alpha_range_deg: [-4, 8] } });
    const s = fitCell(row('linear_range_deg'), set);
    expect(s.note).toMatch(/^\d+ points, set in the setup$/);
    expect(s.hint).toMatch(/range set in the setup \(fit\.alpha_range_deg\)$/);
    // with a range set in the setup the tolerance row gives the largest residual of its points, and says so
    const tol = fitCell(row('linear_tolerance_cl'), set);
    expect(tol.value).toBe(set.fit.linear_tolerance_cl);
    expect(tol.note).toBe('largest residual');
  });

  it('shows every key of the fit once: as a row, or folded into a row as its uncertainty, method or reason', () => {
    const r = reduce('run-101.csv', sample('run-101-clean.csv'));
    const keys = fitRowsFor(r.fit).map((x) => x.key);
    for (const k of Object.keys(r.fit)) expect(keys.includes(k as never) !== FOLDED.has(k as never), k).toBe(true);
  });
});

describe('sweep branches', () => {
  it('a single sweep: one branch, fitted, and no hysteresis loop ("single sweep")', () => {
    const r = reduce('run-101.csv', sample('run-101-clean.csv'));
    const b = branchRows(r);
    expect(b).toHaveLength(1);
    expect(b[0]).toMatchObject({ label: '1 of 1', direction: 'α rising', fitted: true, points: r.points.length, clMaxReason: null });
    expect(fitCell(row('hysteresis_alpha_range_deg'), r).reason).toBe('single sweep');
    expect(fitCell(row('branch'), r).text).toBe('1 of 1 (α rising)');
  });

  it('a return sweep: both branches listed in file order, the rising one fitted, the loop with its largest ΔCL and where', () => {
    const r = reduce('run-108.csv', returnSweep());
    const b = branchRows(r);
    expect(b.map((x) => [x.label, x.direction, x.fitted])).toEqual([
      ['1 of 2', 'α rising', true],
      ['2 of 2', 'α falling', false],
    ]);
    expect(b[1]!.points).toBe(14);
    expect(b[1]!.alphaRange).toMatch(/^-\d\.\d\d to 1\d\.\d\d$/);
    const loop = fitCell(row('hysteresis_alpha_range_deg'), r);
    expect(loop.value).toEqual(r.fit.hysteresis_alpha_range_deg);
    expect(loop.text).toMatch(/^1\d\.\d\d to 1\d\.\d\d$/);
    const dcl = fitCell(row('hysteresis_max_delta_cl'), r);
    // 10 N on q·S ≈ 610 Pa × 0.2025 m² is a ΔCL of about 0.08 (invented)
    expect(r.fit.hysteresis_max_delta_cl!).toBeGreaterThan(0.05);
    expect(dcl.note).toBe(`at α = ${r.fit.hysteresis_alpha_at_max_deg!.toFixed(2)}°`);
    expect(fitCell(row('branch'), r).text).toBe('1 of 2 (α rising)');
  });

  it('a branch without CLmax says why, in full and in a few words', () => {
    const b = branchRows(reduce('run-107.csv', noStall()));
    expect(b[0]!.clMax).toBe('—');
    expect(b[0]!.clMaxShort).toBe('not reached (CL still rising)');
    expect(b[0]!.clMaxReason).toMatch(/^not reached: CL is still rising/);
  });
});
