/** The static server behind the browser host: MIME types, mounts, and no way out of its folders. */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { request } from 'node:http';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { resolveInside, startStaticServer, type StaticServer } from '../../app/serve/static.ts';

/** A raw request: the path goes out exactly as written (fetch would normalise "..").  */
function get(url: string, path: string, method = 'GET'): Promise<{ status: number; type: string | undefined; body: string; csp: string | undefined }> {
  return new Promise((resolve, reject) => {
    const u = new URL(url);
    const req = request({ host: u.hostname, port: u.port, path, method }, (res) => {
      let body = '';
      res.setEncoding('utf8');
      res.on('data', (c: string) => (body += c));
      res.on('end', () => resolve({ status: res.statusCode!, type: res.headers['content-type'], body, csp: res.headers['content-security-policy'] as string | undefined }));
    });
    req.on('error', reject);
    req.end();
  });
}

describe('static server', () => {
  let dir: string;
  let server: StaticServer;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'sweepbook-serve-'));
    const site = join(dir, 'site');
    const samples = join(dir, 'samples');
    mkdirSync(join(site, 'assets'), { recursive: true });
    mkdirSync(samples);
    writeFileSync(join(dir, 'secret.txt'), 'outside');
    writeFileSync(join(site, 'index.html'), '<!doctype html><title>t</title>');
    for (const [name, text] of Object.entries({ 'a.js': 'x', 'a.css': 'x', 'a.json': '{}', 'a.svg': '<svg/>', 'a.wasm': 'x', 'a.js.map': '{}', 'a.bin': 'x' })) writeFileSync(join(site, 'assets', name), text);
    writeFileSync(join(samples, 'run.csv'), 'alpha,dp_pitot\n');
    server = await startStaticServer({ root: site, extra: { '/sample-runs/': samples }, host: '127.0.0.1', port: 0 });
  });

  afterAll(async () => {
    await server.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('listens on loopback at a free port and serves index.html for the root', async () => {
    expect(server.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/$/);
    const r = await get(server.url, '/');
    expect(r.status).toBe(200);
    expect(r.type).toBe('text/html; charset=utf-8');
    expect(r.csp).toContain("script-src 'self'");
    expect(r.csp).not.toContain('unsafe-eval');
  });

  it('sends each kind of file with its MIME type', async () => {
    const types: Record<string, string> = {};
    for (const name of ['a.js', 'a.css', 'a.json', 'a.svg', 'a.wasm', 'a.js.map', 'a.bin']) types[name] = (await get(server.url, `/assets/${name}`)).type!;
    expect(types).toEqual({
      'a.js': 'text/javascript; charset=utf-8',
      'a.css': 'text/css; charset=utf-8',
      'a.json': 'application/json; charset=utf-8',
      'a.svg': 'image/svg+xml',
      'a.wasm': 'application/wasm',
      'a.js.map': 'application/json; charset=utf-8',
      'a.bin': 'application/octet-stream',
    });
    const csv = await get(server.url, '/sample-runs/run.csv');
    expect([csv.status, csv.type, csv.body]).toEqual([200, 'text/csv; charset=utf-8', 'alpha,dp_pitot\n']);
  });

  it('never serves a file outside its folders', async () => {
    const attempts = ['/../secret.txt', '/%2e%2e/secret.txt', '/assets/..%2f..%2fsecret.txt', '/sample-runs/../../secret.txt', '/sample-runs/%2e%2e%2fsecret.txt', '/%5c..%5csecret.txt', '/a%00.js', '/%E0%A4%A'];
    for (const path of attempts) {
      const r = await get(server.url, path);
      expect(r.body, path).not.toContain('outside');
      expect([400, 404], path).toContain(r.status);
    }
    expect(resolveInside('/srv/site', '/a/../../etc/passwd')).toBeNull();
    expect(resolveInside('/srv/site', '/a/b.js')).toBe('/srv/site/a/b.js');
    expect(resolveInside('/srv/site', '/a/')).toBe('/srv/site/a/index.html');
  });

  it('answers only GET and HEAD', async () => {
    expect((await get(server.url, '/', 'POST')).status).toBe(405);
    const head = await get(server.url, '/assets/a.js', 'HEAD');
    expect([head.status, head.body]).toEqual([200, '']);
    expect((await get(server.url, '/missing.js')).status).toBe(404);
  });
});
