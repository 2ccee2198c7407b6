/**
 * The state of one reduction as it passes through the stages (core/reduction/stages/), and the
 * shape of a stage. Stages read and write the context; the result is assembled from it at the end.
 */
import type { Notice } from '../contract/messages.ts';
import type { FitBranch, FitResult, FitSystematic } from '../fits/characteristics.ts';
import type { RunData } from '../formats/runFile.ts';
import type { Setup } from '../setup/schema.ts';
import type { PreparedWall } from '../walls/method.ts';
import type { PointGeometry } from './pointChain.ts';
import type { PointRecord } from './record.ts';
import type { TareTable } from './tare.ts';

/** Which values the fits and the result describe: free-air corrected, or as measured in the tunnel. */
export type Basis = 'corrected' | 'measured';

export interface ReductionContext {
  run: RunData;
  setup: Setup;
  /** A wind-off tare run, when one was given. */
  tareRun?: RunData;
  /** The interpolation table built from the tare (by the tare stage). */
  tare?: TareTable;
  basis: Basis;
  /** True when the wall corrections apply (setup switch and basis). */
  correctionsOn: boolean;
  geometry: PointGeometry;
  /** Warnings in the order they arose; they travel with the result. */
  notices: Notice[];
  /** The points still in the reduction, in file order. */
  points: PointRecord[];
  /** Points dropped by a stage, with the notice that says why. */
  skipped: { point: PointRecord; notice: Notice }[];
  /** The wall-correction method applied, when corrections are on. */
  wall: PreparedWall | null;
  fit: FitResult | null;
  /** Every sweep branch with its own characteristics, and the systematic parts of the fit (set by the fits stage). */
  fitBranches?: FitBranch[];
  fitSystematic?: FitSystematic;
  /** True when the run has the channel. */
  has: (ch: import('../formats/channels.ts').Channel) => boolean;
}

/** One stage of the reduction: a name, the published source of its method, and what it does. */
export interface Stage {
  name: string;
  /** Published source of the method, or "common practice". */
  source: string;
  /** Stages after the wall corrections run once per basis; the ones before are shared. */
  perBasis?: boolean;
  run(ctx: ReductionContext): void;
}

/** Drop a point from the reduction with a located reason. */
export function skipPoint(ctx: ReductionContext, point: PointRecord, message: string): void {
  const notice: Notice = { file: ctx.run.file, line: point.line, message };
  ctx.notices.push(notice);
  ctx.skipped.push({ point, notice });
}

/** "point K (line N)", how messages name a point. */
export function pointName(p: PointRecord): string {
  return `point ${p.key} (line ${p.line})`;
}
