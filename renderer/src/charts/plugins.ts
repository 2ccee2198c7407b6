/**
 * Small drawing plugins of our own, passed per chart: vertical bars (mean ± one standard deviation
 * in the sample-scatter view), error bars (± one standard uncertainty of each point along x and y) and,
 * for exported images, a white background with provenance lines under the plot (a PNG should say where
 * its numbers came from).
 */
import type { Chart, ChartType, Plugin } from 'chart.js';
import { barEnds, type PlotPoint } from '../logic/errorBars.ts';

declare module 'chart.js' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars -- declaration merging repeats chart.js's own type parameter
  interface PluginOptionsByType<TType extends ChartType> {
    rangeBars?: { bars: { dataset: number; low: number[]; high: number[] }[] };
    paperFooter?: { lines: string[] };
    errorBars?: { show: boolean };
  }
}

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
