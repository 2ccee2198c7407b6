import { InputError } from '../../contract/messages.ts';
import type { Channel } from '../../formats/channels.ts';
import { maxOf } from '../../physics/numbers.ts';
import { skipPoint, pointName, type ReductionContext, type Stage } from '../context.ts';
import { coefficients, flowAngle, pointFlow, resolveLoads } from '../pointChain.ts';
import type { PointRecord } from '../record.ts';

/** Upper Mach number of "low-speed" testing, where incompressible wall corrections hold (common practice). */
export const LOW_SPEED_MACH = 0.3;

/** Axes and moment transfer: body ↔ wind axes with α; the pitching moment moved to the reference centre. */
export const axesStage: Stage = {
  name: 'axes and moment transfer',
  source: 'Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed. (1999) §3 (standard resolution); docs/methods.md §5',
  run(ctx) {
    for (const pt of ctx.points) pt.loads = resolveLoads(pt.inputs, ctx.geometry);
  },
};

/** Flow angle: the angle of attack to the flow, and the loads resolved to it. */
export const flowAngleStage: Stage = {
  name: 'flow angle',
  source: 'docs/methods.md §5',
  run(ctx) {
    for (const pt of ctx.points) {
      const r = flowAngle(pt.inputs, pt.loads!);
      pt.alphaFlow = r.alphaFlow;
      pt.loads = r.loads;
    }
  },
};

/**
 * Flow state: CIPM-2007 moist-air density, Sutherland viscosity, the isentropic pitot relations. A
 * point whose readings give Mach 1 or more is dropped: the subsonic pitot relation does not hold there
 * (usually a unit slip).
 */
export const flowStateStage: Stage = {
  name: 'flow state',
  source: 'Picard et al., Metrologia 45 (2008) 149 (CIPM-2007); ISO 2533:1975 (Sutherland); NACA Report 1135 (isentropic relations)',
  run(ctx) {
    ctx.points = ctx.points.filter((pt) => {
      pt.flow = pointFlow(pt.inputs, ctx.geometry);
      if (!(pt.flow.mach >= 1)) return true;
      skipPoint(ctx, pt, `${pointName(pt)} skipped: the pitot readings give Mach ${pt.flow.mach.toFixed(2)}, and the subsonic pitot relation does not hold at Mach 1 and above; check the unit of dp_pitot`);
      return false;
    });
  },
};

/**
 * Uncorrected coefficients on q_u·S (·c or ·b for moments) and the standard error of CL from the
 * sample scatter. Readings far outside any tunnel's range that give a quantity which is not a finite
 * number drop their point, naming the quantity (fuzz finding). Stops when no point is left.
 */
export const coefficientsStage: Stage = {
  name: 'coefficients',
  source: 'docs/methods.md §5',
  run(ctx) {
    const g = ctx.geometry;
    ctx.points = ctx.points.filter((pt) => {
      const flow = pt.flow!;
      const loads = pt.loads!;
      const tunnel = coefficients(pt.inputs, pt.alphaFlow!, loads, flow, g);
      pt.measured = { ...loads, alphaFlow: pt.alphaFlow!, flow, tunnel };
      const a = pt.inputs.alpha;
      const clStd = g.axes === 'wind' ? pt.sd('lift') : Math.hypot(pt.sd('normal') * Math.cos(a), pt.sd('axial') * Math.sin(a));
      pt.clScatter = clStd / (flow.q * g.area) / Math.sqrt(pt.samples);
      const broken = nonFiniteQuantity(pt, clStd / (flow.q * g.area), ctx.has);
      if (!broken) return true;
      skipPoint(ctx, pt, `${pointName(pt)} skipped: these readings give ${broken}; check the values and units`);
      return false;
    });
    requireSomePoints(ctx);
    if (!ctx.has('pitch')) ctx.notices.push({ file: ctx.run.file, message: 'no "pitch" column: pitching-moment coefficients are not given' });
    const maxMach = maxOf(ctx.points.map((p) => p.measured!.tunnel.mach));
    if (maxMach > LOW_SPEED_MACH) {
      ctx.notices.push({ file: ctx.run.file, message: `Mach number up to ${maxMach.toFixed(2)}: above about ${LOW_SPEED_MACH} compressibility matters, and the wall corrections used here are the incompressible ones` });
    }
  },
};

/** Stop, naming the first skipped point's line and reason, when no point is left (fuzz finding: a refusal must say where). */
export function requireSomePoints(ctx: ReductionContext): void {
  if (ctx.points.length > 0) return;
  const first = ctx.skipped[0]?.notice;
  const more = ctx.skipped.length - 1;
  throw new InputError({
    file: ctx.run.file,
    line: first?.line ?? ctx.run.headerLine,
    message: `no point could be reduced${first ? `: ${first.message}` : ''}${more > 0 ? ` (and ${more} more points skipped)` : ''}`,
  });
}

/**
 * The first quantity of a measured point that is not a finite number (or, for the flow state, not
 * positive), described for a warning; undefined when all are. Moments and side force count only when
 * measured (they are NaN without their column).
 */
function nonFiniteQuantity(pt: PointRecord, clStdCoefficient: number, has: (ch: Channel) => boolean): string | undefined {
  const m = pt.measured!;
  const f = m.flow;
  const positive: [string, number][] = [['q', f.q], ['ρ', f.rho], ['V', f.V], ['T', f.T], ['μ', f.mu], ['Re', f.Re]];
  for (const [name, v] of positive) if (!(Number.isFinite(v) && v > 0)) return `${name} = ${v}`;
  const t = m.tunnel;
  const finite: [string, number][] = [['Mach', f.mach], ['CL', t.cl], ['CD', t.cd], ['CL scatter', clStdCoefficient], ['lift', m.lift], ['drag', m.drag]];
  for (const [name, v] of finite) if (!Number.isFinite(v)) return `${name} = ${v}`;
  const optional: [Channel, string, number][] = [['pitch', 'Cm', t.cm], ['side', 'CY', t.cy], ['roll', 'C_roll', t.cRoll], ['yaw', 'C_yaw', t.cYaw]];
  for (const [ch, name, v] of optional) if (has(ch) && !Number.isFinite(v)) return `${name} = ${v}`;
  return undefined;
}
