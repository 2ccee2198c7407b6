/**
 * A shaded band between two curves under a plot's datasets (the repeatability band): a polygon through
 * the upper points forward and the lower points back, in a translucent colour, clipped to the plot area.
 */
import type { Chart, ChartType, Plugin } from 'chart.js';

export interface BandOptions {
  bands: { colour: string; points: { x: number; lo: number; hi: number }[] }[];
}

declare module 'chart.js' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars -- declaration merging repeats chart.js's own type parameter
  interface PluginOptionsByType<TType extends ChartType> {
    bandFill?: BandOptions;
  }
}

export const bandFill: Plugin<'scatter'> = {
  id: 'bandFill',
  beforeDatasetsDraw(chart: Chart<'scatter'>) {
    const opts = chart.options.plugins?.bandFill;
    const xs = chart.scales['x'];
    const ys = chart.scales['y'];
    const area = chart.chartArea;
    if (!opts || !xs || !ys || !area) return;
    const { ctx } = chart;
    ctx.save();
    ctx.beginPath();
    ctx.rect(area.left, area.top, area.right - area.left, area.bottom - area.top);
    ctx.clip();
    for (const band of opts.bands ?? []) {
      const pts = band?.points ?? [];
      if (!band || pts.length < 2) continue;
      ctx.beginPath();
      pts.forEach((p, i) =>
        i === 0 ? ctx.moveTo(xs.getPixelForValue(p!.x!), ys.getPixelForValue(p!.hi!)) : ctx.lineTo(xs.getPixelForValue(p!.x!), ys.getPixelForValue(p!.hi!)),
      );
      for (let i = pts.length - 1; i >= 0; i--) ctx.lineTo(xs.getPixelForValue(pts[i]!.x!), ys.getPixelForValue(pts[i]!.lo!));
      ctx.closePath();
      ctx.globalAlpha = 0.18;
      ctx.fillStyle = band.colour ?? '#888';
      ctx.fill();
      ctx.globalAlpha = 0.6;
      ctx.strokeStyle = band.colour ?? '#888';
      ctx.setLineDash([3, 3]);
      ctx.lineWidth = 1;
      ctx.stroke();
      ctx.setLineDash([]);
      ctx.globalAlpha = 1;
    }
    ctx.restore();
  },
};
