/**
 * What the reduction worker does, free of the worker's message plumbing so it can be tested in
 * process: streams chunks into core's RunFileReader, keeps the read runs by key, reduces on request.
 */
import { attempt, InputError, type Notice } from '../../../core/index.ts';
import { reduceRunBothBases } from '../../../core/index.ts';
import { RunFileReader, type ColumnMapping, type RunData } from '../../../core/index.ts';
import { validateSetup } from '../../../core/index.ts';
import { sniffHeader } from './headerSniff.ts';
import type { ChannelStats, FromWorker, HeaderInfo, ReadReply, ReduceReply, ToWorker } from './protocol.ts';

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
}

export class WorkerEngine {
  private readonly runs = new Map<string, RunData>();
  private readonly jobs = new Map<number, ReadJob>();

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
      case 'begin':
        this.runs.delete(msg.key);
        this.jobs.set(msg.id, { key: msg.key, file: msg.file, explicit: msg.mapping, mappings: msg.mappings, pending: '', header: null, reader: null, mappingUsed: null, errors: null });
        return;
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
      case 'reduce':
        this.send({ type: 'reduced', id: msg.id, reply: this.reduce(msg.key, msg.setupName, msg.setup, msg.tareKey) });
        return;
      case 'forget':
        this.runs.delete(msg.key);
        return;
    }
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
        job.reader = new RunFileReader(job.file, { mapping: job.mappingUsed ?? undefined });
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
    this.runs.set(job.key, run);
    const header = job.header ?? { line: run.headerLine, text: '', signature: '', delimiter: run.delimiter, cells: [], preview: [] };
    return { ok: true, header, stats: channelStats(run), rows: run.rowsRead, mappingUsed: job.mappingUsed };
  }

  private reduce(key: string, setupName: string, setupJson: unknown, tareKey: string | null): ReduceReply {
    const run = this.runs.get(key);
    if (!run) return { ok: false, errors: [{ file: key, message: 'the run has not been read (read it again)' }] };
    let tare: RunData | undefined;
    if (tareKey !== null) {
      tare = this.runs.get(tareKey);
      if (!tare) return { ok: false, errors: [{ file: tareKey, message: 'the tare file has not been read' }] };
    }
    const setup = attempt(() => validateSetup(`setup "${setupName}"`, setupJson));
    if (!setup.ok) return setup;
    // corrected and "as measured" (fits and plots with corrections off) from one pass through the stages
    const both = reduceRunBothBases({ run, setup: setup.value, tare });
    if (!both.ok) return both;
    return { ok: true, result: both.value.result, asMeasured: both.value.asMeasured, reducedAt: new Date().toISOString() };
  }
}

/** Sample statistics of every point, as plain arrays (they cross to the interface by structured clone). */
export function channelStats(run: RunData): ChannelStats {
  return {
    channels: [...run.channels],
    points: run.points.map((p) => ({ key: p.key, line: p.line, n: p.n, mean: Array.from(p.mean), std: Array.from(p.std) })),
  };
}
