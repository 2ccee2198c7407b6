/** Series for the overlaid plots: one per shown run, styled by run (colour) and configuration (marker, dash). */
import type { Series } from '../charts/plotConfig.ts';
import { plotPoints, type PlotSpec } from '../logic/plotSpecs.ts';
import type { Basis, Workbench } from './workbench.ts';

export function seriesLabel(wb: Workbench, file: string): string {
  const config = wb.configurationOf(file);
  const label = config ? `${wb.displayName(file)} · ${config}` : wb.displayName(file);
  // a 2D section says so wherever it is drawn beside 3D models
  return wb.state.entries[file]?.result?.corrections.kind === '2d' ? `${label} (2D)` : label;
}

export function overlaySeries(wb: Workbench, spec: PlotSpec, basis: Basis, files: readonly string[] = wb.shownRuns.value): Series[] {
  const out: Series[] = [];
  for (const file of files) {
    const result = wb.resultOf(file, basis);
    if (!result) continue;
    out.push({ label: seriesLabel(wb, file), style: wb.styleOf(file), points: plotPoints(spec, result.points) });
  }
  return out;
}
