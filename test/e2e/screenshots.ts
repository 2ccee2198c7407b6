/**
 * `npm run screenshots`: builds the interface, opens the sample campaign in Debian's Chromium through
 * the browser host and writes a PNG of every view at 1024×700 and 1400×900 into docs/screenshots/.
 * Prints, per view and size, how wide the page is against the window (a page wider than the window
 * scrolls sideways, which the layout must never need).
 */
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type Page } from 'playwright-core';
import { startStaticServer } from '../../app/serve/static.ts';
import { buildRenderer, CHROMIUM, ROOT } from './browserSetup.ts';

export const SIZES = [
  { width: 1024, height: 700 },
  { width: 1400, height: 900 },
] as const;

export const SAMPLE_RUNS = ['run-101-clean.csv', 'run-102-flap10.csv', 'run-103-flap20.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv'];

/** Tab titles in the order the window shows them, with the file-name part of each screenshot. */
export const VIEWS: readonly { tab: string; slug: string }[] = [
  { tab: 'Plots', slug: 'plots' },
  { tab: 'Against baseline', slug: 'baseline' },
  { tab: 'Characteristics', slug: 'characteristics' },
  { tab: 'Full-scale estimate', slug: 'full-scale' },
  { tab: 'Run detail', slug: 'run-detail' },
  { tab: 'Sample scatter', slug: 'sample-scatter' },
  { tab: 'Setup', slug: 'setup' },
];

/** How far the document is wider than the window, in CSS pixels (0 when it fits). */
export function overflowOf(page: Page): Promise<number> {
  return page.evaluate(() => Math.max(document.documentElement.scrollWidth, document.body.scrollWidth) - document.documentElement.clientWidth);
}

export async function showView(page: Page, tab: string): Promise<void> {
  await page.getByRole('tab', { name: tab, exact: true }).click();
  // charts animate off, but fonts and async views need a moment
  await page.waitForTimeout(400);
}

async function main() {
  const out = join(ROOT, 'docs', 'screenshots');
  mkdirSync(out, { recursive: true });
  const work = mkdtempSync(join(tmpdir(), 'sweepbook-shots-'));
  const site = join(work, 'renderer');
  buildRenderer(site);
  const server = await startStaticServer({ root: site, extra: { '/sample-runs/': join(ROOT, 'sample-runs') } });
  const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ['--no-sandbox', '--disable-gpu'] });
  let worst = 0;
  try {
    for (const size of SIZES) {
      const page = await browser.newPage({ viewport: size });
      await page.goto(server.url);
      for (const f of SAMPLE_RUNS) await page.locator(`tbody[data-run="${f}"][data-status="ready"]`).waitFor({ timeout: 60_000 });
      for (const v of VIEWS) {
        await showView(page, v.tab);
        const over = await overflowOf(page);
        worst = Math.max(worst, over);
        const name = `${v.slug}-${size.width}x${size.height}.png`;
        await page.screenshot({ path: join(out, name) });
        process.stdout.write(`${name}  ${over > 0 ? `${over} px wider than the window` : 'fits'}\n`);
      }
      await page.close();
    }
  } finally {
    await browser.close();
    await server.close();
    rmSync(work, { recursive: true, force: true });
  }
  if (worst > 0) process.exitCode = 1;
}

if (process.argv[1]?.endsWith('screenshots.ts')) {
  main().catch((err: Error) => {
    process.stderr.write(`screenshots: ${err.message}\n`);
    process.exit(1);
  });
}
