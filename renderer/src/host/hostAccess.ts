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
}

export type Host = SweepbookHost & HostExtras;

/** A run entry of an opened campaign (with its size where the host knows it, for the progress bar). */
export type OpenedRun = OpenedCampaign['runs'][number];

export function resolveHost(win: Window & { sweepbook?: Host }): Host {
  return win.sweepbook ?? createBrowserHost(win);
}
