/**
 * The reduction of one run: the ordered stages of core/reduction/stages/ over one point record per
 * test point, then the contract's result (docs/architecture.md, docs/data-format.md). The stages
 * before the wall corrections are shared by both bases; the corrected and the as-measured results
 * come from one pass.
 */
import type { Notice } from '../contract/messages.ts';
import type { RunData } from '../formats/runFile.ts';
import type { Setup } from '../setup/schema.ts';
import type { Basis, ReductionContext, Stage } from './context.ts';
import { assembleResult, type ReductionResult } from './result.ts';
import { STAGES } from './stages/index.ts';

export type { PointResult, ReductionResult } from './result.ts';
export { LOW_SPEED_MACH } from './stages/measure.ts';

export interface ReduceInput {
  run: RunData;
  setup: Setup;
  /** Warnings from reading the setup, reported with the result. */
  setupWarnings?: Notice[];
  tare?: RunData;
  /** Turns corrections off for this run whatever the setup says (`--no-corrections`). */
  noCorrections?: boolean;
}

function newContext(input: ReduceInput, basis: Basis): ReductionContext {
  const { run, setup } = input;
  const channels = new Set(run.channels);
  return {
    run,
    setup,
    tareRun: input.tare,
    basis,
    correctionsOn: basis === 'corrected' && setup.corrections.enabled && !input.noCorrections,
    geometry: {
      area: setup.model.area_m2,
      chord: setup.model.chord_m,
      span: setup.model.span_m,
      gamma: setup.flow.gamma,
      axes: setup.balance.axes,
      offset: setup.model.moment_ref_offset_m,
    },
    notices: [...(input.setupWarnings ?? []), ...run.warnings],
    points: [],
    skipped: [],
    wall: null,
    fit: null,
    has: (ch) => channels.has(ch),
  };
}

/** The shared stages (up to the first per-basis one) and the per-basis rest; a shared stage after a per-basis one is a programming error. */
export function splitStages(stages: readonly Stage[]): { shared: readonly Stage[]; perBasis: readonly Stage[] } {
  const cut = stages.findIndex((s) => s.perBasis);
  const at = cut < 0 ? stages.length : cut;
  const late = stages.slice(at).find((s) => !s.perBasis);
  if (late) throw new Error(`stage "${late.name}" is shared but follows a per-basis stage`);
  return { shared: stages.slice(0, at), perBasis: stages.slice(at) };
}

function runStages(ctx: ReductionContext, stages: readonly Stage[]): void {
  for (const stage of stages) stage.run(ctx);
}

/** The context for another basis, sharing everything the shared stages made (records are copied, so per-basis stages cannot disturb each other). */
function fork(ctx: ReductionContext, basis: Basis, correctionsOn: boolean): ReductionContext {
  return { ...ctx, basis, correctionsOn, notices: [...ctx.notices], skipped: [...ctx.skipped], points: ctx.points.map((p) => ({ ...p })) };
}

/**
 * Reduce one run on the bases asked for, in one pass through the shared stages. Throws InputError when
 * the run and setup cannot be reduced together.
 */
export function reduceBases(input: ReduceInput, bases: readonly Basis[] = ['corrected']): Partial<Record<Basis, ReductionResult>> {
  const { shared, perBasis } = splitStages(STAGES);
  const ctx = newContext(input, bases[0] ?? 'corrected');
  runStages(ctx, shared);
  const out: Partial<Record<Basis, ReductionResult>> = {};
  for (const basis of bases) {
    const correctionsOn = basis === 'corrected' && input.setup.corrections.enabled && !input.noCorrections;
    const b = fork(ctx, basis, correctionsOn);
    runStages(b, perBasis);
    out[basis] = assembleResult(b);
  }
  return out;
}

/** Reduce one run: the corrected result (as measured with corrections off). Throws InputError when it cannot be reduced. */
export function reduce(input: ReduceInput): ReductionResult {
  return reduceBases(input, ['corrected']).corrected!;
}
