// @vitest-environment happy-dom
/// <reference path="../../renderer/src/env.d.ts" />
/**
 * The report exports of the comparison and the full-scale estimate, and the figure sizes: each file is
 * written through the window's own export actions on the sample campaign, read back with a
 * comment-skipping CSV reader (papaparse `comments: '#'`) or a workbook reader, and its numbers held
 * against what the views show, within the rounding written. Also: the window's points CSV and the
 * command line's carry the same numbers and the same `#` lines.
 */
import { mount } from '@vue/test-utils';
import Papa from 'papaparse';
import readXlsx from 'read-excel-file/node';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { nextTick } from 'vue';
import { CAUTIONS, TRIM_CAUTION } from '../../core/fullscale/stallSpeed.ts';
import { decimalsFromUncertainty, MAX_SIGNIFICANT, reportTableCsv, ROUNDING_NOTE, type TableColumn } from '../../core/formats/reportTable.ts';
import { pointsCsv, pointTableComments } from '../../core/reduction/engine.ts';
import DeltaView from '../../renderer/src/components/DeltaView.vue';
import FullScaleView from '../../renderer/src/components/FullScaleView.vue';
import { deltas, dragAtMatchedLift } from '../../renderer/src/logic/delta.ts';
import { FULL_SCALE_HEAD, pointsCsvExport } from '../../renderer/src/logic/exportTables.ts';
import { figureLayout, fitLayout, MIN_LAYOUT, MIN_PLOT_HEIGHT, sizeProblem } from '../../renderer/src/logic/figureSize.ts';
import { SECTION_REASON } from '../../renderer/src/logic/fullScale.ts';
import { APP } from '../../renderer/src/state/context.ts';
import { charts } from './chartMock.ts';
import { appContext, openedSample, TEST_UNCERTAINTY } from './support.ts';

vi.mock('chart.js', async () => (await import('./chartMock.ts')).default);

async function sampleContext(withUncertainty = true) {
  const ctx = appContext();
  ctx.host.nextCampaign = await openedSample(ctx.host);
  await ctx.wb.openCampaign();
  if (withUncertainty) await ctx.wb.applySetup('KM-7 wing', { ...ctx.wb.state.campaign.setups['KM-7 wing'], uncertainty: TEST_UNCERTAINTY });
  return ctx;
}
type Ctx = Awaited<ReturnType<typeof sampleContext>>;

function mountIn<T>(component: T, ctx: Ctx) {
  return mount(component as never, { global: { provide: { [APP as symbol]: ctx } }, attachTo: document.body } as never);
}

function lastExport(ctx: Ctx, ext: string): { name: string; data: Uint8Array | string } {
  const e = ctx.host.exported.at(-1);
  if (!e || !e.name.endsWith(ext)) throw new Error(`no ${ext} export; messages: ${JSON.stringify(ctx.wb.state.banners)}`);
  return e;
}

/** Header, units row and rows of a report CSV read as a comment-skipping reader reads it. */
function readReport(text: string): { header: string[]; units: string[]; rows: Record<string, string>[]; comments: string[] } {
  const parsed = Papa.parse<string[]>(text, { comments: '#', skipEmptyLines: true });
  expect(parsed.errors).toEqual([]);
  const [header, units, ...rest] = parsed.data;
  return {
    header: header!,
    units: units!,
    rows: rest.map((r) => Object.fromEntries(header!.map((h, i) => [h, r[i] ?? '']))),
    comments: text.split('\n').filter((l) => l.startsWith('#')),
  };
}

/** Significant digits of a number as written ("0.004560" → 4, "474000" → 3). */
function significant(text: string): number {
  const m = text.replace(/^-/, '').replace(/e.*$/i, '');
  const digits = m.replace('.', '').replace(/^0+/, '');
  return m.includes('.') ? digits.length : digits.replace(/0+$/, '').length || 1;
}

/** Half a unit in the last place written: the rounding a written number carries. */
function halfPlace(text: string): number {
  const m = text.replace(/^-/, '');
  if (m.includes('.')) return 0.5 * 10 ** -m.split('.')[1]!.length;
  return 0.5 * 10 ** (/0*$/.exec(m)![0].length || 0);
}

function expectNear(cell: string, value: number, what: string) {
  expect(cell, what).not.toBe('');
  expect(significant(cell), `${what}: ${cell}`).toBeLessThanOrEqual(MAX_SIGNIFICANT);
  expect(Math.abs(Number(cell) - value), `${what}: ${cell} vs ${value}`).toBeLessThanOrEqual(halfPlace(cell) * (1 + 1e-9));
}

beforeEach(() => {
  charts.length = 0;
  document.body.innerHTML = '';
});

describe('the report table writer', () => {
  it('writes any rows with raw # lines, a header, a units row, text escaped and numbers rounded', () => {
    const cols: TableColumn<{ a: string; v: number | null; u: number | null; n: number }>[] = [
      { header: 'name', unit: '', decimals: 0, value: (r) => r.a },
      { header: 'value', unit: 'Pa', decimals: 2, value: (r) => r.v, u: (r) => r.u },
      { header: 'typed', unit: 'kg', decimals: 0, given: true, value: (r) => r.n },
    ];
    const csv = reportTableCsv(
      cols,
      [
        { a: '=cmd', v: 611.4812345, u: 0.23, n: 1250 },
        { a: 'b, c', v: null, u: null, n: 0.1 + 0.2 },
      ],
      ['table: test, =1+1'],
    );
    expect(csv).toBe('# table: test, \'=1+1\nname,value,typed\n,Pa,kg\n\'=cmd,611.48,1250\n"b, c",,0.3\n');
  });
});

describe('differences against the baseline', () => {
  it('exports what the view shows: matched alpha and constant lift per run, u(delta) where the runs carry it, the 2D run listed as not compared', async () => {
    const ctx = await sampleContext();
    for (const f of ['run-102-flap10.csv', 'run-104-clean-timehistory.csv']) ctx.wb.setVisible(f, false);
    const w = mountIn(DeltaView, ctx);
    await w.find('select').setValue('run-101-clean.csv');
    await w
      .findAll('button')
      .find((b) => b.text() === 'Differences CSV')!
      .trigger('click');
    await vi.waitFor(() => lastExport(ctx, '.csv'));
    const file = lastExport(ctx, '.csv');
    expect(file.name).toBe('KM-7-wing-flap-study-invented-demonstration-campaign-differences-against-101.csv');
    const text = String(file.data);
    expect(text).not.toMatch(/^"#/m);
    const { header, units, rows, comments } = readReport(text);

    // what the file is comes first, in raw # lines
    expect(comments[0]).toBe('# table: differences against the baseline run, delta = run - baseline');
    expect(comments).toContain('# baseline: 101 · clean (run-101-clean.csv)');
    expect(comments).toContain('# runs compared: 103 · flap 20 (run-103-flap20.csv)');
    expect(comments).toContain('# basis: free-air corrected (wall corrections applied)');
    expect(comments).toContain(`# ${ROUNDING_NOTE}`);
    const refused = comments.find((l) => l.startsWith('# not compared: '))!;
    expect(refused).toMatch(/^# not compared: run-201-section\.csv: 201 · 2D section \(2D\) is a 2D section and the baseline 101 · clean a 3D model/);
    expect(comments.some((l) => /^# run 103 run: run-103-flap20\.csv sha256 [0-9a-f]{64}$/.test(l))).toBe(true);

    expect(header).toEqual([
      'run',
      'configuration',
      'matched at',
      'alpha',
      'CL',
      'delta CL',
      'u(delta CL)',
      'delta CD',
      'u(delta CD)',
      'delta Cm',
      'u(delta Cm)',
    ]);
    expect(units).toEqual(['', '', '', 'deg', '-', '-', '-', '-', '-', '-', '-']);
    expect(rows.every((r) => r['run'] === '103' && r['configuration'] === 'flap 20')).toBe(true);

    // the matched-alpha rows are the view's table rows, within the view's rounding and the file's
    const viewRows = w.findAll('.delta-table tbody tr').map((tr) => tr.findAll('td').map((td) => td.text()));
    const atAlpha = rows.filter((r) => r['matched at'] === 'alpha');
    expect(atAlpha).toHaveLength(viewRows.length);
    const run = ctx.wb.resultOf('run-103-flap20.csv')!.points;
    const base = ctx.wb.resultOf('run-101-clean.csv')!.points;
    const exact = { cl: deltas(run, base, 'cl'), cd: deltas(run, base, 'cd'), cm: deltas(run, base, 'cm') };
    atAlpha.forEach((r, i) => {
      const v = viewRows[i]!;
      expect(Math.abs(Number(r['alpha']) - Number(v[1]))).toBeLessThanOrEqual(0.005 + 0.0005);
      for (const [key, col, viewCol, decimals] of [
        ['cl', 'delta CL', 2, 4],
        ['cd', 'delta CD', 4, 5],
        ['cm', 'delta Cm', 6, 4],
      ] as const) {
        const d = exact[key][i]!;
        expectNear(r[col]!, d.delta, `${col} row ${i}`);
        // rounded to the place of u(delta)'s second significant digit (GUM 7.2.6)
        const places = r[col]!.includes('.') ? r[col]!.split('.')[1]!.length : 0;
        expect(places, `${col} row ${i}`).toBe(decimalsFromUncertainty(d.u!));
        expectNear(r[`u(${col})`]!, d.u!, `u(${col}) row ${i}`);
        expect(significant(r[`u(${col})`]!)).toBeLessThanOrEqual(2);
        // and the view shows the same difference to its own decimals
        expect(Math.abs(Number(r[col]) - Number(v[viewCol]))).toBeLessThanOrEqual(0.5 * 10 ** -decimals + halfPlace(r[col]!));
      }
    });

    // the constant-lift rows: ΔCD at each CL of the run's attached-flow branch, as the view's plot draws them
    const atLift = rows.filter((r) => r['matched at'] === 'CL');
    const lift = dragAtMatchedLift(run, base);
    expect(atLift).toHaveLength(lift.length);
    expect(lift.length).toBeGreaterThan(3);
    const plotted = charts.find((c) => (c.options['scales'] as Record<string, { title: { text: string } }>)['x']!.title.text === 'CL [–]')!.data.datasets[0]!
      .data;
    atLift.forEach((r, i) => {
      expect(r['alpha']).toBe('');
      expect(r['delta CL']).toBe('');
      expectNear(r['CL']!, lift[i]!.cl, `CL row ${i}`);
      expectNear(r['delta CD']!, lift[i]!.delta, `delta CD at CL row ${i}`);
      expectNear(r['delta CD']!, plotted[i]!.y, `plotted delta CD at CL row ${i}`);
    });
  });

  it('writes a workbook of the differences, the fitted characteristics and the notes, full precision under number formats', async () => {
    const ctx = await sampleContext(false);
    for (const f of ['run-102-flap10.csv', 'run-104-clean-timehistory.csv']) ctx.wb.setVisible(f, false);
    ctx.wb.setBaseline('run-101-clean.csv');
    await ctx.exports.exportDeltaXlsx();
    const file = lastExport(ctx, '.xlsx');
    const sheets = await readXlsx(Buffer.from(file.data as Uint8Array));
    expect(sheets.map((s) => s.sheet)).toEqual(['Differences', 'Fitted characteristics', 'Notes']);
    const data = sheets[0]!.data;
    // no uncertainty block in this setup: no u(delta) columns
    expect(data[0]).toEqual(['run', 'configuration', 'matched at', 'alpha', 'CL', 'delta CL', 'delta CD', 'delta Cm']);
    expect(data[1]!.slice(3)).toEqual(['deg', '-', '-', '-', '-']);
    const exact = deltas(ctx.wb.resultOf('run-103-flap20.csv')!.points, ctx.wb.resultOf('run-101-clean.csv')!.points, 'cl');
    expect(data[2]![5]).toBe(exact[0]!.delta);
    const fits = sheets[1]!.data;
    expect(fits[0]).toEqual(['characteristic', 'unit', 'baseline', 'delta 103', 'u(delta) 103']);
    const notes = sheets[2]!.data.map((r) => r[0]);
    expect(notes.some((l) => typeof l === 'string' && l.startsWith('not compared: run-201-section.csv: '))).toBe(true);
  });

  it('asks for a baseline rather than writing an empty file', async () => {
    const ctx = await sampleContext(false);
    ctx.wb.setBaseline(null);
    const before = ctx.host.exported.length;
    await ctx.exports.exportDeltaCsv();
    expect(ctx.host.exported.length).toBe(before);
    expect(ctx.wb.state.banners.at(-1)!.text).toBe('Differences: choose a baseline run first.');
  });
});

describe('the full-scale table', () => {
  it('carries the cautions first, the inputs and the air, each CLmax with its source, the speeds the view shows, and the 2D run with its reason', async () => {
    const ctx = await sampleContext(false);
    Object.assign(ctx.wb.state.fullScale, { mass: '750', wingArea: '11.2', altitude: '1500', temperature: '25', rh: '60' });
    ctx.wb.setBaseline('run-101-clean.csv');
    const w = mountIn(FullScaleView, ctx);
    await nextTick();
    await w
      .findAll('button')
      .find((b) => b.text() === 'Full-scale CSV')!
      .trigger('click');
    await vi.waitFor(() => lastExport(ctx, '.csv'));
    const file = lastExport(ctx, '.csv');
    expect(file.name).toBe('KM-7-wing-flap-study-invented-demonstration-campaign-full-scale-estimate.csv');
    const text = String(file.data);
    const { header, units, rows, comments } = readReport(text);

    // the cautions travel with the numbers, ahead of everything else
    expect(comments[0]).toBe(`# caution: ${FULL_SCALE_HEAD}`);
    for (const c of [...CAUTIONS, TRIM_CAUTION]) expect(text).toContain(`# caution: ${c.split(',')[0]}`);
    expect(comments).toContain(`# ${ROUNDING_NOTE}`);
    expect(comments.some((l) => l.startsWith('# baseline: 101 · clean (run-101-clean.csv)'))).toBe(true);

    const col = (h: string) => units[header.indexOf(h)];
    expect([col('mass'), col('wing area'), col('pressure altitude'), col('outside air temperature'), col('relative humidity')]).toEqual([
      'kg',
      'm^2',
      'm',
      'degC',
      '%',
    ]);
    expect([col('air density'), col('density altitude'), col('V_s'), col('V_s knots'), col('CLmax')]).toEqual(['kg/m^3', 'm', 'm/s', 'kt', '-']);

    // one row per run the view lists, in its order, the typed inputs as typed
    const viewRows = w.findAll('.fs-table:not(.changes) tbody tr');
    expect(rows.map((r) => r['run file'])).toEqual(viewRows.map((tr) => tr.attributes('data-run')));
    for (const r of rows) {
      expect([r['mass'], r['wing area'], r['pressure altitude'], r['relative humidity'], r['lift-off factor']]).toEqual(['750', '11.2', '1500', '60', '1.2']);
      expect(r['outside air temperature']).toBe('25.0');
    }
    const rho = Number(w.find('[data-air="rho"]').attributes('data-value'));
    const densityAltitude = Number(w.find('[data-air="density-altitude"]').attributes('data-value'));
    const clean = rows.find((r) => r['run file'] === 'run-101-clean.csv')!;
    expectNear(clean['air density']!, rho, 'air density');
    expectNear(clean['density altitude']!, densityAltitude, 'density altitude');
    expect(clean['baseline']).toBe('yes');

    for (const tr of viewRows) {
      const r = rows.find((x) => x['run file'] === tr.attributes('data-run'))!;
      const vs = tr.find('[data-col="v-stall"]').attributes('data-value');
      if (vs === undefined) {
        // not projected: listed with the reason, no speeds
        expect(r['V_s']).toBe('');
        expect(r['note']).not.toBe('');
        continue;
      }
      expectNear(r['V_s']!, Number(vs), `V_s ${r['run']}`);
      expectNear(r['V_s knots']!, Number(tr.find('[data-col="v-stall-kt"]').attributes('data-value')), `V_s kt ${r['run']}`);
      expect(Math.abs(Number(r['V_s']) - Number(tr.find('[data-col="v-stall"]').text()))).toBeLessThanOrEqual(0.05 + 1e-9);
      const fit = ctx.wb.resultOf(r['run file']!, 'corrected')!.fit;
      expectNear(r['CLmax']!, fit.cl_max!, `CLmax ${r['run']}`);
      expect(r['CLmax from']).toMatch(new RegExp(`^fit of run ${r['run']}, free-air corrected, `));
    }
    const section = rows.find((r) => r['run file'] === 'run-201-section.csv')!;
    expect(section['note']).toBe(SECTION_REASON);
    expect(section['CLmax']).toBe('');
    // the change against the baseline, as the view's second table shows it
    const flap = rows.find((r) => r['run file'] === 'run-103-flap20.csv')!;
    const dv = Number(w.find('.changes tr[data-run="run-103-flap20.csv"] [data-col="dv"]').attributes('data-value'));
    expectNear(flap['delta V_s']!, dv, 'delta V_s');
    expect(Number(flap['delta V_s'])).toBeLessThan(0);
  });

  it('writes the same table with its cautions above it in a workbook', async () => {
    const ctx = await sampleContext(false);
    Object.assign(ctx.wb.state.fullScale, { mass: '750', wingArea: '11.2' });
    await ctx.exports.exportFullScaleXlsx();
    const sheets = await readXlsx(Buffer.from(lastExport(ctx, '.xlsx').data as Uint8Array));
    expect(sheets.map((s) => s.sheet)).toEqual(['Full-scale estimate', 'Notes']);
    const data = sheets[0]!.data;
    expect(data[0]![0]).toBe(`caution: ${FULL_SCALE_HEAD}`);
    const headRow = data.findIndex((r) => r[0] === 'run');
    expect(headRow).toBeGreaterThan(CAUTIONS.length);
    expect(data[headRow + 1]![data[headRow]!.indexOf('V_s')]).toBe('m/s');
  });

  it('says what is missing instead of writing a table without inputs', async () => {
    const ctx = await sampleContext(false);
    const before = ctx.host.exported.length;
    await ctx.exports.exportFullScaleCsv();
    expect(ctx.host.exported.length).toBe(before);
    expect(ctx.wb.state.banners.at(-1)!.text).toMatch(/^Full-scale table: enter the aircraft mass and wing area/);
  });
});

describe('figure sizes', () => {
  it('lays a size in mm out at 96 px per inch, never smaller than the drawing needs, and says how large its type prints', () => {
    const text = figureLayout({ width: 160, height: 110, unit: 'mm' });
    expect(text.mm).toEqual({ width: 160, height: 110 });
    // 605 × 416 px at true size, just under the least height: scaled up to it, the proportions kept
    expect(text.height).toBe(MIN_LAYOUT.height);
    expect(text.width).toBe(Math.round(160 * (96 / 25.4) * (MIN_LAYOUT.height / (110 * (96 / 25.4)))));
    expect(text.width / text.height).toBeCloseTo(160 / 110, 2);
    const column = figureLayout({ width: 85, height: 70, unit: 'mm' });
    expect(column.width).toBe(MIN_LAYOUT.width);
    expect(column.printedPt).toBeCloseTo((12 * (85 / 600) * 72) / 25.4, 6);
    // a full A4 landscape page is laid out at true size: 12 px prints at 9 pt
    const page = figureLayout({ width: 257, height: 170, unit: 'mm' });
    expect(page.width).toBe(Math.round(257 * (96 / 25.4)));
    expect(page.printedPt).toBeCloseTo(9, 1);
    // 300 dpi for the PNG: device pixels across the width = 257 mm at 300 dpi
    expect(page.width * page.pixelRatio).toBeCloseTo((257 / 25.4) * 300, 6);
    const px = figureLayout({ width: 1280, height: 720, unit: 'px' });
    expect(px).toEqual({ width: 1280, height: 720, mm: null, pixelRatio: 1, printedPt: null });
  });

  it('enlarges a layout in its proportions until the plot keeps its least height, the physical size unchanged', () => {
    const base = figureLayout({ width: 160, height: 110, unit: 'mm' });
    // 300 px around the plot at any width: the plot needs 540 px in all
    const fitted = fitLayout(base, () => 300);
    expect(fitted.height).toBeGreaterThanOrEqual(300 + MIN_PLOT_HEIGHT);
    expect(fitted.width / fitted.height).toBeCloseTo(base.width / base.height, 2);
    expect(fitted.mm).toEqual({ width: 160, height: 110 });
    expect(fitted.printedPt!).toBeLessThan(base.printedPt!);
    expect(fitted.width * fitted.pixelRatio).toBeCloseTo((160 / 25.4) * 300, 6);
    // room enough: the same layout
    expect(fitLayout(base, () => 100)).toBe(base);
  });

  it('refuses a typed size out of range, naming it', () => {
    expect(sizeProblem({ width: 10, height: 100, unit: 'mm' })).toBe('The width must be 30 to 600 mm, not 10.');
    expect(sizeProblem({ width: 800, height: Number.NaN, unit: 'px' })).toBe('The height must be a number of px.');
    expect(sizeProblem({ width: 800, height: 600, unit: 'px' })).toBeNull();
  });

  it('saves the SVG at the chosen physical size over its px layout, and names the size in the file', async () => {
    const ctx = await sampleContext(false);
    ctx.exports.figure.preset = 'custom';
    Object.assign(ctx.exports.figure.custom, { width: 160, height: 110, unit: 'mm' });
    await ctx.exports.exportPlotSvg('cl-alpha');
    const file = lastExport(ctx, '.svg');
    expect(file.name).toBe('KM-7-wing-flap-study-invented-demonstration-campaign-cl-alpha-160x110mm.svg');
    const layout = figureLayout({ width: 160, height: 110, unit: 'mm' });
    const m = /^<svg [^>]*width="160mm" height="110mm" viewBox="0 0 (\d+) (\d+)"/.exec(String(file.data))!;
    // five runs' provenance under the legend: the drawing is laid out larger, in the same proportions
    expect(Number(m[1])).toBeGreaterThan(layout.width);
    expect(Number(m[1]) / Number(m[2])).toBeCloseTo(160 / 110, 2);
    expect(ctx.wb.state.banners.at(-1)!.text).toMatch(
      /^Figure Lift curve: drawn at \d+ × \d+ px to leave the plot room beside the provenance of 5 runs; at 160 × 110 mm its small type prints at [\d.]+ pt\.$/,
    );
    // a typed size out of range: nothing saved, the problem said
    ctx.exports.figure.custom.width = 5;
    const before = ctx.host.exported.length;
    await ctx.exports.exportPlotSvg('cl-alpha');
    expect(ctx.host.exported.length).toBe(before);
    expect(ctx.wb.state.banners.at(-1)!.text).toBe('Figure size: The width must be 30 to 600 mm, not 5.');
  });
});

describe("the window's points CSV and the command line's", () => {
  it('carry the same numbers and the same # lines of the run', async () => {
    const ctx = await sampleContext();
    const file = 'run-101-clean.csv';
    const result = ctx.wb.resultOf(file, 'corrected')!;
    const prov = await ctx.wb.provenance([file], 'corrected');
    const record = prov.runs[0]!.record;
    const window = pointsCsvExport(prov, result);
    const cli = pointsCsv(result, record);
    for (const line of pointTableComments(result, record)) {
      expect(window).toContain(`# ${line.split(',')[0]}`);
      expect(cli).toContain(`# ${line.split(',')[0]}`);
    }
    const a = readReport(window);
    const b = Papa.parse<string[]>(cli, { comments: '#', skipEmptyLines: true }).data;
    const cliHeader = b[0]!;
    expect(a.rows).toHaveLength(b.length - 1);
    // the same text for every number, column by column (trade names in the window, contract names on the command line)
    const keyOf = (await import('../../core/formats/reportTable.ts')).REPORT_COLUMNS;
    a.header.forEach((h) => {
      const key = keyOf.find((c) => c.header === h)!.key;
      const j = cliHeader.indexOf(key);
      a.rows.forEach((r, i) => expect(r[h], `${h} row ${i}`).toBe(b[i + 1]![j]));
    });
  });
});
