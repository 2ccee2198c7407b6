/**
 * Small drawing plugins of our own, passed per chart: vertical bars (mean ± one standard deviation
 * in the sample-scatter view), error bars (± one standard uncertainty of each point along x and y), the
 * marks of the overlaid plots (arrowheads along sweep branches, the fitted CLmax with its uncertainty)
 * and, for exported images, a white background with provenance lines under the plot (a PNG should say
 * where its numbers came from). Also the hover mode of the plots: the nearest point, never a fitted line.
 */
import type { Chart, ChartEvent, ChartType, InteractionItem, InteractionModeFunction, Plugin } from 'chart.js';
import { barEnds, type PlotPoint } from '../logic/errorBars.ts';
import { arrowHead, clMaxGlyph, type Px } from './markGlyphs.ts';

/** What a dataset of an overlaid plot is: a run's points, a fitted line, or a fitted CLmax. */
export type DatasetRole = 'run' | 'fit' | 'clmax';

export interface MarksOptions {
  /** Role of each dataset, by index. */
  roles: DatasetRole[];
  /** Arrowheads: on the segment ending at each listed point of the dataset. */
  arrows: { dataset: number; segments: number[] }[];
  /** CLmax marks: the dataset holding the point and its standard uncertainties (α, CL). */
  clMax: { dataset: number; xu: number | null; yu: number | null }[];
}

declare module 'chart.js' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars -- declaration merging repeats chart.js's own type parameter
  interface PluginOptionsByType<TType extends ChartType> {
    rangeBars?: { bars: { dataset: number; low: number[]; high: number[] }[] };
    paperFooter?: { lines: string[] };
    errorBars?: { show: boolean };
    plotMarks?: MarksOptions;
  }
  interface InteractionModeMap {
    nearestPoint: InteractionModeFunction;
  }
}

/**
 * Hover mode of the plots: the element nearest the cursor (straight-line distance in pixels) among the
 * visible datasets inside the plot area, leaving out fitted lines, whose two ends would otherwise take
 * the read-out from the measured points they lie on. Registered in chartSetup.ts.
 */
export const nearestPoint: InteractionModeFunction = (chart: Chart, e: ChartEvent, _options, useFinalPosition?: boolean) => {
  const roles = (chart.options.plugins as { plotMarks?: MarksOptions } | undefined)?.plotMarks?.roles ?? [];
  if (e.x === null || e.y === null) return [];
  let best: InteractionItem[] = [];
  let min = Infinity;
  for (const meta of chart.getSortedVisibleDatasetMetas()) {
    if (roles[meta.index] === 'fit') continue;
    meta.data.forEach((element, index) => {
      const c = element.getProps(['x', 'y'], useFinalPosition) as { x: number; y: number };
      if (!chart.isPointInArea(c)) return;
      const d = Math.hypot(e.x! - c.x, e.y! - c.y);
      if (d < min) {
        min = d;
        best = [{ element, datasetIndex: meta.index, index }];
      }
    });
  }
  return best;
};

/**
 * Arrowheads along the sweep branches (in each run's colour, one per branch, pointing the way α moved)
 * and the fitted CLmax marks (level bar, caret above, ± one standard uncertainty in α and CL), clipped
 * to the plot area. Geometry shared with the SVG figure (markGlyphs.ts).
 */
export const plotMarks: Plugin<'scatter'> = {
  id: 'plotMarks',
  afterDatasetsDraw(chart: Chart<'scatter'>) {
    const opts = chart.options.plugins?.plotMarks;
    const { ctx, chartArea, scales } = chart;
    const xs = scales['x'];
    const ys = scales['y'];
    if (!opts || !xs || !ys || !chartArea) return;
    ctx.save();
    ctx.beginPath();
    ctx.rect(chartArea.left, chartArea.top, chartArea.right - chartArea.left, chartArea.bottom - chartArea.top);
    ctx.clip();
    ctx.setLineDash([]);
    const fillPath = (pts: readonly Px[]) => {
      ctx.beginPath();
      pts.forEach((p, i) => (i === 0 ? ctx.moveTo(p.x, p.y) : ctx.lineTo(p.x, p.y)));
      ctx.closePath();
      ctx.fill();
    };
    for (const a of opts.arrows ?? []) {
      if (!a || a.dataset === undefined || !chart.isDatasetVisible(a.dataset)) continue;
      const meta = chart.getDatasetMeta(a.dataset);
      ctx.fillStyle = String(chart.data.datasets[a.dataset]?.borderColor ?? '#333');
      for (const i of a.segments ?? []) {
        if (i === undefined) continue;
        const p0 = meta.data[i - 1];
        const p1 = meta.data[i];
        if (!p0 || !p1) continue;
        const head = arrowHead({ x: p0.x, y: p0.y }, { x: p1.x, y: p1.y });
        if (head) fillPath(head);
      }
    }
    for (const m of opts.clMax ?? []) {
      if (!m || m.dataset === undefined || !chart.isDatasetVisible(m.dataset)) continue;
      const ds = chart.data.datasets[m.dataset];
      const raw = ds?.data[0] as PlotPoint | undefined;
      if (!raw) continue;
      const colour = String(ds?.borderColor ?? '#333');
      const at = { x: xs.getPixelForValue(raw.x), y: ys.getPixelForValue(raw.y) };
      const top = typeof m.yu === 'number' ? ys.getPixelForValue(raw.y + m.yu) : undefined;
      ctx.strokeStyle = colour;
      ctx.fillStyle = colour;
      ctx.lineWidth = 1.4;
      ctx.beginPath();
      if (typeof m.yu === 'number') {
        const y0 = ys.getPixelForValue(raw.y - m.yu);
        const y1 = ys.getPixelForValue(raw.y + m.yu);
        ctx.moveTo(at.x, y0);
        ctx.lineTo(at.x, y1);
        ctx.moveTo(at.x - CAP_PX, y0);
        ctx.lineTo(at.x + CAP_PX, y0);
        ctx.moveTo(at.x - CAP_PX, y1);
        ctx.lineTo(at.x + CAP_PX, y1);
      }
      if (typeof m.xu === 'number') {
        const x0 = xs.getPixelForValue(raw.x - m.xu);
        const x1 = xs.getPixelForValue(raw.x + m.xu);
        ctx.moveTo(x0, at.y);
        ctx.lineTo(x1, at.y);
        ctx.moveTo(x0, at.y - CAP_PX);
        ctx.lineTo(x0, at.y + CAP_PX);
        ctx.moveTo(x1, at.y - CAP_PX);
        ctx.lineTo(x1, at.y + CAP_PX);
      }
      ctx.stroke();
      const g = clMaxGlyph(at, top);
      ctx.lineWidth = 3;
      ctx.lineCap = 'round';
      ctx.beginPath();
      ctx.moveTo(g.bar[0].x, g.bar[0].y);
      ctx.lineTo(g.bar[1].x, g.bar[1].y);
      ctx.stroke();
      fillPath(g.caret);
      ctx.strokeStyle = '#ffffff';
      ctx.lineWidth = 1;
      ctx.stroke();
    }
    ctx.restore();
  },
};

/** Half-width of an error bar's end cap, px. */
export const CAP_PX = 3;

/**
 * Error bars from the points' own `xu`/`yu` (logic/errorBars.ts), in each series' colour, solid whatever
 * the series' dash; clipped to the plot area so a zoomed plot does not draw over its axes.
 */
export const errorBars: Plugin<'scatter'> = {
  id: 'errorBars',
  afterDatasetsDraw(chart: Chart<'scatter'>) {
    if (chart.options.plugins?.errorBars?.show !== true) return;
    const { ctx, chartArea, scales } = chart;
    const xs = scales['x'];
    const ys = scales['y'];
    if (!xs || !ys || !chartArea) return;
    ctx.save();
    ctx.beginPath();
    ctx.rect(chartArea.left, chartArea.top, chartArea.right - chartArea.left, chartArea.bottom - chartArea.top);
    ctx.clip();
    ctx.setLineDash([]);
    ctx.lineWidth = 1.2;
    chart.data.datasets.forEach((ds, d) => {
      if (!chart.isDatasetVisible(d)) return;
      const meta = chart.getDatasetMeta(d);
      ctx.strokeStyle = String(ds.borderColor ?? '#333');
      (ds.data as PlotPoint[]).forEach((raw, i) => {
        const el = meta.data[i];
        if (!el || !raw || typeof raw !== 'object') return;
        const ends = barEnds(raw);
        if (!ends.x && !ends.y) return;
        ctx.beginPath();
        if (ends.y) {
          const y0 = ys.getPixelForValue(ends.y[0]);
          const y1 = ys.getPixelForValue(ends.y[1]);
          ctx.moveTo(el.x, y0);
          ctx.lineTo(el.x, y1);
          ctx.moveTo(el.x - CAP_PX, y0);
          ctx.lineTo(el.x + CAP_PX, y0);
          ctx.moveTo(el.x - CAP_PX, y1);
          ctx.lineTo(el.x + CAP_PX, y1);
        }
        if (ends.x) {
          const x0 = xs.getPixelForValue(ends.x[0]);
          const x1 = xs.getPixelForValue(ends.x[1]);
          ctx.moveTo(x0, el.y);
          ctx.lineTo(x1, el.y);
          ctx.moveTo(x0, el.y - CAP_PX);
          ctx.lineTo(x0, el.y + CAP_PX);
          ctx.moveTo(x1, el.y - CAP_PX);
          ctx.lineTo(x1, el.y + CAP_PX);
        }
        ctx.stroke();
      });
    });
    ctx.restore();
  },
};

export const rangeBars: Plugin<'scatter'> = {
  id: 'rangeBars',
  afterDatasetsDraw(chart: Chart<'scatter'>) {
    const opts = chart.options.plugins?.rangeBars;
    if (!opts) return;
    const { ctx, scales } = chart;
    ctx.save();
    // Chart.js hands plugin options over as deep-partial: every field may be missing
    for (const bar of opts.bars ?? []) {
      if (!bar || bar.dataset === undefined) continue;
      const meta = chart.getDatasetMeta(bar.dataset);
      if (meta.hidden) continue;
      const colour = String(chart.data.datasets[bar.dataset]?.borderColor ?? '#333');
      ctx.strokeStyle = colour;
      ctx.lineWidth = 1.2;
      meta.data.forEach((el, i) => {
        const lo = bar.low?.[i];
        const hi = bar.high?.[i];
        if (lo === undefined || hi === undefined || !Number.isFinite(lo) || !Number.isFinite(hi)) return;
        const x = el.x;
        const y0 = scales['y']!.getPixelForValue(lo);
        const y1 = scales['y']!.getPixelForValue(hi);
        ctx.beginPath();
        ctx.moveTo(x, y0);
        ctx.lineTo(x, y1);
        ctx.moveTo(x - 4, y0);
        ctx.lineTo(x + 4, y0);
        ctx.moveTo(x - 4, y1);
        ctx.lineTo(x + 4, y1);
        ctx.stroke();
      });
    }
    ctx.restore();
  },
};

export const FOOTER_LINE_PX = 15;

export const paperFooter: Plugin<'scatter'> = {
  id: 'paperFooter',
  beforeDraw(chart: Chart<'scatter'>) {
    const { ctx, width, height } = chart;
    ctx.save();
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, width, height);
    ctx.restore();
  },
  afterDraw(chart: Chart<'scatter'>) {
    const lines = chart.options.plugins?.paperFooter?.lines ?? [];
    const { ctx, width, height } = chart;
    ctx.save();
    ctx.fillStyle = '#444b55';
    ctx.font = '11px system-ui, sans-serif';
    ctx.textBaseline = 'bottom';
    lines.forEach((line, i) => {
      ctx.fillText(line ?? '', 10, height - 6 - (lines.length - 1 - i) * FOOTER_LINE_PX, width - 20);
    });
    ctx.restore();
  },
};
