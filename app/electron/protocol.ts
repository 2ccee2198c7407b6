/**
 * The app's own scheme, app://sweepbook/, serving the renderer build. Pages from file:// have an
 * opaque origin, under which module workers and 'self' in the Content-Security-Policy do not work as
 * on the web; a privileged standard scheme gives the page a real origin (Electron's security
 * guidance recommends a custom protocol over file://).
 */
import { readFile, realpath, stat } from 'node:fs/promises';
import { extname, resolve, sep } from 'node:path';

export const APP_SCHEME = 'app';
export const APP_HOST = 'sweepbook';
export const APP_ORIGIN = `${APP_SCHEME}://${APP_HOST}`;

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.woff2': 'font/woff2',
};

/** The file behind an app:// URL inside the renderer folder, or undefined for anything else (other hosts, escapes). */
export function resolveAppUrl(url: string, root: string): { path: string; type: string } | undefined {
  let u: URL;
  try {
    u = new URL(url);
  } catch {
    return undefined;
  }
  if (u.protocol !== `${APP_SCHEME}:` || u.host !== APP_HOST) return undefined;
  let rel: string;
  try {
    rel = decodeURIComponent(u.pathname);
  } catch {
    return undefined;
  }
  if (rel.includes('\0')) return undefined;
  const base = resolve(root);
  const path = resolve(base, `.${rel === '/' ? '/index.html' : rel}`);
  if (path !== base && !path.startsWith(base + sep)) return undefined;
  return { path, type: TYPES[extname(path).toLowerCase()] ?? 'application/octet-stream' };
}

/**
 * The response for an app:// request, read from the renderer folder by the main process itself. (Not
 * through `net.fetch('file://…')`: the session's request filter blocks file:// for the page, and a
 * fetch from the main process passing it was an upstream quirk, not a promise.) Symbolic links are
 * followed only when they stay inside the folder; only regular files are served.
 */
export async function serveAppFile(url: string, root: string): Promise<Response> {
  const file = resolveAppUrl(url, root);
  if (!file) return new Response('not found', { status: 404 });
  try {
    const [base, real] = await Promise.all([realpath(root), realpath(file.path)]);
    if (real !== base && !real.startsWith(base + sep)) return new Response('not found', { status: 404 });
    const s = await stat(real);
    if (!s.isFile()) return new Response('not found', { status: 404 });
    const body = await readFile(real);
    return new Response(new Uint8Array(body), { status: 200, headers: { 'content-type': file.type, 'content-length': String(body.length) } });
  } catch {
    return new Response('not found', { status: 404 });
  }
}
