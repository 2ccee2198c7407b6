/**
 * The two campaign versions the crash-safety test saves in turn: the sample campaign grown to a few
 * hundred kilobytes (so a save takes long enough to be interrupted in the middle), differing in name,
 * size and content, so that any mix or truncation of the two is told apart from either.
 */
import { readFileSync } from 'node:fs';
import { parseCampaign, serializeCampaign, type Campaign } from '../../core/formats/campaign.ts';

// read directly, not through inputs.ts, to keep the saving process's start-up short
const SAMPLE = readFileSync(new URL('../../sample-runs/sweepbook-campaign.json', import.meta.url), 'utf8');

function grown(label: string, copies: number): string {
  const base = parseCampaign('sweepbook-campaign.json', SAMPLE);
  const c: Campaign = structuredClone(base);
  c.name = `${base.name} (${label})`;
  for (let i = 0; i < copies; i++) {
    for (const r of base.runs) c.runs.push({ ...r, configuration: `${r.configuration ?? ''} / copy ${i} of version ${label}` });
  }
  return serializeCampaign(c);
}

/** [old, new]: the texts written alternately; version "new" is the larger one. */
export const CAMPAIGN_VERSIONS: readonly [string, string] = [grown('version A', 300), grown('version B', 420)];
