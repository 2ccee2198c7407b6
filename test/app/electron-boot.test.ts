import { existsSync, mkdirSync, readFileSync, rmdirSync, rmSync, writeFileSync } from 'node:fs';
import Module, { createRequire } from 'node:module';
import { join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it, vi } from 'vitest';
import { buildElectron, electronBuild } from '../../electron.config.ts';

function rmdirSafe(dir: string): void {
  try {
    rmdirSync(dir); // fails, and keeps it, when another process has built into it meanwhile
  } catch {
    // not empty: leave it
  }
}

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
    // net.fetch as an Electron that applies the session's request filter to it would behave
    const netFetch = vi.fn(async (url: string) => {
      const filter = session.webRequest.onBeforeRequest.mock.calls[0]?.[0] as ((d: { url: string }, cb: (r: { cancel: boolean }) => void) => void) | undefined;
      let cancel = false;
      filter?.({ url }, (r) => (cancel = r.cancel));
      if (cancel) throw new Error(`net::ERR_BLOCKED_BY_CLIENT ${url}`);
      return new Response(readFileSync(fileURLToPath(url)));
    });
    const fake = {
      app: { whenReady: () => whenReady, enableSandbox: record('enableSandbox'), on: vi.fn(), getPath: () => join(resolve(__dirname), '.userdata-unused'), quit: vi.fn() },
      BrowserWindow: FakeWindow,
      dialog: { showOpenDialog: vi.fn(), showSaveDialog: vi.fn(), showMessageBoxSync: vi.fn() },
      ipcMain: { handle: record('handle') },
      Menu: { buildFromTemplate: (t: unknown) => t, setApplicationMenu: record('setApplicationMenu') },
      net: { fetch: netFetch },
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

    // The app:// handler serves the renderer's own files with the request filter in force.
    const handler = calls['protocolHandle']![0]![1] as (req: Request) => Promise<Response>;
    const rendererRoot = resolve(electronBuild.outDir, '..', 'renderer');
    const made = !existsSync(rendererRoot);
    mkdirSync(rendererRoot, { recursive: true });
    const probe = `boot-probe-${process.pid}.js`;
    writeFileSync(join(rendererRoot, probe), 'export const probe = 1;\n');
    try {
      const res = await handler(new Request(`app://sweepbook/${probe}`));
      expect(res.status).toBe(200);
      expect(res.headers.get('content-type')).toContain('javascript');
      expect(await res.text()).toBe('export const probe = 1;\n');
      expect((await handler(new Request('app://sweepbook/..%2F..%2Fpackage.json'))).status).toBe(404);
      expect(netFetch).not.toHaveBeenCalled();
    } finally {
      // only what this test made: the probe, and the folder if it made it and it is still empty
      rmSync(join(rendererRoot, probe), { force: true });
      if (made) rmdirSafe(rendererRoot);
    }
  }, 60_000);
});
