/**
 * A small static file server for the browser host: the built renderer at "/", and extra folders under
 * their own prefixes (the sample campaign at "/sample-runs/"). Read-only, GET and HEAD only, listening on
 * loopback by default. Paths are resolved inside their folder and anything that would leave it is refused.
 */
import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { extname, resolve, sep } from 'node:path';
import { mayHaveKey, newStorageKey, STORAGE_KEY_PATH } from './storageKey.ts';

export interface StaticServerOptions {
  /** Folder served at "/". */
  root: string;
  /** URL prefix (starting and ending with "/") → folder. */
  extra?: Record<string, string>;
  host?: string;
  /** 0 picks a free port. */
  port?: number;
  /** Key the page encrypts its kept campaign with (storageKey.ts); a fresh one per server when not given. */
  storageKey?: string;
}

export interface StaticServer {
  url: string;
  close(): Promise<void>;
}

export const MIME: Readonly<Record<string, string>> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.csv': 'text/csv; charset=utf-8',
  '.tsv': 'text/tab-separated-values; charset=utf-8',
  '.txt': 'text/plain; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.wasm': 'application/wasm',
  '.woff2': 'font/woff2',
};

/** The same policy as the page's meta tag; sent as a header too so it also covers the worker script. */
export const CONTENT_SECURITY_POLICY =
  "default-src 'self'; script-src 'self'; worker-src 'self'; style-src 'self'; img-src 'self' data: blob:; font-src 'self'; connect-src 'self'; object-src 'none'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'";

/**
 * The file a URL path names inside its folder, or null when the path is malformed or would leave the
 * folder (.., encoded separators, NUL). Folder paths get index.html.
 */
export function resolveInside(folder: string, urlPath: string): string | null {
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath);
  } catch {
    return null;
  }
  if (decoded.includes('\0') || decoded.includes('\\')) return null;
  const parts = decoded.split('/').filter((p) => p !== '' && p !== '.');
  if (parts.some((p) => p === '..')) return null;
  const base = resolve(folder);
  const full = resolve(base, ...parts);
  if (full !== base && !full.startsWith(base + sep)) return null;
  return decoded.endsWith('/') || parts.length === 0 ? resolve(full, 'index.html') : full;
}

export function startStaticServer(options: StaticServerOptions): Promise<StaticServer> {
  const mounts = Object.entries(options.extra ?? {})
    .map(([prefix, folder]) => ({ prefix: prefix.endsWith('/') ? prefix : `${prefix}/`, folder }))
    .sort((a, b) => b.prefix.length - a.prefix.length);

  const storageKey = options.storageKey ?? newStorageKey();
  function sendStorageKey(req: IncomingMessage, res: ServerResponse): void {
    if (!mayHaveKey(req.headers['sec-fetch-site'])) {
      res.writeHead(403, { 'Content-Type': 'text/plain; charset=utf-8' }).end('only for this page\n');
      return;
    }
    const body = JSON.stringify({ key: storageKey });
    res.writeHead(200, { 'Content-Type': 'application/json; charset=utf-8', 'Content-Length': Buffer.byteLength(body), 'Cache-Control': 'no-store', 'X-Content-Type-Options': 'nosniff' });
    res.end(req.method === 'HEAD' ? undefined : body);
  }

  async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
    if (req.method !== 'GET' && req.method !== 'HEAD') {
      res.writeHead(405, { Allow: 'GET, HEAD', 'Content-Type': 'text/plain; charset=utf-8' }).end('method not allowed\n');
      return;
    }
    const path = new URL(req.url ?? '/', 'http://localhost').pathname;
    if (path === STORAGE_KEY_PATH) {
      sendStorageKey(req, res);
      return;
    }
    const mount = mounts.find((m) => path.startsWith(m.prefix));
    const file = mount ? resolveInside(mount.folder, path.slice(mount.prefix.length - 1)) : resolveInside(options.root, path);
    if (!file) {
      res.writeHead(400, { 'Content-Type': 'text/plain; charset=utf-8' }).end('bad path\n');
      return;
    }
    let size: number;
    try {
      const s = await stat(file);
      if (!s.isFile()) throw new Error('not a file');
      size = s.size;
    } catch {
      res.writeHead(404, { 'Content-Type': 'text/plain; charset=utf-8' }).end('not found\n');
      return;
    }
    res.writeHead(200, {
      'Content-Type': MIME[extname(file).toLowerCase()] ?? 'application/octet-stream',
      'Content-Length': size,
      'Cache-Control': 'no-store',
      'X-Content-Type-Options': 'nosniff',
      'Content-Security-Policy': CONTENT_SECURITY_POLICY,
      'Cross-Origin-Opener-Policy': 'same-origin',
    });
    if (req.method === 'HEAD') {
      res.end();
      return;
    }
    createReadStream(file)
      .on('error', () => res.destroy())
      .pipe(res);
  }

  const server = createServer((req, res) => {
    handle(req, res).catch(() => {
      if (!res.headersSent) res.writeHead(500, { 'Content-Type': 'text/plain; charset=utf-8' });
      res.end('server error\n');
    });
  });
  return new Promise((resolveStart, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, options.host ?? '127.0.0.1', () => {
      const { address, port } = server.address() as AddressInfo;
      const host = address.includes(':') ? `[${address}]` : address;
      resolveStart({
        url: `http://${host}:${port}/`,
        close: () =>
          new Promise<void>((done) => {
            server.closeAllConnections();
            server.close(() => done());
          }),
      });
    });
  });
}
