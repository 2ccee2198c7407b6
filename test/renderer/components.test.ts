// @vitest-environment happy-dom
/// <reference path="../../renderer/src/env.d.ts" />
/**
 * The views mounted with @vue/test-utils against the real state and the worker logic in process.
 * Chart.js is replaced by a recorder (happy-dom cannot draw); the drawing is checked in test/e2e.
 */
import { flushPromises, mount } from '@vue/test-utils';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { nextTick } from 'vue';
import DeltaView from '../../renderer/src/components/DeltaView.vue';
import FitsView from '../../renderer/src/components/FitsView.vue';
import MappingDialog from '../../renderer/src/components/MappingDialog.vue';
import PlotsView from '../../renderer/src/components/PlotsView.vue';
import PointTable from '../../renderer/src/components/PointTable.vue';
import RunsPanel from '../../renderer/src/components/RunsPanel.vue';
import SetupEditor from '../../renderer/src/components/SetupEditor.vue';
import { ERROR_BAR_NOTE } from '../../renderer/src/logic/errorBars.ts';
import { APP } from '../../renderer/src/state/context.ts';
import { charts } from './chartMock.ts';
import { appContext, openedSample, sample, TEST_UNCERTAINTY } from './support.ts';

vi.mock('chart.js', async () => (await import('./chartMock.ts')).default);

async function sampleContext() {
  const ctx = appContext();
  ctx.host.nextCampaign = await openedSample(ctx.host);
  await ctx.wb.openCampaign();
  return ctx;
}

function mountIn<T>(component: T, ctx: Awaited<ReturnType<typeof sampleContext>>, props: Record<string, unknown> = {}) {
  return mount(component as never, { props, global: { provide: { [APP as symbol]: ctx } }, attachTo: document.body } as never);
}

beforeEach(() => {
  charts.length = 0;
  document.body.innerHTML = '';
});

describe('run list', () => {
  it('shows each run\'s flow condition, and a failed run\'s located message beside it while the rest keep working', async () => {
    const ctx = await sampleContext();
    ctx.host.add('dup.csv', '# run: 9\nalpha,dp_pitot,alpha,lift,drag\n1,600,1,3,4\n');
    ctx.host.nextChoice = ['dup.csv'];
    await ctx.wb.importRuns();
    const w = mountIn(RunsPanel, ctx);
    await nextTick();
    const bad = w.find('tbody[data-run="dup.csv"]');
    expect(bad.attributes('data-status')).toBe('failed');
    expect(bad.find('.run-error').text()).toBe('dup.csv:2:3: column "alpha" appears twice (columns 1 and 3)');
    const good = w.find('tbody[data-run="run-101-clean.csv"]');
    const r = ctx.wb.state.entries['run-101-clean.csv']!.result!;
    const q = r.points.reduce((a, p) => a + p.q_pa!, 0) / r.points.length;
    expect(good.findAll('td.num')[0]!.text()).toBe(q.toFixed(1));
    expect(good.find('.config').text()).toBe('clean');
  });

  it('ticks runs in and out of the plots, and lists a run\'s warnings on request', async () => {
    const ctx = await sampleContext();
    ctx.host.add('run-105.csv', sample('run-101-clean.csv').replace('# run: 101', '# run: 105').replace(/^(-1\.988),[\d.]+,/m, '$1,-5.0,'));
    ctx.host.nextChoice = ['run-105.csv'];
    await ctx.wb.importRuns();
    const w = mountIn(RunsPanel, ctx);
    await nextTick();
    await w.find('tbody[data-run="run-102-flap10.csv"] input[type="checkbox"]').setValue(false);
    expect(ctx.wb.shownRuns.value).not.toContain('run-102-flap10.csv');
    const row = w.find('tbody[data-run="run-105.csv"]');
    const count = row.find('button.warn-count');
    expect(count.text()).toBe('1');
    await count.trigger('click');
    // a point inside the run whose pitot pressure is below 5 % of the median is wind-off: left out, named by its line
    expect(w.find('ul.warnings').text()).toMatch(/^run-105\.csv:10: point 10 \(line 10\) skipped: wind-off \(pitot impact pressure -5\.000 Pa/);
  });
});

describe('plots', () => {
  it('overlays the ticked runs with their own colours and markers, and follows the corrected/as-measured choice', async () => {
    const ctx = await sampleContext();
    for (const f of ['run-102-flap10.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv']) ctx.wb.setVisible(f, false);
    const w = mountIn(PlotsView, ctx);
    await nextTick();
    expect(charts.length).toBe(4);
    const lift = charts[0]!;
    expect(lift.data.datasets.map((d) => d.label)).toEqual(['101 · clean', '103 · flap 20']);
    expect(lift.data.datasets.map((d) => d.borderColor)).toEqual(['#0072B2', '#009E73']);
    expect(lift.data.datasets[0]!.pointStyle).not.toBe(lift.data.datasets[1]!.pointStyle);
    const r101 = ctx.wb.state.entries['run-101-clean.csv']!.result!;
    expect(lift.data.datasets[0]!.data[0]).toEqual({ x: r101.points[0]!.alpha_deg, y: r101.points[0]!.cl });
    const scales = lift.options['scales'] as Record<string, { title: { text: string } }>;
    expect([scales['x']!.title.text, scales['y']!.title.text]).toEqual(['α [deg]', 'CL [–]']);
    expect((charts[1]!.options['scales'] as Record<string, { title: { text: string } }>)['x']!.title.text).toBe('CD [–]');

    ctx.wb.state.basis = 'measured';
    await nextTick();
    // each chart redraws in a task of its own (charts/drawQueue.ts)
    await vi.waitFor(() => expect(lift.updates).toBeGreaterThan(0));
    expect(lift.data.datasets[0]!.data[0]).toEqual({ x: r101.points[0]!.alpha_uncorrected_deg, y: r101.points[0]!.cl_uncorrected });
    expect(w.findAll('.legend li').map((li) => li.text()).slice(0, 2)).toEqual(['101 · clean', '103 · flap 20']);
  });

  it('shows differences against the chosen baseline', async () => {
    const ctx = await sampleContext();
    for (const f of ['run-102-flap10.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv']) ctx.wb.setVisible(f, false);
    const w = mountIn(DeltaView, ctx);
    await w.find('select').setValue('run-101-clean.csv');
    expect(ctx.wb.state.campaign.baseline).toBe('run-101-clean.csv');
    const rows = w.findAll('.delta-table tbody tr');
    const r103 = ctx.wb.state.entries['run-103-flap20.csv']!.result!;
    const base = ctx.wb.state.entries['run-101-clean.csv']!.result!.points.map((p) => p.alpha_deg!);
    const inside = r103.points.filter((p) => p.alpha_deg! >= Math.min(...base) && p.alpha_deg! <= Math.max(...base));
    expect(inside.length).toBeLessThan(r103.points.length); // the check below can tell "inside" from "all"
    expect(rows.length).toBe(inside.length);
    expect(rows[0]!.text()).toContain('103 · flap 20');
    const dcl = charts.find((c) => c.data.datasets[0]?.label === '103 · flap 20')!;
    // flaps add lift at a given α: the differences at low α are all positive
    expect(dcl.data.datasets[0]!.data.slice(0, 5).every((p) => p.y > 0.3)).toBe(true);
  });
});

describe('uncertainties in the plots and the comparison', () => {
  async function withUncertainty() {
    const ctx = await sampleContext();
    await ctx.wb.applySetup('KM-7 wing', { ...ctx.wb.state.campaign.setups['KM-7 wing'], uncertainty: TEST_UNCERTAINTY });
    for (const f of ['run-102-flap10.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv']) ctx.wb.setVisible(f, false);
    return ctx;
  }
  const toggle = (w: ReturnType<typeof mountIn>) => w.find('.error-bar-toggle input');

  it('offers error bars only when a shown run has uncertainties', async () => {
    const ctx = await sampleContext();
    const w = mountIn(PlotsView, ctx);
    await nextTick();
    expect(toggle(w).attributes('disabled')).toBeDefined();
    expect(w.find('.error-bar-toggle').attributes('title')).toMatch(/No run shown carries uncertainties/);
    expect(charts.every((c) => (c.options['plugins'] as { errorBars: { show: boolean } }).errorBars.show === false)).toBe(true);
  });

  it('draws each point\'s standard uncertainties as error bars, and hides them with the toggle', async () => {
    const ctx = await withUncertainty();
    const w = mountIn(PlotsView, ctx);
    await nextTick();
    expect(toggle(w).attributes('disabled')).toBeUndefined();
    expect(w.find('.error-bar-toggle').attributes('title')).toMatch(/k = 1/);
    const shown = () => charts.map((c) => (c.options['plugins'] as { errorBars: { show: boolean } }).errorBars.show);
    expect(shown()).toEqual([true, true, true, true]);
    const p = ctx.wb.state.entries['run-101-clean.csv']!.result!.points[2]!;
    expect(charts[0]!.data.datasets[0]!.data[2]).toEqual({ x: p.alpha_deg, y: p.cl, xu: p.u_alpha_deg, yu: p.u_cl });
    expect(charts[1]!.data.datasets[0]!.data[2]).toEqual({ x: p.cd, y: p.cl, xu: p.u_cd, yu: p.u_cl });
    await toggle(w).setValue(false);
    expect(ctx.wb.state.errorBars).toBe(false);
    await vi.waitFor(() => expect(shown()).toEqual([false, false, false, false]));
    expect(w.findAll('.plot-panel').map((f) => f.attributes('data-error-bars'))).toEqual(['off', 'off', 'off', 'off']);
  });

  it('shows each difference against the baseline with u(Δ), in the table and as error bars', async () => {
    const ctx = await withUncertainty();
    const w = mountIn(DeltaView, ctx);
    await w.find('select').setValue('run-101-clean.csv');
    const head = w.findAll('.delta-table thead th').map((h) => h.text());
    expect(head).toEqual(['Run', 'α [deg]', 'ΔCL [–]', 'u(ΔCL) [–]', 'ΔCD [–]', 'u(ΔCD) [–]', 'ΔCm [–]', 'u(ΔCm) [–]']);
    // the first difference by hand: the baseline's u(CL) interpolated linearly at the run's α, combined
    // with the run's: u(Δ) = √(u_run² + u_base²) (JCGM 100:2008 eq. 10, independent runs)
    const run = ctx.wb.state.entries['run-103-flap20.csv']!.result!.points;
    const base = [...ctx.wb.state.entries['run-101-clean.csv']!.result!.points].sort((a, b) => a.alpha_deg! - b.alpha_deg!);
    const first = [...run].sort((a, b) => a.alpha_deg! - b.alpha_deg!).find((p) => p.alpha_deg! >= base[0]!.alpha_deg!)!;
    const hi = base.findIndex((p) => p.alpha_deg! >= first.alpha_deg!);
    const [b0, b1] = [base[hi - 1]!, base[hi]!];
    const t = (first.alpha_deg! - b0.alpha_deg!) / (b1.alpha_deg! - b0.alpha_deg!);
    const uBase = b0.u_cl! + t * (b1.u_cl! - b0.u_cl!);
    const cells = w.findAll('.delta-table tbody tr')[0]!.findAll('td');
    expect(cells[1]!.text()).toBe(first.alpha_deg!.toFixed(2));
    expect(cells[3]!.text()).toBe(`± ${Math.hypot(first.u_cl!, uBase).toFixed(4)}`);
    const dcl = charts.find((c) => c.data.datasets[0]?.label === '103 · flap 20' && (c.options['scales'] as Record<string, { title: { text: string } }>)['y']!.title.text === 'ΔCL [–]')!;
    expect(dcl.data.datasets[0]!.data[0]!).toMatchObject({ x: first.alpha_deg, yu: Math.hypot(first.u_cl!, uBase) });
    expect((dcl.options['plugins'] as { errorBars: { show: boolean } }).errorBars.show).toBe(true);
    // the fitted characteristics against the baseline's, with the fits' standard errors combined
    const f103 = ctx.wb.state.entries['run-103-flap20.csv']!.result!.fit;
    const f101 = ctx.wb.state.entries['run-101-clean.csv']!.result!.fit;
    const slope = w.find('tr[data-fit-delta="cl_alpha_per_deg"]').findAll('td');
    expect(slope[2]!.text()).toBe((f103.cl_alpha_per_deg! - f101.cl_alpha_per_deg!).toFixed(5));
    expect(slope[3]!.text()).toBe(`± ${Math.hypot(f103.cl_alpha_stderr_per_deg!, f101.cl_alpha_stderr_per_deg!).toFixed(5)}`);
    expect(w.find('tr[data-fit-delta="cl_max"]').findAll('td')[3]!.text()).toMatch(/^— no standard error from the fit; u\(CL\) at the highest points/);
  });

  it('exports a plot with its error bars and a footer line saying what they are', async () => {
    const ctx = await withUncertainty();
    charts.length = 0;
    await ctx.exports.exportPlotPng('ld-alpha');
    const image = charts.at(-1)!;
    const plugins = image.options['plugins'] as { errorBars: { show: boolean }; paperFooter: { lines: string[] } };
    expect(plugins.errorBars.show).toBe(true);
    expect(plugins.paperFooter.lines.at(-1)).toBe(ERROR_BAR_NOTE);
    expect(ctx.host.exported.at(-1)!.name).toMatch(/-ld-alpha\.png$/);
    // switched off in the window, off in the image too
    ctx.wb.state.errorBars = false;
    await ctx.exports.exportPlotPng('ld-alpha');
    const plain = charts.at(-1)!.options['plugins'] as { errorBars: { show: boolean }; paperFooter: { lines: string[] } };
    expect(plain.errorBars.show).toBe(false);
    expect(plain.paperFooter.lines).not.toContain(ERROR_BAR_NOTE);
  });

  it('leaves the u(Δ) columns out when the runs carry no uncertainties', async () => {
    const ctx = await sampleContext();
    const w = mountIn(DeltaView, ctx);
    await w.find('select').setValue('run-101-clean.csv');
    expect(w.findAll('.delta-table thead th').map((h) => h.text())).toEqual(['Run', 'α [deg]', 'ΔCL [–]', 'ΔCD [–]', 'ΔCm [–]']);
  });
});

describe('characteristics', () => {
  it('puts the runs side by side, with "—" and the reason where a value does not apply', async () => {
    const ctx = await sampleContext();
    const w = mountIn(FitsView, ctx);
    const headers = w.findAll('.fits-table thead th').map((h) => h.text());
    expect(headers).toEqual(['Characteristic', 'Unit', '101 · clean', '102 · flap 10', '103 · flap 20', '104 · clean', '201 · 2D section (2D)']);
    const oswald = w.find('tr[data-fit="oswald_e"]');
    const cells = oswald.findAll('td.num');
    expect(cells[4]!.text()).toBe('— not defined for a 2D section');
    // value ± standard uncertainty, both to the uncertainty's second significant digit (GUM §7.2.6), and its source
    const f101 = ctx.wb.state.entries['run-101-clean.csv']!.result!.fit;
    expect(cells[0]!.find('.val').text()).toBe(`${f101.oswald_e!.toFixed(4)} ± ${f101.oswald_e_u!.toFixed(4)}`);
    expect(cells[0]!.find('.how').text()).toBe('polar through CL = 0');
    expect(w.find('tr[data-fit="cl_alpha_per_deg"] td.unit').text()).toBe('1/deg');
    expect(w.find('.caution').text()).toMatch(/certified data and licensed practice govern/);
  });
});

describe('point table', () => {
  it('copies the selected rows, Shift-click selecting a range', async () => {
    const ctx = await sampleContext();
    const points = ctx.wb.state.entries['run-101-clean.csv']!.result!.points;
    const w = mountIn(PointTable, ctx, { points, runName: '101' });
    const rows = w.findAll('tbody tr');
    expect(rows.length).toBe(points.length);
    await rows[1]!.trigger('click');
    await rows[3]!.trigger('click', { shiftKey: true });
    expect(w.findAll('tr.selected').length).toBe(3);
    await w.findAll('button').find((b) => b.text() === 'Copy as tab-separated text')!.trigger('click');
    const text = (w.emitted('copy')![0] as string[])[0]!;
    const lines = text.trimEnd().split('\n');
    expect(lines.length).toBe(4);
    expect(lines[0]!.split('\t').slice(0, 4)).toEqual(['point', 'samples', 'α [deg]', 'CL [–]']);
    expect(lines[0]).toContain('CL (measured)');
    expect(Number(lines[1]!.split('\t')[3])).toBe(points[1]!.cl);
    // as measured: the value copied is the uncorrected one, at full precision
    const header = lines[0]!.split('\t');
    expect(Number(lines[1]!.split('\t')[header.indexOf('CL (measured) [–]')])).toBe(points[1]!.cl_uncorrected);
  });
});

describe('setup editor', () => {
  it('validates as the user types, beside the field, and applies a valid setup to its runs', async () => {
    const ctx = await sampleContext();
    const w = mountIn(SetupEditor, ctx);
    const apply = () => w.find('button[type="submit"]');
    expect(apply().attributes('disabled')).toBeDefined();
    const chord = w.find('#setup-model-chord_m');
    await chord.setValue('0.2x');
    expect(w.find('#setup-model-chord_m-msg .field-error').text()).toMatch(/reference chord, m/);
    expect(chord.attributes('aria-invalid')).toBe('true');
    expect(apply().attributes('disabled')).toBeDefined();
    await chord.setValue('0.25');
    expect(w.find('#setup-model-chord_m-msg .field-error').exists()).toBe(false);
    expect(apply().attributes('disabled')).toBeUndefined();
    expect(apply().text()).toBe('Apply to 4 runs');
    await w.find('form').trigger('submit');
    await flushPromises();
    await ctx.wb.settled();
    expect((ctx.wb.state.campaign.setups['KM-7 wing'] as { model: { chord_m: number } }).model.chord_m).toBe(0.25);
    expect(ctx.wb.dirty.value).toBe(true);
  });

  it('shows a 2D model\'s reference-area warning from core', async () => {
    const ctx = await sampleContext();
    ctx.wb.state.editingSetup = 'KM-7 section';
    const w = mountIn(SetupEditor, ctx);
    await nextTick();
    await w.find('#setup-model-area_m2').setValue('0.5');
    expect(w.find('ul.warnings').text()).toMatch(/model\.area_m2: 0\.5 m² differs from chord × tunnel width = 0\.36 m²/);
  });
});

describe('column mapping dialog', () => {
  it('offers guesses, refuses an incomplete assignment and reads the file with a complete one', async () => {
    const ctx = await sampleContext();
    ctx.host.add('odd.csv', sample('run-101-clean.csv').replace('alpha [deg],dp_pitot [Pa]', 'incidence [deg],qc [Pa]'));
    ctx.host.nextChoice = ['odd.csv'];
    await ctx.wb.importRuns();
    expect(ctx.wb.state.entries['odd.csv']!.status).toBe('needs-mapping');
    ctx.wb.state.mappingFor = 'odd.csv';
    const w = mountIn(MappingDialog, ctx);
    await nextTick();
    const holds = w.findAll('select[aria-label^="What column"]');
    expect(holds.map((s) => (s.element as HTMLSelectElement).value)).toEqual(['alpha', 'dp_pitot', 'p_static', 't_total', 'rh', 'lift', 'drag', 'pitch']);
    await holds[1]!.setValue('ignore');
    expect(w.find('ul.errors').text()).toContain('no column is assigned to dp_pitot');
    expect(w.find('button[type="submit"]').attributes('disabled')).toBeDefined();
    await holds[1]!.setValue('dp_pitot');
    expect(w.find('ul.errors').exists()).toBe(false);
    await w.find('form').trigger('submit');
    await flushPromises();
    await ctx.wb.settled();
    expect(ctx.wb.state.entries['odd.csv']!.status).toBe('ready');
    expect(ctx.wb.state.mappingFor).toBeNull();
  });
});
