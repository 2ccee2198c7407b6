/**
 * The built browser host in real headless Chromium: the sample campaign, import with column
 * assignment, overlays, corrected/as-measured, exports read back and checked against the command line,
 * clipboard, PNG, printed summary, setup validation, campaign problems, and a 1,000,000-row file.
 * Screenshots of the main views go to test-artifacts/.
 */
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Papa from 'papaparse';
import readXlsx from 'read-excel-file/node';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseCampaign } from '../../core/formats/campaign.ts';
import { reduceRun, readSetup, POINT_COLUMNS } from '../../core/reduction/engine.ts';
import type { ReductionResult } from '../../core/reduction/pipeline.ts';
import { readRunText } from '../../core/formats/runFile.ts';
import { REPORT_COLUMNS } from '../../core/formats/reportTable.ts';
import { ARTIFACTS, browserAvailable, openSession, ROOT, type Session, waitReady } from './browserSetup.ts';

const SAMPLES = join(ROOT, 'sample-runs');
const RUN_101 = join(SAMPLES, 'run-101-clean.csv');

/** The command line's reduction of a sample run (docs/data-format.md §8), the reference for the exports. */
function cli(args: string[]): string {
  return execFileSync(process.execPath, [join(ROOT, 'bin/sweepbook.js'), 'reduce', ...args], { cwd: ROOT, encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] });
}

function sha256Of(path: string): string {
  return createHash('sha256').update(readFileSync(path)).digest('hex');
}

/** Equal to the last bits: the browser's V8 and Node's may round a transcendental function differently. */
function expectSame(actual: unknown, expected: unknown, where: string) {
  if (typeof expected === 'number' && typeof actual === 'number') {
    expect(Math.abs(actual - expected), `${where}: ${actual} vs ${expected}`).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(expected)));
  } else {
    expect(actual, where).toEqual(expected);
  }
}

async function runStatus(page: Page, file: string): Promise<string | null> {
  return page.locator(`tbody[data-run="${file}"]`).getAttribute('data-status');
}


/** Pixels of a canvas that are drawn (not transparent and not white), and how many are near a colour. */
async function canvasInk(page: Page, selector: string, colour?: string): Promise<{ drawn: number; near: number }> {
  return page.locator(selector).evaluate((canvas: HTMLCanvasElement, hex: string | undefined) => {
    const ctx = canvas.getContext('2d')!;
    const { data } = ctx.getImageData(0, 0, canvas.width, canvas.height);
    const target = hex ? [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16)) : null;
    let drawn = 0;
    let near = 0;
    for (let i = 0; i < data.length; i += 4) {
      const [r, g, b, a] = [data[i]!, data[i + 1]!, data[i + 2]!, data[i + 3]!];
      if (a > 0 && !(r > 245 && g > 245 && b > 245)) drawn++;
      if (target && a > 200 && Math.abs(r - target[0]!) < 24 && Math.abs(g - target[1]!) < 24 && Math.abs(b - target[2]!) < 24) near++;
    }
    return { drawn, near };
  }, colour);
}

async function download(page: Page, click: () => Promise<void>, name: string): Promise<string> {
  const [d] = await Promise.all([page.waitForEvent('download'), click()]);
  const path = join(ARTIFACTS, name);
  await d.saveAs(path);
  return path;
}

async function shot(page: Page, name: string) {
  await page.screenshot({ path: join(ARTIFACTS, `${name}.png`) });
}

const run = browserAvailable() ? describe : describe.skip;

run('Sweepbook in a real browser (browser host)', () => {
  let s: Session;
  let page: Page;
  let work: string;
  let cliJson: ReductionResult;
  let cliMeasured: ReductionResult;

  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'sweepbook-e2e-files-'));
    const base = [RUN_101, '--setup', join(SAMPLES, 'setup-3d.json'), '--tare', join(SAMPLES, 'windoff-tare.csv')];
    cliJson = JSON.parse(cli([...base, '--format', 'json'])) as ReductionResult;
    cliMeasured = JSON.parse(cli([...base, '--format', 'json', '--no-corrections'])) as ReductionResult;
    s = await openSession();
    page = s.page;
    await page.goto(s.server.url);
  });

  afterAll(async () => {
    await s?.close();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('opens the bundled sample campaign on first start and draws the polars', async () => {
    for (const f of ['run-101-clean.csv', 'run-102-flap10.csv', 'run-103-flap20.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv']) await waitReady(page, f);
    const polar = await canvasInk(page, '[data-plot="cd-cl"] canvas');
    expect(polar.drawn).toBeGreaterThan(2000);
    for (const id of ['cl-alpha', 'cm-alpha', 'ld-alpha']) expect((await canvasInk(page, `[data-plot="${id}"] canvas`)).drawn).toBeGreaterThan(2000);
    // axes titled with units, on the canvas: read back through the chart's own configuration
    // the label follows the chart's coalesced redraw (at most every 250 ms): wait for it
    await expect.poll(() => page.locator('[data-plot="cl-alpha"] canvas').getAttribute('aria-label')).toContain('101 · clean');
    await expect.poll(() => page.locator('.runs-table tbody').count()).toBe(5);
    await shot(page, 'plots-sample-campaign');
  });

  it('imports a run through the file input and assigns its columns', async () => {
    // run 103 with a header the contract does not know: "aoa" and "pitot dp", and the pressure in mbar
    const text = readFileSync(join(SAMPLES, 'run-103-flap20.csv'), 'utf8')
      .replace('# run: 103', '# run: 303')
      .replace('# configuration: flap 20', '# configuration: flap 20 repeat')
      .replace('alpha [deg],dp_pitot [Pa]', 'aoa [deg],pitot dp [Pa]');
    const file = join(work, 'run-303-flap20-repeat.csv');
    writeFileSync(file, text);
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Import runs…' }).click()]);
    expect(chooser.isMultiple()).toBe(true);
    await chooser.setFiles(file);
    await page.locator('tbody[data-run="run-303-flap20-repeat.csv"][data-status="needs-mapping"]').waitFor();
    await expect.poll(() => page.locator('tbody[data-run="run-303-flap20-repeat.csv"] .run-error').first().textContent()).toMatch(/run-303-flap20-repeat\.csv:\d+: missing required column "alpha"/);
    await page.locator('tbody[data-run="run-303-flap20-repeat.csv"]').getByRole('button', { name: 'Assign columns…' }).click();
    const dialog = page.locator('dialog.mapping-dialog');
    await dialog.waitFor();
    expect(await dialog.getByLabel('What column aoa holds').inputValue()).toBe('alpha');
    expect(await dialog.getByLabel('What column pitot dp holds').inputValue()).toBe('dp_pitot');
    await shot(page, 'import-column-assignment');
    await dialog.getByRole('button', { name: 'Read the file with these columns' }).click();
    await waitReady(page, 'run-303-flap20-repeat.csv');

    // the same file, mapping and setup through core directly
    const campaign = parseCampaign('c', readFileSync(join(SAMPLES, 'sweepbook-campaign.json'), 'utf8'));
    const setup = readSetup('s', JSON.stringify(campaign.setups['KM-7 wing']));
    if (!setup.ok) throw new Error('sample setup invalid');
    const data = readRunText('run-303-flap20-repeat.csv', text, { mapping: { names: { aoa: 'alpha', 'pitot dp': 'dp_pitot' } } });
    const expected = reduceRun({ run: data, setup: setup.value });
    if (!expected.ok) throw new Error('core could not reduce the mapped file');
    const meanQ = expected.value.points.reduce((a, p) => a + p.q_pa!, 0) / expected.value.points.length;
    const row = page.locator('tbody[data-run="run-303-flap20-repeat.csv"] .run-row td.num').first();
    expect(await row.textContent()).toBe(meanQ.toFixed(1));
  });

  it('takes run files dropped onto the window', async () => {
    const text = readFileSync(join(SAMPLES, 'run-102-flap10.csv'), 'utf8').replace('# run: 102', '# run: 402');
    await page.evaluate((csv) => {
      const dt = new DataTransfer();
      dt.items.add(new File([csv], 'run-402-dropped.csv', { type: 'text/csv' }));
      for (const type of ['dragenter', 'dragover', 'drop']) window.dispatchEvent(new DragEvent(type, { dataTransfer: dt, bubbles: true, cancelable: true }));
    }, text);
    await waitReady(page, 'run-402-dropped.csv');
    expect(await page.locator('tbody[data-run="run-402-dropped.csv"] .name').textContent()).toBe('402');
    expect(await page.locator('tbody[data-run="run-402-dropped.csv"] .config').textContent()).toBe('flap 10');
  });

  it('overlays two configurations and switches between corrected and as measured', async () => {
    for (const f of ['run-102-flap10.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv', 'run-303-flap20-repeat.csv', 'run-402-dropped.csv']) {
      await page.locator(`tbody[data-run="${f}"] input[type="checkbox"]`).uncheck();
    }
    const panel = page.locator('[data-plot="cl-alpha"]');
    await expect.poll(() => panel.getAttribute('data-series')).toBe('101 · clean | 103 · flap 20');
    // both runs' colours (Okabe–Ito blue and bluish green) are on the canvas
    expect((await canvasInk(page, '[data-plot="cl-alpha"] canvas', '#0072B2')).near).toBeGreaterThan(50);
    expect((await canvasInk(page, '[data-plot="cl-alpha"] canvas', '#009E73')).near).toBeGreaterThan(50);
    await shot(page, 'plots-two-configurations');

    const before = await panel.locator('canvas').evaluate((c: HTMLCanvasElement) => c.toDataURL());
    await page.getByRole('tab', { name: 'Characteristics' }).click();
    const slope = page.locator('tr[data-fit="cl_alpha_per_deg"] td.num').first();
    expect(await slope.textContent()).toContain(cliJson.fit.cl_alpha_per_deg!.toFixed(5));
    await page.getByLabel('As measured').check();
    expect(await slope.textContent()).toContain(cliMeasured.fit.cl_alpha_per_deg!.toFixed(5));
    expect(cliMeasured.fit.cl_alpha_per_deg!.toFixed(5)).not.toBe(cliJson.fit.cl_alpha_per_deg!.toFixed(5));
    await shot(page, 'characteristics-as-measured');
    await page.getByRole('tab', { name: 'Plots' }).click();
    const after = await page.locator('[data-plot="cl-alpha"] canvas').evaluate((c: HTMLCanvasElement) => c.toDataURL());
    expect(after).not.toBe(before);
    await page.getByLabel('Free-air corrected').check();
  });

  it('reads out the nearest point on hover, zooms with a dragged box and resets', async () => {
    const surface = page.locator('[data-plot="cl-alpha"] .plot-surface');
    const box = (await surface.boundingBox())!;
    const image = () => page.locator('[data-plot="cl-alpha"] canvas').evaluate((c: HTMLCanvasElement) => c.toDataURL());
    await page.mouse.move(box.x + 5, box.y + 5);
    const plain = await image();
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.5);
    await expect.poll(image).not.toBe(plain);
    await shot(page, 'plot-hover-read-out');
    await page.mouse.move(box.x + box.width * 0.3, box.y + box.height * 0.3);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.6, box.y + box.height * 0.6, { steps: 5 });
    await page.mouse.up();
    await expect.poll(() => page.locator('[data-plot="cl-alpha"]').getAttribute('data-zoomed')).toBe('yes');
    await page.locator('[data-plot="cl-alpha"]').getByRole('button', { name: 'Reset zoom' }).click();
    expect(await page.locator('[data-plot="cl-alpha"]').getAttribute('data-zoomed')).toBe('no');
  });

  it('exports the point table as a report CSV: the command line\'s values rounded, trade names, units row, raw # lines', async () => {
    await page.locator('tbody[data-run="run-101-clean.csv"] .run-row .run-name').click();
    const path = await download(page, () => page.getByRole('button', { name: 'Points CSV' }).click(), 'export-101-points.csv');
    const text = readFileSync(path, 'utf8');
    // provenance: tool version, the run file's SHA-256, the setup, corrections and the time of reduction
    const sha = sha256Of(RUN_101);
    expect(text).toContain(`# run: run-101-clean.csv sha256 ${sha}`);
    expect(text).toMatch(/# tool: sweepbook \d+\.\d+\.\d+/);
    expect(text).toMatch(/# reduced_at: \d{4}-\d\d-\d\dT/);
    expect(text).toContain('# corrections: {"enabled":true,"kind":"3d","wake":"classic","method":"3d-classic","fallback":null}');
    expect(text).toContain('# tare: windoff-tare.csv sha256 ');
    expect(text).not.toMatch(/^"#/m);
    const parsed = Papa.parse<string[]>(text, { comments: '#', skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    const [header, units, ...rows] = parsed.data;
    expect(header!.slice(0, 6)).toEqual(['point', 'samples', 'alpha', 'CL', 'CD', 'Cm']);
    expect(units![2]).toBe('deg');
    expect(rows.length).toBe(cliJson.points.length);
    const cols = header!.map((h) => REPORT_COLUMNS.find((c) => c.header === h)!);
    const keys = cols.map((c) => c.key);
    rows.forEach((r, i) => r.forEach((cell, j) => {
      const ref = cliJson.points[i]![keys[j]!];
      if (typeof ref === 'string' || ref === null || ref === undefined) return expect(cell, `${header![j]} row ${i}`).toBe(ref ?? '');
      // rounded to the digits written: within half a unit in the last place
      const decimals = cell.includes('.') ? cell.split('.')[1]!.replace(/e.*$/, '').length : 0;
      const scale = cell.includes('e') ? 10 ** Number(cell.split('e')[1]) : 1;
      const d = cols[j]!.decimals;
      // sig:N columns: half a unit in the N-th significant digit
      const relative = typeof d === 'string' ? 0.5 * 10 ** (1 - Number(d.slice(4))) * Math.abs(ref) : 0;
      expect(Math.abs(Number(cell) - ref), `${header![j]} row ${i}: ${cell} vs ${ref}`).toBeLessThanOrEqual(Math.max(relative, 0.5 * 10 ** -decimals * scale) * (1 + 1e-9) + Math.abs(ref) * 1e-12);
    }));
  });

  it('exports a workbook whose points and fits equal the command line', async () => {
    const path = await download(page, () => page.getByRole('button', { name: 'Workbook XLSX' }).click(), 'export-runs.xlsx');
    const sheets = await readXlsx(readFileSync(path));
    const names = sheets.map((x) => x.sheet);
    expect(names).toEqual(['Fit summary', 'Points 101', 'Points 103', 'Provenance']);
    const points = sheets.find((x) => x.sheet === 'Points 101')!.data;
    // trade names and a units row above full-precision numbers
    const keys = (points[0] as string[]).map((h) => REPORT_COLUMNS.find((c) => c.header === h)!.key);
    expect(keys.every((k) => (POINT_COLUMNS as readonly string[]).includes(k))).toBe(true);
    expect(points[1]![keys.indexOf('alpha_deg')]).toBe('deg');
    expect(points.length - 2).toBe(cliJson.points.length);
    cliJson.points.forEach((p, i) => keys.forEach((k, j) => {
      const v = points[i + 2]![j] ?? null;
      const ref = p[k] ?? null;
      expectSame(typeof ref === 'string' && typeof v === 'number' ? String(v) : v, ref, `${k} point ${i}`);
    }));
    const fits = sheets.find((x) => x.sheet === 'Fit summary')!.data;
    const header = fits[0] as string[];
    const corrected = fits.find((r) => r[0] === '101' && r[3] === 'corrected')!;
    const measured = fits.find((r) => r[0] === '101' && r[3] === 'as measured')!;
    for (const key of ['cl_alpha_per_deg', 'alpha_zero_lift_deg', 'cl_max', 'cd0', 'k_induced', 'oswald_e', 'ld_max', 'cm_alpha_per_deg'] as const) {
      expectSame(corrected[header.indexOf(key)], cliJson.fit[key], `fit ${key}`);
      expectSame(measured[header.indexOf(key)], cliMeasured.fit[key], `fit ${key} as measured`);
    }
    const prov = sheets.find((x) => x.sheet === 'Provenance')!.data.flat().join('\n');
    expect(prov).toContain('run 101 run: run-101-clean.csv sha256');
    expect(prov).toContain('Caution');
  });

  it('copies selected rows of the point table as tab-separated text', async () => {
    await page.getByRole('tab', { name: 'Run detail' }).click();
    const rows = page.locator('.point-table tbody tr');
    await rows.nth(2).click();
    await rows.nth(4).click({ modifiers: ['Shift'] });
    await page.getByRole('button', { name: 'Copy as tab-separated text' }).click();
    await page.getByText('Copied to the clipboard.').waitFor();
    const text = await page.evaluate(() => navigator.clipboard.readText());
    const [prov, ...table] = text.trimEnd().split('\n');
    expect(prov).toMatch(/^# Sweepbook \d+\.\d+\.\d+ · exported \d{4}-/);
    expect(prov!.endsWith(`run-101-clean.csv (sha256 ${sha256Of(RUN_101).slice(0, 12)}…)`)).toBe(true);
    const lines = table.map((l) => l.split('\t'));
    expect(lines.length).toBe(4);
    expect(lines[0]![2]).toBe('α [deg]');
    expectSame(Number(lines[1]![3]), cliJson.points[2]!.cl, 'CL of the third point');
    await shot(page, 'run-detail');
  });

  it('saves a plot as PNG with its provenance drawn under it', async () => {
    await page.getByRole('tab', { name: 'Plots' }).click();
    const path = await download(page, () => page.locator('[data-plot="cd-cl"]').getByRole('button', { name: 'PNG' }).click(), 'export-drag-polar.png');
    const png = readFileSync(path);
    expect(png.subarray(1, 4).toString('latin1')).toBe('PNG');
    expect([png.readUInt32BE(16), png.readUInt32BE(20)]).toEqual([1400, 900]);
  });

  it('prints a one-page run summary', async () => {
    await page.getByRole('tab', { name: 'Run detail' }).click();
    await page.evaluate(() => {
      // the browser's print dialog would wait for a person; the page is printed to PDF below instead
      window.print = () => undefined;
    });
    await page.getByRole('button', { name: 'Print run summary' }).click();
    await page.locator('.print-summary img').first().waitFor({ state: 'attached' });
    await page.emulateMedia({ media: 'print' });
    await page.setViewportSize({ width: 794, height: 1123 }); // A4 at 96 dpi, for the screenshot
    try {
      await shot(page, 'print-summary');
      expect(await page.locator('.print-summary h1').textContent()).toContain('Run 101');
      const pdf = await page.pdf({ format: 'A4' });
      const pages = pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? [];
      expect(pages.length).toBe(1);
    } finally {
      await page.emulateMedia({ media: 'screen' });
      await page.setViewportSize({ width: 1440, height: 900 });
    }
  });

  it('validates the setup as it is typed, naming the field', async () => {
    await page.getByRole('tab', { name: 'Setup' }).click();
    const chord = page.getByLabel('Reference chord c [m]');
    await chord.fill('0.2x');
    await expect.poll(() => page.locator('#setup-model-chord_m-msg .field-error').textContent()).toContain('reference chord, m');
    expect(await chord.getAttribute('aria-invalid')).toBe('true');
    expect(await page.getByRole('button', { name: /^Apply to/ }).isDisabled()).toBe(true);
    await shot(page, 'setup-editor-invalid');
    await chord.fill('0.225');
    await expect.poll(() => page.locator('#setup-model-chord_m-msg .field-error').count()).toBe(0);
  });

  it('shows the differences against a baseline run', async () => {
    await page.getByRole('tab', { name: 'Against baseline' }).click();
    await page.getByLabel('Baseline run').selectOption('run-101-clean.csv');
    await expect.poll(() => page.locator('[data-plot="delta-cl"]').getAttribute('data-series')).toBe('103 · flap 20');
    expect((await canvasInk(page, '[data-plot="delta-cl"] canvas')).drawn).toBeGreaterThan(1000);
    await shot(page, 'against-baseline');
    await page.getByRole('tab', { name: 'Sample scatter' }).click();
    await page.locator('[data-plot="samples-channel"] canvas').waitFor();
    await shot(page, 'sample-scatter');
  });

  it('reports a missing and a changed run file by name when a campaign is opened, and drops neither', async () => {
    const campaign = JSON.parse(readFileSync(join(SAMPLES, 'sweepbook-campaign.json'), 'utf8')) as { runs: { file: string; sha256: string }[] };
    campaign.runs[1]!.sha256 = '0'.repeat(64); // run-102 "changed"
    const cfile = join(work, 'flap-study.json');
    writeFileSync(cfile, JSON.stringify(campaign, null, 2));
    const chosen = [cfile, 'run-101-clean.csv', 'run-102-flap10.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv', 'windoff-tare.csv'].map((f, i) => (i === 0 ? f : join(SAMPLES, f)));
    page.once('dialog', (d) => void d.accept()); // "discard unsaved changes?"
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open…' }).click()]);
    await chooser.setFiles(chosen);
    await page.locator('tbody[data-run="run-103-flap20.csv"][data-status="missing"]').waitFor();
    // the hashes are checked as each run is read (a campaign of many runs is listed first)
    await waitReady(page, 'run-102-flap10.csv');
    const banners = await page.locator('.banner').allTextContents();
    expect(banners.join('\n')).toContain('Not found beside the campaign: run-103-flap20.csv');
    expect(banners.join('\n')).toMatch(/run-102-flap10\.csv: the file has changed since the campaign was saved/);
    await waitReady(page, 'run-102-flap10.csv');
    await shot(page, 'campaign-missing-and-changed');
    const saved = await download(page, () => page.getByRole('button', { name: 'Save', exact: true }).click(), 'saved-campaign.json');
    const back = JSON.parse(readFileSync(saved, 'utf8')) as { runs: { file: string; sha256: string }[] };
    expect(back.runs.map((r) => r.file)).toEqual(campaign.runs.map((r) => r.file));
    expect(back.runs[1]!.sha256).toBe('0'.repeat(64)); // not silently accepted
  });

  it('stays responsive while a 1,000,000-row file is read in the worker', async () => {
    const file = join(work, 'run-900-long.csv');
    const lines = ['# run: 900', '# configuration: long time history', 'point,alpha [deg],dp_pitot [Pa],p_static [Pa],t_total [degC],rh [%],lift [N],drag [N],pitch [N m]'];
    const perPoint = 50_000;
    for (let i = 0; i < 1_000_000; i++) {
      const pt = Math.floor(i / perPoint);
      const a = -4 + pt * 0.8;
      const n = ((i * 7919) % 1000) / 1000 - 0.5; // deterministic sample noise
      lines.push(`${pt + 1},${(a + n * 0.01).toFixed(3)},${(610 + n).toFixed(2)},99180.0,18.6,52.0,${(8.2 * (a + 2.1) + n).toFixed(3)},${(1.6 + 0.004 * a * a + n * 0.01).toFixed(4)},${(-1.6 - 0.02 * a).toFixed(4)}`);
    }
    writeFileSync(file, lines.join('\n') + '\n');
    // the browser's own measure of a blocked main thread: long tasks (> 50 ms, W3C Long Tasks API),
    // and a heartbeat beside it: the longest gap between timer ticks while the file is read
    await page.evaluate(() => {
      const w = window as unknown as { __gap: number; __beat: number; __longest: number; __longObs: PerformanceObserver };
      w.__gap = 0;
      w.__longest = 0;
      w.__longObs = new PerformanceObserver((list) => {
        for (const e of list.getEntries()) w.__longest = Math.max(w.__longest, e.duration);
      });
      w.__longObs.observe({ type: 'longtask' });
      let last = performance.now();
      w.__beat = window.setInterval(() => {
        const now = performance.now();
        w.__gap = Math.max(w.__gap, now - last);
        last = now;
      }, 20);
    });
    const started = Date.now();
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Import runs…' }).click()]);
    await chooser.setFiles(file);
    await page.locator('tbody[data-run="run-900-long.csv"] progress').waitFor({ timeout: 20_000 });
    await waitReady(page, 'run-900-long.csv', 90_000);
    const seconds = (Date.now() - started) / 1000;
    const { gap, longest } = await page.evaluate(() => {
      const w = window as unknown as { __gap: number; __beat: number; __longest: number; __longObs: PerformanceObserver };
      clearInterval(w.__beat);
      w.__longObs.disconnect();
      return { gap: w.__gap, longest: w.__longest };
    });
    console.info(`1,000,000 rows read and reduced in ${seconds.toFixed(1)} s; longest main-thread task ${longest.toFixed(0)} ms; longest pause of the page's timer ${gap.toFixed(0)} ms`);
    // The speed targets (docs/performance.md: no main-thread block over 100 ms, first plot within 3 s) are measured by
    // `npm run bench`, not here. This test holds only what load cannot excuse: the page never freezes while the worker reads.
    expect(longest).toBeLessThan(1000);
    await shot(page, 'large-file-reduced');
    expect(await runStatus(page, 'run-900-long.csv')).toBe('ready');
  }, 120_000);

  it('raised no console error and no Content-Security-Policy violation', () => {
    expect(s.problems).toEqual([]);
  });
});
