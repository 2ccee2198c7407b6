/**
 * The interface's side of the reduction worker: promises for reads and reductions, progress while a
 * file streams in, and back-pressure so a large file never piles up in the worker's message queue.
 */
import type { ColumnMapping } from '../../../core/index.ts';
import type { FromWorker, ReadProfile, ReadReply, ReduceReply, ToWorker } from '../worker/protocol.ts';

export interface Transport {
  post(msg: ToWorker): void;
  listen(handler: (msg: FromWorker) => void): void;
}

/** Chunks allowed in flight before `push` waits for the worker to catch up. */
const IN_FLIGHT = 3;

export interface ReadOptions {
  mapping: ColumnMapping | null;
  mappings: Record<string, ColumnMapping>;
  /** The run's setup where it decides how the run is read (balance calibration, grouping tolerance). */
  profile?: ReadProfile | null;
  /** Called with the number of characters the worker has parsed so far. */
  onProgress?: (chars: number) => void;
}

/** Feeds a file's text: calls `push` for each chunk and resolves when the file has been read. */
export type TextFeeder = (push: (text: string) => Promise<void>) => Promise<void>;

interface Pending {
  resolve: (value: never) => void;
  reject: (err: Error) => void;
  acks?: { waiting: (() => void)[]; inFlight: number; chars: number; dead: boolean; onProgress?: (chars: number) => void };
}

export class EngineClient {
  private nextId = 1;
  private readonly pending = new Map<number, Pending>();

  constructor(private readonly transport: Transport) {
    transport.listen((msg) => this.receive(msg));
  }

  /** Read a file into the worker under `key`. Resolves with the header, or with located errors. */
  async read(key: string, file: string, feed: TextFeeder, options: ReadOptions): Promise<ReadReply> {
    const id = this.nextId++;
    const acks = { waiting: [] as (() => void)[], inFlight: 0, chars: 0, dead: false, onProgress: options.onProgress };
    const done = new Promise<ReadReply>((resolve, reject) => this.pending.set(id, { resolve: resolve as (v: never) => void, reject, acks }));
    // plain copies: the campaign's objects may be reactive proxies, which cannot cross to a worker
    this.transport.post({
      type: 'begin',
      id,
      key,
      file,
      mapping: plain(options.mapping),
      mappings: plain(options.mappings),
      profile: plain(options.profile ?? null),
    });
    const push = async (text: string): Promise<void> => {
      if (acks.dead) throw new Error('the reduction worker stopped');
      if (text.length === 0) return;
      this.transport.post({ type: 'chunk', id, text });
      acks.inFlight++;
      if (acks.inFlight >= IN_FLIGHT) await new Promise<void>((r) => acks.waiting.push(r));
    };
    try {
      await feed(push);
    } catch (err) {
      // the host could not read the file: end the worker's job, report the failure
      this.transport.post({ type: 'end', id });
      await done.catch(() => undefined);
      return { ok: false, errors: [{ file, message: `could not be read: ${(err as Error).message}` }], header: null };
    }
    this.transport.post({ type: 'end', id });
    return done;
  }

  /**
   * Read a file the page holds as a Blob: the worker reads, decodes and parses it (and hashes it when
   * `hash`), so the page does no file reading. Resolves like `read`, with `sha256` where worked out.
   */
  readBlob(key: string, file: string, blob: Blob, options: ReadOptions & { hash: boolean }): Promise<ReadReply> {
    const id = this.nextId++;
    const acks = { waiting: [] as (() => void)[], inFlight: 0, chars: 0, dead: false, onProgress: options.onProgress };
    const done = new Promise<ReadReply>((resolve, reject) => this.pending.set(id, { resolve: resolve as (v: never) => void, reject, acks }));
    this.transport.post({
      type: 'readBlob',
      id,
      key,
      file,
      blob,
      mapping: plain(options.mapping),
      mappings: plain(options.mappings),
      profile: plain(options.profile ?? null),
      hash: options.hash,
    });
    return done;
  }

  reduce(key: string, setupName: string, setup: unknown, tareKey: string | null): Promise<ReduceReply> {
    const id = this.nextId++;
    const done = new Promise<ReduceReply>((resolve, reject) => this.pending.set(id, { resolve: resolve as (v: never) => void, reject }));
    this.transport.post({ type: 'reduce', id, key, setupName, setup: plain(setup ?? null), tareKey });
    return done;
  }

  forget(key: string): void {
    this.transport.post({ type: 'forget', key });
  }

  private receive(msg: FromWorker): void {
    const p = this.pending.get(msg.id);
    if (!p) return;
    switch (msg.type) {
      case 'ack': {
        const a = p.acks!;
        a.inFlight--;
        a.chars += msg.chars;
        a.onProgress?.(a.chars);
        a.waiting.shift()?.();
        return;
      }
      case 'progress':
        p.acks?.onProgress?.(msg.chars);
        return;
      case 'read':
        this.pending.delete(msg.id);
        (p.resolve as (v: ReadReply) => void)(msg.reply);
        return;
      case 'reduced':
        this.pending.delete(msg.id);
        (p.resolve as (v: ReduceReply) => void)(msg.reply);
        return;
      case 'crash':
        this.pending.delete(msg.id);
        if (p.acks) {
          p.acks.dead = true;
          p.acks.waiting.splice(0).forEach((w) => w());
        }
        p.reject(new Error(`internal error in the reduction worker: ${msg.message}`));
        return;
    }
  }
}

/** A structured-clone-safe copy of JSON data. */
function plain<T>(value: T): T {
  return value === undefined ? value : (JSON.parse(JSON.stringify(value)) as T);
}

/** The real worker, bundled by Vite as its own file (same origin, allowed by `worker-src 'self'`). */
export function workerTransport(): Transport {
  const worker = new Worker(new URL('../worker/reduceWorker.ts', import.meta.url), { type: 'module' });
  return {
    post: (msg) => worker.postMessage(msg),
    listen: (handler) => {
      worker.onmessage = (e: MessageEvent<FromWorker>) => handler(e.data);
    },
  };
}
