import { EMPTY_FIT, fitPolar, type SystematicInput } from '../../fits/characteristics.ts';
import type { Stage } from '../context.ts';
import { valuesOf } from '../result.ts';

/**
 * Characteristics of the run on the basis's values (corrected, or as measured), in FILE ORDER: the run
 * is split into sweep branches and no fit mixes two of them; `fit` describes the first rising branch
 * (docs/methods.md, fits). The points' random uncertainties weight the fits; the systematic inputs
 * (common to every point) are propagated to the characteristics afterwards.
 */
export const fitsStage: Stage = {
  name: 'fits',
  source: 'Draper & Smith, Applied Regression Analysis, 3rd ed.; effective variance (Orear 1982); JCGM 100:2008; docs/methods.md, fits',
  perBasis: true,
  run(ctx) {
    const pts = ctx.points;
    const v = pts.map((p) => valuesOf(p));
    const withU = ctx.setup.uncertainty !== null && pts.every((p) => p.u !== undefined);
    let systematic: SystematicInput[] | undefined;
    if (withU) {
      const names = [...new Set(pts.flatMap((p) => p.u!.systematic.map((s) => s.input)))];
      systematic = names.map((input) => {
        const at = (i: number) => pts[i]!.u!.systematic.find((s) => s.input === input);
        return {
          input,
          alphaDeg: pts.map((_, i) => at(i)?.alphaDeg ?? 0),
          cl: pts.map((_, i) => at(i)?.cl ?? 0),
          cd: pts.map((_, i) => at(i)?.cd ?? 0),
          cm: pts.map((_, i) => at(i)?.cm ?? 0),
        };
      });
    }
    const meta = ctx.run.metadata;
    const f = fitPolar({
      alphaDeg: v.map((x) => x.alphaDeg),
      cl: v.map((x) => x.cl),
      cd: v.map((x) => x.cd),
      cm: v.map((x) => x.cm),
      clScatter: pts.map((p) => p.clScatter),
      random: withU ? { alphaDeg: pts.map((p) => p.u!.random.alphaDeg), cl: pts.map((p) => p.u!.random.cl), cd: pts.map((p) => p.u!.random.cd) } : undefined,
      systematic,
      kind: ctx.setup.model.kind,
      aspectRatio: (ctx.setup.model.span_m * ctx.setup.model.span_m) / ctx.setup.model.area_m2,
      runName: meta['run'] ?? ctx.run.file.replace(/^.*[\\/]/, '').replace(/\.[^.]*$/, ''),
      linearToleranceCl: ctx.setup.fit?.linear_tolerance_cl ?? null,
      alphaRangeDeg: ctx.setup.fit?.alpha_range_deg ?? null,
    });
    ctx.fit = f.fit ?? { ...EMPTY_FIT };
    ctx.fitBranches = f.fit_branches;
    ctx.fitSystematic = f.fit_systematic;
    pts.forEach((p, i) => (p.branch = f.pointBranch[i]));
    ctx.notices.push(...f.warnings.map((message) => ({ message })));
  },
};
