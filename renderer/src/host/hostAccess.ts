/**
 * How the renderer finds its host: the Electron preload exposes one as `window.sweepbook`; without it
 * (a plain browser, the tests, an offline install) the browser host stands in.
 */
import type { ChosenFile, OpenedCampaign, SweepbookHost } from '../../../core/host.ts';
import { createBrowserHost } from './browserHost.ts';

/**
 * What a host may offer beyond core's interface. The renderer checks for each before using it.
 * (Asked of core/host.ts: drop, reopening a recent campaign, opening the backup, file sizes.)
 */
export interface HostExtras {
  /** Files dropped onto the window, turned into chosen files (the browser host). */
  acceptDroppedFiles?(files: File[]): Promise<ChosenFile[]>;
  /** One dropped file turned into a chosen file (the Electron preload, by the file's path). */
  adoptDroppedFile?(file: File): Promise<ChosenFile>;
  /** Reopen a campaign from the recent list. */
  openRecentCampaign?(id: string): Promise<OpenedCampaign | null>;
}

export type Host = SweepbookHost & HostExtras;

/** A run entry of an opened campaign; a host may add the file size (for the progress bar). */
export type OpenedRun = OpenedCampaign['runs'][number] & { size?: number };

export function resolveHost(win: Window & { sweepbook?: Host }): Host {
  return win.sweepbook ?? createBrowserHost(win);
}
