/**
 * Setup and tare for an imported run, proposed from the runs already in the campaign: a run of the same
 * model and configuration first, then of the same model (and tunnel), then the run imported last. The
 * proposal is only a starting point; the user confirms it for every imported run.
 */

export interface RunFacts {
  file: string;
  setup: string;
  tare: string | null;
  /** Metadata from the file's `#` lines (model, configuration, tunnel), where known. */
  meta: { model?: unknown; configuration?: unknown; tunnel?: unknown } | null;
}

export interface Proposal {
  setup: string;
  tare: string | null;
  /** Why, in a few words ("as 101: same model and configuration"). */
  reason: string;
}

const same = (a: unknown, b: unknown) => typeof a === 'string' && typeof b === 'string' && a.trim() !== '' && a.trim().toLowerCase() === b.trim().toLowerCase();

/**
 * The proposal for `run` from the `others` (campaign order, the run itself left out), or the campaign's
 * first setup and no tare when there is nothing to go by.
 */
export function propose(run: RunFacts, others: readonly RunFacts[], setups: readonly string[], name: (file: string) => string): Proposal {
  const m = run.meta ?? {};
  const rules: [string, (o: RunFacts) => boolean][] = [
    ['same model and configuration', (o) => same(o.meta?.model, m.model) && same(o.meta?.configuration, m.configuration)],
    ['same model and tunnel', (o) => same(o.meta?.model, m.model) && same(o.meta?.tunnel, m.tunnel)],
    ['same model', (o) => same(o.meta?.model, m.model)],
  ];
  for (const [why, test] of rules) {
    const match = [...others].reverse().find(test);
    if (match) return { setup: match.setup, tare: match.tare, reason: `as ${name(match.file)}: ${why}` };
  }
  const last = others[others.length - 1];
  if (last) return { setup: last.setup, tare: last.tare, reason: `as ${name(last.file)}, the run added last (no metadata in common)` };
  return { setup: setups[0] ?? run.setup, tare: null, reason: 'first run of the campaign' };
}
