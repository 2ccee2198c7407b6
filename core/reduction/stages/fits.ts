import { EMPTY_FIT, fitPolar } from '../../fits/characteristics.ts';
import { sortedOrder } from '../../physics/numbers.ts';
import type { Stage } from '../context.ts';
import { valuesOf } from '../result.ts';

/**
 * Characteristics of the run on the basis's values (corrected, or as measured): lift-curve slope over
 * the linear range, zero-lift angle, CLmax, drag polar, (L/D)max, Cm slope (docs/methods.md §8).
 */
export const fitsStage: Stage = {
  name: 'fits',
  source: 'Draper & Smith, Applied Regression Analysis, 3rd ed.; docs/methods.md §8',
  perBasis: true,
  run(ctx) {
    const v = ctx.points.map((p) => valuesOf(p));
    const alphas = v.map((x) => x.alphaDeg);
    const order = sortedOrder(alphas);
    if (hasHysteresis(ctx.points.map((p) => p.measured!.tunnel.alphaDeg))) {
      ctx.notices.push({ file: ctx.run.file, message: 'α is repeated or not monotonic in the file (a return sweep?): the fits use the points sorted by α, and hysteresis between the sweeps is not separated' });
    }
    const withU = ctx.setup.uncertainty !== null;
    const f = fitPolar({
      alphaDeg: order.map((i) => alphas[i]!),
      cl: order.map((i) => v[i]!.cl),
      cd: order.map((i) => v[i]!.cd),
      cm: order.map((i) => v[i]!.cm),
      clScatter: order.map((i) => ctx.points[i]!.clScatter),
      clU: withU ? order.map((i) => ctx.points[i]!.u?.u_cl ?? Number.NaN) : undefined,
      cdU: withU ? order.map((i) => ctx.points[i]!.u?.u_cd ?? Number.NaN) : undefined,
      kind: ctx.setup.model.kind,
      aspectRatio: (ctx.setup.model.span_m * ctx.setup.model.span_m) / ctx.setup.model.area_m2,
    });
    ctx.fit = f.fit ?? { ...EMPTY_FIT };
    ctx.notices.push(...f.warnings.map((message) => ({ message })));
  },
};

/** True when α goes back on itself or repeats in file order. */
function hasHysteresis(alpha: number[]): boolean {
  let dir = 0;
  for (let i = 1; i < alpha.length; i++) {
    const d = Math.sign(alpha[i]! - alpha[i - 1]!);
    if (d === 0) return true;
    if (dir === 0) dir = d;
    else if (d !== dir) return true;
  }
  return false;
}
