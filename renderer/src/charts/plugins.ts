/**
 * Two small drawing plugins of our own, passed per chart: vertical bars (mean ± one standard deviation
 * in the sample-scatter view) and, for exported images, a white background with provenance lines under
 * the plot (a PNG should say where its numbers came from).
 */
import type { Chart, ChartType, Plugin } from 'chart.js';

declare module 'chart.js' {
  interface PluginOptionsByType<TType extends ChartType> {
    rangeBars?: { bars: { dataset: number; low: number[]; high: number[] }[] };
    paperFooter?: { lines: string[] };
  }
}

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
