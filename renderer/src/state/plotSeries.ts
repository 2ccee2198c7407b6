/**
 * Series for the overlaid plots: one per shown run, styled by run (colour) and configuration (marker,
 * dash), with the run's sweep branches and, when asked for, its fitted marks (CLmax, fitted lines).
 */
import type { ReductionResult } from '../../../core/index.ts';
import type { Series } from '../charts/plotConfig.ts';
import type { SeriesStyle } from '../logic/palette.ts';
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
 * One run's series on one plot, made from its result, style and label. Results are never changed in
 * place (a run reduced again gets a new result object), so a series is kept per result, plot and mark
 * choice and made again only when the run's label or style object changes: a batch of newly reduced
 * runs then costs the plots those runs, not every run again, and the charts get the same series
 * objects (and keep their datasets) for the runs that did not change.
 */
const seriesMemo = new WeakMap<ReductionResult, Map<string, Series>>();

export function runSeries(result: ReductionResult, spec: PlotSpec, label: string, style: SeriesStyle, marks: MarkChoice): Series {
  const key = `${spec.id} ${marks.clMax ? 1 : 0}${marks.fitLines ? 1 : 0}`;
  let forResult = seriesMemo.get(result);
  const hit = forResult?.get(key);
  if (hit && hit.label === label && hit.style === style) return hit;
  const { points, index } = indexedPlotPoints(spec, result.points);
  const s: Series = { label, style, points, plot: spec.id };
  const branches = pointBranches(result);
  if (branches) s.sweep = { branchOf: index.map((i) => branches.branchOf[i]!), directions: branches.directions };
  const m = marksFor(spec.id, result, marks, branches?.branchOf ?? null);
  if (m) s.marks = m;
  if (!forResult) seriesMemo.set(result, (forResult = new Map()));
  forResult.set(key, s);
  return s;
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
    out.push(runSeries(result, spec, seriesLabel(wb, file), wb.styleOf(file), marks));
  }
  return out;
}
