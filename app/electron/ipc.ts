/**
 * IPC handlers of the main process: every argument validated, every sender checked to be the app's
 * own page, every file access limited to paths the user chose (FileGrants).
 */
import { readFile, stat } from 'node:fs/promises';
import { dirname, extname, join, resolve } from 'node:path';
import type { BrowserWindow, Dialog, IpcMain, IpcMainInvokeEvent } from 'electron';
import { z } from 'zod';
import type { ChosenFile, OpenedCampaign } from '../../core/index.ts';
import { writeFileAtomic } from '../files/atomic.ts';
import { FileGrants, sha256File, streamText } from './grants.ts';
import type { RecentList } from './recent.ts';
import { INVOKE, type InvokeChannel } from './ipcChannels.ts';
import { isAppUrl } from './security.ts';

export interface IpcDeps {
  ipcMain: Pick<IpcMain, 'handle'>;
  dialog: Pick<Dialog, 'showOpenDialog' | 'showSaveDialog'>;
  window: () => BrowserWindow | undefined;
  grants: FileGrants;
  recent: RecentList;
  sampleCampaignPath: string;
  setDirty: (dirty: boolean) => void;
  print: () => Promise<void>;
}

const RUN_EXTENSIONS = ['.csv', '.txt', '.tsv', '.dat', '.json'];

const schemas = {
  id: z.string().uuid(),
  chunkBytes: z.number().int().min(4096).max(64 << 20).optional(),
  saveCampaign: z.tuple([
    z.string().max(64 << 20),
    z.strictObject({ id: z.string().uuid().optional(), saveAs: z.boolean().optional(), suggestedName: z.string().max(255).optional() }),
  ]),
  saveExport: z.tuple([z.string().min(1).max(255), z.union([z.string().max(256 << 20), z.instanceof(Uint8Array)]), z.string().max(100)]),
  droppedPath: z.string().min(1).max(4096),
  dirty: z.boolean(),
};

type Handler = (event: IpcMainInvokeEvent, ...args: unknown[]) => unknown;

export function registerIpc(deps: IpcDeps): Map<string, Handler> {
  const handlers = new Map<string, Handler>();
  const streams = new Map<string, AsyncIterator<string>>();
  const on = (channel: InvokeChannel, fn: (...args: unknown[]) => unknown) => {
    const handler: Handler = (event, ...args) => {
      const url = event.senderFrame?.url ?? '';
      if (!isAppUrl(url)) throw new Error(`refused: IPC from a page that is not the app (${url || 'unknown'})`);
      return fn(...args);
    };
    handlers.set(channel, handler);
    deps.ipcMain.handle(channel, handler);
  };
  const chosen = async (path: string): Promise<ChosenFile> => {
    const g = deps.grants.grant(path, 'read');
    let size: number;
    try {
      size = (await stat(g.path)).size;
    } catch {
      size = 0; // reported when the file is read
    }
    return { id: g.id, name: g.name, size };
  };

  on(INVOKE.chooseRunFiles, async () => {
    const win = deps.window();
    const opts = {
      title: 'Import run files',
      properties: ['openFile', 'multiSelections'] as ('openFile' | 'multiSelections')[],
      filters: [
        { name: 'Run files', extensions: ['csv', 'txt', 'tsv', 'dat'] },
        { name: 'Setup files', extensions: ['json'] },
      ],
    };
    const r = win ? await deps.dialog.showOpenDialog(win, opts) : await deps.dialog.showOpenDialog(opts);
    return r.canceled ? [] : Promise.all(r.filePaths.map(chosen));
  });

  on(INVOKE.adoptDroppedFile, async (path) => {
    const p = schemas.droppedPath.parse(path);
    if (!RUN_EXTENSIONS.includes(extname(p).toLowerCase())) throw new Error(`refused: ${p} is not a run file (${RUN_EXTENSIONS.join(', ')})`);
    return chosen(p);
  });

  on(INVOKE.openStream, async (id, chunkBytes) => {
    const g = deps.grants.get(schemas.id.parse(id), 'read');
    const queue: string[] = [];
    let done = false;
    let failure: unknown;
    let wake: (() => void) | undefined;
    streamText(g.path, (t) => {
      queue.push(t);
      wake?.();
    }, schemas.chunkBytes.parse(chunkBytes))
      .catch((err) => (failure = err))
      .finally(() => {
        done = true;
        wake?.();
      });
    const iterator: AsyncIterator<string> = {
      next: async () => {
        while (queue.length === 0 && !done) await new Promise<void>((r) => (wake = r));
        if (failure) throw failure;
        const value = queue.shift();
        return value === undefined ? { done: true, value: undefined } : { done: false, value };
      },
    };
    const streamId = `${g.id}:${Math.random().toString(36).slice(2)}`;
    streams.set(streamId, iterator);
    return streamId;
  });

  on(INVOKE.nextChunk, async (streamId) => {
    const it = streams.get(String(streamId));
    if (!it) throw new Error('refused: unknown stream');
    const r = await it.next();
    if (r.done) {
      streams.delete(String(streamId));
      return null;
    }
    return r.value;
  });

  on(INVOKE.sha256, async (id) => sha256File(deps.grants.get(schemas.id.parse(id), 'read').path));

  const openCampaignAt = async (path: string, from: string = path): Promise<OpenedCampaign> => {
    const g = deps.grants.grant(path, 'write');
    const text = await readFile(from, 'utf8');
    const runs: OpenedCampaign['runs'] = [];
    let names: string[] = [];
    try {
      const json = JSON.parse(text) as { runs?: { file?: unknown }[]; tares?: { file?: unknown }[] };
      names = [...(json.runs ?? []), ...(json.tares ?? [])].map((r) => r.file).filter((f): f is string => typeof f === 'string');
    } catch {
      // the renderer reports an unreadable campaign with its own message
    }
    for (const file of [...new Set(names)]) {
      const p = resolve(dirname(g.path), file);
      try {
        const sha = await sha256File(p);
        runs.push({ file, id: (await chosen(p)).id, sha256: sha, size: (await stat(p)).size });
      } catch {
        runs.push({ file, id: null, sha256: null });
      }
    }
    await deps.recent.add(g.path);
    let backupAvailable: boolean;
    try {
      await readFile(`${g.path}.bak`);
      backupAvailable = true;
    } catch {
      backupAvailable = false;
    }
    return { id: g.id, name: g.name, text, runs, backupAvailable };
  };

  on(INVOKE.openSampleCampaign, async () => {
    const opened = await openCampaignAt(deps.sampleCampaignPath);
    // the bundled sample is never overwritten: saving it asks for a new place
    return { ...opened, id: `sample:${opened.id}` };
  });

  on(INVOKE.openCampaign, async () => {
    const win = deps.window();
    const opts = { title: 'Open campaign', properties: ['openFile'] as 'openFile'[], filters: [{ name: 'Sweepbook campaign', extensions: ['json'] }] };
    const r = win ? await deps.dialog.showOpenDialog(win, opts) : await deps.dialog.showOpenDialog(opts);
    if (r.canceled || r.filePaths.length === 0) return null;
    return openCampaignAt(r.filePaths[0]!);
  });

  on(INVOKE.openRecentCampaign, async (path) => {
    const p = schemas.droppedPath.parse(path);
    if (!(await deps.recent.list()).includes(p)) throw new Error('refused: not a recent campaign');
    return openCampaignAt(p);
  });

  // the previous version kept beside a campaign: opened in its place after the user agreed; saving writes the campaign file
  on(INVOKE.openCampaignBackup, async (id) => {
    const g = deps.grants.get(schemas.id.parse(id), 'write');
    return openCampaignAt(g.path, `${g.path}.bak`);
  });

  on(INVOKE.saveCampaign, async (...args) => {
    const [text, options] = schemas.saveCampaign.parse(args);
    let path: string | undefined;
    if (options.id && !options.saveAs) path = deps.grants.get(options.id, 'write').path;
    if (!path) {
      const win = deps.window();
      const opts = { title: 'Save campaign', defaultPath: options.suggestedName ?? 'campaign.json', filters: [{ name: 'Sweepbook campaign', extensions: ['json'] }] };
      const r = win ? await deps.dialog.showSaveDialog(win, opts) : await deps.dialog.showSaveDialog(opts);
      if (r.canceled || !r.filePath) return null;
      path = r.filePath;
    }
    const g = deps.grants.grant(path, 'write');
    await writeFileAtomic(g.path, text, { backup: true });
    await deps.recent.add(g.path);
    return { id: g.id, name: g.name };
  });

  on(INVOKE.saveExport, async (...args) => {
    const [name, data] = schemas.saveExport.parse(args);
    const win = deps.window();
    const opts = { title: 'Export', defaultPath: name };
    const r = win ? await deps.dialog.showSaveDialog(win, opts) : await deps.dialog.showSaveDialog(opts);
    if (r.canceled || !r.filePath) return false;
    const target = resolve(r.filePath);
    if (deps.grants.isReadGrant(target)) throw new Error(`refused: ${target} is a raw run file and is never overwritten`);
    await writeFileAtomic(target, data);
    return true;
  });

  on(INVOKE.recentCampaigns, async () => (await deps.recent.list()).map((p) => ({ id: p, name: p.split(/[\\/]/).pop() ?? p })));
  on(INVOKE.setDirty, async (dirty) => deps.setDirty(schemas.dirty.parse(dirty)));
  on(INVOKE.print, async () => deps.print());
  return handlers;
}

export const SAMPLE_CAMPAIGN_FILE = join('sample-runs', 'sweepbook-campaign.json');
