/**
 * The Characteristics view in real headless Chromium (browser host), as an engineer reads it after a
 * session: CLmax with its method and standard uncertainty, a run that never stalls saying why it has no
 * CLmax, a run with a return sweep showing both branches and its hysteresis loop, the uncertainty's
 * random and systematic parts on hover, and nothing wider than a 1024×700 window. The two extra runs are
 * made from the invented sample run 101 (cut before the stall; swept back down with lower lift between
 * 10.5° and 13.5°). Screenshots at 1024×700 and 1400×900 go to test-artifacts/.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ARTIFACTS, browserAvailable, openSession, ROOT, type Session, waitReady, UNCERTAINTY } from './browserSetup.ts';
import { overflowOf, SAMPLE_RUNS, showView } from './screenshots.ts';

const SAMPLES = join(ROOT, 'sample-runs');

/** Run 101 cut after α = 10°, where CL is still rising: no stall in the file. */
function noStallRun(): string {
  const lines = readFileSync(join(SAMPLES, 'run-101-clean.csv'), 'utf8').replace('# run: 101', '# run: 107').trimEnd().split('\n');
  const header = lines.findIndex((l) => l.startsWith('alpha'));
  return [...lines.slice(0, header + 1), ...lines.slice(header + 1).filter((l) => Number(l.split(',')[0]) < 10.5)].join('\n') + '\n';
}

/** Run 101 swept up and back down; on the way down the flow reattaches late: 10 N less lift between 10.5° and 13.5°. */
function returnSweepRun(): string {
  const lines = readFileSync(join(SAMPLES, 'run-101-clean.csv'), 'utf8').replace('# run: 101', '# run: 108').trimEnd().split('\n');
  const header = lines.findIndex((l) => l.startsWith('alpha'));
  const up = lines.slice(header + 1);
  const down = up
    .slice(0, -1)
    .reverse()
    .map((l) => {
      const c = l.split(',');
      const a = Number(c[0]) + 0.03;
      c[0] = a.toFixed(3);
      if (a > 10.5 && a < 13.5) c[5] = (Number(c[5]) - 10).toFixed(3);
      return c.join(',');
    });
  return [...lines.slice(0, header + 1), ...up, ...down].join('\n') + '\n';
}

const run = browserAvailable() ? describe : describe.skip;

run('the Characteristics view in a real browser', () => {
  let s: Session;
  let page: Page;
  let work: string;

  /** The cell of one characteristic for one run (columns follow the header's run labels). */
  async function cell(key: string, runLabel: string) {
    const heads = await page.locator('.fits-table thead th').allTextContents();
    const col = heads.findIndex((h) => h.trim().startsWith(runLabel));
    expect(col, `column of run ${runLabel}`).toBeGreaterThan(1);
    return page.locator(`.fits-table tr[data-fit="${key}"] td`).nth(col - 1);
  }

  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'sweepbook-e2e-fits-'));
    s = await openSession();
    page = s.page;
    await page.setViewportSize({ width: 1024, height: 700 });
    await page.goto(s.server.url);
    for (const f of SAMPLE_RUNS) await waitReady(page, f);
    const files = [
      ['run-107-no-stall.csv', noStallRun()],
      ['run-108-return-sweep.csv', returnSweepRun()],
    ].map(([name, text]) => {
      const f = join(work, name!);
      writeFileSync(f, text!);
      return f;
    });
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Import runs…' }).click()]);
    await chooser.setFiles(files);
    const strip = page.getByRole('region', { name: 'Setup and tare of imported runs' });
    await strip.locator('tr[data-import="run-108-return-sweep.csv"]').waitFor({ timeout: 60_000 });
    await strip.locator('tr[data-import="run-107-no-stall.csv"]').waitFor({ timeout: 60_000 });
    // both made runs belong to the 3D wing's setup and tare, chosen explicitly
    for (const r of ['107', '108']) {
      await strip.getByLabel(`Setup for ${r}`).selectOption('KM-7 wing');
      await strip.getByLabel(`Tare for ${r}`).selectOption('windoff-tare.csv');
    }
    await strip.getByRole('button', { name: 'Use these' }).click();
    await waitReady(page, 'run-107-no-stall.csv');
    await waitReady(page, 'run-108-return-sweep.csv');
    // instrument uncertainties in the setup: every fit then carries a standard uncertainty with a systematic part
    await showView(page, 'Setup');
    for (const [key, value] of Object.entries(UNCERTAINTY)) await page.locator(`#setup-uncertainty-${key}`).fill(value);
    await page.getByRole('button', { name: /^Apply to \d+ runs/ }).click();
    await page.waitForTimeout(500);
    for (const f of [...SAMPLE_RUNS, 'run-107-no-stall.csv', 'run-108-return-sweep.csv']) await waitReady(page, f);
    await showView(page, 'Characteristics');
    await page.locator('.fits-table tr[data-fit="cl_max"]').waitFor();
  }, 240_000);

  afterAll(async () => {
    await s?.close();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('shows CLmax ± its standard uncertainty and the method, with random and systematic parts on hover', async () => {
    const c = await cell('cl_max', '101');
    expect(await c.locator('.val').textContent()).toMatch(/^0\.8\d+ ± 0\.00\d\d$/);
    expect(await c.locator('.how').textContent()).toBe('parabola through the peak');
    expect(await c.getAttribute('title')).toMatch(
      /^CLmax is the vertex of the parabola through the highest point and its two neighbours\nu = 0\.00\d+ \(standard uncertainty, k = 1\); random /,
    );
    const slope = await cell('cl_alpha_per_deg', '101');
    expect(await slope.locator('.val').textContent()).toMatch(/^0\.06\d+ ± 0\.000\d\d$/);
    const hover = (await slope.getAttribute('title')) ?? '';
    expect(hover).toMatch(/^u = 0\.000\d+ \(standard uncertainty, k = 1\); random 0\.000\d+ \(standard error of the fit\); systematic 0\.000\d+: /);
    expect(hover).toContain('reference area');
    const range = await cell('linear_range_deg', '101');
    expect(await range.locator('.how').textContent()).toMatch(/^\d+ points, from the scatter$/);
    expect(await range.getAttribute('title')).toMatch(
      /^\d+ points; found from the data: points within ±0\.\d{4} in CL of the line, a tolerance from the run's own scatter \(scatter σ of CL 0\.\d{4}\)$/,
    );
  });

  it('says in words why a run that never stalls has no CLmax', async () => {
    const c = await cell('cl_max', '107');
    expect(await c.locator('.val').textContent()).toBe('—');
    // in a few words in the cell, in full on hover
    expect(await c.locator('.why').textContent()).toBe('not reached (CL still rising)');
    expect(await c.getAttribute('title')).toMatch(
      /^not reached: CL is still rising at the highest angle of the sweep \(α = 1\d\.\d\d°\); the sweep stops before the stall$/,
    );
    expect(await (await cell('alpha_cl_max_deg', '107')).locator('.why').textContent()).toBe('not reached (CL still rising)');
  });

  it('lists the sweep branches of a run with a return sweep, the fitted one marked, and its hysteresis loop', async () => {
    const branches = page.locator('tbody[data-branches="run-108-return-sweep.csv"] tr');
    expect(await branches.count()).toBe(2);
    expect(await branches.nth(0).textContent()).toContain('α rising');
    expect(await branches.nth(1).textContent()).toContain('α falling');
    expect(await branches.nth(0).locator('.tag').textContent()).toBe('fitted');
    expect(await branches.nth(1).locator('.tag').count()).toBe(0);
    // the single sweeps have one row each
    expect(await page.locator('tbody[data-branches="run-101-clean.csv"] tr').count()).toBe(1);
    expect(await page.locator('details.branches').getAttribute('open')).not.toBeNull();
    expect(await (await cell('branch', '108')).locator('.val').textContent()).toBe('1 of 2 (α rising)');
    expect(await (await cell('hysteresis_alpha_range_deg', '108')).locator('.val').textContent()).toMatch(/^1\d\.\d\d to 1\d\.\d\d$/);
    expect(await (await cell('hysteresis_max_delta_cl', '108')).locator('.how').textContent()).toMatch(/^at α = 1\d\.\d\d°$/);
    expect(await (await cell('hysteresis_alpha_range_deg', '101')).locator('.why').textContent()).toBe('single sweep');
    // a branch without CLmax says why in a few words, at length on hover
    const b107 = page.locator('tbody[data-branches="run-107-no-stall.csv"] td.missing');
    expect(await b107.locator('.why').textContent()).toBe('not reached (CL still rising)');
    expect(await b107.getAttribute('title')).toMatch(/^not reached: CL is still rising/);
  });

  it('prints the characteristics with their uncertainty and method, and the branches of a return sweep', async () => {
    await page.locator('tbody[data-run="run-108-return-sweep.csv"] .run-row .run-name').click();
    await page.emulateMedia({ media: 'print' });
    try {
      const sheet = page.locator('.print-summary');
      await sheet.waitFor();
      expect(await sheet.locator('h1').textContent()).toContain('Run 108');
      const clmax = await sheet.locator('[data-fit="cl_max"]').textContent();
      expect(clmax).toMatch(/Maximum lift CLmax \(parabola through the peak\)\s*0\.8\d+ ± 0\.00\d\d/);
      expect(await sheet.locator('table.branches tbody tr').count()).toBe(2);
      expect(await sheet.locator('table.branches tbody tr').first().textContent()).toContain('1 of 2 (fitted)');
      expect(await sheet.locator('table.points thead').textContent()).toContain('Re [10⁶]');
      await page.screenshot({ path: join(ARTIFACTS, 'fits-print-summary.png'), fullPage: true });
    } finally {
      await page.emulateMedia({ media: 'screen' });
    }
    // a single sweep of 15 points still prints on one A4 page with its uncertainties and notes
    await page.locator('tbody[data-run="run-101-clean.csv"] .run-row .run-name').click();
    await page.emulateMedia({ media: 'print' });
    try {
      await expect.poll(() => page.locator('.print-summary h1').textContent()).toContain('Run 101');
      await page.screenshot({ path: join(ARTIFACTS, 'fits-print-summary-101.png'), fullPage: true });
      const pdf = await page.pdf({ format: 'A4' });
      expect((pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length).toBe(1);
    } finally {
      await page.emulateMedia({ media: 'screen' });
    }
    await showView(page, 'Characteristics');
  });

  it('writes the point table with units in every header, symbols for the blockage terms, and values rounded to their uncertainty', async () => {
    await page.locator('tbody[data-run="run-101-clean.csv"] .run-row .run-name').click();
    await showView(page, 'Run detail');
    const table = page.getByRole('table', { name: 'Points of run 101' });
    const heads = (await table.locator('thead tr').nth(1).locator('th').allTextContents()).map((h) => h.trim());
    expect(heads.slice(0, 11)).toEqual(['point', 'samples', 'α [deg]', 'CL [–]', 'CD [–]', 'Cm [–]', 'L/D [–]', 'q [Pa]', 'V [m/s]', 'Mach [–]', 'Re [10⁶]']);
    expect(heads).toEqual(expect.arrayContaining(['u(CL) [–]', 'u(α) [deg]', 'ε_sb [–]', 'ε_wb [–]', 'T₀ [°C]']));
    const cells = (await table.locator('tbody tr').first().locator('td').allTextContents()).map((c) => c.trim());
    // CL to the place of u(CL)'s second significant digit (GUM §7.2.6): u(CL) "0.0034" → CL with 4 decimals
    const uCl = cells[heads.indexOf('u(CL) [–]')]!;
    expect(uCl).toMatch(/^0\.00\d\d$/);
    expect(cells[heads.indexOf('CL [–]')]).toMatch(/^-?\d\.\d{4}$/);
    for (const c of cells) expect(c).not.toContain('\u2212');
    expect(await overflowOf(page)).toBe(0);
    await page.screenshot({ path: join(ARTIFACTS, 'fits-point-table-1024x700.png') });
    await showView(page, 'Characteristics');
  });

  it('fits 1024×700 without sideways scrolling (the wide table scrolls in its own box), and at 1400×900', async () => {
    expect(await overflowOf(page)).toBe(0);
    const wrap = page.locator('.fits-view .table-wrap').first();
    const box = (await wrap.boundingBox())!;
    expect(box.x + box.width).toBeLessThanOrEqual(1024);
    await page.screenshot({ path: join(ARTIFACTS, 'fits-1024x700.png') });
    await page.locator('details.branches').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(ARTIFACTS, 'fits-branches-1024x700.png') });
    await page.setViewportSize({ width: 1400, height: 900 });
    await page.waitForTimeout(300);
    expect(await overflowOf(page)).toBe(0);
    await page.locator('.fits-table').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(ARTIFACTS, 'fits-1400x900.png') });
    await page.locator('details.branches').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(ARTIFACTS, 'fits-branches-1400x900.png') });
    await page.setViewportSize({ width: 1024, height: 700 });
  });
});
