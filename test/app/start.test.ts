import { spawn, type ChildProcess } from 'node:child_process';
import { resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { browserPort, DEFAULT_BROWSER_PORT, electronBinary } from '../../app/start.ts';
import { installStorageKey, mayHaveKey } from '../../app/serve/storageKey.ts';

describe('browser host address and storage key', () => {
  it('listens on one fixed port unless --port or SWEEPBOOK_PORT says otherwise, and refuses a port that is not one', () => {
    expect(browserPort(undefined, {})).toBe(DEFAULT_BROWSER_PORT);
    expect(browserPort(undefined, { SWEEPBOOK_PORT: '8123' })).toBe(8123);
    expect(browserPort('9000', { SWEEPBOOK_PORT: '8123' })).toBe(9000);
    expect(browserPort('0', {})).toBe(0);
    expect(() => browserPort('http', {})).toThrow(/--port: expected a port number 0-65535/);
    expect(() => browserPort('70000', {})).toThrow(/got "70000"/);
  });

  it('makes the storage key once per install, readable by the user only, and keeps it', () => {
    const dir = mkdtempSync(join(tmpdir(), 'sweepbook-key-'));
    try {
      const key = installStorageKey(join(dir, 'cfg'));
      expect(Buffer.from(key, 'base64').length).toBe(32);
      expect(installStorageKey(join(dir, 'cfg'))).toBe(key);
      const file = join(dir, 'cfg', 'browser-storage-key');
      expect(statSync(file).mode & 0o077).toBe(0);
      expect(readFileSync(file, 'utf8').trim()).toBe(key);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("hands the key only to the page's own requests (Fetch Metadata)", () => {
    expect(mayHaveKey('same-origin')).toBe(true);
    expect(mayHaveKey(undefined)).toBe(true);
    expect(mayHaveKey('same-site')).toBe(false);
    expect(mayHaveKey('cross-site')).toBe(false);
    expect(mayHaveKey('none')).toBe(false);
  });
});

const ROOT = resolve(__dirname, '../..');

/** `npm start` as a user meets it: here (no Electron binary) one sentence, then the address on its own line. */
describe('npm start', () => {
  let child: ChildProcess | undefined;
  afterAll(() => {
    child?.kill('SIGTERM');
  });

  it('serves the interface to a browser on 127.0.0.1 when Electron is absent, saying so plainly', async () => {
    const forced = electronBinary() !== undefined; // a developer machine with Electron: ask for the browser host
    // a free port (0) and a throw-away settings folder: other test runs on this machine may hold the default port
    const config = mkdtempSync(join(tmpdir(), 'sweepbook-start-'));
    child = spawn(process.execPath, ['--import', 'tsx', 'app/start.ts', '--port', '0', ...(forced ? ['--browser'] : [])], {
      cwd: ROOT,
      stdio: ['ignore', 'pipe', 'pipe'],
      env: { ...process.env, SWEEPBOOK_CONFIG_DIR: config },
    });
    let out = '';
    const url = await new Promise<string>((resolveUrl, reject) => {
      const timer = setTimeout(() => reject(new Error(`no address within 60 s; stdout so far: ${out}`)), 60_000);
      child!.stdout!.on('data', (d: Buffer) => {
        out += d.toString();
        const m = /^(http:\/\/127\.0\.0\.1:\d+\/)$/m.exec(out);
        if (m) {
          clearTimeout(timer);
          resolveUrl(m[1]!);
        }
      });
      child!.on('exit', (code) => reject(new Error(`start exited with ${code}: ${out}`)));
    });
    const lines = out.trim().split('\n');
    if (!forced) {
      expect(lines[0]).toMatch(/Electron desktop shell is not installed/);
      expect(lines[0]!.split('. ').length).toBe(1); // one sentence
    }
    expect(lines[lines.length - 1]).toBe(url.trim());
    const page = await fetch(url);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain('<div id="app"');
    const campaign = await fetch(new URL('sample-runs/sweepbook-campaign.json', url));
    expect(campaign.status).toBe(200);
    expect((await campaign.json()).format).toBe('sweepbook-campaign');
    const escape = await fetch(new URL('/sample-runs/..%2F..%2Fpackage.json', url));
    expect(escape.status).toBeGreaterThanOrEqual(400);
  }, 90_000);
});
