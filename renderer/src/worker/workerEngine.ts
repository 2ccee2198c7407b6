/**
 * What the reduction worker does, free of the worker's message plumbing so it can be tested in
 * process: streams chunks into core's RunFileReader, keeps the read runs by key, reduces on request.
 */
import { attempt, InputError, type Notice, type Outcome } from '../../../core/index.ts';
import { reduceRunBothBases } from '../../../core/index.ts';
import { RunFileReader, type ColumnMapping, type GroupingOptions, type RunData, type SampleTransform } from '../../../core/index.ts';
import { validateSetup, type SetupResult } from '../../../core/index.ts';
import { balanceTransform, checkBalanceAxes, parseBalance, type Balance } from '../../../core/index.ts';
import { sniffHeader } from './headerSniff.ts';
import type { ChannelStats, FromWorker, HeaderInfo, ReadProfile, ReadReply, ReduceReply, ToWorker } from './protocol.ts';

/** Text kept before the header is known (enough for the header and a preview of the rows after it). */
const SNIFF_BYTES = 64 * 1024;

interface ReadJob {
  key: string;
  file: string;
  explicit: ColumnMapping | null;
  mappings: Record<string, ColumnMapping>;
  pending: string;
  header: HeaderInfo | null;
  reader: RunFileReader | null;
  mappingUsed: ColumnMapping | null;
  errors: Notice[] | null;
  /** What the run's setup decides about reading it (resolved once, before the first chunk). */
  read: ReadSettings;
}

/** How a run is read: the balance calibration's per-sample conversion and the grouping tolerance. */
interface ReadSettings {
  balance: Balance | null;
  transform: SampleTransform | undefined;
  grouping: GroupingOptions | undefined;
}

const PLAIN: ReadSettings = { balance: null, transform: undefined, grouping: undefined };

/** A run as read, with the balance it was read through (put into the setup in place of its path when reducing). */
interface ReadRun {
  run: RunData;
  balance: Balance | null;
}

export class WorkerEngine {
  private readonly runs = new Map<string, ReadRun>();
  private readonly jobs = new Map<number, ReadJob>();
  // a thousand runs share a handful of setups: each is validated once (by its name and JSON text)
  private readonly setups = new Map<string, { text: string; outcome: Outcome<SetupResult> }>();
  private readonly balances = new Map<string, Balance>();

  constructor(private readonly send: (msg: FromWorker) => void) {}

  handle(msg: ToWorker): void {
    try {
      this.dispatch(msg);
    } catch (err) {
      // a bug, not bad input: report it against the request rather than leaving it unanswered
      const id = 'id' in msg ? msg.id : -1;
      this.send({ type: 'crash', id, message: err instanceof Error ? `${err.name}: ${err.message}` : String(err) });
    }
  }

  private dispatch(msg: ToWorker): void {
    switch (msg.type) {
      case 'begin': {
        this.runs.delete(msg.key);
        const settings = attempt(() => this.readSettings(msg.profile ?? null));
        this.jobs.set(msg.id, {
          key: msg.key,
          file: msg.file,
          explicit: msg.mapping,
          mappings: msg.mappings,
          pending: '',
          header: null,
          reader: null,
          mappingUsed: null,
          errors: settings.ok ? null : settings.errors,
          read: settings.ok ? settings.value : PLAIN,
        });
        return;
      }
      case 'chunk': {
        const job = this.job(msg.id);
        this.feed(job, msg.text, false);
        this.send({ type: 'ack', id: msg.id, chars: msg.text.length });
        return;
      }
      case 'end': {
        const job = this.job(msg.id);
        this.jobs.delete(msg.id);
        this.feed(job, '', true);
        this.send({ type: 'read', id: msg.id, reply: this.finish(job) });
        return;
      }
      case 'readBlob':
        this.readBlob(msg).catch((err: unknown) => this.send({ type: 'crash', id: msg.id, message: err instanceof Error ? `${err.name}: ${err.message}` : String(err) }));
        return;
      case 'reduce':
        this.send({ type: 'reduced', id: msg.id, reply: this.reduce(msg.key, msg.setupName, msg.setup, msg.tareKey) });
        return;
      case 'forget':
        this.runs.delete(msg.key);
        return;
    }
  }

  /** A Blob read here in chunks of `BLOB_CHUNK` characters' worth of bytes, decoded, parsed, and hashed when it is one chunk. */
  private async readBlob(msg: Extract<ToWorker, { type: 'readBlob' }>): Promise<void> {
    this.dispatch({ type: 'begin', id: msg.id, key: msg.key, file: msg.file, mapping: msg.mapping, mappings: msg.mappings, profile: msg.profile });
    const job = this.job(msg.id);
    this.jobs.delete(msg.id);
    let sha256: string | null = null;
    try {
      const blob = msg.blob;
      const size = blob.size;
      const decoder = new TextDecoder('utf-8');
      let chars = 0;
      for (let at = 0; at < size || (at === 0 && size === 0); at += BLOB_CHUNK) {
        const bytes = await (size <= BLOB_CHUNK ? blob : blob.slice(at, Math.min(size, at + BLOB_CHUNK))).arrayBuffer();
        if (msg.hash && size <= BLOB_CHUNK && globalThis.crypto?.subtle) sha256 = hex(await globalThis.crypto.subtle.digest('SHA-256', bytes));
        // stream: true keeps a multi-byte character split across chunks for the next one
        const text = decoder.decode(bytes, { stream: true });
        this.feed(job, text, false);
        chars += text.length;
        if (size > BLOB_CHUNK) this.send({ type: 'progress', id: msg.id, chars });
        if (size === 0) break;
      }
      const rest = decoder.decode();
      if (rest.length > 0) this.feed(job, rest, false);
    } catch (err) {
      // the file went away or cannot be read (a Blob of a file on disk that has changed)
      this.send({ type: 'read', id: msg.id, reply: { ok: false, errors: [{ file: msg.file, message: `could not be read: ${(err as Error).message}` }], header: null } });
      return;
    }
    this.feed(job, '', true);
    this.send({ type: 'read', id: msg.id, reply: { ...this.finish(job), sha256 } });
  }

  private job(id: number): ReadJob {
    const job = this.jobs.get(id);
    if (!job) throw new Error(`no read in progress with id ${id}`);
    return job;
  }

  private feed(job: ReadJob, text: string, atEnd: boolean): void {
    if (job.errors) return;
    try {
      if (!job.reader) {
        job.pending += text;
        const header = sniffHeader(job.pending);
        const enough = header !== null && (header.preview.length >= 5 || job.pending.length >= SNIFF_BYTES);
        if (!enough && !atEnd && job.pending.length < SNIFF_BYTES) return;
        job.header = header;
        job.mappingUsed = job.explicit ?? (header ? job.mappings[header.signature] ?? null : null);
        job.reader = new RunFileReader(job.file, { mapping: job.mappingUsed ?? undefined, grouping: job.read.grouping, sampleTransform: job.read.transform });
        const first = job.pending;
        job.pending = '';
        if (first.length > 0) job.reader.push(first);
        return;
      }
      if (text.length > 0) job.reader.push(text);
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      job.errors = [err.notice];
    }
  }

  private finish(job: ReadJob): ReadReply {
    if (job.errors) return { ok: false, errors: job.errors, header: job.header };
    const done = attempt(() => job.reader!.finish());
    if (!done.ok) return { ok: false, errors: done.errors, header: job.header };
    const run = done.value;
    this.runs.set(job.key, { run, balance: job.read.balance });
    const header = job.header ?? { line: run.headerLine, text: '', signature: '', delimiter: run.delimiter, cells: [], preview: [] };
    return { ok: true, header, stats: channelStats(run), rows: run.rowsRead, mappingUsed: job.mappingUsed };
  }

  /**
   * The setup's say in reading a run: its grouping tolerance, and its balance calibration (inline, or the
   * balance file's text the host found for its path) as the reader's per-sample conversion, checked
   * against balance.axes as the command line checks it. A setup that does not validate reads the run
   * plainly; its reduction then reports the setup's problem.
   */
  private readSettings(profile: ReadProfile | null): ReadSettings {
    if (!profile) return PLAIN;
    const checked = this.validated(profile.setupName, profile.setup);
    if (!checked.ok) return PLAIN;
    const setup = checked.value.setup;
    const grouping = { alphaTolRad: ((setup.grouping?.alpha_tol_deg ?? 0.2) * Math.PI) / 180 };
    const c = setup.balance.calibration;
    if (c === null) return { balance: null, transform: undefined, grouping };
    let balance: Balance;
    if ('path' in c) {
      if (!profile.balance) {
        throw new InputError({ file: `setup "${profile.setupName}"`, field: 'balance.calibration', message: `the balance file "${c.path}" was not given` });
      }
      const cacheKey = `${profile.balance.name}\0${profile.balance.text}`;
      let b = this.balances.get(cacheKey);
      if (!b) {
        b = parseBalance(profile.balance.name, profile.balance.text);
        this.balances.set(cacheKey, b);
      }
      checkBalanceAxes(b, setup.balance.axes);
      balance = b;
    } else {
      balance = c;
    }
    return { balance, transform: balanceTransform(balance), grouping };
  }

  private validated(setupName: string, setupJson: unknown): Outcome<SetupResult> {
    const text = JSON.stringify(setupJson);
    const hit = this.setups.get(setupName);
    if (hit && hit.text === text) return hit.outcome;
    const outcome = attempt(() => validateSetup(`setup "${setupName}"`, setupJson));
    this.setups.set(setupName, { text, outcome });
    return outcome;
  }

  private reduce(key: string, setupName: string, setupJson: unknown, tareKey: string | null): ReduceReply {
    const read = this.runs.get(key);
    if (!read) return { ok: false, errors: [{ file: key, message: 'the run has not been read (read it again)' }] };
    const run = read.run;
    let tare: RunData | undefined;
    if (tareKey !== null) {
      tare = this.runs.get(tareKey)?.run;
      if (!tare) return { ok: false, errors: [{ file: tareKey, message: 'the tare file has not been read' }] };
    }
    const checked = this.validated(setupName, setupJson);
    if (!checked.ok) return checked;
    let setup = checked.value;
    const c = setup.setup.balance.calibration;
    if (c !== null && 'path' in c) {
      // as the command line does: the balance file read for this run takes the place of its path
      if (!read.balance) return { ok: false, errors: [{ file: `setup "${setupName}"`, field: 'balance.calibration', message: 'the run was read before its setup named a balance calibration; read it again' }] };
      setup = { ...setup, setup: { ...setup.setup, balance: { ...setup.setup.balance, calibration: read.balance } } };
    }
    // corrected and "as measured" (fits and plots with corrections off) from one pass through the stages
    const both = reduceRunBothBases({ run, setup, tare });
    if (!both.ok) return both;
    return { ok: true, result: both.value.result, asMeasured: both.value.asMeasured, reducedAt: new Date().toISOString() };
  }
}

/** Bytes of a Blob read at a time: as the hosts' chunks. */
const BLOB_CHUNK = 1 << 20;

function hex(bytes: ArrayBuffer): string {
  return Array.from(new Uint8Array(bytes), (b) => b.toString(16).padStart(2, '0')).join('');
}

/** Sample statistics of every point, as plain arrays (they cross to the interface by structured clone). */
export function channelStats(run: RunData): ChannelStats {
  return {
    channels: [...run.channels],
    points: run.points.map((p) => ({ key: p.key, line: p.line, n: p.n, mean: Array.from(p.mean), std: Array.from(p.std) })),
  };
}
