/**
 * The window as a test engineer meets it on a laptop, in real headless Chromium through the browser
 * host: nothing wider than a 1024×700 window on any tab, the working campaign and the recent list kept
 * across a reload and a restart of the server (and unreadable without the server's key), and two runs
 * of one configuration drawn so that neither hides the other.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { request } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startStaticServer } from '../../app/serve/static.ts';
import { STORAGE_KEY_PATH } from '../../app/serve/storageKey.ts';
import { ARTIFACTS, browserAvailable, openSession, ROOT, type Session, waitReady } from './browserSetup.ts';
import { overflowOf, SAMPLE_RUNS, showView, VIEWS } from './screenshots.ts';

const SAMPLES = join(ROOT, 'sample-runs');

async function waitKept(page: Page) {
  await page.locator('html[data-kept="kept"]').waitFor({ timeout: 15_000 });
}

function get(url: string, headers: Record<string, string>): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    request(url, { headers }, (res) => {
      let body = '';
      res.on('data', (c: Buffer) => (body += c.toString()));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
    })
      .on('error', reject)
      .end();
  });
}

const run = browserAvailable() ? describe : describe.skip;

run('the window on a laptop screen, kept across reloads', () => {
  let s: Session;
  let page: Page;
  let work: string;

  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'sweepbook-e2e-window-'));
    s = await openSession();
    page = s.page;
    await page.setViewportSize({ width: 1024, height: 700 });
    await page.goto(s.server.url);
    for (const f of SAMPLE_RUNS) await waitReady(page, f);
  });

  afterAll(async () => {
    await s?.close();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('fits 1024×700 on every tab: no sideways scrolling, every tab on screen', async () => {
    for (const v of VIEWS) {
      await showView(page, v.tab);
      expect(await overflowOf(page), `${v.tab} is wider than the window`).toBe(0);
      const tabs = await page.getByRole('tab').evaluateAll((els) => els.map((e) => e.getBoundingClientRect().right));
      for (const right of tabs) expect(right).toBeLessThanOrEqual(1024);
    }
    await page.screenshot({ path: join(ARTIFACTS, 'window-1024x700-setup.png') });
    await showView(page, 'Plots');
  });

  it('shows the corrected / as-measured switch only on the views it changes', async () => {
    const expectations: Record<string, boolean> = {
      Plots: true,
      'Against baseline': true,
      Characteristics: true,
      'Run detail': false,
      'Sample scatter': false,
      Setup: false,
    };
    for (const [tab, shown] of Object.entries(expectations)) {
      await showView(page, tab);
      expect(await page.getByRole('radiogroup', { name: 'Values shown' }).count(), tab).toBe(shown ? 1 : 0);
    }
    await showView(page, 'Plots');
    // nothing carries uncertainties in the sample: the error-bar box is disabled and not ticked
    const box = page.getByLabel('Error bars');
    expect(await box.isDisabled()).toBe(true);
    expect(await box.isChecked()).toBe(false);
  });

  it('draws two runs of one configuration distinguishably: own colour, same marker, the repeat open and dashed', async () => {
    const swatch = (file: string) => page.locator(`tbody[data-run="${file}"] svg.swatch`);
    const attrs = async (file: string) => {
      const el = swatch(file);
      return {
        colour: await el.getAttribute('data-colour'),
        marker: await el.getAttribute('data-marker'),
        dash: await el.getAttribute('data-dash'),
        filled: await el.getAttribute('data-filled'),
      };
    };
    const first = await attrs('run-101-clean.csv');
    const repeat = await attrs('run-104-clean-timehistory.csv');
    expect(repeat.marker).toBe(first.marker);
    expect(repeat.colour).not.toBe(first.colour);
    expect(first).toMatchObject({ dash: 'solid', filled: 'filled' });
    expect(repeat.dash).not.toBe('solid');
    expect(repeat.filled).toBe('open');
    // every shown run has its own colour
    const colours = await page.locator('.runs-table svg.swatch').evaluateAll((els) => els.map((e) => e.getAttribute('data-colour')));
    expect(new Set(colours).size).toBe(colours.length);
  });

  it('imports a run whose header gives units in parentheses: every unit stated, channels in trade words, setup and tare chosen explicitly', async () => {
    const text = readFileSync(join(SAMPLES, 'run-101-clean.csv'), 'utf8')
      .replace('# run: 101', '# run: 106')
      .replace('alpha [deg],dp_pitot [Pa]', 'AoA (deg),Pitot dp (Pa)');
    const file = join(work, 'run-106-clean.csv');
    writeFileSync(file, text);
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Import runs…' }).click()]);
    await chooser.setFiles(file);
    const row = page.locator('tbody[data-run="run-106-clean.csv"]');
    await page.locator('tbody[data-run="run-106-clean.csv"][data-status="needs-mapping"]').waitFor();
    await row.getByRole('button', { name: 'Assign columns…' }).click();
    const dialog = page.locator('dialog.mapping-dialog');
    await dialog.waitFor();
    expect(await dialog.getByLabel('What column AoA holds').inputValue()).toBe('alpha');
    expect(await dialog.getByLabel('Unit of column AoA').inputValue()).toBe('deg');
    expect(await dialog.locator('tr[data-column="AoA"] .unit-source').textContent()).toBe('header: deg');
    expect(await dialog.locator('tr[data-column="lift"] .unit-source').textContent()).toBe('header: N');
    const labels = await dialog.getByLabel('What column AoA holds').locator('option').allTextContents();
    expect(labels).toContain('angle of attack α');
    expect(labels.some((l) => /default|_/.test(l))).toBe(false);
    expect(await dialog.textContent()).not.toContain('contract default');
    await page.screenshot({ path: join(ARTIFACTS, 'window-column-step-1024x700.png') });
    await dialog.getByRole('button', { name: 'Read the file with these columns' }).click();
    await waitReady(page, 'run-106-clean.csv');

    // the run waits for its setup and tare, proposed from the runs of the same model and configuration
    const strip = page.getByRole('region', { name: 'Setup and tare of imported runs' });
    await strip.waitFor();
    expect(await row.locator('.tag', { hasText: 'setup to confirm' }).count()).toBe(1);
    expect(await strip.getByLabel('Setup for 106').inputValue()).toBe('KM-7 wing');
    expect(await strip.getByLabel('Tare for 106').inputValue()).toBe('windoff-tare.csv');
    expect(await strip.locator('tr[data-import="run-106-clean.csv"]').textContent()).toContain('same model and configuration');
    expect(await overflowOf(page)).toBe(0);
    await page.screenshot({ path: join(ARTIFACTS, 'window-import-choice-1024x700.png') });
    await strip.getByRole('button', { name: 'Use these' }).click();
    await expect.poll(() => strip.count()).toBe(0);
    await waitReady(page, 'run-106-clean.csv');
    expect(await row.locator('.tag', { hasText: 'no tare' }).count()).toBe(0);
    expect(await row.locator('.tag', { hasText: 'setup to confirm' }).count()).toBe(0);
    // the run without a tare says so
    expect(await page.locator('tbody[data-run="run-201-section.csv"] .tag', { hasText: 'no tare' }).count()).toBe(1);
  });

  it('compares drag at constant lift beside matched α, and refuses a 2D section against a 3D baseline with the reason', async () => {
    await showView(page, 'Against baseline');
    await page.getByLabel('Baseline run').selectOption('run-101-clean.csv');
    const refused = page.locator('[data-refused="run-201-section.csv"]');
    await refused.waitFor();
    expect(await refused.textContent()).toMatch(/201 is a 2D section and the baseline 101 a 3D model/);
    const panel = page.locator('[data-plot="delta-cd-at-cl"]');
    expect(await panel.getAttribute('data-series')).toContain('102 · flap 10');
    expect(await panel.getAttribute('data-series')).not.toContain('201');
    expect(await overflowOf(page)).toBe(0);
    await page.screenshot({ path: join(ARTIFACTS, 'window-baseline-1024x700.png') });
    await showView(page, 'Plots');
    expect(await page.locator('.mixed-kinds').textContent()).toMatch(/201 is a 2D section/);
  });

  it('writes the points CSV a comment-skipping reader reads: raw # lines, header, units row, at most 7 significant digits', async () => {
    await page.locator('tbody[data-run="run-101-clean.csv"] .run-row .run-name').click();
    const [d] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Points CSV' }).click()]);
    expect(d.suggestedFilename()).toBe('101-points.csv');
    const text = readFileSync((await d.path())!, 'utf8');
    expect(text).not.toMatch(/^"#/m);
    const Papa = (await import('papaparse')).default;
    const parsed = Papa.parse<string[]>(text, { comments: '#', skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    const [header, units, ...rows] = parsed.data;
    expect(header!.slice(0, 4)).toEqual(['point', 'samples', 'alpha', 'CL']);
    expect(units!.slice(0, 3)).toEqual(['-', '-', 'deg']);
    for (const r of rows) {
      for (const cell of r.slice(1)) {
        if (cell === '') continue;
        const digits = cell.replace(/^-/, '').replace(/e.*$/i, '').replace('.', '').replace(/^0+/, '');
        expect(digits.length, cell).toBeLessThanOrEqual(7);
      }
    }
  });

  it('takes axis ranges typed in, refuses ends the wrong way round, and keeps ticks on round values', async () => {
    const panel = page.locator('[data-plot="cl-alpha"]');
    await panel.getByRole('button', { name: 'Ranges…' }).click();
    const form = panel.getByRole('form', { name: /Axis ranges/ });
    await form.getByLabel('α from').fill('4');
    await form.getByLabel('α to').fill('2');
    await form.getByRole('button', { name: 'Apply' }).click();
    expect(await form.getByRole('alert').textContent()).toMatch(/lower end \(4\) must be below the upper end \(2\)/);
    await form.getByLabel('α from').fill('-2.5');
    await form.getByLabel('α to').fill('12.5');
    await form.getByLabel('CL from').fill('0');
    await form.getByLabel('CL to').fill('1.2');
    await form.getByRole('button', { name: 'Apply' }).click();
    await expect.poll(() => panel.getAttribute('data-zoomed')).toBe('yes');
    expect(await overflowOf(page)).toBe(0);
    await panel.getByRole('button', { name: 'Reset zoom' }).click();
    await expect.poll(() => panel.getAttribute('data-zoomed')).toBe('no');
  });

  it('saves a plot as an SVG figure with a legible provenance block naming setup, tare and factors', async () => {
    const [d] = await Promise.all([page.waitForEvent('download'), page.locator('[data-plot="cl-alpha"]').getByRole('button', { name: 'SVG' }).click()]);
    expect(d.suggestedFilename()).toBe('KM-7-wing-flap-study-invented-demonstration-campaign-cl-alpha.svg');
    const svg = readFileSync((await d.path())!, 'utf8');
    writeFileSync(join(ARTIFACTS, 'window-figure.svg'), svg);
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www.w3.org\/2000\/svg"/);
    expect(svg).toContain('<g class="provenance" font-size="12"');
    expect(svg).toMatch(/101: run-101-clean\.csv \(sha256 [0-9a-f]{12}…\) · setup &quot;KM-7 wing&quot; · tare windoff-tare\.csv · 3D wall corrections/);
    expect(svg).toMatch(/δ = [0-9.]+/);
  });

  it('keeps the campaign, an imported run and unsaved changes across a reload', async () => {
    const text = readFileSync(join(SAMPLES, 'run-101-clean.csv'), 'utf8').replace('# run: 101', '# run: 105');
    const file = join(work, 'run-105-clean-repeat.csv');
    writeFileSync(file, text);
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Import runs…' }).click()]);
    await chooser.setFiles(file);
    await waitReady(page, 'run-105-clean-repeat.csv');
    await page.getByLabel('Campaign name').fill('Flap study, day 2');
    await waitKept(page);
    const before = await page.locator('.runs-table tbody').evaluateAll((els) => els.map((e) => e.getAttribute('data-run')));

    await page.reload();
    for (const f of SAMPLE_RUNS) await waitReady(page, f);
    const after = await page.locator('.runs-table tbody').evaluateAll((els) => els.map((e) => e.getAttribute('data-run')));
    expect(after).toEqual(before);
    expect(await page.getByLabel('Campaign name').inputValue()).toBe('Flap study, day 2');
    // the imported run's file came back with it and is reduced again
    await waitReady(page, 'run-105-clean-repeat.csv');
    // still unsaved: a reload is not a save
    expect(await page.locator('.dirty').count()).toBe(1);
  });

  it('keeps the recent list across a reload', async () => {
    const [d] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Save as…' }).click()]);
    await d.path();
    await expect.poll(() => page.getByLabel('Recent campaigns').locator('option').count()).toBeGreaterThan(1);
    const names = await page.getByLabel('Recent campaigns').locator('option').allTextContents();
    await page.reload();
    await waitReady(page, 'run-101-clean.csv');
    expect(await page.getByLabel('Recent campaigns').locator('option').allTextContents()).toEqual(names);
  });

  it('keeps what it stores unreadable without the key its own server hands out, and hands the key to no other page', async () => {
    await waitKept(page);
    const raw = await page.evaluate(async () => {
      const db = await new Promise<IDBDatabase>((res, rej) => {
        const r = indexedDB.open('sweepbook-kept');
        r.onsuccess = () => res(r.result);
        r.onerror = () => rej(r.error);
      });
      const values = await new Promise<unknown[]>((res, rej) => {
        const r = db.transaction('values').objectStore('values').getAll();
        r.onsuccess = () => res(r.result);
        r.onerror = () => rej(r.error);
      });
      return values.map((v) => new TextDecoder('latin1').decode(v as Uint8Array));
    });
    expect(raw.length).toBeGreaterThan(2);
    for (const v of raw) {
      expect(v).not.toContain('Flap study');
      expect(v).not.toContain('alpha');
    }
    const url = new URL(STORAGE_KEY_PATH, s.server.url).href;
    expect((await get(url, { 'Sec-Fetch-Site': 'same-site' })).status).toBe(403);
    expect((await get(url, { 'Sec-Fetch-Site': 'cross-site' })).status).toBe(403);
    const own = await get(url, { 'Sec-Fetch-Site': 'same-origin' });
    expect(own.status).toBe(200);
    expect(JSON.parse(own.body).key).toMatch(/^[A-Za-z0-9+/]{43}=$/);
  });

  it('brings the campaign back after the server restarts on the same address with the same key, and not with another key', async () => {
    const port = Number(new URL(s.server.url).port);
    const key = JSON.parse((await get(new URL(STORAGE_KEY_PATH, s.server.url).href, {})).body).key as string;
    const root = join(s.profile, 'renderer');
    await s.server.close();
    const again = await startStaticServer({ root, extra: { '/sample-runs/': SAMPLES }, port, storageKey: key });
    try {
      await page.reload();
      await waitReady(page, 'run-105-clean-repeat.csv').catch(() => undefined);
      expect(await page.locator('tbody[data-run="run-105-clean-repeat.csv"]').count()).toBe(1);
    } finally {
      await again.close();
    }
    // another program on the same address, without the key: it finds nothing it can read
    const stranger = await startStaticServer({ root, extra: { '/sample-runs/': SAMPLES }, port });
    try {
      await page.reload();
      await page.locator('.runs-panel').waitFor();
      await page.waitForTimeout(1500);
      expect(await page.locator('tbody[data-run="run-105-clean-repeat.csv"]').count()).toBe(0);
    } finally {
      await stranger.close();
    }
    // the session's own close() closes its server again; give it one that is still open
    s.server = await startStaticServer({ root, extra: { '/sample-runs/': SAMPLES }, port, storageKey: key });
  });
});
