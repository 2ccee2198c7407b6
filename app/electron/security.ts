/**
 * The window's security settings (docs/architecture.md §9), kept in one place so a test can assert them:
 * context isolation, sandbox, no Node in the renderer, a strict Content-Security-Policy, no remote
 * content, navigation and new windows denied, permission requests denied, external links only to an
 * allow-list and only through the system browser.
 */
import type { BrowserWindowConstructorOptions, Session, WebContents } from 'electron';
import { APP_HOST, APP_ORIGIN, APP_SCHEME } from './protocol.ts';

export function webPreferences(preloadPath: string): NonNullable<BrowserWindowConstructorOptions['webPreferences']> {
  return {
    preload: preloadPath,
    contextIsolation: true,
    sandbox: true,
    nodeIntegration: false,
    nodeIntegrationInWorker: false,
    nodeIntegrationInSubFrames: false,
    webSecurity: true,
    allowRunningInsecureContent: false,
    experimentalFeatures: false,
    webviewTag: false,
    navigateOnDragDrop: false,
    spellcheck: false,
  };
}

/** No eval, no remote scripts, no plugins; workers and images from the app itself (blob: for chart export and the worker). */
export const CONTENT_SECURITY_POLICY = [
  "default-src 'self'",
  "script-src 'self'",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "worker-src 'self' blob:",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
  "frame-ancestors 'none'",
].join('; ');

/** Links the app may open, in the system browser only. */
export const EXTERNAL_ALLOW_LIST: readonly string[] = ['https://www.nist.gov/', 'https://www.iso.org/'];

export function isAllowedExternal(url: string): boolean {
  try {
    const u = new URL(url);
    return u.protocol === 'https:' && EXTERNAL_ALLOW_LIST.some((prefix) => url.startsWith(prefix));
  } catch {
    return false;
  }
}

/** True for the app's own pages (served by the app:// scheme from the renderer build). */
export function isAppUrl(url: string): boolean {
  try {
    const u = new URL(url);
    return u.protocol === `${APP_SCHEME}:` && u.host === APP_HOST;
  } catch {
    return false;
  }
}

/** Deny every permission request (camera, notifications, geolocation, ...): the app needs none. */
export function hardenSession(session: Session): void {
  session.setPermissionRequestHandler((_wc, _permission, callback) => callback(false));
  session.setPermissionCheckHandler(() => false);
  session.webRequest.onHeadersReceived((details, callback) => {
    callback({ responseHeaders: { ...details.responseHeaders, 'Content-Security-Policy': [CONTENT_SECURITY_POLICY] } });
  });
  // nothing remote is ever loaded
  session.webRequest.onBeforeRequest((details, callback) => {
    const ok = details.url.startsWith(`${APP_ORIGIN}/`) || /^(devtools|blob|data):/.test(details.url);
    callback({ cancel: !ok });
  });
}

/** Block navigation away from the app and new windows; allow-listed links go to the system browser. */
export function hardenContents(contents: WebContents, openExternal: (url: string) => void): void {
  contents.on('will-navigate', (event, url) => {
    if (!isAppUrl(url)) event.preventDefault();
  });
  contents.on('will-redirect', (event, url) => {
    if (!isAppUrl(url)) event.preventDefault();
  });
  contents.on('will-attach-webview', (event) => event.preventDefault());
  contents.setWindowOpenHandler(({ url }) => {
    if (isAllowedExternal(url)) openExternal(url);
    return { action: 'deny' };
  });
}
