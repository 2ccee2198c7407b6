/**
 * Wall corrections behind one interface. A method turns a run's uncorrected points into
 * free-air-equivalent points: `prepare` computes what is fixed for the run (factors, blockage, the
 * lift-curve slope the curvature terms use, Maskell's polar) and returns the per-point correction with
 * those fixed, so the uncertainty propagation can correct perturbed points the same way. A new tunnel
 * section or mounting is a new method in core/walls/registry.ts; the pipeline does not change.
 */
import type { Notice } from '../contract/messages.ts';
import type { Setup } from '../setup/schema.ts';
import type { CorrectedPoint, TunnelPoint, WallFactors } from './types.ts';

/** What a method gets of a run. */
export interface WallInput {
  setup: Setup;
  /** Uncorrected points in file order. */
  points: readonly TunnelPoint[];
  /** Standard error of each point's CL from its sample scatter (for the linear-range rule). */
  clScatter: readonly number[];
  /** True when the run measured a pitching moment. */
  hasPitch: boolean;
}

/** A method made ready for one run. */
export interface PreparedWall {
  /** Id of the method actually applied (reported in the result and the provenance). */
  method: string;
  factors: WallFactors;
  /** The correction of one point with the run's quantities held fixed. */
  correct: (p: TunnelPoint) => CorrectedPoint;
  warnings: Notice[];
  /** Set when the requested method could not be applied and another was used instead, with the reason. */
  fallback: { requested: string; reason: string } | null;
}

export interface WallMethod {
  /** Stable id, e.g. "2d", "3d-classic", "3d-maskell". */
  id: string;
  /** What it is, for people. */
  label: string;
  /** Published sources of the method. */
  source: string;
  /** Undefined when this method corrects runs of this setup; else why not. */
  accepts(setup: Setup): string | undefined;
  prepare(input: WallInput): PreparedWall;
}
