/**
 * The point record: one per test point, carried through every stage of the reduction. A stage fills
 * in what it is responsible for; nothing is kept in parallel arrays.
 */
import type { Channel } from '../formats/channels.ts';
import type { CorrectedPoint } from '../walls/types.ts';
import type { PointUncertainty } from '../uncertainty/propagation.ts';
import type { FlowState } from '../physics/flowState.ts';
import type { Measured, PointInputs, ResolvedLoads } from './pointChain.ts';

export interface PointRecord {
  /** The `point` value of the file, or the line of its first sample. */
  key: string;
  /** Physical 1-based line of the point's first sample. */
  line: number;
  /** Samples averaged into the point. */
  samples: number;
  /** Channel mean in SI, undefined when the run has no such column. */
  mean: (ch: Channel) => number | undefined;
  /** Channel sample standard deviation in SI (0 for one sample or an absent column). */
  sd: (ch: Channel) => number;
  /** True for a wind-off point (no coefficients are reduced from it). */
  windOff: boolean;
  /** The point's means with ambient defaults filled in and tares removed from the loads (SI). */
  inputs: PointInputs;
  /** Relative humidity as a fraction, as read or from the setup. */
  rh: number;
  /** Set by the axes stage: loads in both axis systems, moment at the reference centre. */
  loads?: ResolvedLoads;
  /** Set by the flow-angle stage: the angle of attack to the flow, rad. */
  alphaFlow?: number;
  /** Set by the flow-state stage. */
  flow?: FlowState;
  /** Set by the coefficients stage: everything measured, with the uncorrected coefficients. */
  measured?: Measured;
  /** Standard error of CL from the point's sample scatter, s(CL)/√n. */
  clScatter: number;
  /** Set by the wall-correction stage (undefined when corrections are off). */
  corrected?: CorrectedPoint;
  /** Set by the uncertainty stage when the setup has an uncertainty block. */
  u?: PointUncertainty;
  /** Index of the sweep branch the point belongs to, when the fits split the run into branches. */
  branch?: number;
}
