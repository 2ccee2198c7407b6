/**
 * Campaign file, Sweepbook's own JSON format (docs/data-format.md §Campaign): the setups, the runs
 * with paths relative to the campaign file and the SHA-256 of each, configuration labels, tare
 * assignment and column mappings. Validated with zod; problems name their field.
 */
import { z } from 'zod';
import { InputError } from '../contract/messages.ts';
import { setupSchema, type SetupInput } from '../setup/schema.ts';

export const CAMPAIGN_FORMAT = 'sweepbook-campaign';
export const CAMPAIGN_VERSION = 1;

const mappingSchema = z.strictObject({
  names: z.record(z.string(), z.string()).optional(),
  units: z.record(z.string(), z.string()).optional(),
});

const runSchema = z.strictObject({
  /** Path relative to the campaign file, forward slashes. */
  file: z.string().min(1),
  sha256: z.string().regex(/^[0-9a-f]{64}$/, 'expected 64 lower-case hex digits').nullable(),
  configuration: z.string().nullable().optional(),
  /** Key into `setups`. */
  setup: z.string().min(1),
  /** Path of the wind-off tare run, relative to the campaign file, or null. */
  tare: z.string().nullable().optional(),
  mapping: mappingSchema.nullable().optional(),
  /** Shown or hidden in the plots. */
  visible: z.boolean().optional(),
  /** Colour slot chosen by the user (index into the palette). */
  style: z.number().int().min(0).max(63).optional(),
});

export const campaignSchema = z.strictObject({
  format: z.literal(CAMPAIGN_FORMAT),
  version: z.literal(CAMPAIGN_VERSION),
  name: z.string(),
  note: z.string().optional(),
  setups: z.record(z.string(), setupSchema),
  runs: z.array(runSchema),
  /** Tare files with their hashes, so a changed tare is noticed too. */
  tares: z.array(z.strictObject({ file: z.string().min(1), sha256: z.string().nullable() })).optional(),
  /** Header signature → mapping, remembered for the next file with the same header. */
  mappings: z.record(z.string(), mappingSchema).optional(),
  baseline: z.string().nullable().optional(),
});

/** A campaign. Its setups stay as written: the schema's defaults fill in when a run is reduced, never into the saved file. */
export type Campaign = Omit<z.infer<typeof campaignSchema>, 'setups'> & { setups: Record<string, SetupInput> };
export type CampaignRun = Campaign['runs'][number];

export function emptyCampaign(name = 'Untitled campaign'): Campaign {
  return { format: CAMPAIGN_FORMAT, version: CAMPAIGN_VERSION, name, setups: {}, runs: [], tares: [], mappings: {}, baseline: null };
}

/** Parse campaign JSON text; throws InputError naming the file and field. */
export function parseCampaign(file: string, text: string): Campaign {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    throw new InputError({ file, message: `not a readable campaign file: ${(err as Error).message}` });
  }
  const r = campaignSchema.safeParse(json);
  if (!r.success) {
    const issue = r.error.issues[0]!;
    throw new InputError({ file, field: issue.path.map(String).join('.') || '(top level)', message: issue.message });
  }
  const keys = new Set(Object.keys(r.data.setups));
  r.data.runs.forEach((run, i) => {
    if (!keys.has(run.setup)) throw new InputError({ file, field: `runs.${i}.setup`, message: `no setup named "${run.setup}" in setups` });
  });
  return { ...r.data, setups: (json as { setups: Record<string, SetupInput> }).setups };
}

/** Campaign text as saved: stable key order, two-space indent, final newline. */
export function serializeCampaign(c: Campaign): string {
  return JSON.stringify(c, null, 2) + '\n';
}

/** Header signature used to remember a column mapping for files with the same header. */
export function headerSignature(headerLine: string): string {
  return headerLine.trim().toLowerCase().replace(/\s+/g, ' ');
}
