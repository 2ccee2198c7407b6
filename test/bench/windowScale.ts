/**
 * Campaigns of N runs (default 1,000) opened in the window through the browser host, in Debian's
 * Chromium: seconds until every run is listed, until the last row shows after scrolling to the end,
 * a tab change while the runs are read, until every run is reduced, and the longest main-thread task
 * (the window's responsiveness). Run with `npx tsx test/bench/windowScale.ts [N …] [--list-only] [--stay] [--profile FILE]`;
 * figures go to docs/performance.md by hand (what each figure measures is said there).
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type Page } from 'playwright-core';
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

/** What one opening measured, in seconds. */
export interface ScaleFigures {
  runs: number;
  /** Open… chosen until the list holds every run (its count says N) and the first screen of rows is drawn. */
  listed: number;
  /** Then scrolled to the end until the last run's row is drawn. */
  lastRow: number;
  /** A click on a tab while the runs are still being read, until the view shows. */
  busyTab: number;
  /** Until every run is reduced (the list says N shown), or null when not waited for. */
  reduced: number | null;
  /**
   * With `stay`, once every run is reduced: an untick of the first run in the run list until all four
   * plots have drawn without it, or null when not measured.
   */
  untick: number | null;
  /** Longest main-thread task (PerformanceObserver "longtask", ≥ 50 ms) from Open… to the last figure. */
  longestTask: number;
  /** Long tasks and their total, same span. */
  longTasks: number;
  longTaskTotal: number;
}

/** Open a campaign of `n` runs in the page and measure it. */
export async function measureOpening(page: Page, paths: string[], n: number, waitReduced: boolean, stay = false): Promise<ScaleFigures> {
  await page.evaluate(() => {
    const w = window as unknown as { __long: number[] };
    w.__long = [];
  });
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByRole('button', { name: 'Open…' }).click()]);
  const t0 = Date.now();
  await chooser.setFiles(paths);
  await page.waitForFunction(
    (count) =>
      document.querySelector('.runs-panel')?.getAttribute('data-runs') === String(count) && document.querySelectorAll('.runs-table tbody[data-run]').length > 0,
    n,
    { timeout: 600_000, polling: 20 },
  );
  const listed = (Date.now() - t0) / 1000;
  const last = `run-${String(1000 + n - 1)}.csv`;
  await page.evaluate(() => {
    const p = document.querySelector('.runs-panel')!;
    p.scrollTop = p.scrollHeight;
  });
  // the spacers are estimates until rows are measured: keep scrolling to the end until the last row shows
  await page.waitForFunction(
    (file) => {
      const p = document.querySelector('.runs-panel')!;
      p.scrollTop = p.scrollHeight;
      return document.querySelector(`.runs-table tbody[data-run="${file}"]`) !== null;
    },
    last,
    { timeout: 600_000, polling: 20 },
  );
  const lastRow = (Date.now() - t0) / 1000;
  // a tab change while the runs are read; with `stay` the view is changed back to the one the opening began on
  const before = await page.locator('[role="tab"][aria-selected="true"]').textContent();
  const r0 = Date.now();
  await page.getByRole('tab', { name: 'Run detail' }).click();
  await page.locator('.view[data-view="detail"]').waitFor();
  const busyTab = (Date.now() - r0) / 1000;
  if (stay && before) await page.getByRole('tab', { name: before.trim(), exact: true }).click();
  let reduced: number | null = null;
  if (waitReduced) {
    await page.waitForFunction((count) => document.querySelector('.runs-panel .panel-head .muted')?.textContent?.includes(`· ${count} shown`) ?? false, n, {
      timeout: 3_600_000,
      polling: 200,
    });
    reduced = (Date.now() - t0) / 1000;
  }
  let untick: number | null = null;
  if (waitReduced && stay) {
    const plotted = (count: number) =>
      [...document.querySelectorAll('.plot-panel canvas')].every(
        (c) => (JSON.parse((c as HTMLElement).dataset['drawn'] ?? '{"datasets":[]}') as { datasets: unknown[] }).datasets.length === count,
      );
    await page.waitForFunction(plotted, n, { timeout: 600_000, polling: 100 });
    const u0 = Date.now();
    await page.locator('.runs-table tbody[data-run] input[type="checkbox"]').first().uncheck();
    await page.waitForFunction(plotted, n - 1, { timeout: 600_000, polling: 20 });
    untick = (Date.now() - u0) / 1000;
  }
  const long = await page.evaluate(() => (window as unknown as { __long: number[] }).__long);
  return {
    runs: n,
    listed,
    lastRow,
    busyTab,
    reduced,
    untick,
    longestTask: Math.max(0, ...long) / 1000,
    longTasks: long.length,
    longTaskTotal: long.reduce((a, b) => a + b, 0) / 1000,
  };
}

interface CpuProfile {
  nodes: { id: number; callFrame: { functionName: string; url: string; lineNumber: number }; hitCount?: number }[];
  samples: number[];
  timeDeltas: number[];
}

/** The 30 functions with the most self time in a CPU profile, as text. */
function selfTimes(profile: CpuProfile): string {
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const self = new Map<string, number>();
  profile.samples.forEach((id, i) => {
    const f = byId.get(id)!.callFrame;
    const name = `${f.functionName || '(anonymous)'} ${f.url.split('/').pop()}:${f.lineNumber + 1}`;
    self.set(name, (self.get(name) ?? 0) + (profile.timeDeltas[i] ?? 0) / 1000);
  });
  return [...self]
    .sort((a, b) => b[1] - a[1])
    .slice(0, 30)
    .map(([name, ms]) => `${ms.toFixed(0).padStart(7)} ms  ${name}\n`)
    .join('');
}

async function main() {
  const args = process.argv.slice(2);
  const waitReduced = !args.includes('--list-only') && !process.env['LIST_ONLY'];
  // --stay: back to the Plots view after the tab change, so the plots draw while the runs reduce
  const stay = args.includes('--stay');
  // --profile FILE: the main thread's CPU profile over the opening (Chromium's sampling profiler), an
  // unminified build so functions keep their names; the heaviest functions by self time are printed
  const profileAt = args.indexOf('--profile');
  const profileFile = profileAt >= 0 ? args[profileAt + 1] : undefined;
  const sizes = args.filter((a, i) => /^\d+$/.test(a) && (profileAt < 0 || i !== profileAt + 1)).map(Number);
  if (sizes.length === 0) sizes.push(1000);
  const work = mkdtempSync(join(tmpdir(), 'sweepbook-scale-'));
  const site = join(work, 'renderer');
  if (profileFile)
    execFileSync(join(ROOT, 'node_modules/.bin/vite'), ['build', '--outDir', site, '--emptyOutDir', '--logLevel', 'warn', '--minify', 'false'], {
      cwd: ROOT,
      stdio: 'inherit',
    });
  else buildRenderer(site);
  const server = await startStaticServer({ root: site, extra: { '/sample-runs/': join(ROOT, 'sample-runs') } });
  const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ['--no-sandbox', '--disable-gpu'] });
  try {
    for (const n of sizes) {
      const dir = join(work, `c${n}`);
      mkdirSync(dir);
      const paths = writeLargeCampaign(dir, n);
      const page = await browser.newPage({ viewport: { width: 1400, height: 900 } });
      await page.addInitScript(() => {
        const w = window as unknown as { __long: number[]; __longAt: [number, number][] };
        w.__long = [];
        w.__longAt = [];
        new PerformanceObserver((list) => {
          for (const e of list.getEntries()) {
            w.__long.push(e.duration);
            w.__longAt.push([e.startTime, e.duration]);
          }
        }).observe({ type: 'longtask', buffered: true });
      });
      page.on('dialog', (d) => void d.accept());
      await page.goto(server.url);
      await page.locator('tbody[data-status="ready"]').first().waitFor({ timeout: 60_000 });
      const cdp = profileFile ? await page.context().newCDPSession(page) : null;
      if (cdp) {
        await cdp.send('Profiler.enable');
        await cdp.send('Profiler.setSamplingInterval', { interval: 200 });
        await cdp.send('Profiler.start');
      }
      const f = await measureOpening(page, paths, n, waitReduced, stay);
      if (profileFile) {
        const long = await page.evaluate(() => (window as unknown as { __longAt: [number, number][] }).__longAt);
        process.stdout.write(`long tasks (start s: ms): ${long.map(([t, d]) => `${(t / 1000).toFixed(2)}: ${d.toFixed(0)}`).join(', ')}\n`);
      }
      if (cdp && profileFile) {
        const { profile } = await cdp.send('Profiler.stop');
        writeFileSync(profileFile, JSON.stringify(profile));
        process.stdout.write(selfTimes(profile as unknown as CpuProfile));
      }
      process.stdout.write(
        `${n} runs${stay ? ' (on the Plots view)' : ''}: listed ${f.listed.toFixed(2)} s, last row after scrolling ${f.lastRow.toFixed(2)} s, tab change while reading ${f.busyTab.toFixed(2)} s` +
          (f.reduced !== null ? `, all reduced ${f.reduced.toFixed(2)} s` : '') +
          (f.untick !== null ? `, one run unticked and all plots redrawn ${f.untick.toFixed(2)} s` : '') +
          `; longest main-thread task ${(f.longestTask * 1000).toFixed(0)} ms (${f.longTasks} tasks ≥ 50 ms, ${f.longTaskTotal.toFixed(2)} s in all)\n`,
      );
      await page.close();
      rmSync(dir, { recursive: true, force: true });
    }
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
