/**
 * The report exports as a test engineer makes them, in real headless Chromium through the browser
 * host: the differences against the baseline and the full-scale table as CSV (read back by a
 * comment-skipping reader and held against the numbers on screen) and as workbooks, and a figure at a
 * chosen size as SVG (physical size in mm over a px layout) and PNG (300 dpi).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Papa from 'papaparse';
import type { Download, Page } from 'playwright-core';
import readXlsx from 'read-excel-file/node';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ARTIFACTS, browserAvailable, openSession, type Session, waitReady } from './browserSetup.ts';
import { overflowOf, SAMPLE_RUNS, showView } from './screenshots.ts';

async function download(page: Page, click: () => Promise<void>, keepAs: string): Promise<{ d: Download; bytes: Buffer }> {
  const [d] = await Promise.all([page.waitForEvent('download'), click()]);
  const bytes = readFileSync((await d.path())!);
  writeFileSync(join(ARTIFACTS, keepAs), bytes);
  return { d, bytes };
}

function readReport(text: string) {
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

/** Half a unit in the last place written. */
function halfPlace(text: string): number {
  const m = text.replace(/^-/, '');
  return m.includes('.') ? 0.5 * 10 ** -m.split('.')[1]!.length : 0.5;
}

/** Significant digits of a number as written. */
function significant(text: string): number {
  const m = text.replace(/^-/, '').replace(/e.*$/i, '');
  const digits = m.replace('.', '').replace(/^0+/, '');
  return m.includes('.') ? digits.length : digits.replace(/0+$/, '').length || 1;
}

const run = browserAvailable() ? describe : describe.skip;

run('report exports of the comparison, the full-scale estimate and figures at a chosen size', () => {
  let s: Session;
  let page: Page;

  beforeAll(async () => {
    s = await openSession();
    page = s.page;
    await page.setViewportSize({ width: 1024, height: 700 });
    await page.goto(s.server.url);
    for (const f of SAMPLE_RUNS) await waitReady(page, f);
  });

  afterAll(async () => {
    await s?.close();
  });

  it('exports the differences against the baseline as the view shows them, the 2D run named as not compared', async () => {
    await showView(page, 'Against baseline');
    await page.getByLabel('Baseline run', { exact: true }).selectOption('run-101-clean.csv');
    await page.locator('.delta-table tbody tr').first().waitFor();
    expect(await overflowOf(page)).toBe(0);
    await page.screenshot({ path: join(ARTIFACTS, 'exports-baseline-1024x700.png') });
    const { d, bytes } = await download(page, () => page.getByRole('button', { name: 'Differences CSV' }).click(), 'exports-differences.csv');
    expect(d.suggestedFilename()).toBe('KM-7-wing-flap-study-invented-demonstration-campaign-differences-against-101.csv');
    const text = bytes.toString('utf8');
    expect(text).not.toMatch(/^"#/m);
    const { header, units, rows, comments } = readReport(text);
    expect(comments[0]).toBe('# table: differences against the baseline run, delta = run - baseline');
    expect(comments).toContain('# baseline: 101 · clean (run-101-clean.csv)');
    expect(comments).toContain('# basis: free-air corrected (wall corrections applied)');
    expect(comments.some((l) => l.startsWith('# not compared: run-201-section.csv: ') && l.includes('2D section'))).toBe(true);
    expect(header.slice(0, 6)).toEqual(['run', 'configuration', 'matched at', 'alpha', 'CL', 'delta CL']);
    expect(units[header.indexOf('alpha')]).toBe('deg');

    // every matched-alpha row is a row of the table on screen, within the screen's rounding and the file's
    const screen = await page
      .locator('.delta-table tbody tr')
      .evaluateAll((trs) => trs.map((tr) => Array.from(tr.querySelectorAll('td'), (td) => td.textContent!.trim())));
    const atAlpha = rows.filter((r) => r['matched at'] === 'alpha');
    expect(atAlpha).toHaveLength(screen.length);
    atAlpha.forEach((r, i) => {
      const v = screen[i]!;
      expect(v[0]).toBe(r['configuration'] ? `${r['run']} · ${r['configuration']}` : r['run']);
      expect(Math.abs(Number(r['alpha']) - Number(v[1]))).toBeLessThanOrEqual(0.005 + halfPlace(r['alpha']!));
      expect(Math.abs(Number(r['delta CL']) - Number(v[2]))).toBeLessThanOrEqual(0.00005 + halfPlace(r['delta CL']!));
      expect(Math.abs(Number(r['delta CD']) - Number(v[3]))).toBeLessThanOrEqual(0.000005 + halfPlace(r['delta CD']!));
      expect(Math.abs(Number(r['delta Cm']) - Number(v[4]))).toBeLessThanOrEqual(0.00005 + halfPlace(r['delta Cm']!));
    });
    const atLift = rows.filter((r) => r['matched at'] === 'CL');
    expect(atLift.length).toBeGreaterThan(5);
    for (const r of rows) for (const h of header.slice(3)) if (r[h] !== '') expect(significant(r[h]!), `${h}: ${r[h]}`).toBeLessThanOrEqual(7);

    const book = await download(page, () => page.getByRole('button', { name: 'Differences XLSX' }).click(), 'exports-differences.xlsx');
    const sheets = await readXlsx(book.bytes);
    expect(sheets.map((x) => x.sheet)).toEqual(['Differences', 'Fitted characteristics', 'Notes']);
    expect(sheets[0]!.data.length - 2).toBe(rows.length);
  });

  it('exports the full-scale table with its cautions first and the speeds the view shows', async () => {
    await showView(page, 'Full-scale estimate');
    await page.getByLabel('Aircraft mass [kg]').fill('750');
    await page.getByLabel('Wing reference area [m²]').fill('11.2');
    await page.getByLabel('Pressure altitude [m]').fill('1500');
    await page.locator('[data-air="rho"]').waitFor();
    expect(await overflowOf(page)).toBe(0);
    await page.getByRole('button', { name: 'Full-scale CSV' }).scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(ARTIFACTS, 'exports-full-scale-1024x700.png') });
    const { d, bytes } = await download(page, () => page.getByRole('button', { name: 'Full-scale CSV' }).click(), 'exports-full-scale.csv');
    expect(d.suggestedFilename()).toBe('KM-7-wing-flap-study-invented-demonstration-campaign-full-scale-estimate.csv');
    const text = bytes.toString('utf8');
    const { header, units, rows, comments } = readReport(text);
    expect(comments[0]).toBe('# caution: ENGINEERING ESTIMATE FROM MODEL TESTS - NOT FOR OPERATIONAL USE');
    expect(
      comments.some((l) =>
        l.startsWith('# caution: Not for operational use: certified flight-manual data, local regulations and licensed engineering practice govern.'),
      ),
    ).toBe(true);
    expect(comments.some((l) => l.startsWith('# caution: Reynolds-number and scale effects'))).toBe(true);
    expect(units[header.indexOf('V_s')]).toBe('m/s');
    expect(units[header.indexOf('V_s knots')]).toBe('kt');
    const rho = Number(await page.locator('[data-air="rho"]').getAttribute('data-value'));
    for (const r of rows) expect(Math.abs(Number(r['air density']) - rho)).toBeLessThanOrEqual(halfPlace(r['air density']!));
    const screen = await page
      .locator('.fs-table:not(.changes) tbody tr')
      .evaluateAll((trs) =>
        trs.map((tr) => ({ file: tr.getAttribute('data-run'), vs: tr.querySelector('[data-col="v-stall"]')?.getAttribute('data-value') ?? null })),
      );
    expect(rows.map((r) => r['run file'])).toEqual(screen.map((x) => x.file));
    for (const x of screen) {
      const r = rows.find((y) => y['run file'] === x.file)!;
      if (x.vs === null) {
        expect(r['V_s']).toBe('');
        expect(r['note']).not.toBe('');
      } else {
        expect(Math.abs(Number(r['V_s']) - Number(x.vs))).toBeLessThanOrEqual(halfPlace(r['V_s']!));
        expect(r['CLmax from']).toMatch(/^fit of run \S+, free-air corrected, /);
      }
    }
    const book = await download(page, () => page.getByRole('button', { name: 'Full-scale XLSX' }).click(), 'exports-full-scale.xlsx');
    const sheets = await readXlsx(book.bytes);
    expect(sheets[0]!.data[0]![0]).toBe('caution: ENGINEERING ESTIMATE FROM MODEL TESTS - NOT FOR OPERATIONAL USE');
  });

  it('saves a figure at a chosen size: the SVG at its physical size in mm over a px layout, the PNG at 300 dpi', async () => {
    await showView(page, 'Plots');
    await page.getByLabel('Figure size for PNG and SVG').selectOption('text-width');
    expect(await page.locator('[data-figure-size]').textContent()).toMatch(
      /^160 × 110 mm; drawn at \d+ × \d+ px or more, small type prints at [\d.]+ pt or less; PNG at 300 dpi$/,
    );
    expect(await overflowOf(page)).toBe(0);
    const panel = page.locator('[data-plot="cl-alpha"]');
    const svg = await download(page, () => panel.getByRole('button', { name: 'SVG' }).click(), 'exports-figure-160x110mm.svg');
    expect(svg.d.suggestedFilename()).toBe('KM-7-wing-flap-study-invented-demonstration-campaign-cl-alpha-160x110mm.svg');
    const text = svg.bytes.toString('utf8');
    const m = /^<svg [^>]*width="160mm" height="110mm" viewBox="0 0 (\d+) (\d+)"/.exec(text);
    expect(m).not.toBeNull();
    expect(Number(m![1]) / Number(m![2])).toBeCloseTo(160 / 110, 2);
    expect(text).toContain('<g class="provenance" font-size="12"');
    // the figure opened as an image at its own size: Chromium lays it out at 160 mm = 604.7 CSS px
    const shown = await page.evaluate(async (src) => {
      const img = new Image();
      img.src = `data:image/svg+xml;base64,${btoa(unescape(encodeURIComponent(src)))}`;
      await img.decode();
      return { w: img.naturalWidth, h: img.naturalHeight };
    }, text);
    expect(shown.w).toBeCloseTo((160 * 96) / 25.4, 0);
    expect(shown.h).toBeCloseTo((110 * 96) / 25.4, 0);

    const png = await download(page, () => panel.getByRole('button', { name: 'PNG' }).click(), 'exports-figure-160x110mm.png');
    expect(png.d.suggestedFilename()).toBe('KM-7-wing-flap-study-invented-demonstration-campaign-cl-alpha-160x110mm.png');
    // 160 mm at 300 dpi is 1890 pixels across (PNG header: width and height at bytes 16 and 20)
    expect(Math.abs(png.bytes.readUInt32BE(16) - (160 / 25.4) * 300)).toBeLessThanOrEqual(1);
    expect(Math.abs(png.bytes.readUInt32BE(20) - (110 / 25.4) * 300)).toBeLessThanOrEqual(1);

    // a size typed in px, and one out of range refused with its reason
    await page.getByLabel('Figure size for PNG and SVG').selectOption('custom');
    await page.getByLabel('Figure size unit').selectOption('px');
    await page.getByLabel('Figure width').fill('900');
    await page.getByLabel('Figure height').fill('600');
    const typed = await download(page, () => panel.getByRole('button', { name: 'SVG' }).click(), 'exports-figure-900x600px.svg');
    expect(typed.bytes.toString('utf8')).toMatch(/^<svg [^>]*width="900" height="600" viewBox="0 0 900 600"/);
    await page.getByLabel('Figure width').fill('20');
    expect(await page.locator('.figure-size [role="alert"]').textContent()).toBe('The width must be 300 to 6000 px, not 20.');
    await page.getByLabel('Figure size for PNG and SVG').selectOption('screen');
    await page.screenshot({ path: join(ARTIFACTS, 'exports-plots-1024x700.png') });
  });
});
