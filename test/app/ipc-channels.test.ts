import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { registerIpc } from '../../app/electron/ipc.ts';
import { EVENTS, INVOKE } from '../../app/electron/ipcChannels.ts';
import { FileGrants } from '../../app/electron/grants.ts';

/** The IPC channel names live in one table (app/electron/ipcChannels.ts) shared by main and preload. */
const ROOT = resolve(__dirname, '../..');
const CHANNEL_LITERAL = /['"`]([a-z]+:[a-z-]+)['"`]/g;

describe('IPC channel table', () => {
  it('names each channel once', () => {
    const names = [...Object.values(INVOKE), ...Object.values(EVENTS)];
    expect(new Set(names).size).toBe(names.length);
  });

  it('has a main-process handler for every invoke channel, and none besides', () => {
    const handle = vi.fn();
    registerIpc({
      ipcMain: { handle },
      dialog: { showOpenDialog: vi.fn(), showSaveDialog: vi.fn() } as never,
      window: () => undefined,
      grants: new FileGrants(),
      recent: { list: async () => [], add: async () => undefined },
      sampleCampaignPath: '/nonexistent/campaign.json',
      setDirty: vi.fn(),
      print: vi.fn(),
    });
    expect(handle.mock.calls.map((c) => c[0]).sort()).toEqual(Object.values(INVOKE).sort());
  });

  it('is the only place the main process and the preload spell a channel name', () => {
    for (const file of ['app/electron/ipc.ts', 'app/electron/main.ts', 'app/electron/preload.ts']) {
      const literals = [...readFileSync(resolve(ROOT, file), 'utf8').matchAll(CHANNEL_LITERAL)].map((m) => m[1]).filter((s) => !s!.startsWith('node:'));
      expect(literals, file).toEqual([]);
    }
  });

  it('lets the preload invoke every channel the main process handles', () => {
    const preload = readFileSync(resolve(ROOT, 'app/electron/preload.ts'), 'utf8');
    for (const key of Object.keys(INVOKE)) expect(preload, `preload never invokes INVOKE.${key}`).toContain(`INVOKE.${key}`);
  });
});
