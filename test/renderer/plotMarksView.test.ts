// @vitest-environment happy-dom
/// <reference path="../../renderer/src/env.d.ts" />
/**
 * The plot marks in the Plots view and its exports, with Chart.js recorded (chartMock.ts): the two
 * toggles add the CLmax and fitted-line datasets to the plots, the legend explains them and notes what a
 * fit cannot give, and the PNG and SVG exports carry exactly what the screen shows.
 */
import { mount } from '@vue/test-utils';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { nextTick } from 'vue';
import PlotsView from '../../renderer/src/components/PlotsView.vue';
import { APP } from '../../renderer/src/state/context.ts';
import { plotMarks } from '../../renderer/src/state/plotMarks.ts';
import { charts, type MockChart } from './chartMock.ts';
import { appContext, openedSample, sample } from './support.ts';

vi.mock('chart.js', async () => (await import('./chartMock.ts')).default);

const RETURN = 'run-107-clean-return-sweep.csv';

async function context() {
  const ctx = appContext();
  ctx.host.nextCampaign = await openedSample(ctx.host);
  await ctx.wb.openCampaign();
  ctx.host.add(RETURN, sample(RETURN));
  ctx.host.nextChoice = [RETURN];
  await ctx.wb.importRuns();
  await ctx.wb.settled();
  for (const f of ['run-102-flap10.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv']) ctx.wb.setVisible(f, false);
  return ctx;
}

function mountIn(ctx: Awaited<ReturnType<typeof context>>) {
  return mount(PlotsView as never, { global: { provide: { [APP as symbol]: ctx } }, attachTo: document.body } as never);
}

type Plugins = { plotMarks: { roles: string[]; arrows: { dataset: number; segments: number[] }[] }; paperFooter?: { lines: string[] } };
const rolesOf = (c: MockChart) => (c.options['plugins'] as Plugins).plotMarks.roles;

beforeEach(() => {
  charts.length = 0;
  document.body.innerHTML = '';
  plotMarks.clMax = false;
  plotMarks.fitLines = false;
});

describe('marks in the Plots view', () => {
  it('draws the return sweep with arrows and explains it, with no fitted marks until asked', async () => {
    const ctx = await context();
    expect(ctx.wb.state.entries[RETURN]!.status).toBe('ready');
    const w = mountIn(ctx);
    await nextTick();
    const lift = charts[0]!;
    expect(lift.data.datasets.map((d) => d.label)).toEqual(['101 · clean', '103 · flap 20', '107 · clean']);
    expect(rolesOf(lift)).toEqual(['run', 'run', 'run']);
    expect((lift.options['plugins'] as Plugins).plotMarks.arrows).toEqual([{ dataset: 2, segments: [11, 18] }]);
    // paintLater: the chart paints in a task after its update (ChartCanvas.vue)
    expect(lift.plugins).toEqual(['errorBars', 'plotMarks', 'paintLater']);
    const keys = w.findAll('[data-plot="cl-alpha"] .legend-key');
    expect(keys.map((k) => k.attributes('data-key'))).toEqual(['return']);
    expect(w.find('[data-plot="cl-alpha"] .mark-notes').exists()).toBe(false);
  });

  it('adds CLmax marks and fitted lines with the toggles, on the lift curve and the polar only', async () => {
    const ctx = await context();
    const w = mountIn(ctx);
    await nextTick();
    await w.find('input[aria-label="Mark CLmax"]').setValue(true);
    expect(plotMarks.clMax).toBe(true);
    const [lift, polar, moment] = charts;
    // each chart redraws in a task of its own (charts/drawQueue.ts)
    await vi.waitFor(() => expect(rolesOf(lift!)).toEqual(['run', 'run', 'run', 'clmax', 'clmax', 'clmax']));
    const r107 = ctx.wb.state.entries[RETURN]!.result!;
    expect(lift!.data.datasets[5]!.data).toEqual([{ x: r107.fit.alpha_cl_max_deg, y: r107.fit.cl_max }]);
    await w.find('input[aria-label="Show fitted lines"]').setValue(true);
    // redraws within 250 ms of the last are coalesced (ChartCanvas.vue)
    await vi.waitFor(() => expect(rolesOf(lift!)).toEqual(['run', 'run', 'run', 'fit', 'fit', 'fit', 'clmax', 'clmax', 'clmax']));
    // each chart redraws in its own turn: the polar may follow the lift curve by a task
    await vi.waitFor(() => expect(rolesOf(polar!)).toEqual(['run', 'run', 'run', 'fit', 'fit', 'fit']));
    expect(rolesOf(moment!)).toEqual(['run', 'run', 'run']);
    expect(w.findAll('[data-plot="cl-alpha"] .legend-key').map((k) => k.attributes('data-key'))).toEqual(['return', 'clmax', 'fit']);
    // the as-measured basis has its own fit
    ctx.wb.state.basis = 'measured';
    await nextTick();
    const measured = ctx.wb.state.entries[RETURN]!.asMeasured!;
    expect(measured.fit.cl_max).not.toBe(r107.fit.cl_max);
    await vi.waitFor(() => expect(lift!.data.datasets[8]!.data).toEqual([{ x: measured.fit.alpha_cl_max_deg, y: measured.fit.cl_max }]));
  });

  it('exports the marks shown: the PNG is drawn with them and the marks plugin, the SVG with the same marks', async () => {
    const ctx = await context();
    plotMarks.clMax = true;
    plotMarks.fitLines = true;
    charts.length = 0;
    await ctx.exports.exportPlotPng('cl-alpha');
    const image = charts.at(-1)!;
    expect(image.plugins).toContain('plotMarks');
    expect(rolesOf(image)).toEqual(['run', 'run', 'run', 'fit', 'fit', 'fit', 'clmax', 'clmax', 'clmax']);
    await ctx.exports.exportPlotSvg('cl-alpha');
    const svg = String(ctx.host.exported.at(-1)!.data);
    expect(svg.match(/class="clmax-mark"/g)).toHaveLength(3);
    expect(svg.match(/class="fit-line"/g)).toHaveLength(3);
    expect(svg.match(/class="sweep-arrow"/g)).toHaveLength(2);
    // marks off in the window, off in the exports
    plotMarks.clMax = false;
    plotMarks.fitLines = false;
    await ctx.exports.exportPlotPng('cl-alpha');
    expect(rolesOf(charts.at(-1)!)).toEqual(['run', 'run', 'run']);
    await ctx.exports.exportPlotSvg('cl-alpha');
    expect(String(ctx.host.exported.at(-1)!.data)).not.toContain('clmax-mark');
  });

  it('notes a run whose fit gives no CLmax, under the plot and in the exported image, and marks nothing for it', async () => {
    const ctx = await context();
    const short = sample('run-101-clean.csv')
      .replace('# run: 101', '# run: 108')
      .split('\n')
      .filter((l) => !/^(9|1\d)\./.test(l))
      .join('\n');
    ctx.host.add('run-108-short.csv', short);
    ctx.host.nextChoice = ['run-108-short.csv'];
    await ctx.wb.importRuns();
    await ctx.wb.settled();
    const r108 = ctx.wb.state.entries['run-108-short.csv']!.result!;
    expect(r108.fit.cl_max).toBeNull();
    plotMarks.clMax = true;
    const w = mountIn(ctx);
    await nextTick();
    const lift = charts[0]!;
    expect(lift.data.datasets.filter((d, i) => rolesOf(lift)[i] === 'clmax').map((d) => d.label!.split(':')[0])).toEqual([
      '101 · clean',
      '103 · flap 20',
      '107 · clean',
    ]);
    expect(w.find('[data-plot="cl-alpha"] .mark-notes').text()).toBe(`108 · clean: no CLmax: ${r108.fit.cl_max_reason}`);
    await ctx.exports.exportPlotPng('cl-alpha');
    expect((charts.at(-1)!.options['plugins'] as Plugins).paperFooter!.lines[0]).toBe(`108 · clean: no CLmax: ${r108.fit.cl_max_reason}`);
  });
});
