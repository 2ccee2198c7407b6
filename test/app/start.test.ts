import { spawn, type ChildProcess } from 'node:child_process';
import { resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { electronBinary } from '../../app/start.ts';

const ROOT = resolve(__dirname, '../..');

/** `npm start` as a user meets it: here (no Electron binary) one sentence, then the address on its own line. */
describe('npm start', () => {
  let child: ChildProcess | undefined;
  afterAll(() => {
    child?.kill('SIGTERM');
  });

  it('serves the interface to a browser on 127.0.0.1 when Electron is absent, saying so plainly', async () => {
    const forced = electronBinary() !== undefined; // a developer machine with Electron: ask for the browser host
    child = spawn(process.execPath, ['--import', 'tsx', 'app/start.ts', ...(forced ? ['--browser'] : [])], { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] });
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
