/**
 * The Plots view in real headless Chromium: a run with a return sweep drawn with its falling branch
 * thin and arrows along both branches; CLmax and the fitted lines marked on request, with the values
 * the engine fits (checked against the same run reduced here in Node); a run whose fit has no CLmax
 * gets a note and no mark; the choices survive a reload; the exported SVG and PNG carry the same marks.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readSetup, reduceRun } from '../../core/reduction/engine.ts';
import type { ReductionResult } from '../../core/reduction/pipeline.ts';
import { readRunText } from '../../core/formats/runFile.ts';
import { ARTIFACTS, browserAvailable, openSession, ROOT, type Session, waitReady } from './browserSetup.ts';
import { overflowOf, SAMPLE_RUNS, showView } from './screenshots.ts';

const SAMPLES = join(ROOT, 'sample-runs');
const RETURN = 'run-107-clean-return-sweep.csv';
const NO_STALL = 'run-108-clean-no-stall.csv';

interface Drawn {
  datasets: { label: string; role: 'run' | 'fit' | 'clmax'; n: number; first: { x: number; y: number } | null; last: { x: number; y: number } | null }[];
  arrows: number;
}

async function drawn(page: Page, plot: string): Promise<Drawn> {
  const text = await page.locator(`[data-plot="${plot}"] canvas`).getAttribute('data-drawn');
  return JSON.parse(text ?? '{"datasets":[],"arrows":0}') as Drawn;
}

async function importRun(page: Page, path: string, file: string) {
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Import runs…' }).click()]);
  await chooser.setFiles(path);
  await waitReady(page, file);
  const strip = page.getByRole('region', { name: 'Setup and tare of imported runs' });
  await strip.waitFor();
  await strip.getByRole('button', { name: 'Use these' }).click();
  await strip.waitFor({ state: 'detached' });
  await waitReady(page, file);
}

/** The same run reduced in Node with the sample's setup and tare: what the window's worker must have fitted. */
function reducedHere(text: string, file: string): ReductionResult {
  const s = readSetup('setup-3d.json', readFileSync(join(SAMPLES, 'setup-3d.json'), 'utf8'));
  if (!s.ok) throw new Error(JSON.stringify(s.errors));
  const r = reduceRun({
    run: readRunText(file, text),
    setup: s.value,
    tare: readRunText('windoff-tare.csv', readFileSync(join(SAMPLES, 'windoff-tare.csv'), 'utf8')),
  });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

const run = browserAvailable() ? describe : describe.skip;

run('the Plots view: sweep branches, CLmax and fitted lines', () => {
  let s: Session;
  let page: Page;
  let work: string;
  const back = reducedHere(readFileSync(join(SAMPLES, RETURN), 'utf8'), RETURN);
  // run 101 cut below the stall (α up to 8°): its fit has no CLmax
  const noStallText = readFileSync(join(SAMPLES, 'run-101-clean.csv'), 'utf8')
    .replace('# run: 101', '# run: 108')
    .split('\n')
    .filter((l) => !/^(9|1\d)\./.test(l))
    .join('\n');
  const noStall = reducedHere(noStallText, NO_STALL);

  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'sweepbook-e2e-plots-'));
    writeFileSync(join(work, NO_STALL), noStallText);
    s = await openSession();
    page = s.page;
    await page.setViewportSize({ width: 1024, height: 700 });
    await page.goto(s.server.url);
    for (const f of SAMPLE_RUNS) await waitReady(page, f);
    await importRun(page, join(SAMPLES, RETURN), RETURN);
    await importRun(page, join(work, NO_STALL), NO_STALL);
    // a readable picture: the clean wing, flap 20, the return sweep and the run that stops short of stall
    for (const f of ['run-102-flap10.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv']) {
      await page.locator(`tbody[data-run="${f}"] input[type="checkbox"]`).first().uncheck();
    }
    await showView(page, 'Plots');
  });

  afterAll(async () => {
    await s?.close();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('draws the return sweep as its own branches: every point, one arrowhead per branch, a key entry, no marks unasked', async () => {
    expect(noStall.fit.cl_max).toBeNull();
    expect(back.fit_branches.map((b) => [b.direction, b.points])).toEqual([
      ['up', 15],
      ['down', 14],
    ]);
    await expect.poll(async () => (await drawn(page, 'cl-alpha')).datasets.length).toBe(4);
    const lift = await drawn(page, 'cl-alpha');
    expect(lift.datasets.map((d) => d.role)).toEqual(['run', 'run', 'run', 'run']);
    const r107 = lift.datasets.find((d) => d.label === '107 · clean')!;
    expect(r107.n).toBe(29);
    // drawn in file order: it starts at the lowest angle and comes back to it
    expect(r107.first!.x).toBeCloseTo(back.points[0]!.alpha_deg!, 10);
    expect(r107.last!.x).toBeCloseTo(back.points[28]!.alpha_deg!, 10);
    // the other runs are single rising sweeps: the two arrowheads are the return-sweep run's
    expect(lift.arrows).toBe(2);
    await expect.poll(async () => (await drawn(page, 'cd-cl')).arrows).toBe(2);
    const key = page.locator('[data-plot="cl-alpha"] .legend-key');
    expect(await key.evaluateAll((els) => els.map((e) => e.getAttribute('data-key')))).toEqual(['return']);
    expect(await key.textContent()).toBe('return sweep (α falling)');
    expect(await page.getByLabel('Mark CLmax').isChecked()).toBe(false);
  });

  it("marks the fitted CLmax of each run that has one, at the engine's values, and says why a run has none", async () => {
    await page.getByLabel('Mark CLmax').check();
    await expect.poll(async () => (await drawn(page, 'cl-alpha')).datasets.filter((d) => d.role === 'clmax').length).toBe(3);
    const lift = await drawn(page, 'cl-alpha');
    const marks = lift.datasets.filter((d) => d.role === 'clmax');
    expect(marks.map((m) => m.label.split(':')[0])).toEqual(['101 · clean', '103 · flap 20', '107 · clean']);
    const m107 = marks.find((m) => m.label.startsWith('107 · clean'))!;
    expect(m107.n).toBe(1);
    expect(m107.first!.x).toBeCloseTo(back.fit.alpha_cl_max_deg!, 10);
    expect(m107.first!.y).toBeCloseTo(back.fit.cl_max!, 10);
    expect(m107.label).toMatch(/CLmax 0\.\d{4} at α 1\d\.\d\d deg \(.*rising sweep\)/);
    // run 108 stops below the stall: no mark, and the fit's reason under the plot
    expect(marks.some((m) => m.label.startsWith('108'))).toBe(false);
    const notes = page.locator('[data-plot="cl-alpha"] .mark-notes');
    expect(await notes.textContent()).toContain(`108 · clean: no CLmax: ${noStall.fit.cl_max_reason}`);
    // only the lift curve carries CLmax
    expect((await drawn(page, 'cd-cl')).datasets.every((d) => d.role === 'run')).toBe(true);
    expect(await page.locator('[data-plot="cl-alpha"] .legend-key').evaluateAll((els) => els.map((e) => e.getAttribute('data-key')))).toEqual([
      'return',
      'clmax',
    ]);
  });

  it('draws the fitted lift line over the linear range and the fitted polar over its range', async () => {
    await page.getByLabel('Show fitted lines').check();
    await expect.poll(async () => (await drawn(page, 'cl-alpha')).datasets.filter((d) => d.role === 'fit').length).toBe(4);
    const lift = await drawn(page, 'cl-alpha');
    const line = lift.datasets.find((d) => d.role === 'fit' && d.label.startsWith('107 · clean'))!;
    const [lo, hi] = back.fit.linear_range_deg!;
    const a = back.fit.cl_alpha_per_deg!;
    const a0 = back.fit.alpha_zero_lift_deg!;
    expect(line.n).toBe(2);
    expect(line.first!.x).toBeCloseTo(lo, 10);
    expect(line.last!.x).toBeCloseTo(hi, 10);
    expect(line.first!.y).toBeCloseTo(a * (lo - a0), 10);
    expect(line.last!.y).toBeCloseTo(a * (hi - a0), 10);
    // each plot redraws in its own turn (charts/drawQueue.ts): the polar may follow the lift curve by a task
    await expect.poll(async () => (await drawn(page, 'cd-cl')).datasets.filter((d) => d.role === 'fit').length).toBe(4);
    const polar = (await drawn(page, 'cd-cl')).datasets.filter((d) => d.role === 'fit');
    const p107 = polar.find((d) => d.label.startsWith('107 · clean'))!;
    expect(p107.n).toBe(25);
    expect(p107.first!.x).toBeCloseTo(back.fit.cd0! + back.fit.k_induced! * p107.first!.y ** 2, 10);
    // the moment and L/D plots carry no fitted marks
    expect((await drawn(page, 'cm-alpha')).datasets.every((d) => d.role === 'run')).toBe(true);
    expect(await overflowOf(page)).toBe(0);
    await page.screenshot({ path: join(ARTIFACTS, 'plots-marks-1024x700.png') });
    await page.locator('[data-plot="cl-alpha"]').screenshot({ path: join(ARTIFACTS, 'plots-marks-lift-panel.png') });
    await page.setViewportSize({ width: 1400, height: 900 });
    await page.waitForTimeout(400);
    expect(await overflowOf(page)).toBe(0);
    await page.screenshot({ path: join(ARTIFACTS, 'plots-marks-1400x900.png') });
    await page.setViewportSize({ width: 1024, height: 700 });
  });

  it('exports the same marks: the SVG figure and the PNG', async () => {
    const panel = page.locator('[data-plot="cl-alpha"]');
    const [d] = await Promise.all([page.waitForEvent('download'), panel.getByRole('button', { name: 'SVG' }).click()]);
    const svg = readFileSync((await d.path())!, 'utf8');
    writeFileSync(join(ARTIFACTS, 'plots-marks-figure.svg'), svg);
    expect(svg.match(/class="clmax-mark"/g)).toHaveLength(3);
    expect(svg.match(/class="fit-line"/g)).toHaveLength(4);
    expect(svg.match(/class="sweep-arrow"/g)).toHaveLength(2);
    expect(svg.match(/class="branch-falling"/g)).toHaveLength(1);
    expect(svg).toContain(`data-cl-max="${back.fit.cl_max}"`);
    expect(svg).toContain('108 · clean: no CLmax: ');
    const [dp] = await Promise.all([page.waitForEvent('download'), page.locator('[data-plot="cd-cl"]').getByRole('button', { name: 'SVG' }).click()]);
    const polar = readFileSync((await dp.path())!, 'utf8');
    writeFileSync(join(ARTIFACTS, 'plots-marks-polar.svg'), polar);
    expect(polar.match(/class="fit-line"/g)).toHaveLength(4);
    expect(polar).not.toContain('clmax-mark');
    expect(polar.match(/class="sweep-arrow"/g)).toHaveLength(2);
    const [p] = await Promise.all([page.waitForEvent('download'), panel.getByRole('button', { name: 'PNG' }).click()]);
    const png = readFileSync((await p.path())!);
    writeFileSync(join(ARTIFACTS, 'plots-marks-export.png'), png);
    expect(png.subarray(1, 4).toString()).toBe('PNG');
  });

  it('remembers both choices across a reload', async () => {
    await page.reload();
    await waitReady(page, RETURN);
    await showView(page, 'Plots');
    expect(await page.getByLabel('Mark CLmax').isChecked()).toBe(true);
    expect(await page.getByLabel('Show fitted lines').isChecked()).toBe(true);
    await expect.poll(async () => (await drawn(page, 'cl-alpha')).datasets.some((d) => d.role === 'clmax')).toBe(true);
    // hovering runs the plots' own hover mode over runs, fitted lines and CLmax marks without a page error
    const box = (await page.locator('[data-plot="cl-alpha"] canvas').boundingBox())!;
    for (const f of [0.2, 0.5, 0.7, 0.8, 0.9]) await page.mouse.move(box.x + box.width * f, box.y + box.height * (1 - f));
    await page.getByLabel('Mark CLmax').uncheck();
    await page.getByLabel('Show fitted lines').uncheck();
    await expect.poll(async () => (await drawn(page, 'cl-alpha')).datasets.every((d) => d.role === 'run')).toBe(true);
    expect(s.problems).toEqual([]);
  });
});
