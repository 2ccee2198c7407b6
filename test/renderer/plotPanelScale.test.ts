// @vitest-environment happy-dom
/// <reference path="../../renderer/src/env.d.ts" />
/**
 * The plot panel with many runs, Chart.js recorded (chartMock.ts): the legend lists the first runs and
 * says how many more are drawn while every run stays on the chart; an empty plot says what it was told.
 */
import { mount } from '@vue/test-utils';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import PlotPanel from '../../renderer/src/components/PlotPanel.vue';
import type { Series } from '../../renderer/src/charts/plotConfig.ts';
import { LEGEND_MAX } from '../../renderer/src/logic/legendEntries.ts';
import { styleFor } from '../../renderer/src/logic/palette.ts';
import { APP } from '../../renderer/src/state/context.ts';
import { createPlotLimits } from '../../renderer/src/state/plotLimits.ts';
import { charts } from './chartMock.ts';

vi.mock('chart.js', async () => (await import('./chartMock.ts')).default);

const AXES = { xTitle: 'α [deg]', yTitle: 'CL [–]', xName: 'α', yName: 'CL', xDecimals: 2, yDecimals: 4 };
const series = (n: number): Series[] =>
  Array.from({ length: n }, (_, i) => ({ label: `run ${1000 + i}`, style: styleFor(i, 0), points: [{ x: i, y: i / 100 }], plot: 'cl-alpha' }));

function mountPanel(props: Record<string, unknown>) {
  return mount(
    PlotPanel as never,
    { props: { id: 'cl-alpha', title: 'Lift curve', axes: AXES, ...props }, global: { provide: { [APP as symbol]: { limits: createPlotLimits() } } } } as never,
  );
}

beforeEach(() => {
  charts.length = 0;
});

describe('plot panel with many runs', () => {
  it('lists the first runs in the legend and counts the rest, while the chart gets every run', () => {
    const w = mountPanel({ series: series(1000) });
    const items = w.findAll('.legend li');
    expect(items).toHaveLength(LEGEND_MAX + 1);
    expect(items[0]!.text()).toBe('run 1000');
    expect(items[LEGEND_MAX - 1]!.text()).toBe(`run ${1000 + LEGEND_MAX - 1}`);
    expect(w.find('.legend-more').text()).toBe(`+ ${1000 - LEGEND_MAX} more runs`);
    expect(charts[0]!.data.datasets).toHaveLength(1000);
    expect(w.find('figure').attributes('data-series')!.split(' | ')).toHaveLength(1000);
  });

  it('lists every run of a small campaign with no count', () => {
    const w = mountPanel({ series: series(3) });
    expect(w.findAll('.legend li').map((li) => li.text())).toEqual(['run 1000', 'run 1001', 'run 1002']);
    expect(w.find('.legend-more').exists()).toBe(false);
  });

  it('says what it is told when empty, and that no reduced run is ticked by default', () => {
    expect(mountPanel({ series: [] }).find('.plot-empty').text()).toBe('No reduced run is ticked in the run list.');
    const w = mountPanel({ series: [], emptyText: 'The ticked runs are still being read and reduced (12 to go); they are drawn as they are ready.' });
    expect(w.find('.plot-empty').text()).toMatch(/still being read and reduced \(12 to go\)/);
  });
});
