/**
 * A campaign of N runs (default 1,000) opened in the window through the browser host, in Debian's
 * Chromium: seconds until every run is listed, and until every run is reduced. Run with
 * `npx tsx test/bench/windowScale.ts [N]`; figures go to docs/performance.md by hand.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { startStaticServer } from '../../app/serve/static.ts';
import { buildRenderer, CHROMIUM, ROOT } from '../e2e/browserSetup.ts';

/** Write a campaign of `n` runs (copies of the sample runs under their own numbers) into `dir`; returns every path. */
export function writeLargeCampaign(dir: string, n: number): string[] {
  const samples = join(ROOT, 'sample-runs');
  const campaign = JSON.parse(readFileSync(join(samples, 'sweepbook-campaign.json'), 'utf8')) as {
    name: string;
    runs: { file: string; sha256: string | null }[];
  };
  const sources = campaign.runs.filter((r) => !r.file.includes('201')).map((r) => ({ run: r, text: readFileSync(join(samples, r.file), 'utf8') }));
  const runs: typeof campaign.runs = [];
  const paths = [join(dir, 'campaign.json'), join(dir, 'windoff-tare.csv')];
  writeFileSync(paths[1]!, readFileSync(join(samples, 'windoff-tare.csv')));
  for (let i = 0; i < n; i++) {
    const src = sources[i % sources.length]!;
    const file = `run-${String(1000 + i)}.csv`;
    writeFileSync(join(dir, file), src.text.replace(/# run: \d+/, `# run: ${1000 + i}`));
    runs.push({ ...src.run, file, sha256: null });
    paths.push(join(dir, file));
  }
  writeFileSync(paths[0]!, JSON.stringify({ ...campaign, name: `${n} runs`, runs, baseline: null }, null, 1));
  return paths;
}

async function main() {
  const n = Number(process.argv[2] ?? 1000);
  const work = mkdtempSync(join(tmpdir(), 'sweepbook-scale-'));
  const site = join(work, 'renderer');
  buildRenderer(site);
  const paths = writeLargeCampaign(work, n);
  const server = await startStaticServer({ root: site, extra: { '/sample-runs/': join(ROOT, 'sample-runs') } });
  const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ['--no-sandbox', '--disable-gpu'] });
  try {
    const page = await browser.newPage({ viewport: { width: 1400, height: 900 } });
    await page.goto(server.url);
    await page.locator('tbody[data-status="ready"]').first().waitFor({ timeout: 60_000 });
    page.on('dialog', (d) => void d.accept());
    if (process.env['TAB']) await page.getByRole('tab', { name: process.env['TAB'], exact: true }).click();
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open…' }).click()]);
    const t0 = Date.now();
    await chooser.setFiles(paths);
    await page.waitForFunction((count) => document.querySelectorAll('.runs-table tbody').length >= count, n, { timeout: 600_000, polling: 50 });
    const listed = (Date.now() - t0) / 1000;
    // responsiveness while the runs are being reduced: a click on a tab until the view shows
    const r0 = Date.now();
    await page.getByRole('tab', { name: 'Run detail' }).click();
    await page.locator('.view[data-view="detail"]').waitFor();
    const busyTab = (Date.now() - r0) / 1000;
    process.stdout.write(`${n} runs: listed in ${listed.toFixed(2)} s; a tab change while reducing ${busyTab.toFixed(2)} s\n`);
    if (process.env['LIST_ONLY']) return;
    await page.waitForFunction((count) => document.querySelectorAll('.runs-table tbody[data-status="ready"]').length >= count, n, {
      timeout: 600_000,
      polling: 200,
    });
    const reduced = (Date.now() - t0) / 1000;
    // responsiveness after opening: a click on a tab until the view shows
    const c0 = Date.now();
    await page.getByRole('tab', { name: 'Characteristics' }).click();
    await page.locator('.view[data-view="fits"]').waitFor();
    const tab = (Date.now() - c0) / 1000;
    process.stdout.write(`${n} runs: listed in ${listed.toFixed(2)} s, all reduced in ${reduced.toFixed(2)} s, a tab change then ${tab.toFixed(2)} s\n`);
  } finally {
    await browser.close();
    await server.close();
    rmSync(work, { recursive: true, force: true });
  }
}

if (process.argv[1]?.endsWith('windowScale.ts')) {
  main().catch((err: Error) => {
    process.stderr.write(`windowScale: ${err.message}\n`);
    process.exit(1);
  });
}
