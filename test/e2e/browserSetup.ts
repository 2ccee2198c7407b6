/**
 * Shared set-up of the browser tests: a fresh build of the renderer into a temporary folder, the
 * static server of app/serve/static.ts, and Debian's Chromium driven by playwright-core.
 * In CI (CI=true) a missing Chromium is a failure; locally the browser tests are skipped with a note.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { startStaticServer, type StaticServer } from '../../app/serve/static.ts';

export const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
/** Debian's Chromium; CHROMIUM_PATH points elsewhere on other systems. */
export const CHROMIUM = process.env['CHROMIUM_PATH'] ?? '/usr/bin/chromium';
export const ARTIFACTS = join(ROOT, 'test-artifacts');
export const IN_CI = process.env['CI'] === 'true';
export const HAVE_CHROMIUM = existsSync(CHROMIUM);

/** Whether to run the browser tests; explains itself when not. */
export function browserAvailable(): boolean {
  if (HAVE_CHROMIUM) return true;
  if (IN_CI) return true; // run anyway so that set-up fails loudly
  console.warn(`browser tests skipped: ${CHROMIUM} not found (install it with: apt-get update && apt-get install -y chromium)`);
  return false;
}

/**
 * Build the renderer into a folder of this run's own: always the current sources, and no race with
 * another process building or serving dist/renderer at the same time.
 */
export function buildRenderer(outDir: string): void {
  execFileSync(join(ROOT, 'node_modules/.bin/vite'), ['build', '--outDir', outDir, '--emptyOutDir', '--logLevel', 'warn'], { cwd: ROOT, stdio: 'inherit' });
}

export interface Session {
  server: StaticServer;
  context: BrowserContext;
  page: Page;
  /** Console errors and Content-Security-Policy violations seen so far. */
  problems: string[];
  profile: string;
  close(): Promise<void>;
}

export async function openSession(): Promise<Session> {
  if (!HAVE_CHROMIUM) throw new Error(`${CHROMIUM} is missing; the browser tests need it (apt-get install -y chromium)`);
  mkdirSync(ARTIFACTS, { recursive: true });
  const profile = mkdtempSync(join(tmpdir(), 'sweepbook-e2e-'));
  const site = join(profile, 'renderer');
  buildRenderer(site);
  const server = await startStaticServer({ root: site, extra: { '/sample-runs/': join(ROOT, 'sample-runs') } });
  const context = await chromium.launchPersistentContext(join(profile, 'browser'), {
    executablePath: CHROMIUM,
    headless: true,
    viewport: { width: 1440, height: 900 },
    acceptDownloads: true,
    args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  await context.grantPermissions(['clipboard-read', 'clipboard-write'], { origin: server.url.replace(/\/$/, '') });
  const problems: string[] = [];
  await context.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (e) => console.error(`CSP violation: ${e.violatedDirective} ${e.blockedURI}`));
  });
  const page = context.pages()[0] ?? (await context.newPage());
  page.on('console', (m) => {
    if (m.type() === 'error') problems.push(m.text());
  });
  page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
  return {
    server,
    context,
    page,
    problems,
    profile,
    async close() {
      await context.close();
      await server.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Wait until a run's row in the run list says it is reduced. */
export async function waitReady(page: Page, file: string, timeout = 60_000): Promise<void> {
  await page.locator(`tbody[data-run="${file}"][data-status="ready"]`).waitFor({ timeout });
}

/** Instrument standard uncertainties (k = 1) typed into the setup editor: invented for the tests. */
export const UNCERTAINTY: Readonly<Record<string, string>> = {
  dp_pitot_pa: '1.5',
  p_static_pa: '20',
  t_total_c: '0.2',
  rh_pct: '2',
  force_n: '0.3',
  moment_nm: '0.02',
  alpha_deg: '0.05',
  area_rel: '0.002',
  chord_rel: '0.002',
};
