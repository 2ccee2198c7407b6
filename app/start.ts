/**
 * `npm start`: opens the desktop window on the bundled sample campaign. Where the Electron binary is
 * not installed (an offline install skips its download), says so in one sentence and serves the same
 * interface to a web browser on 127.0.0.1 instead, printing the address on a line of its own.
 *   options: --browser (serve to a browser even when Electron is installed), --port N
 * The browser host listens on a fixed port (DEFAULT_BROWSER_PORT, or SWEEPBOOK_PORT, or --port): the page
 * keeps the working campaign and the recent list in the browser's storage, which belongs to one address,
 * so the same address on every start is what lets them survive a restart.
 */
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { buildElectron, electronBuild } from '../electron.config.ts';
import { startStaticServer, type StaticServer } from './serve/static.ts';
import { installStorageKey } from './serve/storageKey.ts';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');
const RENDERER_OUT = join(ROOT, 'dist', 'renderer');

/** Path of the Electron executable, or undefined when the package or its binary is absent. */
export function electronBinary(): string | undefined {
  try {
    const path = createRequire(import.meta.url)('electron') as unknown;
    return typeof path === 'string' && existsSync(path) ? path : undefined;
  } catch {
    return undefined;
  }
}

function newestMtime(dir: string): number {
  let newest = 0;
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    const s = statSync(p);
    newest = Math.max(newest, s.isDirectory() ? newestMtime(p) : s.mtimeMs);
  }
  return newest;
}

/** True when the renderer build is missing or older than its sources (renderer/ and core/). */
export function rendererIsStale(): boolean {
  const index = join(RENDERER_OUT, 'index.html');
  return !existsSync(index) || Math.max(newestMtime(join(ROOT, 'renderer')), newestMtime(join(ROOT, 'core'))) > statSync(index).mtimeMs;
}

/** Build the renderer when its output is missing or older than its sources. */
export async function ensureRendererBuilt(log: (line: string) => void): Promise<void> {
  if (!rendererIsStale()) return;
  log('Building the interface (first start only)…');
  const { build } = await import('vite');
  await build({ configFile: join(ROOT, 'vite.config.ts'), logLevel: 'warn' });
}

/** The browser host's port unless --port or SWEEPBOOK_PORT says otherwise (an unassigned port in the dynamic range). */
export const DEFAULT_BROWSER_PORT = 51760;

/** The port to listen on: --port, else SWEEPBOOK_PORT, else the default; a clear message for anything else. */
export function browserPort(option: string | undefined, env: NodeJS.ProcessEnv = process.env): number {
  const text = option ?? env['SWEEPBOOK_PORT'];
  if (text === undefined || text === '') return DEFAULT_BROWSER_PORT;
  const n = Number(text);
  if (!Number.isInteger(n) || n < 0 || n > 65535) throw new Error(`--port: expected a port number 0-65535 (0 picks a free one), got "${text}"`);
  return n;
}

async function serveBrowser(port: number, storageKey: string, log: (line: string) => void): Promise<StaticServer> {
  const options = { root: RENDERER_OUT, extra: { '/sample-runs/': join(ROOT, 'sample-runs') }, host: '127.0.0.1', storageKey };
  try {
    return await startStaticServer({ ...options, port });
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'EADDRINUSE' || port === 0) throw err;
    log(`Port ${port} is in use by another program, so a free port is used this time. The campaign kept in the browser belongs to the usual address; start with --port N to choose one.`);
    return startStaticServer({ ...options, port: 0 });
  }
}

async function main() {
  const { values } = parseArgs({ options: { browser: { type: 'boolean', default: false }, port: { type: 'string' } } });
  const log = (line: string) => process.stderr.write(line + '\n');
  await ensureRendererBuilt(log);
  const electron = values.browser ? undefined : electronBinary();
  if (electron) {
    await buildElectron();
    const child = spawn(electron, [join(electronBuild.outDir, 'main.cjs')], { stdio: 'inherit' });
    child.on('exit', (code) => process.exit(code ?? 0));
    return;
  }
  if (!values.browser) {
    process.stdout.write('The Electron desktop shell is not installed here (its binary download was skipped or is unavailable), so Sweepbook is serving the same interface to your web browser instead.\n');
  }
  const server = await serveBrowser(browserPort(values.port), installStorageKey(), log);
  process.stdout.write(`${server.url}\n`);
  log('Open that address in a browser. Press Ctrl+C to stop.');
  const stop = () => {
    void server.close().then(() => process.exit(0));
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  main().catch((err: Error) => {
    process.stderr.write(`sweepbook: could not start: ${err.message}\n`);
    process.exit(1);
  });
}
