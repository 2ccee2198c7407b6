/** The browser host's server answers only to its own address and serves nothing through a link out of its folders. */
import { mkdirSync, mkdtempSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { request } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { hostAllowed, startStaticServer, type StaticServer } from '../../app/serve/static.ts';

/** A raw GET with an explicit Host header (a browser sends the name it resolved, which DNS rebinding controls). */
function get(url: string, path: string, host?: string): Promise<{ status: number; body: string }> {
  return new Promise((resolve, reject) => {
    const u = new URL(url);
    const req = request({ host: u.hostname, port: u.port, path, headers: host === undefined ? {} : { host } }, (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => (body += c));
      res.on('end', () => resolve({ status: res.statusCode!, body }));
    });
    req.on('error', reject);
    req.end();
  });
}

describe('static server: Host header and links', () => {
  let dir: string;
  let server: StaticServer;
  let port: number;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'sweepbook-host-'));
    const site = join(dir, 'site');
    const samples = join(dir, 'samples');
    mkdirSync(site);
    mkdirSync(samples);
    writeFileSync(join(dir, 'secret.txt'), 'outside');
    writeFileSync(join(site, 'index.html'), '<!doctype html><title>t</title>');
    writeFileSync(join(samples, 'run.csv'), 'alpha,dp_pitot\n');
    symlinkSync(join(dir, 'secret.txt'), join(site, 'leak.txt'));
    symlinkSync(join(dir, 'secret.txt'), join(samples, 'leak.csv'));
    symlinkSync(dir, join(samples, 'up'));
    symlinkSync(join(samples, 'run.csv'), join(samples, 'alias.csv'));
    server = await startStaticServer({ root: site, extra: { '/sample-runs/': samples }, host: '127.0.0.1', port: 0 });
    port = Number(new URL(server.url).port);
  });

  afterAll(async () => {
    await server.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('answers to 127.0.0.1, localhost and the printed address with the port', async () => {
    for (const host of [`127.0.0.1:${port}`, `localhost:${port}`, `LOCALHOST:${port}`, new URL(server.url).host]) {
      expect((await get(server.url, '/sample-runs/run.csv', host)).status, host).toBe(200);
    }
  });

  it('turns away any other Host (DNS rebinding), a wrong port and a missing port', async () => {
    for (const host of [`evil.example:${port}`, `127.0.0.1.evil.example:${port}`, `localhost.:${port}`, `127.0.0.1:${port + 1}`, 'localhost']) {
      const r = await get(server.url, '/sample-runs/run.csv', host);
      expect(r.status, JSON.stringify(host)).toBe(421);
      expect(r.body).not.toContain('alpha');
    }
  });

  it('serves no file through a symbolic link that leads out of its folder, and links inside still work', async () => {
    const host = `127.0.0.1:${port}`;
    for (const path of ['/leak.txt', '/sample-runs/leak.csv', '/sample-runs/up/secret.txt']) {
      const r = await get(server.url, path, host);
      expect(r.status, path).toBe(404);
      expect(r.body).not.toContain('outside');
    }
    expect((await get(server.url, '/sample-runs/alias.csv', host)).body).toBe('alpha,dp_pitot\n');
  });

  it('checks the Host header exactly', () => {
    expect(hostAllowed('127.0.0.1:8080', '127.0.0.1', 8080)).toBe(true);
    expect(hostAllowed('[::1]:8080', '[::1]', 8080)).toBe(true);
    expect(hostAllowed('[::1]:8080', '127.0.0.1', 8080)).toBe(false);
    expect(hostAllowed(undefined, '127.0.0.1', 8080)).toBe(false);
    expect(hostAllowed('127.0.0.1:8080:1', '127.0.0.1', 8080)).toBe(false);
  });
});
