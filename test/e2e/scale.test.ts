/**
 * A campaign of a thousand runs in real headless Chromium through the browser host: every run is in the
 * list (scrolled through from top to bottom, each row with its name, configuration and status), a
 * raw-output run reduces through the balance file beside its campaign to the command line's CL, and a
 * campaign file that cannot be opened says why, where. Timing belongs to the bench
 * (test/bench/windowScale.ts), not here.
 */
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeLargeCampaign } from '../bench/windowScale.ts';
import { runCli } from '../support/cli.ts';
import { ARTIFACTS, browserAvailable, openSession, ROOT, type Session } from './browserSetup.ts';
import { SAMPLE_RUNS } from './screenshots.ts';

const SAMPLES = join(ROOT, 'sample-runs');
const run = browserAvailable() ? describe : describe.skip;

async function openCampaignFiles(page: Page, paths: string[]): Promise<void> {
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open…' }).click()]);
  await chooser.setFiles(paths);
}

/** One screen of the run list: the drawn rows with their name, configuration and status, and where the list is scrolled. */
async function drawnRows(page: Page) {
  return page.evaluate(() => {
    const panel = document.querySelector('.runs-panel') as HTMLElement;
    const rows = Array.from(document.querySelectorAll<HTMLElement>('.runs-table tbody[data-run]')).map((b) => ({
      file: b.dataset['run']!,
      status: b.dataset['status']!,
      name: b.querySelector('.run-name .name')?.textContent?.trim() ?? '',
      configuration: b.querySelector('.run-name .config')?.textContent?.trim() ?? '',
      shown: b.querySelector('.status')?.textContent?.trim() ?? (b.querySelector('td.num') ? 'reduced' : ''),
    }));
    return { rows, top: panel.scrollTop, max: panel.scrollHeight - panel.clientHeight, page: panel.clientHeight };
  });
}

run('a campaign of a thousand runs, raw balance outputs and refused campaigns, in Chromium', () => {
  let s: Session;
  let page: Page;
  let work: string;

  beforeAll(async () => {
    work = mkdtempSync(join(tmpdir(), 'sweepbook-e2e-scale-'));
    s = await openSession();
    page = s.page;
    page.on('dialog', (d) => void d.accept());
    await page.setViewportSize({ width: 1024, height: 700 });
    await page.goto(s.server.url);
    for (const f of SAMPLE_RUNS) await page.locator(`tbody[data-run="${f}"][data-status="ready"]`).waitFor({ timeout: 30_000 });
  });

  afterAll(async () => {
    await s?.close();
    if (work) rmSync(work, { recursive: true, force: true });
  });

  it('lists every one of 1,000 runs with its name, configuration and status, and scrolls through them all', async () => {
    const dir = join(work, 'thousand');
    mkdirSync(dir);
    const n = 1000;
    const paths = writeLargeCampaign(dir, n);
    const campaign = JSON.parse(readFileSync(paths[0]!, 'utf8')) as { runs: { file: string; configuration: string }[] };
    const expected = new Map(campaign.runs.map((r) => [r.file, r.configuration]));
    await openCampaignFiles(page, paths);
    await page.locator(`.runs-panel[data-runs="${n}"]`).waitFor({ timeout: 120_000 });
    expect(await page.locator('.runs-panel .panel-head').textContent()).toContain(`${n} in campaign`);
    // the page holds a screenful of rows, not a thousand
    const first = await drawnRows(page);
    expect(first.rows[0]!.file).toBe('run-1000.csv');
    expect(first.rows.length).toBeLessThan(120);
    await page.screenshot({ path: join(ARTIFACTS, 'scale-1000-runs-1024x700.png') });
    // the plots of a thousand runs are not what this test is about: a light view while they reduce
    await page.getByRole('tab', { name: 'Setup', exact: true }).click();

    // scroll from top to bottom a screen at a time: every run comes by, once, in campaign order
    const seen = new Map<string, { name: string; configuration: string; status: string; shown: string }>();
    const order: string[] = [];
    for (let guard = 0; guard < 400; guard++) {
      const screen = await drawnRows(page);
      for (const r of screen.rows) {
        if (!seen.has(r.file)) order.push(r.file);
        seen.set(r.file, r);
      }
      if (screen.top >= screen.max - 1) break;
      await page.evaluate((by) => {
        const p = document.querySelector('.runs-panel') as HTMLElement;
        p.scrollTop += by;
      }, screen.page * 0.8);
      await page.waitForTimeout(30);
    }
    expect(seen.size).toBe(n);
    expect(order).toEqual(campaign.runs.map((r) => r.file));
    for (const [file, r] of seen) {
      // the file's name until it is read, then the run number the file gives
      const number = /run-(\d+)\.csv/.exec(file)![1]!;
      expect(r.name, file).toBe(r.status === 'ready' ? number : `run-${number}`);
      expect(r.configuration, file).toBe(expected.get(file));
      expect(r.shown, file).toMatch(/^(waiting|reading|reducing|reduced)$/);
    }
    // and it fills in: every run reduced in the end
    await page.waitForFunction((count) => document.querySelector('.runs-panel .panel-head .muted')?.textContent?.includes(`· ${count} shown`) ?? false, n, {
      timeout: 600_000,
      polling: 250,
    });
    await page.evaluate(() => ((document.querySelector('.runs-panel') as HTMLElement).scrollTop = 0));
    await page.waitForTimeout(200);
    await page.screenshot({ path: join(ARTIFACTS, 'scale-1000-runs-reduced-1024x700.png') });
    expect((await drawnRows(page)).rows.every((r) => r.status === 'ready')).toBe(true);
  }, 900_000);

  it("reduces a raw-output run through the balance file beside its campaign, to the command line's CL", async () => {
    const dir = join(work, 'raw');
    mkdirSync(dir);
    for (const f of ['run-301-raw-outputs.csv', 'windoff-tare-raw.csv', 'balance-b3.json']) copyFileSync(join(SAMPLES, f), join(dir, f));
    const setup = JSON.parse(readFileSync(join(SAMPLES, 'setup-3d-raw.json'), 'utf8')) as object;
    const campaign = {
      format: 'sweepbook-campaign',
      version: 1,
      name: 'Raw bridge outputs (invented demonstration data)',
      setups: { 'KM-7 wing, balance B3': setup },
      runs: [
        {
          file: 'run-301-raw-outputs.csv',
          sha256: null,
          configuration: 'clean (B3)',
          setup: 'KM-7 wing, balance B3',
          tare: 'windoff-tare-raw.csv',
          visible: true,
        },
      ],
      tares: [{ file: 'windoff-tare-raw.csv', sha256: null }],
      mappings: {},
      baseline: null,
    };
    writeFileSync(join(dir, 'raw.json'), JSON.stringify(campaign, null, 2));
    await openCampaignFiles(
      page,
      ['raw.json', 'run-301-raw-outputs.csv', 'windoff-tare-raw.csv', 'balance-b3.json'].map((f) => join(dir, f)),
    );
    const row = page.locator('tbody[data-run="run-301-raw-outputs.csv"]');
    await row.and(page.locator('[data-status="ready"]')).waitFor({ timeout: 60_000 });

    const cli = await runCli(
      'reduce',
      join(SAMPLES, 'run-301-raw-outputs.csv'),
      '--setup',
      join(SAMPLES, 'setup-3d-raw.json'),
      '--tare',
      join(SAMPLES, 'windoff-tare-raw.csv'),
    );
    expect(cli.code).toBe(0);
    const cliPoints = (JSON.parse(cli.stdout) as { points: { cl: number }[] }).points;

    await row.locator('.run-row').click();
    await page.getByRole('tab', { name: 'Run detail' }).click();
    const table = page.locator('.view[data-view="detail"] table').last();
    await table.waitFor();
    // the run says how its loads were read
    expect(await page.locator('.view[data-view="detail"] dl').textContent()).toMatch(/Balance\s*raw outputs through the balance file balance-b3\.json/);
    const { headers, cells } = await table.evaluate((t) => ({
      headers: Array.from(t.querySelectorAll('thead tr:last-child th')).map((h) => h.textContent?.trim() ?? ''),
      cells: Array.from(t.querySelectorAll('tbody tr')).map((tr) => Array.from(tr.querySelectorAll('td')).map((td) => td.textContent?.trim() ?? '')),
    }));
    const cl = headers.findIndex((h) => /^CL\b/.test(h));
    expect(cl).toBeGreaterThanOrEqual(0);
    expect(cells).toHaveLength(cliPoints.length);
    // the shown CL is the command line's, to every digit shown
    const shown = cells[7]![cl]!;
    const decimals = (shown.split('.')[1] ?? '').length;
    expect(Number(shown.replace('−', '-'))).toBeCloseTo(cliPoints[7]!.cl, decimals - 1);
    expect(Number(shown.replace('−', '-')).toFixed(decimals)).toBe(cliPoints[7]!.cl.toFixed(decimals));
    await page.screenshot({ path: join(ARTIFACTS, 'scale-raw-outputs-detail-1024x700.png') });
  }, 120_000);

  it('says why a campaign file is refused: not JSON (line and column), a path outside its folder', async () => {
    const dir = join(work, 'refused');
    mkdirSync(dir);
    writeFileSync(join(dir, 'broken.json'), '{\n  "format": "sweepbook-campaign",\n  "version": 1,\n  "name": "x",,\n}\n');
    await openCampaignFiles(page, [join(dir, 'broken.json')]);
    await page.locator('.banners', { hasText: /broken\.json:4:\d+: not valid JSON/ }).waitFor({ timeout: 10_000 });

    const c = JSON.parse(readFileSync(join(SAMPLES, 'sweepbook-campaign.json'), 'utf8')) as { runs: object[] };
    writeFileSync(join(dir, 'outside.json'), JSON.stringify({ ...c, runs: [{ ...c.runs[0], file: '../run-101-clean.csv', tare: null }], tares: [] }));
    copyFileSync(join(SAMPLES, 'run-101-clean.csv'), join(dir, 'run-101-clean.csv'));
    await openCampaignFiles(page, [join(dir, 'outside.json'), join(dir, 'run-101-clean.csv')]);
    const row = page.locator('tbody[data-run="../run-101-clean.csv"]');
    await row.and(page.locator('[data-status="missing"]')).waitFor({ timeout: 10_000 });
    expect(await row.textContent()).toContain('refused: leaves the campaign folder');
  }, 60_000);
});
