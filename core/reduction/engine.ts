/**
 * The engine's entry points for hosts (command line, Electron main, browser worker): text in,
 * result or located errors out. Nothing here touches a file system.
 */
import { attempt, InputError, type Outcome } from '../contract/messages.ts';
import { reduce, reduceBases, type ReductionResult, type PointResult } from './pipeline.ts';
import { RunFileReader, type ColumnMapping, type GroupingOptions, type RunData } from '../formats/runFile.ts';
import { parseSetup, type SetupResult } from '../setup/schema.ts';
import { toCsv, type Cell } from '../formats/csvWriter.ts';
import { provenanceLines, type Provenance } from '../formats/provenance.ts';

export type { ReductionResult, PointResult } from './pipeline.ts';

/** A source of text chunks: a Node stream with utf8 encoding, a browser file's text stream, or an array. */
export type TextSource = AsyncIterable<string> | Iterable<string>;

export async function readRun(file: string, source: TextSource, mapping?: ColumnMapping, grouping?: GroupingOptions): Promise<Outcome<RunData>> {
  const reader = new RunFileReader(file, { mapping, grouping });
  return attemptAsync(async () => {
    for await (const chunk of source as AsyncIterable<string>) reader.push(chunk);
    return reader.finish();
  });
}

export function readSetup(file: string, text: string): Outcome<SetupResult> {
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

/** The point table of a result as CSV, headed by `# ` provenance lines when given. */
export function pointsCsv(result: ReductionResult, provenance?: Provenance): string {
  const rows: Cell[][] = result.points.map((p) => POINT_COLUMNS.map((k) => p[k] as Cell));
  // raw comment lines (not CSV cells): what `comment='#'` readers such as pandas and our own reader skip
  // the run's name and configuration first, as `# key: value` metadata a run-file reader takes back
  const meta = [`run: ${result.run.name}`, ...(result.run.configuration !== null ? [`configuration: ${result.run.configuration}`] : [])];
  const lines = [...meta, ...(provenance ? provenanceLines(provenance) : [])];
  const head = lines.map((l) => `# ${l.replace(/[\r\n]+/g, ' ')}`).join('\n') + '\n';
  return head + toCsv(POINT_COLUMNS as string[], rows);
}
