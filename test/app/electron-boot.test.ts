import Module, { createRequire } from 'node:module';
import { join, resolve } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { buildElectron, electronBuild } from '../../electron.config.ts';

/**
 * The bundled main process (dist/electron/main.cjs) booted with `electron` replaced by a recording
 * fake: it must register the privileged app:// scheme, open one hardened window on it, and set a menu.
 */
describe('main process boot (electron mocked)', () => {
  it('opens one window with isolation, sandbox and no Node, on app://sweepbook, with the menu set', async () => {
    await buildElectron();
    const calls: Record<string, unknown[][]> = {};
    const record = (name: string) => (...args: unknown[]) => {
      (calls[name] ??= []).push(args);
    };
    let ready: () => void = () => undefined;
    const whenReady = new Promise<void>((r) => (ready = r));
    const windows: { options: Record<string, unknown>; url?: string }[] = [];
    class FakeWindow {
      webContents = { on: vi.fn(), setWindowOpenHandler: vi.fn(), send: vi.fn(), print: vi.fn() };
      entry: { options: Record<string, unknown>; url?: string };
      constructor(options: Record<string, unknown>) {
        this.entry = { options };
        windows.push(this.entry);
      }
      on = vi.fn();
      once = vi.fn();
      show = vi.fn();
      setDocumentEdited = vi.fn();
      async loadURL(url: string) {
        this.entry.url = url;
      }
    }
    const session = { setPermissionRequestHandler: vi.fn(), setPermissionCheckHandler: vi.fn(), webRequest: { onHeadersReceived: vi.fn(), onBeforeRequest: vi.fn() } };
    const fake = {
      app: { whenReady: () => whenReady, enableSandbox: record('enableSandbox'), on: vi.fn(), getPath: () => join(resolve(__dirname), '.userdata-unused'), quit: vi.fn() },
      BrowserWindow: FakeWindow,
      dialog: { showOpenDialog: vi.fn(), showSaveDialog: vi.fn(), showMessageBoxSync: vi.fn() },
      ipcMain: { handle: record('handle') },
      Menu: { buildFromTemplate: (t: unknown) => t, setApplicationMenu: record('setApplicationMenu') },
      net: { fetch: vi.fn() },
      protocol: { registerSchemesAsPrivileged: record('registerSchemesAsPrivileged'), handle: record('protocolHandle') },
      shell: { openExternal: vi.fn() },
      session: { defaultSession: session },
    };
    const loader = Module as unknown as { _load: (request: string, ...rest: unknown[]) => unknown };
    const original = loader._load;
    loader._load = (request, ...rest) => (request === 'electron' ? fake : original(request, ...rest));
    try {
      createRequire(import.meta.url)(join(electronBuild.outDir, 'main.cjs'));
      ready();
      await new Promise((r) => setTimeout(r, 50));
    } finally {
      loader._load = original;
    }
    expect(calls['registerSchemesAsPrivileged']?.[0]).toEqual([[{ scheme: 'app', privileges: { standard: true, secure: true, supportFetchAPI: true } }]]);
    expect(calls['enableSandbox']).toHaveLength(1);
    expect(windows).toHaveLength(1);
    expect(windows[0]!.url).toBe('app://sweepbook/index.html');
    expect(windows[0]!.options['webPreferences']).toMatchObject({ contextIsolation: true, sandbox: true, nodeIntegration: false });
    expect(String((windows[0]!.options['webPreferences'] as { preload: string }).preload)).toMatch(/preload\.cjs$/);
    expect(calls['protocolHandle']?.[0]?.[0]).toBe('app');
    expect(calls['setApplicationMenu']).toHaveLength(1);
    const channels = (calls['handle'] ?? []).map((c) => c[0]);
    expect(channels).toEqual(expect.arrayContaining(['runs:choose', 'file:open-stream', 'campaign:save', 'export:save']));
    expect(session.setPermissionRequestHandler).toHaveBeenCalled();
  }, 60_000);
});
