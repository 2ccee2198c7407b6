/**
 * Export actions: tables as CSV and XLSX, plots as PNG, a table to the clipboard, the printed run
 * summary. Each export carries provenance (logic/provenance.ts); files go out through the host.
 */
import { ref } from 'vue';
import { renderPng, dataUrlBytes } from '../charts/renderImage.ts';
import { plotConfig } from '../charts/plotConfig.ts';
import { anyUncertainty, ERROR_BAR_NOTE } from '../logic/errorBars.ts';
import { fileStem, fitsCsvExport, pointsCsvExport, type FitSource } from '../logic/exportTables.ts';
import { PLOTS, plotSpec, type PlotId } from '../logic/plotSpecs.ts';
import { exportProvenanceLines, figureProvenance, provenanceFooter } from '../logic/provenance.ts';
import { factorLine } from '../logic/factorNames.ts';
import { svgFigure } from '../charts/svgFigure.ts';
import type { Host } from '../host/hostAccess.ts';
import type { PlotLimits } from './plotLimits.ts';
import { overlaySeries } from './plotSeries.ts';
import type { Workbench } from './workbench.ts';

export const PNG_SIZE = { width: 1400, height: 900 } as const;
/** SVG figures: A4-landscape-like proportions at 96 px per inch. */
export const SVG_SIZE = { width: 1100, height: 780 } as const;

export interface PrintJob {
  file: string;
  images: { title: string; url: string }[];
  exportedAt: string;
  provenance: string[];
}

export function createExports(wb: Workbench, host: Host, limits: PlotLimits, doc: Document = document) {
  const printJob = ref<PrintJob | null>(null);

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
      await host.saveExport(`${campaignStem()}-runs.xlsx`, bytes, 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet');
    });

  async function plotImage(id: PlotId, width: number, height: number, withFooter: boolean, files?: readonly string[]): Promise<string> {
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
    const scope = files?.length === 1 ? `run ${wb.displayName(files[0]!)}` : wb.state.campaign.name;
    cfg.options!.plugins!.title = { display: true, text: `${spec.title}, ${spec.y.title.split(' ')[0]} vs ${spec.x.title.split(' ')[0]} (${basis}) · ${scope}`, font: { size: withFooter ? 16 : 22 } };
    if (!withFooter) {
      // printed small: larger type so the axes stay legible at half a page width
      const axesFont = { size: 20, weight: 'bold' as const };
      cfg.options!.scales!['x']!.title!.font = axesFont;
      cfg.options!.scales!['y']!.title!.font = axesFont;
      cfg.options!.scales!['x']!.ticks = { includeBounds: false, font: { size: 17 } };
      cfg.options!.scales!['y']!.ticks = { includeBounds: false, font: { size: 17 } };
    }
    return renderPng(cfg, width, height, doc);
  }

  const exportPlotPng = (id: PlotId = 'cl-alpha') =>
    guarded('PNG export', async () => {
      if (wb.shownRuns.value.length === 0) return nothing('Plot PNG');
      const url = await plotImage(id, PNG_SIZE.width, PNG_SIZE.height, true);
      await host.saveExport(`${campaignStem()}-${id}.png`, dataUrlBytes(url), 'image/png');
    });

  /** The plot as an SVG figure (vector) at the chosen size, with a provenance block of legible lines. */
  const exportPlotSvg = (id: PlotId = 'cl-alpha', size: { width: number; height: number } = SVG_SIZE) =>
    guarded('SVG export', async () => {
      if (wb.shownRuns.value.length === 0) return nothing('Plot SVG');
      const spec = plotSpec(id);
      const series = overlaySeries(wb, spec, wb.state.basis);
      const basis = wb.state.basis === 'corrected' ? 'free-air corrected' : 'as measured in the tunnel';
      const prov = await wb.provenance(wb.shownRuns.value);
      const svg = svgFigure({
        title: `${spec.title}, ${spec.y.title.split(' ')[0]} vs ${spec.x.title.split(' ')[0]} (${basis}) · ${wb.state.campaign.name}`,
        xTitle: spec.x.title,
        yTitle: spec.y.title,
        series,
        limits: limits.get(id),
        width: size.width,
        height: size.height,
        provenance: figureProvenance(prov, (r) => factorLine(r.factors)),
      });
      await host.saveExport(`${campaignStem()}-${id}.svg`, svg, 'image/svg+xml');
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

  return { printJob, exportPlotSvg, exportPointsCsv, exportFitsCsv, exportXlsx, exportPlotPng, copyText, printSummary, plotImage };
}

export type Exports = ReturnType<typeof createExports>;
