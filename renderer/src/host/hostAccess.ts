/**
 * How the renderer finds its host: the Electron preload exposes one as `window.sweepbook`; without it
 * (a plain browser, the tests, an offline install) the browser host stands in.
 */
import type { ChosenFile, OpenedCampaign, SweepbookHost } from '../../../core/index.ts';
import { createBrowserHost } from './browserHost.ts';

/**
 * What a host may offer beyond core's interface: taking dropped files, which needs the DOM's File (core
 * stays free of the DOM). Reopening a recent campaign, opening a backup and file sizes are core's own
 * optional members. The renderer checks for each before using it.
 */
export interface HostExtras {
  /** Files dropped onto the window, turned into chosen files (the browser host). */
  acceptDroppedFiles?(files: File[]): Promise<ChosenFile[]>;
  /** One dropped file turned into a chosen file (the Electron preload, by the file's path). */
  adoptDroppedFile?(file: File): Promise<ChosenFile>;
  /**
   * Keep the working campaign and the files it was opened with, so a reload or a restart of the browser
   * host finds them again (the browser host; the desktop window works on files on disk instead).
   */
  keepSession?(session: KeptSession): Promise<void>;
  /** File → Open Recent in a native menu (the Electron preload): the id to pass to openRecentCampaign. */
  onOpenRecent?(listener: (id: string) => void): () => void;
  /**
   * The Blob behind a chosen file (the browser host): handed to the reduction worker, which reads it
   * off the page's thread. Hosts whose files live elsewhere (the desktop window) stream them with readChunks.
   */
  blobOf?(id: string): Blob;
  /** A SHA-256 worked out elsewhere (the worker, while reading a Blob), remembered by the host. */
  noteDigest?(id: string, digest: string): void;
  /** The campaign kept by keepSession, its files chosen again under new ids; null when nothing is kept. */
  restoreSession?(): Promise<RestoredSession | null>;
}

export interface KeptSession {
  campaignText: string;
  /** What the campaign was when last saved or opened (unsaved changes stay unsaved after a reload). */
  savedText: string;
  campaignFile: string | null;
  /** Run and tare files by their name in the campaign, with the host's id of their content. */
  files: { file: string; id: string }[];
}

export interface RestoredSession {
  opened: OpenedCampaign;
  savedText: string;
  campaignFile: string | null;
}

export type Host = SweepbookHost & HostExtras;

/** A run entry of an opened campaign (with its size where the host knows it, for the progress bar). */
export type OpenedRun = OpenedCampaign['runs'][number];

export function resolveHost(win: Window & { sweepbook?: Host }): Host {
  return win.sweepbook ?? createBrowserHost(win);
}
