import type { Channel } from '../../formats/channels.ts';
import { skipPoint, pointName, type Stage } from '../context.ts';
import type { PointRecord } from '../record.ts';

/**
 * Points: one record per group of samples (the reader has averaged them by Welford's algorithm and
 * kept their standard deviations), with the setup's ambient values where the run has no column.
 */
export const pointsStage: Stage = {
  name: 'points',
  source: 'Welford, Technometrics 4 (1962) 419 (running mean and variance); data contract',
  run(ctx) {
    const { run, setup } = ctx;
    const idx = new Map(run.channels.map((ch, i) => [ch, i] as const));
    const [f1, f2] = setup.balance.axes === 'wind' ? (['lift', 'drag'] as const) : (['normal', 'axial'] as const);
    ctx.points = run.points.map((pt): PointRecord => {
      const mean = (ch: Channel) => {
        const i = idx.get(ch);
        return i === undefined ? undefined : pt.mean[i];
      };
      const sd = (ch: Channel) => {
        const i = idx.get(ch);
        return i === undefined ? 0 : pt.std[i]!;
      };
      const load = (ch: Channel) => mean(ch) ?? Number.NaN;
      const rh = mean('rh') ?? setup.ambient.rh_pct! / 100;
      return {
        key: pt.key,
        line: pt.line,
        samples: pt.n,
        mean,
        sd,
        windOff: false,
        rh,
        clScatter: 0,
        inputs: {
          alpha: mean('alpha')!,
          dp: mean('dp_pitot')!,
          p: mean('p_static') ?? setup.ambient.p_pa!,
          T0: mean('t_total') ?? setup.ambient.t_c! + 273.15,
          rh,
          force1: load(f1),
          force2: load(f2),
          side: load('side'),
          pitch: load('pitch'),
          roll: load('roll'),
          yaw: load('yaw'),
        },
      };
    });
  },
};

/**
 * Readings that cannot be reduced (no positive impact pressure, static pressure or temperature, a
 * negative humidity, an angle that is not a finite number) drop their point with a located warning.
 */
export const readingsStage: Stage = {
  name: 'readings check',
  source: 'common practice',
  run(ctx) {
    ctx.points = ctx.points.filter((pt) => {
      const { alpha, dp, p, T0, rh } = pt.inputs;
      // Number.isFinite(alpha): a point's mean overflows to ±Infinity or NaN when samples near ±1.8e308 are averaged (fuzz finding)
      if (dp > 0 && p > 0 && T0 > 0 && rh >= 0 && Number.isFinite(alpha)) return true;
      const why = !Number.isFinite(alpha)
        ? 'the angle of attack is not a finite number'
        : !(dp > 0)
          ? `pitot impact pressure ${dp.toPrecision(4)} Pa is not positive (wind off?)`
          : !(p > 0)
            ? 'static pressure is not positive'
            : !(T0 > 0)
              ? 'temperature is below absolute zero'
              : 'relative humidity is negative';
      skipPoint(ctx, pt, `${pointName(pt)} skipped: ${why}`);
      return false;
    });
  },
};
