/**
 * The reduction, in order (docs/architecture.md). The reader has already done the first steps while
 * streaming the file — read, map columns, convert units to SI, group samples into points — so these
 * stages start from the points. Stages marked `perBasis` run once for the corrected values and once
 * for the values as measured; the others are shared. Adding a stage: one module, one line here.
 */
import type { Stage } from '../context.ts';
import { columnsStage } from './columns.ts';
import { fitsStage } from './fits.ts';
import { axesStage, coefficientsStage, flowAngleStage, flowStateStage } from './measure.ts';
import { pointsStage, readingsStage } from './points.ts';
import { taresStage } from './tares.ts';
import { uncertaintyStage } from './uncertainty.ts';
import { wallsStage } from './walls.ts';
import { windOffStage } from './windOff.ts';

export const STAGES: readonly Stage[] = [
  columnsStage,
  windOffStage,
  pointsStage,
  readingsStage,
  taresStage,
  axesStage,
  flowAngleStage,
  flowStateStage,
  coefficientsStage,
  wallsStage,
  uncertaintyStage,
  fitsStage,
];
