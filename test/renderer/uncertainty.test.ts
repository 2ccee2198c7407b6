/**
 * Uncertainties in the window's logic: error-bar data of each plot, L/D propagated to first order, the
 * error-bar plugin's drawing, differences against a baseline with u(Δ), and the fitted characteristics
 * against the baseline's with their standard errors.
 */
import type { Chart } from 'chart.js';
import { describe, expect, it } from 'vitest';
import { readSetup, reduceRun } from '../../core/reduction/engine.ts';
import type { PointResult, ReductionResult } from '../../core/reduction/pipeline.ts';
import { readRunText } from '../../core/formats/runFile.ts';
import { errorBars } from '../../renderer/src/charts/plugins.ts';
import { plotConfig, readOut } from '../../renderer/src/charts/plotConfig.ts';
import { curveOf, deltas, differenceUncertainty, fitDeltas, interpolateUncertainty, uClAtPeak } from '../../renderer/src/logic/delta.ts';
import { anyUncertainty, ldUncertainty } from '../../renderer/src/logic/errorBars.ts';
import { PLOTS, plotPoints, plotSpec } from '../../renderer/src/logic/plotSpecs.ts';
import { checkSetup, draftFrom, setupFrom, UNCERTAINTY_GROUP, SETUP_FIELDS } from '../../renderer/src/logic/setupForm.ts';
import { sample, TEST_UNCERTAINTY } from './support.ts';

function reduced(file: string, uncertainty: object | null): ReductionResult {
  const setup = JSON.parse(sample('setup-3d.json')) as Record<string, unknown>;
  if (uncertainty) setup['uncertainty'] = uncertainty;
  const s = readSetup('setup.json', JSON.stringify(setup));
  if (!s.ok) throw new Error(JSON.stringify(s.errors));
  const r = reduceRun({ run: readRunText(file, sample(file)), setup: s.value, tare: readRunText('windoff-tare.csv', sample('windoff-tare.csv')) });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

/** A point with invented values, for the arithmetic of the differences. */
function pt(alpha: number, cl: number, uCl: number | null): PointResult {
  return { alpha_deg: alpha, cl, cd: 0.02, cm: -0.05, u_cl: uCl, u_cd: null, u_cm: null } as PointResult;
}

describe('error-bar data', () => {
  const withU = reduced('run-103-flap20.csv', TEST_UNCERTAINTY);
  const without = reduced('run-103-flap20.csv', null);

  it('puts each point\'s engine uncertainties on the axes it is plotted against', () => {
    const p = withU.points[3]!;
    expect(p.u_cl).toBeGreaterThan(0);
    const at = (id: Parameters<typeof plotSpec>[0]) => plotPoints(plotSpec(id), withU.points)[3]!;
    expect(at('cl-alpha')).toEqual({ x: p.alpha_deg, y: p.cl, xu: p.u_alpha_deg, yu: p.u_cl });
    // the polar: CD along x, CL along y
    expect(at('cd-cl')).toEqual({ x: p.cd, y: p.cl, xu: p.u_cd, yu: p.u_cl });
    expect(at('cm-alpha')).toEqual({ x: p.alpha_deg, y: p.cm, xu: p.u_alpha_deg, yu: p.u_cm });
    expect(at('ld-alpha').yu).toBeCloseTo(ldUncertainty(p.cl, p.cd, p.u_cl, p.u_cd)!, 15);
    expect(PLOTS.every((s) => anyUncertainty([{ points: plotPoints(s, withU.points) }]))).toBe(true);
  });

  it('draws no bars for a run without an uncertainty block, and keeps its points as they were', () => {
    const p = without.points[3]!;
    expect(p.u_cl).toBeNull();
    expect(plotPoints(plotSpec('cl-alpha'), without.points)[3]).toEqual({ x: p.alpha_deg, y: p.cl });
    expect(PLOTS.some((s) => anyUncertainty([{ points: plotPoints(s, without.points) }]))).toBe(false);
  });

  it('propagates u(CL) and u(CD) to L/D by the first-order law', () => {
    // JCGM 100:2008 eq. (10) for y = CL/CD, by hand: CL = 0.8, CD = 0.04, u(CL) = 0.004, u(CD) = 0.0006:
    // (0.004/0.04)² + (0.8·0.0006/0.04²)² = 0.01 + 0.09 = 0.1, u = √0.1
    expect(ldUncertainty(0.8, 0.04, 0.004, 0.0006)).toBeCloseTo(Math.sqrt(0.1), 14);
    // the same from numerical sensitivity coefficients (central differences of CL/CD)
    const f = (cl: number, cd: number) => cl / cd;
    const h = 1e-7;
    const dCl = (f(0.8 + h, 0.04) - f(0.8 - h, 0.04)) / (2 * h);
    const dCd = (f(0.8, 0.04 + h) - f(0.8, 0.04 - h)) / (2 * h);
    expect(ldUncertainty(0.8, 0.04, 0.004, 0.0006)).toBeCloseTo(Math.hypot(dCl * 0.004, dCd * 0.0006), 6);
    // at zero lift only u(CL) counts: 0.003/0.02 = 0.15; no drag, no ratio
    expect(ldUncertainty(0, 0.02, 0.003, 0.001)).toBeCloseTo(0.15, 14);
    expect(ldUncertainty(0.5, 0, 0.003, 0.001)).toBeNull();
    expect(ldUncertainty(0.5, 0.02, null, 0.001)).toBeNull();
  });

  it('reads out a point with its uncertainty on hover', () => {
    expect(readOut(0.51234, 0.00312, 4)).toBe('0.5123 ± 0.0031');
    expect(readOut(0.51234, undefined, 4)).toBe('0.5123');
    const cfg = plotConfig({ xTitle: 'α [deg]', yTitle: 'CL [–]', xName: 'α', yName: 'CL', xDecimals: 2, yDecimals: 4 }, [], {}, [], false, true);
    expect(cfg.options!.plugins!.errorBars).toEqual({ show: true });
    expect(plotConfig({ xTitle: '', yTitle: '', xName: '', yName: '', xDecimals: 2, yDecimals: 4 }, []).options!.plugins!.errorBars).toEqual({ show: false });
  });
});

/** A chart stand-in for the plugin: linear scales, one visible and one hidden dataset, a recording context. */
function fakeChart(show: boolean) {
  const ops: string[] = [];
  const ctx = new Proxy({} as Record<string, unknown>, {
    get: (_t, name: string) => (...args: number[]) => ops.push(`${name}(${args.map((a) => (typeof a === 'number' ? +a.toFixed(3) : a)).join(',')})`),
    set: (_t, name: string, v) => {
      ops.push(`${name}=${v}`);
      return true;
    },
  });
  // x: 10 px per unit from 100; y: 100 px per unit, upward, from 300
  const chart = {
    ctx,
    chartArea: { left: 50, top: 10, right: 450, bottom: 310 },
    scales: { x: { getPixelForValue: (v: number) => 100 + 10 * v }, y: { getPixelForValue: (v: number) => 300 - 100 * v } },
    options: { plugins: { errorBars: { show } } },
    data: {
      datasets: [
        { borderColor: '#0072B2', data: [{ x: 2, y: 0.5, xu: 0.5, yu: 0.1 }, { x: 4, y: 0.7 }] },
        { borderColor: '#009E73', data: [{ x: 2, y: 0.9, yu: 0.2 }] },
      ],
    },
    isDatasetVisible: (d: number) => d === 0,
    getDatasetMeta: (d: number) => ({ data: d === 0 ? [{ x: 120, y: 250 }, { x: 140, y: 230 }] : [{ x: 120, y: 210 }] }),
  };
  return { chart: chart as unknown as Chart<'scatter'>, ops };
}

describe('error-bar plugin', () => {
  it('draws ± u along y and x with end caps, in the series colour, clipped to the plot area', () => {
    const { chart, ops } = fakeChart(true);
    (errorBars.afterDatasetsDraw as (c: Chart<'scatter'>) => void)(chart);
    expect(ops).toContain('rect(50,10,400,300)');
    expect(ops).toContain('clip()');
    expect(ops).toContain('strokeStyle=#0072B2');
    // y: 0.5 ± 0.1 → pixels 260 and 240 at x = 120; caps 3 px either side
    for (const op of ['moveTo(120,260)', 'lineTo(120,240)', 'moveTo(117,260)', 'lineTo(123,260)', 'moveTo(117,240)', 'lineTo(123,240)']) expect(ops).toContain(op);
    // x: 2 ± 0.5 → pixels 115 and 125 at y = 250
    for (const op of ['moveTo(115,250)', 'lineTo(125,250)', 'moveTo(115,247)', 'lineTo(115,253)']) expect(ops).toContain(op);
    // one bar set for the one point with uncertainties; nothing for the hidden series
    expect(ops.filter((o) => o === 'stroke()').length).toBe(1);
    expect(ops).not.toContain('strokeStyle=#009E73');
  });

  it('draws nothing when the bars are switched off', () => {
    const { chart, ops } = fakeChart(false);
    (errorBars.afterDatasetsDraw as (c: Chart<'scatter'>) => void)(chart);
    expect(ops).toEqual([]);
  });
});

describe('differences with uncertainties', () => {
  it('combines the run\'s u with the baseline\'s, interpolated in α like the value', () => {
    const base = [pt(0, 0.1, 0.003), pt(2, 0.3, 0.005), pt(4, 0.5, 0.005)];
    const run = [pt(1, 0.25, 0.004), pt(5, 0.7, 0.004)];
    const [d, ...rest] = deltas(run, base, 'cl');
    expect(rest).toEqual([]);
    // baseline u at α = 1 halfway between 0.003 and 0.005: 0.004; JCGM 100:2008 eq. (10) for y = a − b with
    // independent a and b: u(y) = √(0.004² + 0.004²) = 0.004·√2
    expect(d!.delta).toBeCloseTo(0.05, 12);
    expect(d!.u).toBeCloseTo(0.004 * Math.SQRT2, 15);
    expect(differenceUncertainty(0.003, 0.004)).toBeCloseTo(0.005, 15);
  });

  it('gives no u(Δ) when either run has no uncertainties', () => {
    const base = [pt(0, 0.1, null), pt(2, 0.3, null)];
    expect(deltas([pt(1, 0.25, 0.004)], base, 'cl')[0]!.u).toBeNull();
    expect(deltas([pt(1, 0.25, null)], [pt(0, 0.1, 0.003), pt(2, 0.3, 0.003)], 'cl')[0]!.u).toBeNull();
  });

  it('keeps the uncertainty of repeated angles as their root-mean-square (the instruments\' part does not average out)', () => {
    const c = curveOf([pt(0, 0.1, 0.003), pt(0, 0.3, 0.004), pt(2, 0.5, 0.002)], (p) => p.cl, (p) => p.u_cl);
    expect(c.value[0]).toBeCloseTo(0.2, 15);
    expect(c.u[0]).toBeCloseTo(Math.sqrt((0.003 ** 2 + 0.004 ** 2) / 2), 15);
    expect(interpolateUncertainty(c, 0.5)).toBeCloseTo(0.75 * c.u[0]! + 0.25 * 0.002, 15);
    expect(interpolateUncertainty(c, 2.5)).toBeNull();
  });

  it('compares the fitted characteristics with the baseline\'s, u(Δ) from the two fits\' standard errors', () => {
    const clean = reduced('run-101-clean.csv', TEST_UNCERTAINTY);
    const flap = reduced('run-103-flap20.csv', TEST_UNCERTAINTY);
    expect(flap.fit.weighted).toBe(true);
    const rows = new Map(fitDeltas(flap, clean).map((r) => [r.key, r]));
    const slope = rows.get('cl_alpha_per_deg')!;
    expect(slope.delta).toBeCloseTo(flap.fit.cl_alpha_per_deg! - clean.fit.cl_alpha_per_deg!, 15);
    expect(slope.u).toBeCloseTo(Math.sqrt(flap.fit.cl_alpha_stderr_per_deg! ** 2 + clean.fit.cl_alpha_stderr_per_deg! ** 2), 15);
    const cd0 = rows.get('cd0')!;
    expect(cd0.u).toBeCloseTo(Math.hypot(flap.fit.cd0_stderr!, clean.fit.cd0_stderr!), 15);
    expect(rows.get('alpha_zero_lift_deg')!.u).toBeCloseTo(Math.hypot(flap.fit.alpha_zero_lift_stderr_deg!, clean.fit.alpha_zero_lift_stderr_deg!), 15);
    // CLmax has no standard error of its own: the points' u(CL) at the peaks are shown instead
    const clMax = rows.get('cl_max')!;
    expect(clMax.delta).toBeCloseTo(flap.fit.cl_max! - clean.fit.cl_max!, 15);
    expect(clMax.u).toBeNull();
    const peak = flap.points.reduce((a, b) => (b.cl! > a.cl! ? b : a));
    expect(uClAtPeak(flap.points)).toBe(peak.u_cl);
    expect(clMax.note).toContain(`${peak.u_cl!.toFixed(4)} (run)`);
  });
});

describe('setup form: instrument uncertainties', () => {
  it('edits the uncertainty block, and leaves it out when every field is empty', () => {
    // every instrument uncertainty has a field, and so has the incidence zero (a systematic offset for the fits, not set in the test block)
    expect(SETUP_FIELDS.filter((f) => f.group === UNCERTAINTY_GROUP).map((f) => f.path.split('.')[1]).sort()).toEqual([...Object.keys(TEST_UNCERTAINTY), 'alpha_offset_deg'].sort());
    const setup = { ...(JSON.parse(sample('setup-3d.json')) as object), uncertainty: TEST_UNCERTAINTY };
    const draft = draftFrom(setup);
    expect(draft['uncertainty.force_n']).toBe('0.3');
    expect(setupFrom(setup, draft)['uncertainty']).toEqual(TEST_UNCERTAINTY);
    for (const key of Object.keys(TEST_UNCERTAINTY)) draft[`uncertainty.${key}`] = '';
    expect(setupFrom(setup, draft)).not.toHaveProperty('uncertainty');
  });

  it('puts core\'s message beside the uncertainty field it names', () => {
    const setup = JSON.parse(sample('setup-3d.json')) as object;
    const draft = draftFrom(setup);
    draft['uncertainty.force_n'] = '-0.3';
    const check = checkSetup('s', setupFrom(setup, draft));
    expect(check.ok).toBe(false);
    expect(Object.keys(check.byField)).toEqual(['uncertainty.force_n']);
  });
});
