/**
 * What the plots draw beyond the points: the sweep branch of each plotted point (checked against the
 * engine's own branch split), where the arrowheads go, the fitted lift line's ends, the fitted polar,
 * the CLmax mark (never one when the fit gives none), the datasets and read-outs handed to Chart.js, and
 * the remembered mark choice.
 */
import { nextTick } from 'vue';
import { describe, expect, it } from 'vitest';
import { EMPTY_FIT, type FitResult } from '../../core/fits/characteristics.ts';
import { splitBranches } from '../../core/fits/sweepBranches.ts';
import { readSetup, reduceRun } from '../../core/reduction/engine.ts';
import type { ReductionResult } from '../../core/reduction/pipeline.ts';
import { readRunText } from '../../core/formats/runFile.ts';
import type { Chart, ChartEvent } from 'chart.js';
import { arrowHead, clMaxGlyph } from '../../renderer/src/charts/markGlyphs.ts';
import { nearestPoint, plotMarks as marksPlugin } from '../../renderer/src/charts/plugins.ts';
import { datasetsOf, plotConfig, type Series } from '../../renderer/src/charts/plotConfig.ts';
import { styleFor } from '../../renderer/src/logic/palette.ts';
import {
  arrowSegments,
  branchName,
  clMaxMark,
  liftLine,
  markKey,
  markNotes,
  marksFor,
  pointBranches,
  polarCurve,
  POLAR_STEPS,
  segmentFalls,
} from '../../renderer/src/logic/plotMarks.ts';
import { indexedPlotPoints, plotSpec } from '../../renderer/src/logic/plotSpecs.ts';
import { createPlotMarks, MARKS_STORAGE_KEY, readChoice } from '../../renderer/src/state/plotMarks.ts';
import { sample } from './support.ts';

function reduced(file: string): ReductionResult {
  const s = readSetup('setup-3d.json', sample('setup-3d.json'));
  if (!s.ok) throw new Error(JSON.stringify(s.errors));
  const r = reduceRun({ run: readRunText(file, sample(file)), setup: s.value, tare: readRunText('windoff-tare.csv', sample('windoff-tare.csv')) });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

const fit = (over: Partial<FitResult>): FitResult => ({ ...EMPTY_FIT, ...over });
const ALL = { clMax: true, fitLines: true };

describe('sweep branches of the plotted points', () => {
  const back = reduced('run-107-clean-return-sweep.csv');
  const plain = reduced('run-101-clean.csv');

  it('gives nothing to mark for a run that is one rising sweep', () => {
    expect(plain.fit_branches.map((b) => b.direction)).toEqual(['up']);
    expect(pointBranches(plain)).toBeNull();
  });

  it('gives a single falling sweep its direction (drawn thin with arrows, named "falling sweep")', () => {
    const r = { points: plain.points.slice(0, 4), fit_branches: [{ ...plain.fit_branches[0]!, direction: 'down' as const, points: 4 }] };
    expect(pointBranches(r)).toEqual({ branchOf: [0, 0, 0, 0], directions: ['down'] });
    expect(branchName(['down'], 0)).toBe('falling sweep');
  });

  it('puts each point of a return sweep on the branch the engine fitted it with', () => {
    const b = pointBranches(back)!;
    expect(b.directions).toEqual(['up', 'down']);
    // the engine's own split of the same angles (file order)
    const engine = splitBranches(back.points.map((p) => p.alpha_deg!));
    const expected: number[] = [];
    for (const br of engine) for (const i of br.points) expected[i] = br.index;
    expect(b.branchOf).toEqual(expected);
    // the points up to the highest angle rise, the rest fall
    const top = back.points.reduce((m, p, i) => (p.alpha_deg! > back.points[m]!.alpha_deg! ? i : m), 0);
    expect(b.branchOf.slice(0, top + 1).every((x) => x === 0)).toBe(true);
    expect(b.branchOf.slice(top + 1).every((x) => x === 1)).toBe(true);
  });

  it('draws nothing rather than something wrong when the branch counts do not add up to the points', () => {
    expect(pointBranches({ points: back.points.slice(1), fit_branches: back.fit_branches })).toBeNull();
    expect(pointBranches({ points: [], fit_branches: [] })).toBeNull();
  });

  it('gives the segment into the first falling point to the falling branch, and names the branches', () => {
    const sweep = { branchOf: [0, 0, 0, 1, 1], directions: ['up', 'down'] as ('up' | 'down')[] };
    expect([1, 2, 3, 4].map((i) => segmentFalls(sweep, i))).toEqual([false, false, true, true]);
    expect(branchName(sweep.directions, 0)).toBe('rising sweep (branch 1 of 2)');
    expect(branchName(sweep.directions, 1)).toBe('return sweep (branch 2 of 2)');
  });

  it("puts one arrowhead on each branch, where a loop's branches part near the turn", () => {
    expect(arrowSegments([])).toEqual([]);
    expect(arrowSegments([0])).toEqual([]);
    expect(arrowSegments([0, 0, 0, 0, 1, 1, 1])).toEqual([2, 5]);
    // a branch of one plotted point gets the segment that reaches it
    expect(arrowSegments([0, 0, 0, 1])).toEqual([2, 3]);
    // one branch: halfway; three: near the turns on the outer branches, halfway on the middle one
    expect(arrowSegments([0, 0, 0, 0, 0])).toEqual([2]);
    expect(arrowSegments([0, 0, 0, 1, 1, 1, 2, 2, 2])).toEqual([2, 4, 7]);
    const b = pointBranches(back)!;
    const segs = arrowSegments(b.branchOf);
    expect(segs).toHaveLength(2);
    expect(segs.map((i) => b.branchOf[i])).toEqual([0, 1]);
    expect(segs.every((i) => b.branchOf[i - 1] === b.branchOf[i])).toBe(true);
  });

  it('keeps the branch of each point when points without a value are left out of a plot', () => {
    const points = back.points.map((p, i) => (i === 2 ? { ...p, cm: null } : p));
    const { points: shown, index } = indexedPlotPoints(plotSpec('cm-alpha'), points);
    expect(shown).toHaveLength(points.length - 1);
    expect(index).not.toContain(2);
    expect(index[2]).toBe(3);
  });
});

describe('fitted marks', () => {
  const back = reduced('run-107-clean-return-sweep.csv');

  it('draws the lift line CL = a·(α − α0) exactly between the ends of the linear range', () => {
    const line = liftLine(back.fit)!;
    const [lo, hi] = back.fit.linear_range_deg!;
    const a = back.fit.cl_alpha_per_deg!;
    const a0 = back.fit.alpha_zero_lift_deg!;
    expect(line.points).toHaveLength(2);
    expect(line.points[0]!.x).toBe(lo);
    expect(line.points[1]!.x).toBe(hi);
    expect(line.points[0]!.y).toBeCloseTo(a * (lo - a0), 12);
    expect(line.points[1]!.y).toBeCloseTo(a * (hi - a0), 12);
    // and it passes through zero lift at α0
    const slope = (line.points[1]!.y - line.points[0]!.y) / (hi - lo);
    expect(line.points[0]!.y + slope * (a0 - lo)).toBeCloseTo(0, 10);
    expect(line.text).toMatch(/^fitted lift line CL = 0\.06\d\d\/deg · \(α \+ 2\.1\d°\), α -4\.2° to 10\.1°$/);
  });

  it('draws no lift line without a slope, zero-lift angle or range', () => {
    expect(liftLine(fit({}))).toBeNull();
    expect(liftLine(fit({ cl_alpha_per_deg: 0.07, alpha_zero_lift_deg: -2 }))).toBeNull();
    expect(liftLine(fit({ cl_alpha_per_deg: 0.07, linear_range_deg: [-4, 8] }))).toBeNull();
  });

  it('marks CLmax where the fit puts it, with its standard uncertainties where given', () => {
    const m = clMaxMark(back.fit);
    if ('reason' in m) throw new Error(m.reason);
    expect([m.x, m.y]).toEqual([back.fit.alpha_cl_max_deg, back.fit.cl_max]);
    expect(m.text).toMatch(/^CLmax 0\.86\d\d at α 12\.\d\d deg \(.*rising sweep\)$/);
    const u = clMaxMark(
      fit({ cl_max: 1.25, alpha_cl_max_deg: 13.1, cl_max_u: 0.012, alpha_cl_max_u_deg: 0.2, cl_max_method: 'parabola', branch_direction: 'up' }),
    );
    expect(u).toEqual({ x: 13.1, y: 1.25, xu: 0.2, yu: 0.012, text: 'CLmax 1.2500 ± 0.0120 at α 13.10 ± 0.20 deg (parabola, rising sweep)' });
  });

  it("makes no CLmax mark when the fit gives none, and says the fit's reason instead", () => {
    const reason = 'no peak was reached: the highest CL is at the highest angle of the sweep (α = 15.00°), so the sweep does not reach stall';
    const none = fit({ cl_max: null, alpha_cl_max_deg: null, cl_max_reason: reason });
    expect(clMaxMark(none)).toEqual({ reason });
    const marks = marksFor('cl-alpha', { fit: none, points: [] }, { clMax: true, fitLines: false }, null)!;
    expect(marks.clMax).toBeUndefined();
    expect(marks.notes).toEqual([`no CLmax: ${reason}`]);
    // half a CLmax is no CLmax either
    expect('reason' in clMaxMark(fit({ cl_max: 1.2, alpha_cl_max_deg: null }))).toBe(true);
    const series: Series[] = [{ label: '201 · section', style: styleFor(0, 0), points: [{ x: 0, y: 0.2 }], marks }];
    expect(markNotes(series)).toEqual([`201 · section: no CLmax: ${reason}`]);
    expect(markKey(series, 'cl-alpha')).toEqual([]);
    expect(datasetsOf(series).roles).toEqual(['run']);
  });

  it('draws the polar the fit reports over the CL span of the points it was fitted to', () => {
    const curve = polarCurve(back.fit, back.points, pointBranches(back)!.branchOf)!;
    expect(curve.points).toHaveLength(POLAR_STEPS + 1);
    // this run's Oswald factor came from the polar through CL = 0, so that is the curve drawn
    expect(back.fit.oswald_e_source).toBe('polar through CL = 0');
    for (const p of curve.points) expect(p.x).toBeCloseTo(back.fit.cd0! + back.fit.k_induced! * p.y * p.y, 12);
    const [lo, hi] = back.fit.polar_range_deg!;
    const fitted = back.points.filter((p, i) => pointBranches(back)!.branchOf[i] === 0 && p.alpha_deg! >= lo && p.alpha_deg! <= hi).map((p) => p.cl!);
    expect(curve.points[0]!.y).toBe(Math.min(...fitted));
    expect(curve.points[POLAR_STEPS]!.y).toBe(Math.max(...fitted));
    expect(curve.text).toMatch(/^fitted drag polar CD = 0\.01\d{3} \+ 0\.1\d{3}·CL², CL -0\.\d\d to 0\.\d\d$/);
  });

  it('draws the cambered polar CD = CDmin + k′·(CL − CL_mindrag)² where the fit used it, and none without a polar', () => {
    const f = fit({
      polar_range_deg: [0, 4],
      cd_min: 0.02,
      cl_min_drag: 0.3,
      k_induced_cambered: 0.05,
      cd0: 0.021,
      k_induced: 0.04,
      oswald_e_source: 'cambered polar',
    });
    const pts = [0, 2, 4, 6].map((a) => ({ alpha_deg: a, cl: 0.1 * a })) as ReductionResult['points'];
    const c = polarCurve(f, pts, null)!;
    expect(c.points[0]).toEqual({ x: 0.02 + 0.05 * 0.09, y: 0 });
    expect(c.points[POLAR_STEPS]!.y).toBeCloseTo(0.4, 12);
    expect(c.text).toBe('fitted drag polar CD = 0.02000 + 0.0500·(CL − 0.300)², CL 0.00 to 0.40');
    expect(polarCurve(fit({ polar_range_deg: [0, 4] }), pts, null)).toBeNull();
    expect(polarCurve(fit({ cd0: 0.02, k_induced: 0.05 }), pts, null)).toBeNull();
    expect(marksFor('cd-cl', { fit: fit({}), points: pts }, ALL, null)!.notes).toEqual(["no fitted drag polar: the fit gives none (see the run's warnings)"]);
  });

  it('puts CLmax and the lift line on the lift curve, the polar on the drag polar, and nothing anywhere unless asked', () => {
    const b = pointBranches(back)!.branchOf;
    const lift = marksFor('cl-alpha', back, ALL, b)!;
    expect(lift.clMax).toBeDefined();
    expect(lift.fitLine!.text).toMatch(/lift line/);
    expect(marksFor('cd-cl', back, ALL, b)!.fitLine!.text).toMatch(/drag polar/);
    expect(marksFor('cd-cl', back, ALL, b)!.clMax).toBeUndefined();
    expect(marksFor('cm-alpha', back, ALL, b)).toBeUndefined();
    expect(marksFor('ld-alpha', back, ALL, b)).toBeUndefined();
    expect(marksFor('cl-alpha', back, { clMax: false, fitLines: false }, b)).toBeUndefined();
    expect(marksFor('cl-alpha', back, { clMax: true, fitLines: false }, b)!.fitLine).toBeUndefined();
  });
});

describe('what Chart.js is handed', () => {
  const back = reduced('run-107-clean-return-sweep.csv');
  const b = pointBranches(back)!;
  const axes = { xTitle: 'α [deg]', yTitle: 'CL [–]', xName: 'α', yName: 'CL', xDecimals: 2, yDecimals: 4 };
  const { points, index } = indexedPlotPoints(plotSpec('cl-alpha'), back.points);
  const runs: Series[] = [
    { label: '101 · clean', style: styleFor(0, 0), points: [{ x: 0, y: 0.15 }], plot: 'cl-alpha' },
    {
      label: '107 · clean',
      style: styleFor(1, 0, 1),
      points,
      plot: 'cl-alpha',
      sweep: { branchOf: index.map((i) => b.branchOf[i]!), directions: b.directions },
      marks: marksFor('cl-alpha', back, ALL, b.branchOf),
    },
  ];

  it('keeps the runs first, then the fitted lines, then the CLmax marks, each with its role', () => {
    const { datasets, roles, marks } = datasetsOf(runs);
    expect(roles).toEqual(['run', 'run', 'fit', 'clmax']);
    expect(datasets.map((d) => d.data.length)).toEqual([1, 29, 2, 1]);
    expect(datasets[3]!.data[0]).toEqual({ x: back.fit.alpha_cl_max_deg, y: back.fit.cl_max });
    // the fitted line in the run's colour, pale and broad, under the points; the CLmax mark on top
    expect(datasets[2]!.borderColor).toBe('rgba(213,94,0,0.3)');
    expect([datasets[2]!.order, datasets[3]!.order]).toEqual([1, -1]);
    expect(marks.arrows).toEqual([{ dataset: 1, segments: [11, 18] }]);
    // both arrows lie inside the hysteresis loop the engine finds, where the two branches part
    const [h0, h1] = back.fit.hysteresis_alpha_range_deg!;
    for (const i of [11, 18]) {
      const mid = (points[i - 1]!.x + points[i]!.x) / 2;
      expect(mid).toBeGreaterThan(h0);
      expect(mid).toBeLessThan(h1);
    }
    expect(marks.clMax).toEqual([{ dataset: 3, xu: null, yu: null }]);
  });

  it("draws the falling branch thin, in the run's colour and dash, and the rising branch at full width", () => {
    const ds = datasetsOf(runs).datasets[1]! as unknown as {
      borderWidth: number;
      borderDash: number[];
      segment: { borderWidth: (c: { p1DataIndex: number }) => number | undefined };
    };
    expect(ds.borderWidth).toBe(1.8);
    expect(ds.borderDash).toEqual([8, 4]);
    const widths = points.map((_, i) => (i === 0 ? null : (ds.segment.borderWidth({ p1DataIndex: i }) ?? ds.borderWidth)));
    expect(widths.slice(1, 15).every((w) => w === 1.8)).toBe(true);
    expect(widths.slice(15).every((w) => w === 0.9)).toBe(true);
    expect(datasetsOf([runs[0]!]).datasets[0]).not.toHaveProperty('segment');
  });

  it('names the branch in the read-out of a point, and the fit in the read-out of a CLmax mark', () => {
    const cfg = plotConfig(axes, runs);
    const label = cfg.options!.plugins!.tooltip!.callbacks!.label as (item: object) => string | string[];
    const item = (datasetIndex: number, dataIndex: number) => {
      const ds = cfg.data.datasets[datasetIndex]!;
      const raw = ds.data[dataIndex] as { x: number; y: number };
      return { datasetIndex, dataIndex, dataset: ds, raw, parsed: raw };
    };
    // the branch on a second line, so the read-out stays narrow
    const rising = label(item(1, 3)) as string[];
    expect(rising[0]).toMatch(/^107 · clean: α = 2\.\d\d deg, CL = 0\.\d{4}$/);
    expect(rising[1]).toBe('rising sweep (branch 1 of 2)');
    expect((label(item(1, 20)) as string[])[1]).toBe('return sweep (branch 2 of 2)');
    expect(label(item(0, 0))).toBe('101 · clean: α = 0.00 deg, CL = 0.1500');
    const peak = label(item(3, 0)) as string[];
    expect(peak[0]).toBe('107 · clean:');
    expect(peak[1]).toMatch(/^CLmax 0\.86\d\d at α 12\.\d\d deg/);
    expect(cfg.options!.interaction!.mode).toBe('nearestPoint');
    expect(cfg.options!.plugins!.plotMarks!.roles).toEqual(['run', 'run', 'fit', 'clmax']);
  });

  it('writes the notes on marks not drawn above the provenance of an exported image, and not on screen', () => {
    const none = { ...runs[0]!, marks: { notes: ['no CLmax: no stall is seen'] } };
    const exported = plotConfig(axes, [none], {}, ['Sweepbook · exported …']);
    expect(exported.options!.plugins!.paperFooter!.lines).toEqual(['101 · clean: no CLmax: no stall is seen', 'Sweepbook · exported …']);
    expect(plotConfig(axes, [none]).options!.plugins!.paperFooter).toBeUndefined();
  });

  it('explains each mark once in the key, whatever the number of runs carrying it', () => {
    expect(markKey(runs, 'cl-alpha').map((k) => k.kind)).toEqual(['return', 'clmax', 'fit']);
    expect(markKey([...runs, runs[1]!], 'cl-alpha')).toHaveLength(3);
    expect(markKey(runs, 'cd-cl')[2]!.text).toBe('fitted drag polar');
    // the key promises uncertainty bars only when a mark has them
    expect(markKey(runs, 'cl-alpha')[1]!.text).toBe('fitted CLmax');
    const withU = { ...runs[1]!, marks: { ...runs[1]!.marks!, clMax: { ...runs[1]!.marks!.clMax!, yu: 0.01 } } };
    expect(markKey([withU], 'cl-alpha')[1]!.text).toBe('fitted CLmax, ± one standard uncertainty');
    expect(markKey([runs[0]!], 'cl-alpha')).toEqual([]);
  });
});

describe('mark geometry', () => {
  it('points the arrowhead along the segment, centred on its middle, and leaves short segments alone', () => {
    const [tip, l, r] = arrowHead({ x: 0, y: 0 }, { x: 40, y: 0 })!;
    expect(tip).toEqual({ x: 25, y: 0 });
    expect([l.x, r.x]).toEqual([15, 15]);
    expect(Math.abs(l.y - r.y)).toBe(9);
    const down = arrowHead({ x: 0, y: 0 }, { x: 0, y: -30 })!;
    expect(down[0]).toEqual({ x: 0, y: -20 });
    expect(arrowHead({ x: 0, y: 0 }, { x: 10, y: 0 })).toBeNull();
  });

  it('puts the CLmax caret above the level bar, and above the top of its uncertainty bar', () => {
    const g = clMaxGlyph({ x: 100, y: 50 });
    expect(g.bar).toEqual([
      { x: 91, y: 50 },
      { x: 109, y: 50 },
    ]);
    expect(g.caret[0]).toEqual({ x: 100, y: 47 });
    expect(g.caret[1]!.y).toBeLessThan(47);
    expect(clMaxGlyph({ x: 100, y: 50 }, 30).caret[0]).toEqual({ x: 100, y: 27 });
  });
});

/** A chart stand-in: linear scales, a recording context, a run (dataset 0), a fitted line (1) and a CLmax mark (2). */
function fakeChart() {
  const ops: string[] = [];
  const ctx = new Proxy({} as Record<string, unknown>, {
    get:
      (_t, name: string) =>
      (...args: number[]) =>
        ops.push(`${name}(${args.map((a) => (typeof a === 'number' ? +a.toFixed(3) : a)).join(',')})`),
    set: (_t, name: string, v) => {
      ops.push(`${name}=${v}`);
      return true;
    },
  });
  // x: 10 px per unit from 100; y: 100 px per unit, upward, from 300
  const px = (p: { x: number; y: number }) => ({ x: 100 + 10 * p.x, y: 300 - 100 * p.y, getProps: () => ({ x: 100 + 10 * p.x, y: 300 - 100 * p.y }) });
  const data = [
    [
      { x: 0, y: 0 },
      { x: 4, y: 0.4 },
      { x: 8, y: 0.8 },
      { x: 4, y: 0.3 },
    ],
    [
      { x: 0, y: 0.01 },
      { x: 8, y: 0.81 },
    ],
    [{ x: 7, y: 0.85 }],
  ];
  const chart = {
    ctx,
    chartArea: { left: 50, top: 10, right: 450, bottom: 310 },
    scales: { x: { getPixelForValue: (v: number) => 100 + 10 * v }, y: { getPixelForValue: (v: number) => 300 - 100 * v } },
    options: {
      plugins: { plotMarks: { roles: ['run', 'fit', 'clmax'], arrows: [{ dataset: 0, segments: [1, 3] }], clMax: [{ dataset: 2, xu: 0.5, yu: 0.05 }] } },
    },
    data: { datasets: data.map((d, i) => ({ borderColor: ['#0072B2', 'rgba(0,114,178,0.3)', '#0072B2'][i], data: d })) },
    isDatasetVisible: () => true,
    getDatasetMeta: (d: number) => ({ index: d, data: data[d]!.map(px) }),
    getSortedVisibleDatasetMetas: () => data.map((d, i) => ({ index: i, data: d.map(px) })),
    isPointInArea: (p: { x: number; y: number }) => p.x >= 50 && p.x <= 450 && p.y >= 10 && p.y <= 310,
  };
  return { chart: chart as unknown as Chart<'scatter'>, ops };
}

describe('the marks plugin and the hover mode', () => {
  it('draws an arrowhead on each listed segment and the CLmax mark with its bars, clipped to the plot area', () => {
    const { chart, ops } = fakeChart();
    (marksPlugin.afterDatasetsDraw as (c: Chart<'scatter'>) => void)(chart);
    expect(ops.slice(0, 4)).toEqual(['save()', 'beginPath()', 'rect(50,10,400,300)', 'clip()']);
    // segment 0 → 1 runs from (100, 300) to (140, 260): tip 5 px past its middle (120, 280) towards (140, 260)
    expect(ops).toContain(`moveTo(${+(120 + 5 / Math.SQRT2).toFixed(3)},${+(280 - 5 / Math.SQRT2).toFixed(3)})`);
    // segment 2 → 3 runs from (180, 220) back to (140, 270), the return: tip towards the lower left
    expect(ops.filter((o) => o === 'fill()')).toHaveLength(3);
    // CLmax at (7, 0.85) → (170, 215); u(CL) = 0.05 → bar 210 … 220; u(α) = 0.5 → bar 165 … 175
    for (const op of ['moveTo(170,220)', 'lineTo(170,210)', 'moveTo(165,215)', 'lineTo(175,215)', 'moveTo(161,215)', 'lineTo(179,215)'])
      expect(ops).toContain(op);
    // the caret points down at the top of the CL bar, 3 px above it
    expect(ops).toContain('moveTo(170,207)');
    expect(ops.at(-1)).toBe('restore()');
  });

  it('reads out the nearest point of a run or a CLmax mark, never the end of a fitted line', () => {
    const { chart } = fakeChart();
    const at = (x: number, y: number) => nearestPoint(chart as unknown as Chart, { x, y } as ChartEvent, {} as never)[0];
    // (101, 299) is 1 px from the fitted line's end (100, 299) and 1.4 px from the run's first point
    expect(at(101, 299)).toMatchObject({ datasetIndex: 0, index: 0 });
    expect(at(171, 214)).toMatchObject({ datasetIndex: 2, index: 0 });
    expect(at(141, 268)).toMatchObject({ datasetIndex: 0, index: 3 });
    expect(nearestPoint(chart as unknown as Chart, { x: null, y: null } as unknown as ChartEvent, {} as never)).toEqual([]);
  });
});

describe('the remembered choice', () => {
  function memory(initial: Record<string, string> = {}) {
    const m = new Map(Object.entries(initial));
    return { getItem: (k: string) => m.get(k) ?? null, setItem: (k: string, v: string) => void m.set(k, v), m };
  }

  it('starts with both marks off, and reads back what was stored', () => {
    expect(readChoice(null)).toEqual({ clMax: false, fitLines: false });
    expect(readChoice(memory({ [MARKS_STORAGE_KEY]: 'not json' }))).toEqual({ clMax: false, fitLines: false });
    expect(readChoice(memory({ [MARKS_STORAGE_KEY]: '{"clMax":true,"fitLines":"yes"}' }))).toEqual({ clMax: true, fitLines: false });
  });

  it('stores every change, so a reload brings it back', async () => {
    const store = memory();
    const choice = createPlotMarks(store);
    choice.fitLines = true;
    await nextTick();
    expect(JSON.parse(store.m.get(MARKS_STORAGE_KEY)!)).toEqual({ clMax: false, fitLines: true });
    expect(createPlotMarks(store)).toEqual({ clMax: false, fitLines: true });
  });
});
