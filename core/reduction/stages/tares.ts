import { BODY_LOADS, WIND_LOADS } from '../../formats/channels.ts';
import { DEG_PER_RAD } from '../../physics/angles.ts';
import { pointName, type Stage } from '../context.ts';
import { buildTare, tareAt } from '../tare.ts';

/**
 * Weight tares: the wind-off sweep's loads, interpolated linearly in geometric α, are subtracted in
 * the balance's own axes (Barlow, Rae & Pope 3rd ed. §7; docs/methods.md §2). A point outside the
 * sweep takes the nearest end value and a warning names it.
 */
export const taresStage: Stage = {
  name: 'tares',
  source: 'Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed. (1999) §7',
  run(ctx) {
    if (!ctx.tareRun) return;
    const table = buildTare(ctx.tareRun, ctx.setup.balance.axes === 'wind' ? WIND_LOADS : BODY_LOADS);
    ctx.tare = table;
    ctx.notices.push(...ctx.tareRun.warnings);
    const [f1, f2] = ctx.setup.balance.axes === 'wind' ? (['lift', 'drag'] as const) : (['normal', 'axial'] as const);
    for (const pt of ctx.points) {
      const t = tareAt(table, pt.inputs.alpha);
      if (t.clamped) {
        const a = table.alpha;
        ctx.notices.push({
          file: ctx.run.file,
          line: pt.line,
          message: `${pointName(pt)}: α = ${(pt.inputs.alpha * DEG_PER_RAD).toFixed(2)}° lies outside the tare sweep (${(a[0]! * DEG_PER_RAD).toFixed(2)}° to ${(a[a.length - 1]! * DEG_PER_RAD).toFixed(2)}°); the nearest end value is used`,
        });
      }
      const x = pt.inputs;
      const minus = (v: number, ch: Parameters<typeof t.loads.get>[0]) => v - (t.loads.get(ch) ?? 0);
      x.force1 = minus(x.force1, f1);
      x.force2 = minus(x.force2, f2);
      x.side = minus(x.side, 'side');
      x.pitch = minus(x.pitch, 'pitch');
      x.roll = minus(x.roll, 'roll');
      x.yaw = minus(x.yaw, 'yaw');
    }
  },
};
