/**
 * Messages between the user interface and the reduction worker. Runs are read once (streamed in
 * chunks) and kept in the worker by key; reductions are asked for separately, so a setup edit or a
 * tare change re-reduces without reading the file again.
 */
import type { ColumnMapping } from '../../../core/index.ts';
import type { Notice } from '../../../core/index.ts';
import type { ReductionResult } from '../../../core/index.ts';

/** The header line of a run file as found before reading, for the column-mapping step. */
export interface HeaderInfo {
  /** Physical 1-based line of the header. */
  line: number;
  text: string;
  signature: string;
  delimiter: string;
  /**
   * Header cells as the reader names them, with the unit the file gives: in brackets `alpha [deg]`, in
   * parentheses `AoA (deg)`, or in a units row below the header; `unitFrom` says which.
   */
  cells: { name: string; unit: string | null; unitFrom?: 'brackets' | 'parentheses' | 'units row' }[];
  /** 1-based line of a units row below the header, when there is one. */
  unitsRow?: number;
  /** A few data rows after the header, split into cells, as a preview. */
  preview: string[][];
}

/** Per-point sample statistics of every channel read (SI units), for the sample-scatter view. */
export interface ChannelStats {
  channels: string[];
  points: { key: string; line: number; n: number; mean: number[]; std: number[] }[];
}

/**
 * What a run's setup decides about reading it (not only reducing it): a balance calibration turns raw
 * bridge outputs into loads sample by sample, and the grouping tolerance forms points from rows without
 * a point column. The worker validates the setup; a calibration named by path comes with the text of
 * the balance file the host found for it.
 */
export interface ReadProfile {
  setupName: string;
  setup: unknown;
  /** The balance file a `balance.calibration` path names, as found beside the campaign. */
  balance: { name: string; text: string } | null;
}

export type ToWorker =
  | { type: 'begin'; id: number; key: string; file: string; mapping: ColumnMapping | null; mappings: Record<string, ColumnMapping>; profile?: ReadProfile | null }
  | { type: 'chunk'; id: number; text: string }
  /**
   * Read a file the page holds as a Blob (the browser host): the worker reads, decodes and hashes it
   * itself, so a campaign of thousands of files costs the page no file reading at all.
   */
  | {
      type: 'readBlob';
      id: number;
      key: string;
      file: string;
      blob: Blob;
      mapping: ColumnMapping | null;
      mappings: Record<string, ColumnMapping>;
      profile?: ReadProfile | null;
      /** Also work out the SHA-256 of the file's bytes (done for files of one chunk, else left to the host). */
      hash: boolean;
    }
  | { type: 'end'; id: number }
  | { type: 'reduce'; id: number; key: string; setupName: string; setup: unknown; tareKey: string | null }
  | { type: 'forget'; key: string };

export type ReadReply = (
  | { ok: true; header: HeaderInfo; stats: ChannelStats; rows: number; mappingUsed: ColumnMapping | null }
  | { ok: false; errors: Notice[]; header: HeaderInfo | null }
) & {
  /** SHA-256 of the file's bytes, hex, when a `readBlob` asked for it and could work it out. */
  sha256?: string | null;
};

export type ReduceReply =
  | { ok: true; result: ReductionResult; asMeasured: ReductionResult; reducedAt: string }
  | { ok: false; errors: Notice[] };

export type FromWorker =
  | { type: 'ack'; id: number; chars: number }
  /** Characters parsed so far of a `readBlob` (the progress bar). */
  | { type: 'progress'; id: number; chars: number }
  | { type: 'read'; id: number; reply: ReadReply }
  | { type: 'reduced'; id: number; reply: ReduceReply }
  | { type: 'crash'; id: number; message: string };
