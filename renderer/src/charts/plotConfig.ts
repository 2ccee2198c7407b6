/** Chart.js configurations for the plots: overlaid runs, titled axes with units, read-out on hover. */
import { Chart, type ChartConfiguration, type ChartDataset, type LegendItem, type TooltipItem } from 'chart.js';
import type { PlotPoint } from '../logic/errorBars.ts';
import type { SeriesStyle } from '../logic/palette.ts';
import { branchName, arrowSegments, markKey, markNotes, segmentFalls, type KeyEntry, type SeriesMarks, type SweepInfo } from '../logic/plotMarks.ts';
import type { Range } from '../logic/zoom.ts';
import { readOutText } from '../logic/numberFormat.ts';
import { FALLING_LINE_PX, FIT_LINE_ALPHA, FIT_LINE_PX, RISING_LINE_PX, withAlpha } from './markGlyphs.ts';
import { FOOTER_LINE_PX, type DatasetRole, type MarksOptions } from './plugins.ts';

export interface Series {
  label: string;
  style: SeriesStyle;
  /** Points with their standard uncertainties where known (drawn as error bars when they are shown). */
  points: PlotPoint[];
  /** Draw the points joined in order (true) or as markers only. */
  joined?: boolean;
  /** Sweep branches of a run that is not one plain rising sweep: falling stretches drawn thin, arrows along each branch. */
  sweep?: SweepInfo;
  /** Fitted marks asked for (CLmax, fitted line), and notes on those the fit cannot give. */
  marks?: SeriesMarks;
  /** Which plot the series is drawn on ("cl-alpha", "cd-cl", …), for the key's wording. */
  plot?: string;
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
    borderWidth: RISING_LINE_PX,
    borderDash: [...s.style.dash],
    // a falling (return) branch keeps the run's colour and dash, drawn thin
    ...(s.sweep ? { segment: { borderWidth: (ctx: { p1DataIndex: number }) => (segmentFalls(s.sweep!, ctx.p1DataIndex) ? FALLING_LINE_PX : undefined) } } : {}),
  };
}

/** A fitted line: a broad pale stroke in the run's colour, under the points, not a hover target. */
function fitDataset(s: Series): ChartDataset<'scatter'> {
  return {
    label: `${s.label}: ${s.marks!.fitLine!.text}`,
    data: s.marks!.fitLine!.points,
    showLine: true,
    borderColor: withAlpha(s.style.colour, FIT_LINE_ALPHA),
    backgroundColor: withAlpha(s.style.colour, FIT_LINE_ALPHA),
    borderWidth: FIT_LINE_PX,
    borderCapStyle: 'round',
    pointRadius: 0,
    pointHoverRadius: 0,
    order: 1,
  };
}

/** The fitted CLmax: one point, drawn by the marks plugin (bar, caret, uncertainty), on top of the runs. */
function clMaxDataset(s: Series): ChartDataset<'scatter'> {
  const m = s.marks!.clMax!;
  return {
    label: `${s.label}: ${m.text}`,
    data: [{ x: m.x, y: m.y }],
    showLine: false,
    borderColor: s.style.colour,
    backgroundColor: s.style.colour,
    pointRadius: 0,
    pointHoverRadius: 0,
    order: -1,
  };
}

/**
 * Datasets made for series, kept while the series object lives: a chart handed the same dataset object
 * again keeps what it worked out from it, so a batch of newly reduced runs costs the chart those runs,
 * not every run again. One cache per chart (Chart.js keeps its bookkeeping per chart and dataset).
 */
export type DatasetCache = WeakMap<Series, { run: ChartDataset<'scatter'>; fit?: ChartDataset<'scatter'>; clMax?: ChartDataset<'scatter'> }>;

function cached(cache: DatasetCache | undefined, s: Series, part: 'run' | 'fit' | 'clMax', make: (s: Series) => ChartDataset<'scatter'>): ChartDataset<'scatter'> {
  if (!cache) return make(s);
  let entry = cache.get(s);
  if (!entry) cache.set(s, (entry = { run: part === 'run' ? make(s) : dataset(s) }));
  return (entry[part] ??= make(s));
}

/** Every dataset of a plot: the runs first (in series order), then the fitted lines, then the CLmax marks. */
export function datasetsOf(
  series: readonly Series[],
  cache?: DatasetCache,
): { datasets: ChartDataset<'scatter'>[]; roles: DatasetRole[]; owner: number[]; marks: MarksOptions } {
  const datasets: ChartDataset<'scatter'>[] = [];
  const roles: DatasetRole[] = [];
  const owner: number[] = [];
  const marks: MarksOptions = { roles, arrows: [], clMax: [] };
  series.forEach((s, i) => {
    datasets.push(cached(cache, s, 'run', dataset));
    roles.push('run');
    owner.push(i);
    if (s.sweep && s.joined !== false) marks.arrows.push({ dataset: datasets.length - 1, segments: arrowSegments(s.sweep.branchOf) });
  });
  series.forEach((s, i) => {
    if (!s.marks?.fitLine) return;
    datasets.push(cached(cache, s, 'fit', fitDataset));
    roles.push('fit');
    owner.push(i);
  });
  series.forEach((s, i) => {
    const m = s.marks?.clMax;
    if (!m) return;
    datasets.push(cached(cache, s, 'clMax', clMaxDataset));
    roles.push('clmax');
    owner.push(i);
    marks.clMax.push({ dataset: datasets.length - 1, xu: m.xu, yu: m.yu });
  });
  return { datasets, roles, owner, marks };
}

const KEY_GREY = '#4a5058';

/** Legend entries of the key (canvas legend of exported images), drawn in grey: they explain a style, not a run. */
export function keyLegendItem(k: KeyEntry): LegendItem {
  const base = { text: k.text, hidden: false, fontColor: '#2b2f36' };
  if (k.kind === 'return') return { ...base, pointStyle: 'line', strokeStyle: KEY_GREY, fillStyle: KEY_GREY, lineWidth: FALLING_LINE_PX };
  if (k.kind === 'fit') return { ...base, pointStyle: 'line', strokeStyle: withAlpha('#4a5058', FIT_LINE_ALPHA), fillStyle: withAlpha('#4a5058', FIT_LINE_ALPHA), lineWidth: FIT_LINE_PX };
  return { ...base, pointStyle: 'triangle', rotation: 180, strokeStyle: KEY_GREY, fillStyle: KEY_GREY, lineWidth: 1 };
}

/** "0.5123 ± 0.0031" for a read-out, the uncertainty only where the point has one, then the unit if any (the window's one number format). */
export function readOut(value: number, u: number | undefined, decimals: number, unit = ''): string {
  return readOutText(value, u, decimals, unit);
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
  cache?: DatasetCache,
): ChartConfiguration<'scatter'> {
  const { datasets, roles, owner, marks } = datasetsOf(series, cache);
  const key = markKey(series, series[0]?.plot ?? '');
  // an exported image says which marks could not be drawn, above its provenance
  const lines = canvasLegend ? [...markNotes(series), ...footer] : footer;
  return {
    type: 'scatter',
    data: { datasets },
    options: {
      responsive: footer.length === 0,
      maintainAspectRatio: false,
      animation: false,
      // not `parsing: false`: Chart.js then takes the points as sorted by x and, zoomed in, cuts a polar
      // or a return sweep at the first point outside the range
      layout: { padding: { bottom: lines.length * FOOTER_LINE_PX + (lines.length ? 8 : 0), right: 8 } },
      // the nearest point of a run or a CLmax mark; fitted lines are never picked (plugins.ts)
      interaction: { mode: 'nearestPoint', intersect: false },
      scales: {
        x: { type: 'linear', title: { display: true, text: axes.xTitle, font: { size: 13, weight: 'bold' } }, min: limits.x?.min, max: limits.x?.max, grid: { color: '#e3e6ea' }, ticks: { includeBounds: false } },
        y: {
          type: 'linear',
          title: { display: true, text: axes.yTitle, font: { size: 13, weight: 'bold' } },
          min: limits.y?.min,
          max: limits.y?.max,
          // room above the highest CLmax for its caret
          ...(marks.clMax.length ? { grace: '15%' } : {}),
          grid: { color: '#e3e6ea' },
          ticks: { includeBounds: false },
        },
      },
      plugins: {
        legend: {
          display: canvasLegend,
          position: 'bottom',
          labels: {
            usePointStyle: true,
            boxHeight: 7,
            padding: 14,
            // the runs, then the key to the marks (fitted lines and CLmax marks have no entries of their own)
            generateLabels: (chart) => [
              ...Chart.defaults.plugins.legend.labels.generateLabels(chart).filter((item) => item.datasetIndex !== undefined && roles[item.datasetIndex] === 'run'),
              ...key.map(keyLegendItem),
            ],
          },
        },
        tooltip: {
          callbacks: {
            label: (item: TooltipItem<'scatter'>) => {
              const s = series[owner[item.datasetIndex]!];
              const role = roles[item.datasetIndex];
              // a second line rather than a wider box: the plots are narrow on a laptop
              if (role === 'clmax') return [`${s?.label}:`, s?.marks?.clMax?.text ?? ''];
              if (role === 'fit') return [`${s?.label}:`, s?.marks?.fitLine?.text ?? ''];
              const raw = item.raw as PlotPoint;
              const text = `${item.dataset.label}: ${axes.xName} = ${readOut(item.parsed.x!, raw.xu, axes.xDecimals, unitOf(axes.xTitle))}, ${axes.yName} = ${readOut(item.parsed.y!, raw.yu, axes.yDecimals, unitOf(axes.yTitle))}`;
              const branch = s?.sweep?.branchOf[item.dataIndex];
              return s?.sweep && branch !== undefined ? [text, branchName(s.sweep.directions, branch)] : text;
            },
          },
        },
        paperFooter: lines.length ? { lines } : undefined,
        errorBars: { show: errorBars },
        plotMarks: marks,
      },
    },
  };
}
