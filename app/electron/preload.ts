/**
 * Preload (sandboxed, CommonJS bundle): exposes the SweepbookHost interface on window.sweepbook and
 * nothing else. Each method is one validated IPC call; no Node or Electron object reaches the page.
 */
import { contextBridge, ipcRenderer, webUtils } from 'electron';
import type { ChosenFile, MenuCommand, SweepbookHost } from '../../core/index.ts';

const host: SweepbookHost & { adoptDroppedFile(file: File): Promise<ChosenFile>; onOpenRecent(listener: (id: string) => void): () => void } = {
  kind: 'electron',
  chooseRunFiles: () => ipcRenderer.invoke('runs:choose'),
  readChunks: async (id, onChunk, chunkBytes) => {
    const stream: string = await ipcRenderer.invoke('file:open-stream', id, chunkBytes);
    for (;;) {
      const chunk: string | null = await ipcRenderer.invoke('file:next-chunk', stream);
      if (chunk === null) return;
      // a renderer that returns a promise gets back-pressure: the next chunk waits for it
      await (onChunk(chunk) as unknown);
    }
  },
  sha256: (id) => ipcRenderer.invoke('file:sha256', id),
  openSampleCampaign: () => ipcRenderer.invoke('campaign:sample'),
  openCampaign: () => ipcRenderer.invoke('campaign:open'),
  saveCampaign: (text, options) => ipcRenderer.invoke('campaign:save', text, options),
  saveExport: (name, data, mime) => ipcRenderer.invoke('export:save', name, data, mime),
  recentCampaigns: () => ipcRenderer.invoke('recent:list'),
  onMenuCommand: (listener) => {
    const fn = (_e: unknown, command: MenuCommand) => listener(command);
    ipcRenderer.on('menu:command', fn);
    return () => ipcRenderer.removeListener('menu:command', fn);
  },
  setDirty: (dirty) => void ipcRenderer.invoke('app:set-dirty', dirty),
  print: () => ipcRenderer.invoke('app:print'),
  adoptDroppedFile: (file) => ipcRenderer.invoke('file:adopt-dropped', webUtils.getPathForFile(file)),
  openRecentCampaign: (id) => ipcRenderer.invoke('campaign:open-recent', id),
  // File → Open Recent in the native menu: the id is the recent list's own, checked again by campaign:open-recent
  onOpenRecent: (listener) => {
    const fn = (_e: unknown, id: unknown) => {
      if (typeof id === 'string') listener(id);
    };
    ipcRenderer.on('menu:open-recent', fn);
    return () => ipcRenderer.removeListener('menu:open-recent', fn);
  },
  openCampaignBackup: (id) => ipcRenderer.invoke('campaign:open-backup', id),
};

contextBridge.exposeInMainWorld('sweepbook', host);
