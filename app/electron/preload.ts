/**
 * Preload (sandboxed, CommonJS bundle): exposes the SweepbookHost interface on window.sweepbook and
 * nothing else. Each method is one validated IPC call; no Node or Electron object reaches the page.
 */
import { contextBridge, ipcRenderer, webUtils } from 'electron';
import type { ChosenFile, MenuCommand, SweepbookHost } from '../../core/index.ts';

const host: SweepbookHost & { adoptDroppedFile(file: File): Promise<ChosenFile> } = {
  kind: 'electron',
  chooseRunFiles: () => ipcRenderer.invoke('runs:choose'),
  readChunks: async (id, onChunk, chunkBytes) => {
    const stream: string = await ipcRenderer.invoke('file:open-stream', id, chunkBytes);
    let finished = false;
    try {
      for (;;) {
        const chunk: string | null = await ipcRenderer.invoke('file:next-chunk', stream);
        if (chunk === null) {
          finished = true;
          return;
        }
        // pulled one at a time: a renderer that returns a promise holds back the next read (back-pressure)
        await (onChunk(chunk) as unknown);
      }
    } finally {
      // a reader that gave up (an error in onChunk) frees the main process's file handle at once
      if (!finished) void ipcRenderer.invoke('file:close-stream', stream).catch(() => undefined);
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
  openCampaignBackup: (id) => ipcRenderer.invoke('campaign:open-backup', id),
};

contextBridge.exposeInMainWorld('sweepbook', host);
