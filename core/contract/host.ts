/**
 * The one interface through which the renderer reaches the outside world (docs/architecture.md §1). Implemented
 * twice: by the Electron preload (contextBridge → IPC → main process) and by the browser host (file
 * inputs, downloads, local storage). Types only: core stays free of any host.
 */

/** A file the user chose (dialog, drop, file input). The id is the host's handle; the renderer never sees a path it could forge. */
export interface ChosenFile {
  id: string;
  /** File name without folders, for display. */
  name: string;
  size: number;
}

/** A campaign file as opened: its text and a display name. */
export interface OpenedCampaign {
  id: string;
  name: string;
  text: string;
  /**
   * Run files the campaign names, resolved by the host relative to the campaign (id null when missing);
   * `size` in bytes where the host knows it (optional: it only drives the reading progress bar).
   * `refused` says why the host would not open a listed file (outside the campaign folder, not a
   * regular file, too large); such a file has id null and was never read.
   */
  runs: { file: string; id: string | null; sha256: string | null; size?: number; refused?: string }[];
  /** Set when the campaign could not be read and a backup exists. */
  backupAvailable?: boolean;
}

export type MenuCommand =
  | 'campaign:new'
  | 'campaign:open'
  | 'campaign:save'
  | 'campaign:save-as'
  | 'runs:import'
  | 'export:points-csv'
  | 'export:points-xlsx'
  | 'export:fits-csv'
  | 'export:plot-png'
  | 'print:summary';

export interface SweepbookHost {
  readonly kind: 'electron' | 'browser';
  /** Ask the user for run files (several at once). */
  chooseRunFiles(): Promise<ChosenFile[]>;
  /** Read a chosen file's text in chunks (streamed; a million-row file never sits in one string). */
  readChunks(id: string, onChunk: (text: string) => void, chunkBytes?: number): Promise<void>;
  /** SHA-256 of a chosen file's bytes, hex. */
  sha256(id: string): Promise<string>;
  /** The bundled demonstration campaign, opened as a campaign file. */
  openSampleCampaign(): Promise<OpenedCampaign>;
  /** Ask the user for a campaign file and open it. Null when cancelled. */
  openCampaign(): Promise<OpenedCampaign | null>;
  /** Save campaign text; to the file it came from unless saveAs or it has none. Returns the saved name, null when cancelled. */
  saveCampaign(text: string, options: { id?: string; saveAs?: boolean; suggestedName?: string }): Promise<{ id: string; name: string } | null>;
  /** Offer bytes or text to the user as a file (save dialog or download). */
  saveExport(suggestedName: string, data: Uint8Array | string, mime: string): Promise<boolean>;
  /** Recently used campaigns, newest first. */
  recentCampaigns(): Promise<{ id: string; name: string }[]>;
  /** Menu commands from the native menu (Electron); the browser host never calls it. */
  onMenuCommand(listener: (command: MenuCommand) => void): () => void;
  /** Tell the host whether there are unsaved changes (it asks before closing). */
  setDirty(dirty: boolean): void;
  /** Print the current view (Electron: to PDF via the print dialog; browser: window.print()). */
  print(): Promise<void>;
  /** Optional: reopen a campaign from the recent list (an id from recentCampaigns()); null when it is gone or cancelled. */
  openRecentCampaign?(id: string): Promise<OpenedCampaign | null>;
  /**
   * Optional: the backup kept beside a campaign that could not be read (`backupAvailable`), opened in its
   * place: same id and name as the campaign, so saving writes the campaign file. Asked for only after the
   * user agreed.
   */
  openCampaignBackup?(campaignId: string): Promise<OpenedCampaign | null>;
}
