// @vitest-environment happy-dom
/// <reference path="../../renderer/src/env.d.ts" />
/**
 * The window's balance, upflow and repeatability parts against the real state and worker logic in
 * process (Chart.js recorded, not drawn; drawing is looked at in the browser). Reference values: the
 * command line's `upflow` and `repeat` on the same invented sample files (test/app/analysis-cli.test.ts
 * checks those against the invented truth and the pooling formula).
 */
import { flushPromises, mount } from '@vue/test-utils';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { nextTick } from 'vue';
import AnalysisView from '../../renderer/src/components/AnalysisView.vue';
import { APP } from '../../renderer/src/state/context.ts';
import { repeatBand, residualPlots, upflowFromRuns, withUpflow, balanceTable } from '../../renderer/src/logic/flowAnalysis.ts';
import { degreesWithUncertainty } from '../../renderer/src/logic/numberFormat.ts';
import { parseBalance } from '../../core/balance/document.ts';
import { charts } from './chartMock.ts';
import { appContext, openedSample, sample } from './support.ts';
import { runCli } from '../support/cli.ts';
import { join } from 'node:path';
import { SAMPLES } from './support.ts';

vi.mock('chart.js', async () => (await import('./chartMock.ts')).default);

const PAIR = ['run-401-upright.csv', 'run-402-inverted.csv'];
const REPEATS = [1, 2, 3, 4, 5, 6].map((i) => `run-50${i}-repeat.csv`);

async function contextWith(files: string[], tare: string | null = null) {
  const ctx = appContext();
  ctx.host.nextCampaign = await openedSample(ctx.host);
  await ctx.wb.openCampaign();
  for (const f of files) ctx.host.add(f, sample(f));
  ctx.host.nextChoice = files;
  await ctx.wb.importRuns();
  for (const f of files) ctx.wb.setRunTare(f, tare);
  await flushPromises();
  await ctx.wb.settled();
  return ctx;
}

/** The upright/inverted sample runs hold loads with the weight tare already removed: no tare for them. */
const pairContext = () => contextWith(PAIR, null);

function mountIn(ctx: Awaited<ReturnType<typeof contextWith>>) {
  return mount(AnalysisView as never, { global: { provide: { [APP as symbol]: ctx } }, attachTo: document.body } as never);
}

beforeEach(() => {
  charts.length = 0;
  document.body.innerHTML = '';
});

describe('upflow from a chosen pair', () => {
  it('finds the pair by its configuration names, shows the upflow the command line gives, and applies it in one click', async () => {
    const ctx = await pairContext();
    const w = mountIn(ctx);
    await flushPromises();
    const cli = JSON.parse((await runCli('upflow', join(SAMPLES, PAIR[0]!), join(SAMPLES, PAIR[1]!), '--setup', join(SAMPLES, 'setup-3d.json'))).stdout);
    const shown = w.find('[data-testid="upflow-value"]').text();
    // rounded to the place of the uncertainty's second significant digit (GUM §7.2.6)
    expect(shown).toContain(degreesWithUncertainty(cli.upflow_deg, cli.upflow_u_deg, 3));
    const setupName = ctx.wb.runOf(PAIR[0]!)!.setup!;
    const button = w.findAll('button').find((b) => b.text().startsWith('Apply'))!;
    expect(button.text()).toBe(`Apply ${cli.upflow_deg.toFixed(3)}° to setup "${setupName}"`);
    await button.trigger('click');
    await flushPromises();
    await ctx.wb.settled();
    await flushPromises();
    expect((ctx.wb.state.campaign.setups[setupName] as { flow: { upflow_deg: number } }).flow.upflow_deg).toBeCloseTo(cli.upflow_deg, 4);
    expect(w.find('.upflow-part .flash').text()).toMatch(/written to setup/);
    // applied to both runs of that setup, the same pair measures the same upflow (it cancels), and says so
    expect(Number.parseFloat(w.find('[data-testid="upflow-value"]').text())).toBeCloseTo(cli.upflow_deg, 3);
    expect(w.find('.upflow-part').text()).toMatch(/it cancels/);
  });
  it('takes out half the difference when the two runs’ setups apply different upflows (logic)', async () => {
    const ctx = await pairContext();
    const up = ctx.wb.resultOf(PAIR[0]!, 'measured')!;
    const inv = ctx.wb.resultOf(PAIR[1]!, 'measured')!;
    const plain = upflowFromRuns(up, inv);
    const shifted = upflowFromRuns(up, inv, 0, 0.2);
    expect(plain.ok && shifted.ok && plain.value.upflow_deg - shifted.value.upflow_deg).toBeCloseTo(0.1, 12);
    expect(withUpflow({ flow: { gamma: 1.4 } }, 0.123456)).toEqual({ flow: { gamma: 1.4, upflow_deg: 0.1235 } });
  });
});

describe('repeatability band', () => {
  it('ticks the six repeats (same configuration), gives the pooled scatter of the command line, and draws ± 2 s around the chosen run', async () => {
    const ctx = await contextWith(REPEATS, 'windoff-tare.csv');
    const w = mountIn(ctx);
    await flushPromises();
    const ticked = w.findAll('.repeat-choice input').filter((i) => (i.element as HTMLInputElement).checked);
    expect(ticked).toHaveLength(6);
    const cli = JSON.parse(
      (await runCli('repeat', ...REPEATS.map((f) => join(SAMPLES, f)), '--setup', join(SAMPLES, 'setup-3d.json'), '--tare', join(SAMPLES, 'windoff-tare.csv')))
        .stdout,
    );
    const text = w.find('[data-testid="repeat-pooled"]').text();
    expect(text).toContain(`CL ${cli.pooled_sd_cl.toPrecision(2)}`);
    expect(text).toContain('75 degrees of freedom');
    const band = charts.find((c) => (c.options['plugins'] as Record<string, unknown>)?.['bandFill'])!;
    const opts = (band.options['plugins'] as { bandFill: { bands: { points: { x: number; y: number; lo: number; hi: number }[] }[] } }).bandFill;
    const p = opts.bands[0]!.points[3]!;
    expect(p.hi - p.y).toBeCloseTo(2 * cli.pooled_sd_cl, 12);
    expect(p.y - p.lo).toBeCloseTo(2 * cli.pooled_sd_cl, 12);
  });
  it('band logic: ± 2 pooled SD of each coefficient around the reference run', async () => {
    const ctx = await contextWith(REPEATS.slice(0, 3));
    const results = REPEATS.slice(0, 3).map((f) => ctx.wb.resultOf(f, 'corrected')!);
    const b = repeatBand(results[0]!, results);
    expect(b.cd[0]!.hi - b.cd[0]!.lo).toBeCloseTo(4 * b.stats.pooled_sd_cd!, 12);
    expect(b.cl.map((p) => p.x)).toEqual(results[0]!.points.map((p) => p.alpha_deg));
  });
});

describe('balance of a setup', () => {
  it('asks for the balance file a setup names, then shows its zeros, matrix and residuals against the applied load', async () => {
    const ctx = await contextWith([]);
    ctx.wb.state.campaign.setups['KM-7 on B3'] = JSON.parse(sample('setup-3d-raw.json'));
    const w = mountIn(ctx);
    await flushPromises();
    const select = w.find('.balance-part select');
    await select.setValue('KM-7 on B3');
    expect(w.find('.balance-part').text()).toMatch(/reads its balance from balance-b3\.json/);
    ctx.host.add('balance-b3.json', sample('balance-b3.json'));
    ctx.host.nextChoice = ['balance-b3.json'];
    await w
      .findAll('.balance-part button')
      .find((b) => b.text() === 'Open balance file…')!
      .trigger('click');
    await flushPromises();
    const b = parseBalance('balance-b3.json', sample('balance-b3.json'));
    const cells = w.findAll('.balance-part table[aria-label="Natural zeros"] td.num').map((c) => c.text());
    expect(cells).toHaveLength(3);
    expect(Number(cells[0])).toBeCloseTo(b.zeros[0]!, 5);
    expect(w.findAll('.balance-part table[aria-label="Calibration matrix"] tbody tr')).toHaveLength(3);
    expect(w.findAll('.balance-part table[aria-label="Calibration matrix"] th')).toHaveLength(1 + 3 + 6);
    const residualCharts = charts.filter((c) => c.data.datasets[0]?.label?.includes('residual'));
    expect(residualCharts).toHaveLength(3);
    expect(residualCharts[0]!.data.datasets[0]!.data).toHaveLength(42);
  });
  it('names the file and field of a malformed balance file', async () => {
    const ctx = await contextWith([]);
    const w = mountIn(ctx);
    await flushPromises();
    const bad = JSON.parse(sample('balance-b3.json'));
    bad.natural_zeros = [0, 0];
    ctx.host.add('bad.json', JSON.stringify(bad));
    ctx.host.nextChoice = ['bad.json'];
    await w
      .findAll('.balance-part button')
      .find((b) => b.text() === 'Open balance file…')!
      .trigger('click');
    await flushPromises();
    await nextTick();
    expect(w.find('.balance-part [role="alert"]').text()).toBe('bad.json: natural_zeros: 2 numbers; expected 3');
  });
  it('table and residual logic follow the document’s term order', () => {
    const b = parseBalance('balance-b3.json', sample('balance-b3.json'));
    expect(balanceTable(b).columns).toEqual(['normal', 'axial', 'pitch', 'normal²', 'normal·axial', 'normal·pitch', 'axial²', 'axial·pitch', 'pitch²']);
    const r = residualPlots(b);
    expect(r.map((x) => x.load)).toEqual(['normal', 'axial', 'pitch']);
    expect(Math.max(...r[1]!.points.map((p) => Math.abs(p.y)))).toBeCloseTo(r[1]!.max!, 12);
  });
});
