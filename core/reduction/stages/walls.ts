import type { Channel } from '../../formats/channels.ts';
import { InputError } from '../../contract/messages.ts';
import type { CorrectedPoint } from '../../walls/types.ts';
import { chooseWallMethod } from '../../walls/registry.ts';
import { skipPoint, type Stage } from '../context.ts';
import { requireSomePoints } from './measure.ts';

/**
 * Wall corrections by the method the setup chooses from core/walls/registry.ts (2D Allen & Vincenti;
 * 3D classic or Maskell wake blockage, Glauert's lift interference, streamline curvature). What was
 * applied is what is reported: a fallback says so, with its reason. A point whose corrected values
 * overflow is dropped and named (fuzz finding).
 */
export const wallsStage: Stage = {
  name: 'wall corrections',
  source: 'Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed. (1999) §9–10; Allen & Vincenti, NACA Report 782; Glauert, ARC R&M 1566; Maskell, ARC R&M 3400',
  perBasis: true,
  run(ctx) {
    if (!ctx.correctionsOn) return;
    const chosen = chooseWallMethod(ctx.setup);
    if ('refused' in chosen) throw new InputError({ file: ctx.run.file, field: 'tunnel.section', message: chosen.refused });
    const wall = chosen.method.prepare({
      setup: ctx.setup,
      points: ctx.points.map((p) => p.measured!.tunnel),
      clScatter: ctx.points.map((p) => p.clScatter),
      hasPitch: ctx.has('pitch'),
    });
    ctx.wall = wall;
    ctx.notices.push(...wall.warnings);
    ctx.points = ctx.points.filter((pt) => {
      pt.corrected = wall.correct(pt.measured!.tunnel);
      const bad = nonFiniteCorrected(pt.corrected, ctx.has);
      if (!bad) return true;
      skipPoint(ctx, pt, `point ${pt.key} (line ${pt.line}) skipped: the wall corrections give ${bad}; check the values and units`);
      return false;
    });
    requireSomePoints(ctx);
  },
};

/** The first corrected value that is not a finite number, described for a warning; undefined when all are. */
function nonFiniteCorrected(k: CorrectedPoint, has: (ch: Channel) => boolean): string | undefined {
  const always: [string, number][] = [['α', k.alphaDeg], ['CL', k.cl], ['CD', k.cd], ['q', k.q], ['V', k.V], ['Mach', k.mach], ['Re', k.Re], ['ε_solid', k.epsSolid], ['ε_wake', k.epsWake]];
  for (const [name, v] of always) if (!Number.isFinite(v)) return `${name} = ${v}`;
  const optional: [Channel, string, number][] = [['pitch', 'Cm', k.cm], ['side', 'CY', k.cy], ['roll', 'C_roll', k.cRoll], ['yaw', 'C_yaw', k.cYaw]];
  for (const [ch, name, v] of optional) if (has(ch) && !Number.isFinite(v)) return `${name} = ${v}`;
  return undefined;
}
