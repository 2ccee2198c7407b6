/**
 * The four standard plots of a polar, their axes (titled with units) and how a point maps onto them.
 * Points come from a result of the chosen basis (corrected, or the same run reduced with corrections off),
 * so the un-suffixed fields serve both.
 */
import type { PointResult } from '../../../core/reduce.ts';

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
  },
  {
    id: 'cd-cl',
    title: 'Drag polar',
    x: { title: 'CD [–]', decimals: 5 },
    y: { title: 'CL [–]', decimals: 4 },
    xName: 'CD',
    yName: 'CL',
    value: (p) => ({ x: p.cd, y: p.cl }),
  },
  {
    id: 'cm-alpha',
    title: 'Pitching moment',
    x: { title: 'α [deg]', decimals: 2 },
    y: { title: 'Cm [–]', decimals: 4 },
    xName: 'α',
    yName: 'Cm',
    value: (p) => ({ x: p.alpha_deg, y: p.cm }),
  },
  {
    id: 'ld-alpha',
    title: 'Lift-to-drag ratio',
    x: { title: 'α [deg]', decimals: 2 },
    y: { title: 'L/D [–]', decimals: 2 },
    xName: 'α',
    yName: 'L/D',
    value: (p) => ({ x: p.alpha_deg, y: p.ld }),
  },
];

export function plotSpec(id: PlotId): PlotSpec {
  return PLOTS.find((p) => p.id === id)!;
}

/** Points of one run on one plot, in the order measured (a return sweep shows as a loop, as it was run). */
export function plotPoints(spec: PlotSpec, points: readonly PointResult[]): { x: number; y: number }[] {
  const out: { x: number; y: number }[] = [];
  for (const p of points) {
    const { x, y } = spec.value(p);
    if (x !== null && y !== null && Number.isFinite(x) && Number.isFinite(y)) out.push({ x, y });
  }
  return out;
}
