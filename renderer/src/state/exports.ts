/**
 * Export actions: tables as CSV and XLSX (points, fits, the differences against the baseline, the
 * full-scale estimate), plots as PNG and SVG at a chosen size, a table to the clipboard, the printed run
 * summary. Each export carries provenance (logic/provenance.ts); files go out through the host.
 */
import { reactive, ref } from 'vue';
import { attempt, projectStallSpeed } from '../../../core/index.ts';
import { renderPng, dataUrlBytes } from '../charts/renderImage.ts';
import { plotConfig } from '../charts/plotConfig.ts';
import { anyUncertainty, ERROR_BAR_NOTE } from '../logic/errorBars.ts';
import {
  deltaCsvExport,
  deltaExport,
  fileStem,
  fitsCsvExport,
  fullScaleCsvExport,
  pointsCsvExport,
  type DeltaExport,
  type ExportRun,
  type FitSource,
  type FullScaleExport,
} from '../logic/exportTables.ts';
import { DEFAULT_PRESET, FIGURE_PRESETS, figureLayout, fitLayout, sizeProblem, sizeStem, type FigureSize } from '../logic/figureSize.ts';
import { checkInputs, projectRuns, stallChanges } from '../logic/fullScale.ts';
import { PLOTS, plotSpec, type PlotId } from '../logic/plotSpecs.ts';
import { exportProvenanceLines, figureProvenance, provenanceFooter } from '../logic/provenance.ts';
import { factorLine } from '../logic/factorNames.ts';
import { svgFigure, wrapLines } from '../charts/svgFigure.ts';
import type { Host } from '../host/hostAccess.ts';
import type { PlotLimits } from './plotLimits.ts';
import { overlaySeries, seriesLabel } from './plotSeries.ts';
import type { Workbench } from './workbench.ts';

const XLSX_TYPE = 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet';

/** The figure size chosen for the plots' PNG and SVG buttons: a preset, or a size typed in. */
export interface FigureChoice {
  preset: string;
  custom: FigureSize;
}

/** The size a choice stands for; null (with the problem) for a typed size out of range. */
export function chosenSize(c: FigureChoice): FigureSize | null {
  const preset = FIGURE_PRESETS.find((p) => p.id === c.preset);
  if (preset) return { width: preset.width, height: preset.height, unit: preset.unit };
  return sizeProblem(c.custom) ? null : { ...c.custom };
}

export interface PrintJob {
  file: string;
  images: { title: string; url: string }[];
  exportedAt: string;
  provenance: string[];
}

export function createExports(wb: Workbench, host: Host, limits: PlotLimits, doc: Document = document) {
  const printJob = ref<PrintJob | null>(null);
  const figure = reactive<FigureChoice>({ preset: DEFAULT_PRESET, custom: { width: 160, height: 110, unit: 'mm' } });

  /** The chosen figure size, or a message and null when the typed size is out of range. */
  function figureSize(): FigureSize | null {
    const size = chosenSize(figure);
    if (!size) wb.say('error', `Figure size: ${sizeProblem(figure.custom)}`);
    return size;
  }

  function exportRun(file: string): ExportRun | null {
    const result = wb.resultOf(file);
    return result ? { file, name: wb.displayName(file), label: seriesLabel(wb, file), configuration: wb.configurationOf(file), result } : null;
  }

  /** What the Against baseline view shows: the baseline, the ticked runs against it, on the basis shown. */
  function currentDeltas(): DeltaExport | null {
    const file = wb.state.campaign.baseline;
    const baseline = file && wb.readyRuns.value.includes(file) ? exportRun(file) : null;
    if (!baseline) return null;
    const compared = wb.shownRuns.value.filter((f) => f !== file).map(exportRun).filter((r): r is ExportRun => r !== null);
    return deltaExport(baseline, compared, wb.state.basis);
  }

  /** What the Full-scale view shows: the ticked runs and the baseline, projected with the form's inputs. */
  function currentFullScale(): FullScaleExport | null {
    const check = checkInputs(wb.state.fullScale);
    if (!check.ok) return null;
    const air = attempt(() => projectStallSpeed({ ...check.inputs, clMax: 1 }));
    if (!air.ok) return null;
    const baseline = wb.state.campaign.baseline && wb.readyRuns.value.includes(wb.state.campaign.baseline) ? wb.state.campaign.baseline : null;
    const files = [...wb.shownRuns.value];
    if (baseline && !files.includes(baseline)) files.unshift(baseline);
    const runs = files.map((file) => ({ file, label: seriesLabel(wb, file), result: wb.resultOf(file, 'corrected') }));
    const rows = projectRuns(check, runs);
    const { changes } = stallChanges(rows, baseline);
    return {
      air: air.value,
      baseline,
      rows: rows.map((row, i) => ({
        run: { file: row.file, name: wb.displayName(row.file), label: row.label, configuration: wb.configurationOf(row.file), result: runs[i]!.result },
        isBaseline: row.file === baseline,
        row,
        change: changes.find((c) => c.file === row.file) ?? null,
      })),
    };
  }

  function campaignStem(): string {
    return fileStem(wb.state.campaign.name);
  }

  function fitSources(files: readonly string[]): FitSource[] {
    const out: FitSource[] = [];
    for (const file of files) {
      const e = wb.state.entries[file];
      if (!e?.result || !e.asMeasured || e.status !== 'ready') continue;
      out.push({ name: e.result.run.name, configuration: wb.configurationOf(file), file, result: e.result, asMeasured: e.asMeasured });
    }
    return out;
  }

  async function guarded(what: string, step: () => Promise<unknown>): Promise<void> {
    try {
      await step();
    } catch (err) {
      wb.say('error', `${what} failed: ${err instanceof Error ? err.message : String(err)}`);
    }
  }

  function nothing(what: string): void {
    wb.say('info', `${what}: no reduced run is selected.`);
  }

  const exportPointsCsv = (file = wb.state.currentRun) =>
    guarded('CSV export', async () => {
      const e = file ? wb.state.entries[file] : undefined;
      if (!file || !e?.result) return nothing('Point table CSV');
      const text = pointsCsvExport(await wb.provenance([file], 'corrected'), e.result);
      await host.saveExport(`${fileStem(e.result.run.name)}-points.csv`, text, 'text/csv');
    });

  const exportFitsCsv = (files: readonly string[] = wb.shownRuns.value) =>
    guarded('CSV export', async () => {
      const sources = fitSources(files);
      if (sources.length === 0) return nothing('Fit summary CSV');
      await host.saveExport(`${campaignStem()}-fits.csv`, fitsCsvExport(await wb.provenance(sources.map((s) => s.file), 'corrected'), sources), 'text/csv');
    });

  const exportXlsx = (files: readonly string[] = wb.shownRuns.value) =>
    guarded('XLSX export', async () => {
      const sources = fitSources(files);
      if (sources.length === 0) return nothing('Workbook');
      // the spreadsheet writer is loaded only when a workbook is asked for
      const { workbookBytes } = await import('../logic/xlsxExport.ts');
      const bytes = await workbookBytes(await wb.provenance(sources.map((s) => s.file), 'corrected'), sources);
      await host.saveExport(`${campaignStem()}-runs.xlsx`, bytes, XLSX_TYPE);
    });

  function deltaStem(d: DeltaExport): string {
    return `${campaignStem()}-differences-against-${fileStem(d.baseline.name, 40)}`;
  }

  async function deltaProvenance(d: DeltaExport) {
    return wb.provenance([d.baseline.file, ...d.runs.map((r) => r.file), ...d.refused.map((r) => r.run.file)]);
  }

  /** The differences against the baseline as the view shows them, as a report CSV. */
  const exportDeltaCsv = () =>
    guarded('CSV export', async () => {
      const d = currentDeltas();
      if (!d) return wb.say('info', 'Differences: choose a baseline run first.');
      await host.saveExport(`${deltaStem(d)}.csv`, deltaCsvExport(await deltaProvenance(d), d), 'text/csv');
    });

  const exportDeltaXlsx = () =>
    guarded('XLSX export', async () => {
      const d = currentDeltas();
      if (!d) return wb.say('info', 'Differences: choose a baseline run first.');
      const { deltaWorkbookBytes } = await import('../logic/xlsxExport.ts');
      await host.saveExport(`${deltaStem(d)}.xlsx`, await deltaWorkbookBytes(await deltaProvenance(d), d), XLSX_TYPE);
    });

  function fullScaleReady(): FullScaleExport | null {
    const x = currentFullScale();
    if (!x) wb.say('info', 'Full-scale table: enter the aircraft mass and wing area (and correct any marked field) first.');
    else if (x.rows.length === 0) wb.say('info', 'Full-scale table: no reduced run is ticked in the run list.');
    return x && x.rows.length ? x : null;
  }

  /** The full-scale estimate as the view shows it, its cautions first, as a report CSV. */
  const exportFullScaleCsv = () =>
    guarded('CSV export', async () => {
      const x = fullScaleReady();
      if (!x) return;
      const prov = await wb.provenance(x.rows.map((r) => r.run.file), 'corrected');
      await host.saveExport(`${campaignStem()}-full-scale-estimate.csv`, fullScaleCsvExport(prov, x), 'text/csv');
    });

  const exportFullScaleXlsx = () =>
    guarded('XLSX export', async () => {
      const x = fullScaleReady();
      if (!x) return;
      const { fullScaleWorkbookBytes } = await import('../logic/xlsxExport.ts');
      const prov = await wb.provenance(x.rows.map((r) => r.run.file), 'corrected');
      await host.saveExport(`${campaignStem()}-full-scale-estimate.xlsx`, await fullScaleWorkbookBytes(prov, x), XLSX_TYPE);
    });

  async function plotImage(id: PlotId, width: number, height: number, withFooter: boolean, files?: readonly string[], pixelRatio = 1): Promise<string> {
    const spec = plotSpec(id);
    const series = overlaySeries(wb, spec, wb.state.basis, files);
    const basis = wb.state.basis === 'corrected' ? 'free-air corrected' : 'as measured in the tunnel';
    // an exported plot shows error bars as the window does, and says what they are (the printed summary keeps its plots plain)
    const bars = withFooter && wb.state.errorBars && anyUncertainty(series);
    const footer = withFooter ? [provenanceFooter(await wb.provenance(files ?? wb.shownRuns.value)), ...(bars ? [ERROR_BAR_NOTE] : [])] : [];
    const cfg = plotConfig(
      { xTitle: spec.x.title, yTitle: spec.y.title, xName: spec.xName, yName: spec.yName, xDecimals: spec.x.decimals, yDecimals: spec.y.decimals },
      series,
      limits.get(id),
      footer,
      footer.length > 0,
      bars,
    );
    // a narrow figure leaves the campaign to the provenance lines, so the title fits its width
    const scope = files?.length === 1 ? `run ${wb.displayName(files[0]!)}` : width < 900 ? '' : wb.state.campaign.name;
    cfg.options!.plugins!.title = { display: true, text: `${spec.title}, ${spec.y.title.split(' ')[0]} vs ${spec.x.title.split(' ')[0]} (${basis})${scope ? ` · ${scope}` : ''}`, font: { size: withFooter ? 16 : 22 } };
    if (!withFooter) {
      // printed small: larger type so the axes stay legible at half a page width
      const axesFont = { size: 20, weight: 'bold' as const };
      cfg.options!.scales!['x']!.title!.font = axesFont;
      cfg.options!.scales!['y']!.title!.font = axesFont;
      cfg.options!.scales!['x']!.ticks = { includeBounds: false, font: { size: 17 } };
      cfg.options!.scales!['y']!.ticks = { includeBounds: false, font: { size: 17 } };
    }
    return renderPng(cfg, width, height, doc, pixelRatio);
  }

  /** A file name for a figure: the plot, and the size when it is not the default one. */
  function figureName(id: PlotId, size: FigureSize, ext: string): string {
    const screen = FIGURE_PRESETS.find((p) => p.id === DEFAULT_PRESET)!;
    const plain = size.unit === screen.unit && size.width === screen.width && size.height === screen.height;
    return `${campaignStem()}-${id}${plain ? '' : `-${sizeStem(size)}`}.${ext}`;
  }

  /** The plot as a PNG at the chosen figure size (300 dpi for a size in mm), with its provenance footer. */
  const exportPlotPng = (id: PlotId = 'cl-alpha', size: FigureSize | null = figureSize()) =>
    guarded('PNG export', async () => {
      if (!size) return;
      if (wb.shownRuns.value.length === 0) return nothing('Plot PNG');
      const layout = figureLayout(size);
      const url = await plotImage(id, layout.width, layout.height, true, undefined, layout.pixelRatio);
      await host.saveExport(figureName(id, size, 'png'), dataUrlBytes(url), 'image/png');
    });

  /** The plot as an SVG figure (vector) at the chosen size (physical in mm, or px), with a provenance block of legible lines. */
  const exportPlotSvg = (id: PlotId = 'cl-alpha', size: FigureSize | null = figureSize()) =>
    guarded('SVG export', async () => {
      if (!size) return;
      if (wb.shownRuns.value.length === 0) return nothing('Plot SVG');
      const spec = plotSpec(id);
      const series = overlaySeries(wb, spec, wb.state.basis);
      const basis = wb.state.basis === 'corrected' ? 'free-air corrected' : 'as measured in the tunnel';
      const prov = await wb.provenance(wb.shownRuns.value);
      const provenance = figureProvenance(prov, (r) => factorLine(r.factors));
      const base = figureLayout(size);
      // a size in mm keeps its physical size over a larger drawing when the plot would be squeezed out;
      // svgFigure's frame: 44 px above the plot, 56 below it for the x axis, 20 per legend row of three
      // runs, 16 per provenance line (12 px type, about 7 px a character) and 12 below them
      const layout = !base.mm ? base : fitLayout(base, (w) => 44 + 56 + Math.ceil(series.length / 3) * 20 + wrapLines(provenance, Math.floor((w - 48) / 7)).length * 16 + 12);
      if (layout !== base)
        wb.say(
          'info',
          `Figure ${plotSpec(id).title}: drawn at ${layout.width} × ${layout.height} px to leave the plot room beside the provenance of ${series.length} runs; at ${size.width} × ${size.height} mm its small type prints at ${layout.printedPt!.toFixed(1)} pt.`,
        );
      const svg = svgFigure({
        title: `${spec.title}, ${spec.y.title.split(' ')[0]} vs ${spec.x.title.split(' ')[0]} (${basis})${layout.width < 900 ? '' : ` · ${wb.state.campaign.name}`}`,
        xTitle: spec.x.title,
        yTitle: spec.y.title,
        series,
        limits: limits.get(id),
        width: layout.width,
        height: layout.height,
        mm: layout.mm,
        provenance,
      });
      await host.saveExport(figureName(id, size, 'svg'), svg, 'image/svg+xml');
    });

  /** Put text on the clipboard; falls back to a hidden text area where the clipboard API is refused. */
  async function copyText(text: string): Promise<boolean> {
    try {
      await navigator.clipboard.writeText(text);
      return true;
    } catch {
      const area = doc.createElement('textarea');
      area.value = text;
      area.setAttribute('readonly', '');
      area.style.position = 'fixed';
      area.style.left = '-9999px';
      doc.body.appendChild(area);
      area.select();
      const ok = doc.execCommand('copy');
      area.remove();
      return ok;
    }
  }

  const printSummary = (file = wb.state.currentRun) =>
    guarded('Printing', async () => {
      if (!file || !wb.state.entries[file]?.result) return nothing('Run summary');
      const images: PrintJob['images'] = [];
      for (const id of ['cl-alpha', 'cd-cl'] as const) images.push({ title: PLOTS.find((p) => p.id === id)!.title, url: await plotImage(id, 900, 620, false, [file]) });
      const prov = await wb.provenance([file], 'corrected');
      printJob.value = { file, images, exportedAt: prov.exportedAt, provenance: exportProvenanceLines(prov) };
      // let the summary render before the print dialog takes its snapshot
      await new Promise((r) => setTimeout(r, 50));
      await host.print();
    });

  return {
    printJob,
    figure,
    exportPlotSvg,
    exportPointsCsv,
    exportFitsCsv,
    exportXlsx,
    exportDeltaCsv,
    exportDeltaXlsx,
    exportFullScaleCsv,
    exportFullScaleXlsx,
    exportPlotPng,
    copyText,
    printSummary,
    plotImage,
  };
}

export type Exports = ReturnType<typeof createExports>;
