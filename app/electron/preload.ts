/**
 * Preload (sandboxed, CommonJS bundle): exposes the SweepbookHost interface on window.sweepbook and
 * nothing else. Each method is one validated IPC call; no Node or Electron object reaches the page.
 */
import { contextBridge, ipcRenderer, webUtils } from 'electron';
import type { ChosenFile, MenuCommand, SweepbookHost } from '../../core/index.ts';
import { EVENTS, INVOKE } from './ipcChannels.ts';

const host: SweepbookHost & { adoptDroppedFile(file: File): Promise<ChosenFile>; onOpenRecent(listener: (id: string) => void): () => void } = {
  kind: 'electron',
  chooseRunFiles: () => ipcRenderer.invoke(INVOKE.chooseRunFiles),
  readChunks: async (id, onChunk, chunkBytes) => {
    const stream: string = await ipcRenderer.invoke(INVOKE.openStream, id, chunkBytes);
    let finished = false;
    try {
      for (;;) {
        const chunk: string | null = await ipcRenderer.invoke(INVOKE.nextChunk, stream);
        if (chunk === null) {
          finished = true;
          return;
        }
        // pulled one at a time: a renderer that returns a promise holds back the next read (back-pressure)
        await (onChunk(chunk) as unknown);
      }
    } finally {
      // a reader that gave up (an error in onChunk) frees the main process's file handle at once
      if (!finished) void ipcRenderer.invoke(INVOKE.closeStream, stream).catch(() => undefined);
    }
  },
  sha256: (id) => ipcRenderer.invoke(INVOKE.sha256, id),
  openSampleCampaign: () => ipcRenderer.invoke(INVOKE.openSampleCampaign),
  openCampaign: () => ipcRenderer.invoke(INVOKE.openCampaign),
  saveCampaign: (text, options) => ipcRenderer.invoke(INVOKE.saveCampaign, text, options),
  saveExport: (name, data, mime) => ipcRenderer.invoke(INVOKE.saveExport, name, data, mime),
  recentCampaigns: () => ipcRenderer.invoke(INVOKE.recentCampaigns),
  onMenuCommand: (listener) => {
    const fn = (_e: unknown, command: MenuCommand) => listener(command);
    ipcRenderer.on(EVENTS.menuCommand, fn);
    return () => ipcRenderer.removeListener(EVENTS.menuCommand, fn);
  },
  setDirty: (dirty) => void ipcRenderer.invoke(INVOKE.setDirty, dirty),
  print: () => ipcRenderer.invoke(INVOKE.print),
  adoptDroppedFile: (file) => ipcRenderer.invoke(INVOKE.adoptDroppedFile, webUtils.getPathForFile(file)),
  openRecentCampaign: (id) => ipcRenderer.invoke(INVOKE.openRecentCampaign, id),
  // File → Open Recent in the native menu: the id is the recent list's own, checked again by campaign:open-recent
  onOpenRecent: (listener) => {
    const fn = (_e: unknown, id: unknown) => {
      if (typeof id === 'string') listener(id);
    };
    ipcRenderer.on(EVENTS.menuOpenRecent, fn);
    return () => ipcRenderer.removeListener(EVENTS.menuOpenRecent, fn);
  },
  openCampaignBackup: (id) => ipcRenderer.invoke(INVOKE.openCampaignBackup, id),
};

contextBridge.exposeInMainWorld('sweepbook', host);
