/** Chart.js configurations for the plots: overlaid runs, titled axes with units, read-out on hover. */
import type { ChartConfiguration, ChartDataset, TooltipItem } from 'chart.js';
import type { PlotPoint } from '../logic/errorBars.ts';
import type { SeriesStyle } from '../logic/palette.ts';
import type { Range } from '../logic/zoom.ts';
import { FOOTER_LINE_PX } from './plugins.ts';

export interface Series {
  label: string;
  style: SeriesStyle;
  /** Points with their standard uncertainties where known (drawn as error bars when they are shown). */
  points: PlotPoint[];
  /** Draw the points joined in order (true) or as markers only. */
  joined?: boolean;
}

export interface AxesSpec {
  title?: string;
  xTitle: string;
  yTitle: string;
  xName: string;
  yName: string;
  xDecimals: number;
  yDecimals: number;
}

export interface Limits {
  x?: Range;
  y?: Range;
}

export function dataset(s: Series): ChartDataset<'scatter'> {
  return {
    label: s.label,
    data: s.points,
    showLine: s.joined !== false,
    borderColor: s.style.colour,
    backgroundColor: s.style.colour,
    pointBorderColor: s.style.colour === '#F0E442' ? '#6b6310' : s.style.colour,
    // a repeat of a configuration: an open, larger ring, so it shows even when it lies on its twin
    pointBackgroundColor: s.style.filled ? s.style.colour : 'rgba(255,255,255,0)',
    pointBorderWidth: s.style.filled ? 1 : 1.8,
    pointStyle: s.style.marker,
    pointRadius: s.style.filled ? 4 : 6,
    pointHoverRadius: s.style.filled ? 6 : 8,
    borderWidth: 1.8,
    borderDash: [...s.style.dash],
  };
}

/** "0.5123 ± 0.0031" for a read-out, the uncertainty only where the point has one, then the unit if any. */
export function readOut(value: number, u: number | undefined, decimals: number, unit = ''): string {
  const text = u === undefined ? value.toFixed(decimals) : `${value.toFixed(decimals)} ± ${u.toFixed(decimals)}`;
  return unit ? `${text} ${unit}` : text;
}

/** The unit in an axis title ("α [deg]" → "deg"); none for a ratio ("[–]", "[-]") or no brackets. */
export function unitOf(title: string): string {
  const m = /\[([^\]]+)\]\s*$/.exec(title);
  return m && !/^[–-]$/.test(m[1]!.trim()) ? m[1]!.trim() : '';
}

/**
 * On screen the legend is the panel's own (HTML); an exported image draws it on the canvas. With
 * `errorBars` the points' standard uncertainties are drawn (plugins.ts).
 */
export function plotConfig(
  axes: AxesSpec,
  series: readonly Series[],
  limits: Limits = {},
  footer: string[] = [],
  canvasLegend = footer.length > 0,
  errorBars = false,
): ChartConfiguration<'scatter'> {
  return {
    type: 'scatter',
    data: { datasets: series.map(dataset) },
    options: {
      responsive: footer.length === 0,
      maintainAspectRatio: false,
      animation: false,
      layout: { padding: { bottom: footer.length * FOOTER_LINE_PX + (footer.length ? 8 : 0), right: 8 } },
      interaction: { mode: 'nearest', intersect: false },
      scales: {
        x: { type: 'linear', title: { display: true, text: axes.xTitle, font: { size: 13, weight: 'bold' } }, min: limits.x?.min, max: limits.x?.max, grid: { color: '#e3e6ea' }, ticks: { includeBounds: false } },
        y: { type: 'linear', title: { display: true, text: axes.yTitle, font: { size: 13, weight: 'bold' } }, min: limits.y?.min, max: limits.y?.max, grid: { color: '#e3e6ea' }, ticks: { includeBounds: false } },
      },
      plugins: {
        legend: { display: canvasLegend, position: 'bottom', labels: { usePointStyle: true, boxHeight: 7, padding: 14 } },
        tooltip: {
          callbacks: {
            label: (item: TooltipItem<'scatter'>) => {
              const raw = item.raw as PlotPoint;
              return `${item.dataset.label}: ${axes.xName} = ${readOut(item.parsed.x!, raw.xu, axes.xDecimals, unitOf(axes.xTitle))}, ${axes.yName} = ${readOut(item.parsed.y!, raw.yu, axes.yDecimals, unitOf(axes.yTitle))}`;
            },
          },
        },
        paperFooter: footer.length ? { lines: footer } : undefined,
        errorBars: { show: errorBars },
      },
    },
  };
}
