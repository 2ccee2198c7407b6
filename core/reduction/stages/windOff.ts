import { BODY_LOADS, WIND_LOADS } from '../../formats/channels.ts';
import type { Stage } from '../context.ts';
import { buildTare, tareAt } from '../tare.ts';
import { checkTare, prepareRun } from '../windOff.ts';

/**
 * Wind-off points and zero readings (core/reduction/windOff.ts): the tare is checked against the
 * run, the pressure source chosen (q, dp_pitot, dp_contraction), wind-off points found by their q
 * against the run's median, a wind-off sweep taken as the tare when none is given, the balance zero
 * drift removed, and only the wind-on points passed on. It works on the read points, so it runs
 * before the point records are made.
 */
export const windOffStage: Stage = {
  name: 'wind-off points and zero readings',
  source: 'Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed. (1999) §7 (tares and balance zeros); data contract (5 % of median q)',
  run(ctx) {
    const { setup } = ctx;
    if (ctx.tareRun) checkTare(ctx.run, ctx.tareRun, setup);
    const loadChannels = setup.balance.axes === 'wind' ? WIND_LOADS : BODY_LOADS;
    const prepared = prepareRun(ctx.run, setup, ctx.tareRun, (t) => {
      const table = buildTare(t, loadChannels);
      return (alpha) => tareAt(table, alpha).loads;
    });
    ctx.run = prepared.run;
    ctx.tareRun ??= prepared.embeddedTare;
    ctx.notices.push(...prepared.notices);
    const channels = new Set(prepared.run.channels);
    ctx.has = (ch) => channels.has(ch);
  },
};
