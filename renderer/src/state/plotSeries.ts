/**
 * Series for the overlaid plots: one per shown run, styled by run (colour) and configuration (marker,
 * dash), with the run's sweep branches and, when asked for, its fitted marks (CLmax, fitted lines).
 */
import type { Series } from '../charts/plotConfig.ts';
import { marksFor, pointBranches, type MarkChoice } from '../logic/plotMarks.ts';
import { indexedPlotPoints, type PlotSpec } from '../logic/plotSpecs.ts';
import { plotMarks } from './plotMarks.ts';
import type { Basis, Workbench } from './workbench.ts';

export function seriesLabel(wb: Workbench, file: string): string {
  const config = wb.configurationOf(file);
  const label = config ? `${wb.displayName(file)} · ${config}` : wb.displayName(file);
  // a 2D section says so wherever it is drawn beside 3D models
  return wb.state.entries[file]?.result?.corrections.kind === '2d' ? `${label} (2D)` : label;
}

/**
 * The shown runs on one plot. The marks follow the window's choice (`plotMarks`) unless one is given,
 * so the exported figures carry what the screen shows.
 */
export function overlaySeries(
  wb: Workbench,
  spec: PlotSpec,
  basis: Basis,
  files: readonly string[] = wb.shownRuns.value,
  marks: MarkChoice = plotMarks,
): Series[] {
  const out: Series[] = [];
  for (const file of files) {
    const result = wb.resultOf(file, basis);
    if (!result) continue;
    const { points, index } = indexedPlotPoints(spec, result.points);
    const s: Series = { label: seriesLabel(wb, file), style: wb.styleOf(file), points, plot: spec.id };
    const branches = pointBranches(result);
    if (branches) s.sweep = { branchOf: index.map((i) => branches.branchOf[i]!), directions: branches.directions };
    const m = marksFor(spec.id, result, marks, branches?.branchOf ?? null);
    if (m) s.marks = m;
    out.push(s);
  }
  return out;
}
