/**
 * A small static file server for the browser host: the built renderer at "/", and extra folders under
 * their own prefixes (the sample campaign at "/sample-runs/"). Read-only, GET and HEAD only, listening on
 * loopback by default. Paths are resolved inside their folder and anything that would leave it is refused,
 * symbolic links included. Requests must name the server by an address it answers to (127.0.0.1,
 * localhost or the printed address, with its port): a web page elsewhere that points its own host name
 * at 127.0.0.1 (DNS rebinding) is turned away.
 */
import { createReadStream } from 'node:fs';
import { realpath, stat } from 'node:fs/promises';
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
  const full = resolve(base, parts.join('/'));
  if (full !== base && !full.startsWith(base + sep)) return null;
  return decoded.endsWith('/') || parts.length === 0 ? resolve(full, 'index.html') : full;
}

/**
 * True when a request's Host header names this server: 127.0.0.1, localhost or the address it printed
 * (`printedHost`, e.g. "[::1]"), each with the port it listens on. Names compare case-insensitively.
 */
export function hostAllowed(header: string | undefined, printedHost: string, port: number): boolean {
  if (!header) return false;
  const names = new Set(['127.0.0.1', 'localhost', printedHost.toLowerCase()]);
  const m = /^(\[[0-9a-f:.]+\]|[^:]+):(\d+)$/i.exec(header.trim());
  return m !== null && Number(m[2]) === port && names.has(m[1]!.toLowerCase());
}

/** `file` with all symbolic links resolved when it lies inside `folder` (also resolved), else undefined. */
async function realInside(folder: string, file: string): Promise<string | undefined> {
  try {
    const [base, real] = await Promise.all([realpath(folder), realpath(file)]);
    return real === base || real.startsWith(base.endsWith(sep) ? base : base + sep) ? real : undefined;
  } catch {
    return undefined;
  }
}

export function startStaticServer(options: StaticServerOptions): Promise<StaticServer> {
  const mounts = Object.entries(options.extra ?? {})
    .map(([prefix, folder]) => ({ prefix: prefix.endsWith('/') ? prefix : `${prefix}/`, folder }))
    .sort((a, b) => b.prefix.length - a.prefix.length);
  let printedHost = '127.0.0.1';
  let listenPort = 0;

  const storageKey = options.storageKey ?? newStorageKey();
  function sendStorageKey(req: IncomingMessage, res: ServerResponse): void {
    if (!mayHaveKey(req.headers['sec-fetch-site'])) {
      res.writeHead(403, { 'Content-Type': 'text/plain; charset=utf-8' }).end('only for this page\n');
      return;
    }
    const body = JSON.stringify({ key: storageKey });
    res.writeHead(200, {
      'Content-Type': 'application/json; charset=utf-8',
      'Content-Length': Buffer.byteLength(body),
      'Cache-Control': 'no-store',
      'X-Content-Type-Options': 'nosniff',
    });
    res.end(req.method === 'HEAD' ? undefined : body);
  }

  async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
    if (!hostAllowed(req.headers.host, printedHost, listenPort)) {
      res.writeHead(421, { 'Content-Type': 'text/plain; charset=utf-8' }).end('this server answers only to its own address\n');
      return;
    }
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
    const folder = mount ? mount.folder : options.root;
    const named = resolveInside(folder, mount ? path.slice(mount.prefix.length - 1) : path);
    if (!named) {
      res.writeHead(400, { 'Content-Type': 'text/plain; charset=utf-8' }).end('bad path\n');
      return;
    }
    let size: number;
    // the file itself, links resolved, is what is served: no link can lead out of the folder
    const file = await realInside(folder, named);
    try {
      if (!file) throw new Error('missing or outside its folder');
      const s = await stat(file);
      if (!s.isFile()) throw new Error('not a file');
      size = s.size;
    } catch {
      res.writeHead(404, { 'Content-Type': 'text/plain; charset=utf-8' }).end('not found\n');
      return;
    }
    res.writeHead(200, {
      'Content-Type': MIME[extname(named).toLowerCase()] ?? 'application/octet-stream',
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
      printedHost = host;
      listenPort = port;
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
