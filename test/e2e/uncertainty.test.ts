/**
 * Uncertainties and the full-scale estimate in real headless Chromium (browser host): instrument
 * uncertainties entered in the setup editor, error bars drawn and switched off, differences against the
 * baseline with u(Δ), and the full-scale estimate checked against the command line's `project` for the
 * same run, setup and inputs, with its cautions on screen. Screenshots go to test-artifacts/.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CAUTIONS, projectStallSpeed, type Projection } from '../../core/fullscale/stallSpeed.ts';
import { ARTIFACTS, browserAvailable, openSession, ROOT, type Session, waitReady, UNCERTAINTY } from './browserSetup.ts';

const SAMPLES = join(ROOT, 'sample-runs');
const RUNS = ['run-101-clean.csv', 'run-102-flap10.csv', 'run-103-flap20.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv'];


/** The aircraft and day typed into the full-scale estimate: invented. */
const AIRCRAFT = { mass: '680', wingArea: '10.2', altitude: '1200', temperature: '32', rh: '70' };

function cli(args: string[]): string {
  return execFileSync(process.execPath, [join(ROOT, 'bin/sweepbook.js'), ...args], { cwd: ROOT, encoding: 'utf8', stdio: ['ignore', 'pipe', 'ignore'] });
}


/** Drawn pixels of a canvas (neither transparent nor white). */
async function ink(page: Page, selector: string): Promise<number> {
  return page.locator(selector).evaluate((canvas: HTMLCanvasElement) => {
    const { data } = canvas.getContext('2d')!.getImageData(0, 0, canvas.width, canvas.height);
    let n = 0;
    for (let i = 0; i < data.length; i += 4) if (data[i + 3]! > 0 && !(data[i]! > 245 && data[i + 1]! > 245 && data[i + 2]! > 245)) n++;
    return n;
  });
}

async function shot(page: Page, name: string) {
  await page.screenshot({ path: join(ARTIFACTS, `${name}.png`) });
}

const run = browserAvailable() ? describe : describe.skip;

run('uncertainties and the full-scale estimate in a real browser', () => {
  let s: Session;
  let page: Page;
  let work: string;
  let setupFile: string;

  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'sweepbook-e2e-u-'));
    // the sample campaign's setup with the same uncertainty block, for the command line
    const campaign = JSON.parse(readFileSync(join(SAMPLES, 'sweepbook-campaign.json'), 'utf8')) as { setups: Record<string, Record<string, unknown>> };
    const setup = { ...campaign.setups['KM-7 wing']!, uncertainty: Object.fromEntries(Object.entries(UNCERTAINTY).map(([k, v]) => [k, Number(v)])) };
    setupFile = join(work, 'setup-with-uncertainty.json');
    writeFileSync(setupFile, JSON.stringify(setup, null, 2));
    s = await openSession();
    page = s.page;
    await page.goto(s.server.url);
    for (const f of RUNS) await waitReady(page, f);
  });

  afterAll(async () => {
    await s?.close();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('offers no error bars while no run has uncertainties', async () => {
    expect(await page.locator('.plot-toolbar .error-bar-toggle input').isDisabled()).toBe(true);
    expect(await page.locator('.plot-toolbar').textContent()).toContain('no uncertainties in the shown runs');
  });

  it('takes instrument uncertainties in the setup editor and reduces the runs again with them', async () => {
    await page.getByRole('tab', { name: 'Setup' }).click();
    expect(await page.getByLabel('Setup being edited').inputValue()).toBe('KM-7 wing');
    for (const [key, value] of Object.entries(UNCERTAINTY)) await page.locator(`#setup-uncertainty-${key}`).fill(value);
    await page.locator('fieldset', { hasText: 'Instrument uncertainties' }).scrollIntoViewIfNeeded();
    await shot(page, 'setup-uncertainties');
    await page.getByRole('button', { name: /^Apply to 4 runs/ }).click();
    await page.getByRole('tab', { name: 'Plots' }).click();
    await page.locator('.plot-toolbar .error-bar-toggle input:not([disabled])').waitFor({ timeout: 30_000 });
    for (const f of RUNS) await waitReady(page, f);
  });

  it('draws error bars on the plots and takes them away with the toggle', async () => {
    for (const f of ['run-102-flap10.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv']) await page.locator(`tbody[data-run="${f}"] input[type="checkbox"]`).uncheck();
    const toggle = page.locator('.plot-toolbar .error-bar-toggle input');
    expect(await toggle.isChecked()).toBe(true);
    expect(await page.locator('.plot-toolbar .error-bar-toggle').getAttribute('title')).toMatch(/k = 1/);
    // zoom the lift curve to the flapped run's peak (typed ranges: the same view whatever headroom the axes keep),
    // where bars of a few thousandths of CL become visible
    const panel = page.locator('[data-plot="cl-alpha"]');
    await panel.getByRole('button', { name: 'Ranges…' }).click();
    const form = panel.getByRole('form', { name: /Axis ranges/ });
    await form.getByLabel('α from').fill('9');
    await form.getByLabel('α to').fill('18');
    await form.getByLabel('CL from').fill('0.95');
    await form.getByLabel('CL to').fill('1.2');
    await form.getByRole('button', { name: 'Apply' }).click();
    await expect.poll(() => page.locator('[data-plot="cl-alpha"]').getAttribute('data-zoomed')).toBe('yes');
    const ids = ['cl-alpha', 'cd-cl', 'ld-alpha'];
    await expect.poll(() => page.locator('[data-plot="ld-alpha"]').getAttribute('data-error-bars')).toBe('shown');
    // charts redraw at most every 250 ms (ChartCanvas.vue): let the last redraw land before reading pixels
    await page.waitForTimeout(400);
    const withBars = await Promise.all(ids.map((id) => ink(page, `[data-plot="${id}"] canvas`)));
    await shot(page, 'plots-error-bars');
    await toggle.uncheck();
    await expect.poll(() => page.locator('[data-plot="ld-alpha"]').getAttribute('data-error-bars')).toBe('off');
    await page.waitForTimeout(400);
    const without = await Promise.all(ids.map((id) => ink(page, `[data-plot="${id}"] canvas`)));
    // every plot loses the ink of its bars (L/D's are tens of pixels long at low drag)
    ids.forEach((id, i) => expect(withBars[i]!, id).toBeGreaterThan(without[i]! + 30));
    await toggle.check();
    await page.locator('[data-plot="cl-alpha"]').getByRole('button', { name: 'Reset zoom' }).click();
  });

  it('shows each difference against the baseline with its standard uncertainty', async () => {
    await page.getByRole('tab', { name: 'Against baseline' }).click();
    await page.getByLabel('Baseline run').selectOption('run-101-clean.csv');
    await expect.poll(() => page.locator('[data-plot="delta-cl"]').getAttribute('data-series')).toBe('103 · flap 20');
    const head = await page.locator('.delta-table thead th').allTextContents();
    expect(head).toContain('u(ΔCL) [–]');
    const u = await page.locator('.delta-table tbody tr').first().locator('td').nth(3).textContent();
    // a few thousandths: the points' u(CL) with these instruments are 0.002–0.004 each
    expect(u).toMatch(/^± 0\.00\d\d$/);
    expect(await page.locator('[data-plot="delta-cl"]').getAttribute('data-error-bars')).toBe('shown');
    await shot(page, 'against-baseline-uncertainty');
  });

  it('estimates the full-scale stall speed as the command line does, with the cautions on screen', async () => {
    await page.getByRole('tab', { name: 'Full-scale estimate' }).click();
    const cautions = page.locator('.cautions-box');
    // the view is loaded on first use: wait for it, then the cautions must be the first thing in it
    await cautions.waitFor({ state: 'visible' });
    expect(await page.locator('.full-scale > :first-child').getAttribute('class')).toBe('cautions-box');
    expect(await cautions.locator('li').allTextContents()).toEqual(CAUTIONS);
    await page.locator('#fs-mass').fill(AIRCRAFT.mass);
    await page.locator('#fs-wingArea').fill(AIRCRAFT.wingArea);
    await page.locator('#fs-altitude').fill(AIRCRAFT.altitude);
    await page.locator('#fs-temperature').fill(AIRCRAFT.temperature);
    await page.locator('#fs-rh').fill(AIRCRAFT.rh);

    const reference = (file: string) =>
      JSON.parse(
        cli(['project', join(SAMPLES, file), '--setup', setupFile, '--tare', join(SAMPLES, 'windoff-tare.csv'), '--mass-kg', AIRCRAFT.mass, '--wing-area-m2', AIRCRAFT.wingArea,
          '--pressure-altitude-m', AIRCRAFT.altitude, '--temp-c', AIRCRAFT.temperature, '--rh-pct', AIRCRAFT.rh]),
      ) as Projection;
    for (const file of ['run-101-clean.csv', 'run-103-flap20.csv']) {
      const expected = reference(file);
      const row = page.locator(`.fs-table tr[data-run="${file}"]`);
      const cell = row.locator('td[data-col="v-stall"]');
      await expect.poll(() => cell.textContent()).toBe(expected.v_stall_mps.toFixed(1));
      // to the last bits: the browser's V8 and Node's may round a transcendental function differently
      const shown = Number(await cell.getAttribute('data-value'));
      expect(Math.abs(shown - expected.v_stall_mps)).toBeLessThanOrEqual(1e-12 * expected.v_stall_mps);
      expect(await row.locator('td[data-col="v-stall-kt"]').textContent()).toBe(expected.v_stall_kt.toFixed(1));
      expect((await row.locator('td[data-col="cl-max"]').textContent())!.trim()).toBe(expected.cl_max.toFixed(4));
      // and core's function itself, in this process, from the command line's CLmax
      expect(projectStallSpeed({ massKg: 680, wingAreaM2: 10.2, clMax: expected.cl_max, pressureAltitudeM: 1200, tempC: 32, rhPct: 70 }).v_stall_mps).toBeCloseTo(expected.v_stall_mps, 12);
    }
    const air = reference('run-103-flap20.csv');
    expect(await page.locator('[data-air="rho"]').textContent()).toBe(air.rho_kgm3.toFixed(4));
    expect(await page.locator('[data-air="density-altitude"]').textContent()).toBe(air.density_altitude_m.toFixed(0));
    // the flap lowers the stall speed against the clean baseline
    const pct = Number(await page.locator('table.changes tr[data-run="run-103-flap20.csv"] td[data-col="dv-pct"]').getAttribute('data-value'));
    const clean = reference('run-101-clean.csv');
    expect(pct).toBeCloseTo(100 * (air.v_stall_mps / clean.v_stall_mps - 1), 9);
    expect(pct).toBeLessThan(0);
    await shot(page, 'full-scale-estimate');

    // scrolled to the bottom of the view, the cautions are still in sight
    await page.locator('.view').evaluate((v) => v.scrollTo(0, v.scrollHeight));
    const box = (await cautions.boundingBox())!;
    const view = (await page.locator('.view').boundingBox())!;
    expect(box.y).toBeGreaterThanOrEqual(view.y - 1);
    expect(box.y + box.height).toBeLessThanOrEqual(view.y + view.height);
    await shot(page, 'full-scale-estimate-scrolled');
    await page.locator('.view').evaluate((v) => v.scrollTo(0, 0));

    // a refused value is named beside its field, as typed, and no speed is shown from it
    await page.locator('#fs-mass').fill('-680');
    await expect.poll(() => page.locator('#fs-mass-msg .field-error').textContent()).toBe('Aircraft mass: expected a positive number (aircraft mass, kg)');
    expect(await page.locator('.fs-table tr[data-run="run-103-flap20.csv"] td[data-col="v-stall"]').textContent()).toBe('—');
    expect(await cautions.isVisible()).toBe(true);
    await shot(page, 'full-scale-estimate-invalid');
  });

  it('raised no console error and no Content-Security-Policy violation', () => {
    expect(s.problems).toEqual([]);
  });
});
