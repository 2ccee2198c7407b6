import type { Channel } from '../../formats/channels.ts';
import { skipPoint, pointName, type Stage } from '../context.ts';
import type { PointStats } from '../../formats/pointStats.ts';
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
      const rec = new ReadPoint(pt, idx);
      const load = (ch: Channel) => rec.mean(ch) ?? Number.NaN;
      rec.rh = rec.mean('rh') ?? setup.ambient.rh_pct! / 100;
      rec.inputs = {
        alpha: rec.mean('alpha')!,
        dp: rec.mean('dp_pitot')!,
        p: rec.mean('p_static') ?? setup.ambient.p_pa!,
        T0: rec.mean('t_total') ?? setup.ambient.t_c! + 273.15,
        rh: rec.rh,
        force1: load(f1),
        force2: load(f2),
        side: load('side'),
        pitch: load('pitch'),
        roll: load('roll'),
        yaw: load('yaw'),
      };
      return rec;
    });
  },
};

/**
 * A point record made from the reader's statistics. Channel means and deviations are looked up
 * through one index shared by the run (methods on the prototype, not closures per point: a run of a
 * million points keeps one copy of them).
 */
class ReadPoint implements PointRecord {
  key: string;
  line: number;
  samples: number;
  windOff = false;
  rh = 0;
  clScatter = 0;
  inputs!: PointRecord['inputs'];
  private readonly stats: PointStats;
  private readonly index: ReadonlyMap<Channel, number>;
  constructor(stats: PointStats, index: ReadonlyMap<Channel, number>) {
    this.stats = stats;
    this.index = index;
    this.key = stats.key;
    this.line = stats.line;
    this.samples = stats.n;
  }
  mean(ch: Channel): number | undefined {
    const i = this.index.get(ch);
    return i === undefined ? undefined : this.stats.mean[i];
  }
  sd(ch: Channel): number {
    const i = this.index.get(ch);
    return i === undefined ? 0 : this.stats.std[i]!;
  }
}

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
