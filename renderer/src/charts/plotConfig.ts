/** Chart.js configurations for the plots: overlaid runs, titled axes with units, read-out on hover. */
import type { ChartConfiguration, ChartDataset, TooltipItem } from 'chart.js';
import type { SeriesStyle } from '../logic/palette.ts';
import type { Range } from '../logic/zoom.ts';
import { FOOTER_LINE_PX } from './plugins.ts';

export interface Series {
  label: string;
  style: SeriesStyle;
  points: { x: number; y: number }[];
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
    pointStyle: s.style.marker,
    pointRadius: 4,
    pointHoverRadius: 6,
    borderWidth: 1.8,
    borderDash: [...s.style.dash],
  };
}

/** On screen the legend is the panel's own (HTML); an exported image draws it on the canvas. */
export function plotConfig(axes: AxesSpec, series: readonly Series[], limits: Limits = {}, footer: string[] = [], canvasLegend = footer.length > 0): ChartConfiguration<'scatter'> {
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
        x: { type: 'linear', title: { display: true, text: axes.xTitle, font: { size: 13, weight: 'bold' } }, min: limits.x?.min, max: limits.x?.max, grid: { color: '#e3e6ea' } },
        y: { type: 'linear', title: { display: true, text: axes.yTitle, font: { size: 13, weight: 'bold' } }, min: limits.y?.min, max: limits.y?.max, grid: { color: '#e3e6ea' } },
      },
      plugins: {
        legend: { display: canvasLegend, position: 'bottom', labels: { usePointStyle: true, boxHeight: 7, padding: 14 } },
        tooltip: {
          callbacks: {
            label: (item: TooltipItem<'scatter'>) =>
              `${item.dataset.label}: ${axes.xName} = ${item.parsed.x!.toFixed(axes.xDecimals)}, ${axes.yName} = ${item.parsed.y!.toFixed(axes.yDecimals)}`,
          },
        },
        paperFooter: footer.length ? { lines: footer } : undefined,
      },
    },
  };
}
