/**
 * Every IPC channel between the main process (ipc.ts, main.ts) and the preload, named once. Both sides
 * import the names from here, so a renamed or misspelt channel is a type error, not a silent no-op.
 */

/** Request/response channels: the preload invokes, the main process handles (ipcMain.handle). */
export const INVOKE = {
  chooseRunFiles: 'runs:choose',
  adoptDroppedFile: 'file:adopt-dropped',
  openStream: 'file:open-stream',
  nextChunk: 'file:next-chunk',
  sha256: 'file:sha256',
  openSampleCampaign: 'campaign:sample',
  openCampaign: 'campaign:open',
  openRecentCampaign: 'campaign:open-recent',
  openCampaignBackup: 'campaign:open-backup',
  saveCampaign: 'campaign:save',
  saveExport: 'export:save',
  recentCampaigns: 'recent:list',
  setDirty: 'app:set-dirty',
  print: 'app:print',
} as const;

/** Events the main process sends to the page (webContents.send), which the preload listens to. */
export const EVENTS = {
  /** A menu command (core's MenuCommand) chosen in the application menu. */
  menuCommand: 'menu:command',
  /** A campaign chosen in the menu's recent list, by its path. */
  menuOpenRecent: 'menu:open-recent',
} as const;

export type InvokeChannel = (typeof INVOKE)[keyof typeof INVOKE];
export type EventChannel = (typeof EVENTS)[keyof typeof EVENTS];
