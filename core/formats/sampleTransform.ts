/**
 * A per-sample conversion the run-file reader applies before averaging: some columns are read raw
 * (their header unit is kept as written, never converted) and turned into contract channels for each
 * sample, e.g. a strain-gauge balance's bridge outputs into loads. Averaging converted samples, not
 * converting averaged outputs, keeps a nonlinear calibration exact for every sample.
 */
import type { Channel } from './channels.ts';

export interface SampleTransform {
  /** Header names read raw (unit bracket removed; matched without regard to case). */
  inputs: readonly string[];
  /** Channels written by `apply`, in order; they join the run's channels and take the place of file columns of the same name. */
  outputs: readonly Channel[];
  /** What the inputs belong to, for messages ("the balance calibration in balance-km7.json"). */
  source: string;
  /**
   * Convert one sample: `raw` holds the inputs in order, `out` receives the outputs in SI. A returned
   * text means the sample could not be converted; `out` is then filled with NaN, the reader names the
   * line, and the point it belongs to is not reduced.
   */
  apply(raw: Float64Array, out: Float64Array): string | undefined;
}
