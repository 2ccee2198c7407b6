import { mkdtempSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import type { MenuItemConstructorOptions } from 'electron';
import { FileGrants } from '../../app/electron/grants.ts';
import { registerIpc } from '../../app/electron/ipc.ts';
import { menuTemplate } from '../../app/electron/menu.ts';
import { resolveAppUrl } from '../../app/electron/protocol.ts';
import { CONTENT_SECURITY_POLICY, hardenContents, hardenSession, isAllowedExternal, webPreferences } from '../../app/electron/security.ts';

const APP_ROOT = '/opt/sweepbook/dist/renderer';
const appEvent = { senderFrame: { url: 'app://sweepbook/index.html' } } as never;
const foreignEvent = { senderFrame: { url: 'https://example.com/' } } as never;

describe('window security settings (docs/architecture.md §9)', () => {
  it('isolates the page: context isolation, sandbox, no Node anywhere', () => {
    const w = webPreferences('/x/preload.cjs');
    expect(w).toMatchObject({ contextIsolation: true, sandbox: true, nodeIntegration: false, nodeIntegrationInWorker: false, nodeIntegrationInSubFrames: false, webSecurity: true, webviewTag: false });
  });

  it('has a Content-Security-Policy without eval or remote sources', () => {
    expect(CONTENT_SECURITY_POLICY).not.toContain('unsafe-eval');
    expect(CONTENT_SECURITY_POLICY).toContain("default-src 'self'");
    expect(CONTENT_SECURITY_POLICY).toContain("object-src 'none'");
    expect(CONTENT_SECURITY_POLICY).not.toMatch(/https?:/);
  });

  it('blocks navigation away from the app and every new window; allow-listed links go to the system browser', () => {
    const listeners: Record<string, (e: { preventDefault(): void }, url: string) => void> = {};
    let openHandler: (d: { url: string }) => { action: string } = () => ({ action: 'allow' });
    const contents = {
      on: (name: string, fn: never) => (listeners[name] = fn),
      setWindowOpenHandler: (fn: typeof openHandler) => (openHandler = fn),
    };
    const opened: string[] = [];
    hardenContents(contents as never, (u) => opened.push(u));
    const prevent = vi.fn();
    listeners['will-navigate']!({ preventDefault: prevent }, 'https://evil.example/');
    expect(prevent).toHaveBeenCalledTimes(1);
    listeners['will-navigate']!({ preventDefault: prevent }, 'app://sweepbook/index.html#plots');
    expect(prevent).toHaveBeenCalledTimes(1);
    listeners['will-navigate']!({ preventDefault: prevent }, `file://${APP_ROOT}/index.html`);
    expect(prevent).toHaveBeenCalledTimes(2);
    listeners['will-navigate']!({ preventDefault: prevent }, 'app://sweepbook.evil/index.html');
    expect(prevent).toHaveBeenCalledTimes(3);
    expect(openHandler({ url: 'https://evil.example/' })).toEqual({ action: 'deny' });
    expect(openHandler({ url: 'https://www.nist.gov/pml/special-publication-811' })).toEqual({ action: 'deny' });
    expect(opened).toEqual(['https://www.nist.gov/pml/special-publication-811']);
    expect(isAllowedExternal('http://www.nist.gov/')).toBe(false);
  });

  it('denies every permission request and cancels remote requests', () => {
    let permission: (wc: unknown, p: string, cb: (ok: boolean) => void) => void = () => undefined;
    let before: (d: { url: string }, cb: (r: { cancel: boolean }) => void) => void = () => undefined;
    const session = {
      setPermissionRequestHandler: (fn: typeof permission) => (permission = fn),
      setPermissionCheckHandler: vi.fn(),
      webRequest: { onHeadersReceived: vi.fn(), onBeforeRequest: (fn: typeof before) => (before = fn) },
    };
    hardenSession(session as never);
    const answer = vi.fn();
    permission(null, 'media', answer);
    expect(answer).toHaveBeenCalledWith(false);
    const r = vi.fn();
    before({ url: 'https://cdn.example/x.js' }, r);
    expect(r).toHaveBeenCalledWith({ cancel: true });
    before({ url: 'app://sweepbook/assets/index.js' }, r);
    expect(r).toHaveBeenLastCalledWith({ cancel: false });
    before({ url: 'file:///etc/passwd' }, r);
    expect(r).toHaveBeenLastCalledWith({ cancel: true });
  });
});

describe('app:// scheme', () => {
  it('maps app://sweepbook/ paths into the renderer folder and refuses escapes and other hosts', () => {
    expect(resolveAppUrl('app://sweepbook/', APP_ROOT)).toEqual({ path: `${APP_ROOT}/index.html`, type: 'text/html; charset=utf-8' });
    expect(resolveAppUrl('app://sweepbook/assets/x.js', APP_ROOT)?.type).toContain('javascript');
    expect(resolveAppUrl('app://sweepbook/..%2F..%2Fpackage.json', APP_ROOT)).toBeUndefined();
    expect(resolveAppUrl('app://sweepbook/%00', APP_ROOT)).toBeUndefined();
    expect(resolveAppUrl('app://other/index.html', APP_ROOT)).toBeUndefined();
    expect(resolveAppUrl('file:///opt/sweepbook/dist/renderer/index.html', APP_ROOT)).toBeUndefined();
  });
});

describe('native menu', () => {
  it('offers the campaign commands with the usual shortcuts, and sends them to the page', () => {
    const sent: string[] = [];
    const t = menuTemplate((c) => sent.push(c), { isMac: false, recent: [] });
    const file = (t[0]!.submenu as MenuItemConstructorOptions[]).filter((i) => i.label);
    const byLabel = Object.fromEntries(file.map((i) => [i.label!, i]));
    expect(byLabel['New Campaign']!.accelerator).toBe('CmdOrCtrl+N');
    expect(byLabel['Open Campaign…']!.accelerator).toBe('CmdOrCtrl+O');
    expect(byLabel['Save Campaign']!.accelerator).toBe('CmdOrCtrl+S');
    expect(byLabel['Save Campaign As…']!.accelerator).toBe('CmdOrCtrl+Shift+S');
    expect(byLabel['Import Runs…']!.accelerator).toBe('CmdOrCtrl+I');
    (byLabel['Save Campaign']!.click as () => void)();
    (byLabel['Import Runs…']!.click as () => void)();
    expect(sent).toEqual(['campaign:save', 'runs:import']);
    expect((t[0]!.submenu as MenuItemConstructorOptions[]).some((i) => i.role === 'quit' && i.accelerator === 'CmdOrCtrl+Q')).toBe(true);
  });
});

describe('IPC handlers', () => {
  function setup(dialogPaths: { open?: string[]; save?: string } = {}) {
    const dir = mkdtempSync(join(tmpdir(), 'sweepbook-ipc-'));
    const grants = new FileGrants();
    const handlers = registerIpc({
      ipcMain: { handle: vi.fn() },
      dialog: {
        showOpenDialog: vi.fn(async () => ({ canceled: !dialogPaths.open, filePaths: dialogPaths.open ?? [] })),
        showSaveDialog: vi.fn(async () => ({ canceled: !dialogPaths.save, filePath: dialogPaths.save })),
      } as never,
      window: () => undefined,
      grants,
      recent: { list: async () => [], add: async () => undefined },
      sampleCampaignPath: join(dir, 'none.json'),
      setDirty: vi.fn(),
      print: vi.fn(),
    });
    const call = (channel: string, ...args: unknown[]) => handlers.get(channel)!(appEvent, ...args) as Promise<unknown>;
    return { dir, grants, handlers, call };
  }

  it('refuses calls from any page that is not the app', () => {
    const { handlers } = setup();
    expect(() => handlers.get('recent:list')!(foreignEvent)).toThrow(/not the app/);
  });

  it('reads only files the user chose, and streams them in chunks', async () => {
    const { dir, call } = setup();
    const run = join(dir, 'run.csv');
    writeFileSync(run, 'alpha,lift\n' + '1,2\n'.repeat(5000));
    await expect(call('file:sha256', '00000000-0000-4000-8000-000000000000')).rejects.toThrow(/not chosen by the user/);
    await expect(call('file:sha256', '../../etc/passwd')).rejects.toThrow();
    const { call: call2 } = setup({ open: [run] });
    const [chosen] = (await call2('runs:choose')) as { id: string; name: string }[];
    expect(chosen!.name).toBe('run.csv');
    const stream = (await call2('file:open-stream', chosen!.id, 4096)) as string;
    let text = '';
    let chunks = 0;
    for (;;) {
      const c = (await call2('file:next-chunk', stream)) as string | null;
      if (c === null) break;
      text += c;
      chunks++;
    }
    expect(text).toBe(readFileSync(run, 'utf8'));
    expect(chunks).toBeGreaterThan(1);
  });

  it('never writes a raw run file: a read grant cannot be saved over, and exports refuse it as a target', async () => {
    const { dir } = setup();
    const run = join(dir, 'run.csv');
    writeFileSync(run, 'alpha,lift\n1,2\n');
    const before = statSync(run).mtimeMs;
    const h = setup({ open: [run], save: run });
    const [chosen] = (await h.call('runs:choose')) as { id: string }[];
    expect(() => h.grants.get(chosen!.id, 'write')).toThrow(/never written/);
    await expect(h.call('campaign:save', '{}', { id: chosen!.id })).rejects.toThrow(/never written/);
    await expect(h.call('export:save', 'points.csv', 'a,b\n', 'text/csv')).rejects.toThrow(/raw run file/);
    expect(readFileSync(run, 'utf8')).toBe('alpha,lift\n1,2\n');
    expect(statSync(run).mtimeMs).toBe(before);
  });

  it('validates arguments: wrong types are refused before anything is touched', async () => {
    const { call } = setup();
    await expect(call('campaign:save', 42, {})).rejects.toThrow();
    await expect(call('campaign:save', '{}', { id: 'not-a-uuid' })).rejects.toThrow();
    await expect(call('app:set-dirty', 'yes')).rejects.toThrow();
    await expect(call('file:adopt-dropped', '/etc/shadow')).rejects.toThrow(/not a run file/);
  });

  it('opens the backup of a campaign the user opened, and only recent campaigns from the recent list', async () => {
    const { dir } = setup();
    const target = join(dir, 'c.json');
    writeFileSync(target, '{"v":2,"runs":[]}');
    writeFileSync(`${target}.bak`, '{"v":1,"runs":[]}');
    const h = setup({ open: [target] });
    const opened = (await h.call('campaign:open')) as { id: string; text: string; backupAvailable: boolean };
    expect(opened.text).toBe('{"v":2,"runs":[]}');
    expect(opened.backupAvailable).toBe(true);
    const backup = (await h.call('campaign:open-backup', opened.id)) as { text: string; id: string };
    expect(backup.text).toBe('{"v":1,"runs":[]}');
    expect(backup.id).toBe(opened.id); // saving writes the campaign file, not the backup
    await expect(h.call('campaign:open-backup', '00000000-0000-4000-8000-000000000000')).rejects.toThrow(/not chosen/);
    await expect(h.call('campaign:open-recent', target)).rejects.toThrow(/not a recent campaign/);
  });

  it('saves a campaign atomically and keeps the previous version as a backup', async () => {
    const { dir } = setup();
    const target = join(dir, 'campaign.json');
    writeFileSync(target, '{"old":true}\n');
    const h = setup({ save: target });
    const saved = (await h.call('campaign:save', '{"new":true}\n', { saveAs: true })) as { id: string; name: string };
    expect(saved.name).toBe('campaign.json');
    expect(readFileSync(target, 'utf8')).toBe('{"new":true}\n');
    expect(readFileSync(`${target}.bak`, 'utf8')).toBe('{"old":true}\n');
    await h.call('campaign:save', '{"newer":true}\n', { id: saved.id });
    expect(readFileSync(target, 'utf8')).toBe('{"newer":true}\n');
  });
});
