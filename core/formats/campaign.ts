/**
 * Campaign file, Sweepbook's own JSON format (docs/data-format.md §Campaign): the setups, the runs
 * with paths relative to the campaign file and the SHA-256 of each, configuration labels, tare
 * assignment and column mappings. Validated with zod; problems name their field.
 */
import { z } from 'zod';
import { InputError } from '../contract/messages.ts';
import { setupSchema, type SetupInput } from '../setup/schema.ts';
import { CAMPAIGN_MAX_BYTES, CAMPAIGN_MAX_FILES, campaignTooLarge } from './limits.ts';

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
  // UTF-16 code units: at least the byte count of the ASCII a campaign mostly is
  if (text.length > CAMPAIGN_MAX_BYTES) throw new InputError({ file, message: campaignTooLarge(text.length) });
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
  const named = r.data.runs.length + (r.data.tares?.length ?? 0);
  if (named > CAMPAIGN_MAX_FILES) throw new InputError({ file, field: 'runs', message: `names ${named} files; a campaign holds at most ${CAMPAIGN_MAX_FILES}` });
  const keys = new Set(Object.keys(r.data.setups));
  r.data.runs.forEach((run, i) => {
    if (!keys.has(run.setup)) throw new InputError({ file, field: `runs.${i}.setup`, message: `no setup named "${run.setup}" in setups` });
  });
  return { ...r.data, setups: (json as { setups: Record<string, SetupInput> }).setups };
}

/**
 * Why a run or tare path in a campaign is not one the hosts will open, or undefined when it is: it
 * must be relative to the campaign's folder, written with forward slashes, and stay inside that folder
 * (no "..", no root, no drive letter, no UNC or device path). A campaign file is shared between
 * people, so it may not point a reader at arbitrary files. Whether the file exists and is a regular
 * file is the host's check.
 */
export function campaignPathProblem(file: string): string | undefined {
  if (file.length === 0) return 'empty path';
  if (file.length > 4096) return 'path longer than 4096 characters';
  if (file.includes('\0')) return 'path contains a NUL character';
  if (file.includes('\\')) return 'backslash in the path (campaign paths use forward slashes, relative to the campaign file)';
  if (file.startsWith('/')) return 'absolute path (campaign paths are relative to the campaign file)';
  if (/^[A-Za-z]:/.test(file)) return 'drive-letter path (campaign paths are relative to the campaign file)';
  if (/^[A-Za-z][A-Za-z0-9+.-]*:\/\//.test(file)) return 'URL (campaign paths are relative to the campaign file)';
  const parts = file.split('/');
  if (parts.some((p) => p === '..')) return 'leaves the campaign folder ("..")';
  if (parts.some((p) => p === '' || p === '.')) return 'empty or "." path segment';
  return undefined;
}

/** Every run, tare and balance file a campaign names, each once, in order of first mention (linear in their number). */
export function campaignFiles(c: Campaign): string[] {
  const seen = new Set<string>();
  const add = (f: string | null | undefined) => {
    if (f) seen.add(f);
  };
  for (const r of c.runs) add(r.file);
  for (const r of c.runs) add(r.tare);
  for (const t of c.tares ?? []) add(t.file);
  // balance files the setups name by path (relative to the campaign file, where the setups live)
  for (const s of Object.values(c.setups)) {
    const cal = (s as { balance?: { calibration?: unknown } }).balance?.calibration;
    if (typeof cal === 'string') add(cal);
  }
  return [...seen];
}

/** Campaign text as saved: stable key order, two-space indent, final newline. */
export function serializeCampaign(c: Campaign): string {
  return JSON.stringify(c, null, 2) + '\n';
}

/** Header signature used to remember a column mapping for files with the same header. */
export function headerSignature(headerLine: string): string {
  return headerLine.trim().toLowerCase().replace(/\s+/g, ' ');
}
