/**
 * The four standard plots of a polar, their axes (titled with units) and how a point maps onto them.
 * Points come from a result of the chosen basis (corrected, or the same run reduced with corrections off),
 * so the un-suffixed fields serve both.
 */
import type { PointResult } from '../../../core/index.ts';
import { ldUncertainty, withUncertainty, type PlotPoint } from './errorBars.ts';

export type PlotId = 'cl-alpha' | 'cd-cl' | 'cm-alpha' | 'ld-alpha';

export interface AxisSpec {
  title: string;
  /** Digits after the point in read-outs. */
  decimals: number;
}

export interface PlotSpec {
  id: PlotId;
  title: string;
  x: AxisSpec;
  y: AxisSpec;
  /** Short names for the read-out ("α", "CL"). */
  xName: string;
  yName: string;
  value(p: PointResult): { x: number | null; y: number | null };
  /** Standard uncertainties (k = 1) along x and y; null where the point carries none. */
  uncertainty(p: PointResult): { x: number | null; y: number | null };
}

export const PLOTS: readonly PlotSpec[] = [
  {
    id: 'cl-alpha',
    title: 'Lift curve',
    x: { title: 'α [deg]', decimals: 2 },
    y: { title: 'CL [–]', decimals: 4 },
    xName: 'α',
    yName: 'CL',
    value: (p) => ({ x: p.alpha_deg, y: p.cl }),
    uncertainty: (p) => ({ x: p.u_alpha_deg ?? null, y: p.u_cl ?? null }),
  },
  {
    id: 'cd-cl',
    title: 'Drag polar',
    x: { title: 'CD [–]', decimals: 5 },
    y: { title: 'CL [–]', decimals: 4 },
    xName: 'CD',
    yName: 'CL',
    value: (p) => ({ x: p.cd, y: p.cl }),
    uncertainty: (p) => ({ x: p.u_cd ?? null, y: p.u_cl ?? null }),
  },
  {
    id: 'cm-alpha',
    title: 'Pitching moment',
    x: { title: 'α [deg]', decimals: 2 },
    y: { title: 'Cm [–]', decimals: 4 },
    xName: 'α',
    yName: 'Cm',
    value: (p) => ({ x: p.alpha_deg, y: p.cm }),
    uncertainty: (p) => ({ x: p.u_alpha_deg ?? null, y: p.u_cm ?? null }),
  },
  {
    id: 'ld-alpha',
    title: 'Lift-to-drag ratio',
    x: { title: 'α [deg]', decimals: 2 },
    y: { title: 'L/D [–]', decimals: 2 },
    xName: 'α',
    yName: 'L/D',
    value: (p) => ({ x: p.alpha_deg, y: p.ld }),
    uncertainty: (p) => ({ x: p.u_alpha_deg ?? null, y: ldUncertainty(p.cl, p.cd, p.u_cl ?? null, p.u_cd ?? null) }),
  },
];

export function plotSpec(id: PlotId): PlotSpec {
  return PLOTS.find((p) => p.id === id)!;
}

/**
 * Points of one run on one plot, in the order measured (a return sweep shows as a loop, as it was run),
 * each with its standard uncertainties where the run has them (the error bars).
 */
export function plotPoints(spec: PlotSpec, points: readonly PointResult[]): PlotPoint[] {
  return indexedPlotPoints(spec, points).points;
}

/** The plotted points with the index of the result point each came from (points without a value are left out). */
export function indexedPlotPoints(spec: PlotSpec, points: readonly PointResult[]): { points: PlotPoint[]; index: number[] } {
  const out: PlotPoint[] = [];
  const index: number[] = [];
  points.forEach((p, i) => {
    const { x, y } = spec.value(p);
    if (x === null || y === null || !Number.isFinite(x) || !Number.isFinite(y)) return;
    const u = spec.uncertainty(p);
    out.push(withUncertainty(x, y, u.x, u.y));
    index.push(i);
  });
  return { points: out, index };
}
