/**
 * The upflow, repeatability and balance view in real headless Chromium (browser host): the invented
 * upright/inverted pair and six repeats imported through the file input, the upflow shown and applied,
 * the ± 2 s band drawn around a run, a balance file opened and its residuals drawn. Screenshots:
 * test-artifacts/analysis-view.png and analysis-{upflow,repeat,balance}.png.
 */
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ARTIFACTS, browserAvailable, openSession, ROOT, type Session } from './browserSetup.ts';

const SAMPLES = join(ROOT, 'sample-runs');
const PAIR = ['run-401-upright.csv', 'run-402-inverted.csv'];
const REPEATS = [1, 2, 3, 4, 5, 6].map((i) => `run-50${i}-repeat.csv`);

async function ink(page: Page, selector: string): Promise<number> {
  return page.locator(selector).evaluate((canvas: HTMLCanvasElement) => {
    const { data } = canvas.getContext('2d')!.getImageData(0, 0, canvas.width, canvas.height);
    let drawn = 0;
    for (let i = 0; i < data.length; i += 4) if (data[i + 3]! > 0 && !(data[i]! > 245 && data[i + 1]! > 245 && data[i + 2]! > 245)) drawn++;
    return drawn;
  });
}

const run = browserAvailable() ? describe : describe.skip;

run('upflow, repeats and balance in a real browser', () => {
  let s: Session;
  let page: Page;

  beforeAll(async () => {
    s = await openSession();
    page = s.page;
    await page.goto(s.server.url);
    await page.locator('tbody[data-run="run-101-clean.csv"][data-status="ready"]').waitFor({ timeout: 30_000 });
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Import runs…' }).click()]);
    await chooser.setFiles([...PAIR, ...REPEATS].map((f) => join(SAMPLES, f)));
    for (const f of [...PAIR, ...REPEATS]) await page.locator(`tbody[data-run="${f}"][data-status="ready"]`).waitFor({ timeout: 30_000 });
    await page.getByRole('tab', { name: 'Upflow, repeats, balance' }).click();
  }, 120_000);

  afterAll(async () => {
    await s?.close();
  });

  it('shows the pair’s upflow with its uncertainty and applies it to the setup in one click', async () => {
    const value = page.getByTestId('upflow-value');
    await expect.poll(() => value.textContent()).toMatch(/^0\.35\d+° ± 0\.00\d+°/);
    await page.getByRole('button', { name: /^Apply 0\.35\d° to setup/ }).click();
    await expect.poll(() => page.locator('.upflow-part .flash').textContent()).toMatch(/flow\.upflow_deg = 0\.35\d+° written to setup "KM-7 wing"/);
  });

  it('draws the ± 2 s repeatability band around the chosen run', async () => {
    await expect
      .poll(() => page.getByTestId('repeat-pooled').textContent(), { timeout: 20_000 })
      .toMatch(/Pooled standard deviation \(1 s, 75 degrees of freedom\): CL 0\.00\d+/);
    expect(await ink(page, '[data-plot="repeat-cl"] canvas')).toBeGreaterThan(2000);
  });

  it('opens a balance file and draws its residuals against the applied load', async () => {
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open balance file…' }).click()]);
    await chooser.setFiles(join(SAMPLES, 'balance-b3.json'));
    await page.locator('table[aria-label="Calibration matrix"]').waitFor();
    expect(await page.locator('table[aria-label="Calibration matrix"] tbody tr').count()).toBe(3);
    // the campaign's setup reads lift and drag; balance B3 gives normal, axial and pitch: shown, with a note
    expect(await page.getByTestId('balance-axes-note').textContent()).toMatch(/Not usable with setup "KM-7 wing": .*not lift and drag/);
    expect(await ink(page, '[data-plot="balance-residual-normal"] canvas')).toBeGreaterThan(1000);
    await page.screenshot({ path: join(ARTIFACTS, 'analysis-view.png') });
    for (const part of ['upflow', 'repeat', 'balance']) await page.locator(`.${part}-part`).screenshot({ path: join(ARTIFACTS, `analysis-${part}.png`) });
    expect(s.problems).toEqual([]);
  });
});
