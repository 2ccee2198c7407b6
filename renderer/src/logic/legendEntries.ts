/**
 * The runs a plot's legend lists. A legend of a thousand runs is a page of names nobody reads and
 * costs the window a thousand swatches to draw on every update; past `max` runs it lists the first
 * `max` (campaign order, the order of the run list) and says how many more are drawn.
 */
export const LEGEND_MAX = 24;

export interface LegendList<T> {
  shown: T[];
  /** Runs drawn but not listed. */
  more: number;
  /** "+ 976 more runs" when some are not listed, else null. */
  moreText: string | null;
}

export function legendEntries<T>(series: readonly T[], max = LEGEND_MAX): LegendList<T> {
  const limit = Math.max(0, Math.floor(max));
  // one name left out would take as much room as its line: list it instead
  if (series.length <= limit + 1) return { shown: [...series], more: 0, moreText: null };
  const more = series.length - limit;
  return { shown: series.slice(0, limit), more, moreText: `+ ${more} more runs` };
}

/**
 * A list of run names in a sentence, the first `max` named and the rest counted ("101, 102 and 998
 * more"): the setup's "Used by" line in a campaign of thousands. `nameOf` is asked only for the names
 * shown, so the line does not depend on every run's name.
 */
export function namesText(files: readonly string[], nameOf: (file: string) => string, max = 12): string {
  if (files.length === 0) return 'no run';
  const limit = Math.max(1, Math.floor(max));
  const shown = files.length <= limit + 1 ? files : files.slice(0, limit);
  const names = shown.map(nameOf).join(', ');
  return shown.length < files.length ? `${names} and ${files.length - shown.length} more` : names;
}
