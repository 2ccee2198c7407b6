import { propagatePoint, type Correct } from '../../uncertainty/propagation.ts';
import type { Stage } from '../context.ts';

/**
 * Standard uncertainties (k = 1) of every point's corrected values by first-order propagation through
 * the per-point chain and the wall correction with the run's quantities held fixed (JCGM 100:2008;
 * AIAA S-071A-1999). Only with the setup's uncertainty block.
 */
export const uncertaintyStage: Stage = {
  name: 'uncertainty',
  source: 'JCGM 100:2008 (GUM) eq. 10; AIAA S-071A-1999',
  perBasis: true,
  run(ctx) {
    const spec = ctx.setup.uncertainty;
    if (!spec) return;
    const correct: Correct = ctx.wall ? ctx.wall.correct : (t) => t;
    for (const pt of ctx.points) pt.u = propagatePoint(pt.inputs, ctx.geometry, spec, { n: pt.samples, sd: pt.sd }, correct);
  },
};
