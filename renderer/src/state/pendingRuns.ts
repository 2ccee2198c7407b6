/** Runs on their way to being drawn: ticked in the run list and still waiting, being read or being reduced. */
import type { CampaignRun } from '../../../core/index.ts';
import type { RunEntry, RunStatus } from './campaignState.ts';

const ON_THE_WAY: ReadonlySet<RunStatus> = new Set<RunStatus>(['queued', 'reading', 'reducing']);

/** How many ticked runs are still waiting, being read or being reduced. */
export function tickedOnTheWay(
  runs: readonly Pick<CampaignRun, 'file' | 'visible'>[],
  entries: Readonly<Record<string, Pick<RunEntry, 'status'> | undefined>>,
): number {
  let n = 0;
  for (const r of runs) if (r.visible !== false && ON_THE_WAY.has(entries[r.file]?.status ?? 'missing')) n++;
  return n;
}
