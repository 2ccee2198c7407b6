/**
 * The engine's entry points for hosts (command line, Electron main, browser worker): text in,
 * result or located errors out. Nothing here touches a file system.
 */
import { attempt, InputError, type Outcome } from '../contract/messages.ts';
import { reduce, reduceBases, type ReductionResult, type PointResult } from './pipeline.ts';
import { RunFileReader, type ColumnMapping, type GroupingOptions, type RunData } from '../formats/runFile.ts';
import { parseSetup, type SetupResult } from '../setup/schema.ts';
import { commentLine, csvLine } from '../formats/csvWriter.ts';
import { reportCsvRow, ROUNDING_NOTE } from '../formats/reportTable.ts';
import { provenanceLines, type Provenance } from '../formats/provenance.ts';
import { SETUP_MAX_BYTES, setupTooLarge } from '../formats/limits.ts';
import type { SampleTransform } from '../formats/sampleTransform.ts';

export type { ReductionResult, PointResult } from './pipeline.ts';

/** A source of text chunks: a Node stream with utf8 encoding, a browser file's text stream, or an array. */
export type TextSource = AsyncIterable<string> | Iterable<string>;

export async function readRun(
  file: string,
  source: TextSource,
  mapping?: ColumnMapping,
  grouping?: GroupingOptions,
  sampleTransform?: SampleTransform,
): Promise<Outcome<RunData>> {
  const reader = new RunFileReader(file, { mapping, grouping, sampleTransform });
  return attemptAsync(async () => {
    for await (const chunk of source as AsyncIterable<string>) reader.push(chunk);
    return reader.finish();
  });
}

export function readSetup(file: string, text: string): Outcome<SetupResult> {
  // UTF-16 code units; one per byte for the ASCII a setup is written in, so a fair stand-in for its size
  if (text.length > SETUP_MAX_BYTES) return { ok: false, errors: [{ file, field: '(file size)', message: setupTooLarge(text.length) }] };
  return attempt(() => parseSetup(file, text));
}

export interface ReduceRequest {
  run: RunData;
  setup: SetupResult;
  tare?: RunData;
  noCorrections?: boolean;
}

export function reduceRun(req: ReduceRequest): Outcome<ReductionResult> {
  return attempt(() =>
    reduce({ run: req.run, setup: req.setup.setup, setupWarnings: req.setup.warnings, tare: req.tare, noCorrections: req.noCorrections }),
  );
}

/** The corrected result and the as-measured one (corrections off) from one pass; the same object twice when the setup has corrections off. */
export function reduceRunBothBases(req: ReduceRequest): Outcome<{ result: ReductionResult; asMeasured: ReductionResult }> {
  return attempt(() => {
    const input = { run: req.run, setup: req.setup.setup, setupWarnings: req.setup.warnings, tare: req.tare, noCorrections: req.noCorrections };
    const on = req.setup.setup.corrections.enabled && !req.noCorrections;
    const r = reduceBases(input, on ? ['corrected', 'measured'] : ['corrected']);
    return { result: r.corrected!, asMeasured: r.measured ?? r.corrected! };
  });
}

async function attemptAsync<T>(step: () => Promise<T>): Promise<Outcome<T>> {
  try {
    return { ok: true, value: await step() };
  } catch (err) {
    if (err instanceof InputError) return { ok: false, errors: [err.notice] };
    throw err;
  }
}

/** Point-table columns in export order: corrected first, then as measured, then the blockage terms. */
export const POINT_COLUMNS: readonly (keyof PointResult)[] = [
  'point', 'samples', 'alpha_deg', 'cl', 'cd', 'cm', 'ld', 'q_pa', 'v_mps', 'mach', 'reynolds',
  'alpha_uncorrected_deg', 'cl_uncorrected', 'cd_uncorrected', 'cm_uncorrected', 'q_uncorrected_pa',
  'v_uncorrected_mps', 'mach_uncorrected', 'reynolds_uncorrected', 'rho_kgm3', 'mu_pas', 'p_static_pa',
  'p_total_pa', 't_static_k', 't_total_k', 'rh_pct', 'cy', 'c_roll', 'c_yaw', 'cy_uncorrected',
  'c_roll_uncorrected', 'c_yaw_uncorrected', 'lift_n', 'drag_n', 'pitch_ref_nm', 'cl_scatter',
  'eps_solid', 'eps_wake', 'u_q_pa', 'u_v_mps', 'u_alpha_deg', 'u_cl', 'u_cd', 'u_cm', 'line',
];

/**
 * The point table of a result as CSV, headed by `# ` lines (pointTableComments): the contract's column
 * names (POINT_COLUMNS), no units row, and each number rounded by the report rule
 * (core/formats/reportTable.ts: to the place of its uncertainty's second significant digit where the
 * point has one, else to the quantity's resolution, never past seven significant digits), so the
 * command line's CSV and the window's report table carry the same numbers.
 */
export function pointsCsv(result: ReductionResult, provenance?: Provenance): string {
  let text = '';
  for (const chunk of pointsCsvChunks(result, provenance)) text += chunk;
  return text;
}

/**
 * The `#` lines above a point table: the run's name and configuration (`# key: value` metadata a
 * run-file reader takes back), the provenance when given, and the rounding rule.
 */
export function pointTableComments(result: ReductionResult, provenance?: Provenance): string[] {
  const meta = [`run: ${result.run.name}`, ...(result.run.configuration !== null ? [`configuration: ${result.run.configuration}`] : [])];
  return [...meta, ...(provenance ? provenanceLines(provenance) : []), ROUNDING_NOTE];
}

/** Rows per chunk of `pointsCsvChunks`. */
const ROWS_PER_CHUNK = 2048;

/**
 * `pointsCsv` in pieces of a few thousand lines, for hosts that write a large table as it is made:
 * a million-point table is several hundred million characters, near the longest string a JavaScript
 * engine holds, so it is never built whole there.
 */
export function* pointsCsvChunks(result: ReductionResult, provenance?: Provenance): Generator<string> {
  // comment lines (not CSV cells), skipped by `comment='#'` readers such as pandas and our own reader,
  // escaped with the cells' formula rule for spreadsheets that split them at commas
  yield pointTableComments(result, provenance).map(commentLine).join('\n') + '\n';
  yield csvLine(POINT_COLUMNS as string[]) + '\n';
  const points = result.points;
  for (let start = 0; start < points.length; start += ROWS_PER_CHUNK) {
    const end = Math.min(points.length, start + ROWS_PER_CHUNK);
    const rows = new Array<string>(end - start);
    // REPORT_COLUMNS lists POINT_COLUMNS in the same order (checked by the report table's tests)
    for (let i = start; i < end; i++) rows[i - start] = reportCsvRow(points[i]!);
    yield rows.join('\n') + '\n';
  }
}
