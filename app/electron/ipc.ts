/**
 * IPC handlers of the main process: every argument validated, every sender checked to be the app's
 * own page, every file access limited to paths the user chose (FileGrants).
 */
import { stat } from 'node:fs/promises';
import { randomUUID } from 'node:crypto';
import { extname, join, resolve } from 'node:path';
import type { BrowserWindow, Dialog, IpcMain, IpcMainInvokeEvent } from 'electron';
import { z } from 'zod';
import { CAMPAIGN_MAX_BYTES, campaignFiles, campaignTooLarge, parseCampaign, type Campaign, type ChosenFile, type OpenedCampaign } from '../../core/index.ts';
import { writeFileAtomic } from '../files/atomic.ts';
import { FileGrants } from './grants.ts';
import type { RecentList } from './recent.ts';
import { INVOKE, type InvokeChannel } from './ipcChannels.ts';
import { confinedCampaignFile, PullStream, readRegularText, refused, sha256Regular } from './safeFiles.ts';
import { isAppUrl } from './security.ts';

/** Open streams at most; opening one more closes the one unused longest. */
export const MAX_OPEN_STREAMS = 8;
/** A stream not pulled for this long is closed (the page went away or gave up). */
export const STREAM_IDLE_MS = 120_000;
/** No channel takes more arguments than this. */
const MAX_ARGS = 4;

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
    z.string().max(CAMPAIGN_MAX_BYTES),
    z.strictObject({ id: z.string().uuid().optional(), saveAs: z.boolean().optional(), suggestedName: z.string().max(255).optional() }),
  ]),
  saveExport: z.tuple([z.string().min(1).max(255), z.union([z.string().max(256 << 20), z.instanceof(Uint8Array)]), z.string().max(100)]),
  droppedPath: z.string().min(1).max(4096),
  dirty: z.boolean(),
};

type Handler = (event: IpcMainInvokeEvent, ...args: unknown[]) => unknown;

export function registerIpc(deps: IpcDeps): Map<string, Handler> {
  const handlers = new Map<string, Handler>();
  const streams = new Map<string, { stream: PullStream; grantId: string }>();
  const on = (channel: InvokeChannel, fn: (...args: unknown[]) => unknown) => {
    const handler: Handler = (event, ...args) => {
      const url = event.senderFrame?.url ?? '';
      if (!isAppUrl(url)) throw new Error(`refused: IPC from a page that is not the app (${url || 'unknown'})`);
      if (args.length > MAX_ARGS) throw new Error(`refused: ${channel} takes at most ${MAX_ARGS} arguments`);
      return fn(...args); // bounded spread: at most MAX_ARGS, checked above
    };
    handlers.set(channel, handler);
    deps.ipcMain.handle(channel, handler);
  };
  const chosen = async (path: string): Promise<ChosenFile> => {
    const g = await deps.grants.grantRead(path);
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

  /** Close streams idle too long, then the longest-unused ones beyond the limit (abandoned by the page). */
  const sweepStreams = async (room: number) => {
    const now = Date.now();
    for (const [id, s] of streams) {
      if (now - s.stream.lastUsed > STREAM_IDLE_MS) {
        streams.delete(id);
        await s.stream.close();
      }
    }
    const byAge = [...streams.entries()].sort((a, b) => a[1].stream.lastUsed - b[1].stream.lastUsed);
    while (byAge.length > MAX_OPEN_STREAMS - room) {
      const [id, s] = byAge.shift()!;
      streams.delete(id);
      await s.stream.close();
    }
  };

  // Pull-based: each file:next-chunk reads one chunk, so the page's pace holds back the reading.
  on(INVOKE.openStream, async (id, chunkBytes) => {
    const g = deps.grants.get(schemas.id.parse(id), 'read');
    await sweepStreams(1);
    const stream = await PullStream.open(g.path, schemas.chunkBytes.parse(chunkBytes) ?? 1 << 20);
    const streamId = randomUUID();
    streams.set(streamId, { stream, grantId: g.id });
    return streamId;
  });

  on(INVOKE.nextChunk, async (streamId) => {
    const entry = streams.get(String(streamId));
    if (!entry) throw refused('unknown or closed stream');
    let chunk: string | null;
    try {
      chunk = await entry.stream.next();
    } catch (err) {
      streams.delete(String(streamId));
      await entry.stream.close();
      throw err;
    }
    if (chunk === null || entry.stream.isClosed) {
      streams.delete(String(streamId));
      // the hash of exactly the bytes the page read, kept for file:sha256
      if (entry.stream.digest) deps.grants.get(entry.grantId, 'read').digest = entry.stream.digest;
    }
    return chunk;
  });

  on(INVOKE.closeStream, async (streamId) => {
    const entry = streams.get(String(streamId));
    streams.delete(String(streamId));
    await entry?.stream.close();
    return null;
  });

  on(INVOKE.sha256, async (id) => {
    const g = deps.grants.get(schemas.id.parse(id), 'read');
    if (g.digest) {
      try {
        const s = await stat(g.path);
        if (s.size === g.digest.size && s.mtimeMs === g.digest.mtimeMs) return g.digest.sha256;
      } catch {
        // gone: the hash below reports it
      }
    }
    g.digest = await sha256Regular(g.path);
    return g.digest.sha256;
  });

  /**
   * Open a campaign: its text is read only when it is a regular file within the size limit; the files
   * it names are looked at only after the document has been validated, and only inside its folder.
   */
  const openCampaignAt = async (path: string, from: string = path): Promise<OpenedCampaign> => {
    const g = deps.grants.grant(path, 'write');
    const text = await readRegularText(from, CAMPAIGN_MAX_BYTES, campaignTooLarge);
    const runs: OpenedCampaign['runs'] = [];
    let campaign: Campaign | undefined;
    try {
      campaign = parseCampaign(g.name, text);
    } catch {
      campaign = undefined; // the renderer reports an unreadable campaign with its own message; no file is touched
    }
    for (const file of campaign ? campaignFiles(campaign) : []) {
      const found = await confinedCampaignFile(g.path, file);
      if ('refused' in found) {
        runs.push({ file, id: null, sha256: null, refused: found.refused });
        continue;
      }
      try {
        const grant = await deps.grants.grantRead(found.path);
        grant.digest = await sha256Regular(found.path);
        runs.push({ file, id: grant.id, sha256: grant.digest.sha256, size: grant.digest.size });
      } catch {
        runs.push({ file, id: null, sha256: null });
      }
    }
    await deps.recent.add(g.path);
    let backupAvailable: boolean;
    try {
      backupAvailable = (await stat(`${g.path}.bak`)).isFile();
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
    const problem = await deps.grants.writeProblem(path);
    if (problem) throw refused(problem);
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
    const problem = await deps.grants.writeProblem(target);
    if (problem) throw refused(problem);
    await writeFileAtomic(target, data);
    return true;
  });

  on(INVOKE.recentCampaigns, async () => (await deps.recent.list()).map((p) => ({ id: p, name: p.split(/[\\/]/).pop() ?? p })));
  on(INVOKE.setDirty, async (dirty) => deps.setDirty(schemas.dirty.parse(dirty)));
  on(INVOKE.print, async () => deps.print());
  return handlers;
}

export const SAMPLE_CAMPAIGN_FILE = join('sample-runs', 'sweepbook-campaign.json');
