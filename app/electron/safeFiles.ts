/**
 * File access of the main process that a page cannot steer outside what the user chose: files are
 * opened without blocking (a FIFO or device never hangs the app) and read only when they are regular
 * files within a size limit; files a campaign names must lie inside the campaign's folder, symbolic
 * links resolved. Streams are pulled: nothing is read until the page asks for the next chunk, so a
 * slow page holds back the reading (back-pressure), and the SHA-256 is computed from the same bytes.
 */
import { createHash, type Hash } from 'node:crypto';
import { constants } from 'node:fs';
import { open, realpath, type FileHandle } from 'node:fs/promises';
import { dirname, resolve, sep } from 'node:path';
import { CAMPAIGN_RUN_MAX_BYTES, campaignPathProblem } from '../../core/index.ts';
import { chunkDecoder } from '../files/textDecoding.ts';

/** An error whose message is meant for the user, prefixed "refused:". */
export function refused(message: string): Error {
  return new Error(`refused: ${message}`);
}

/** Open a regular file for reading, never blocking on a FIFO or device; refused when it is not one or is larger than `maxBytes`. */
export async function openRegular(path: string, maxBytes = Number.POSITIVE_INFINITY): Promise<{ handle: FileHandle; size: number; mtimeMs: number }> {
  // O_NONBLOCK: opening a FIFO with no writer would otherwise wait forever (constants.O_NONBLOCK is undefined on Windows)
  const handle = await open(path, constants.O_RDONLY | (constants.O_NONBLOCK ?? 0));
  try {
    const s = await handle.stat();
    if (!s.isFile()) throw refused(`${path} is not a regular file`);
    if (s.size > maxBytes) throw refused(`${path} is ${s.size} bytes, more than the ${maxBytes} allowed`);
    return { handle, size: s.size, mtimeMs: s.mtimeMs };
  } catch (err) {
    await handle.close();
    throw err;
  }
}

/** A whole small file (campaign) as text, read only when it is a regular file within `maxBytes`. */
export async function readRegularText(path: string, maxBytes: number, tooLarge: (bytes: number) => string): Promise<string> {
  const { handle, size } = await openRegular(path);
  try {
    if (size > maxBytes) throw refused(`${path}: ${tooLarge(size)}`);
    return await handle.readFile('utf8');
  } finally {
    await handle.close();
  }
}

function inside(folder: string, path: string): boolean {
  return path === folder || path.startsWith(folder.endsWith(sep) ? folder : folder + sep);
}

/**
 * The file a campaign names, as a path the host may read, or the reason it is refused: the name must
 * pass the format's path rule, and the file (symbolic links followed) must be a regular file inside
 * the campaign's folder, at most CAMPAIGN_RUN_MAX_BYTES. Nothing is read here.
 */
export async function confinedCampaignFile(campaignPath: string, file: string): Promise<{ path: string; size: number } | { refused: string }> {
  const problem = campaignPathProblem(file);
  if (problem) return { refused: problem };
  let folder: string;
  try {
    folder = await realpath(dirname(resolve(campaignPath)));
  } catch {
    return { refused: 'the campaign folder cannot be read' };
  }
  let real: string;
  try {
    real = await realpath(resolve(folder, file));
  } catch {
    return { refused: 'not found' };
  }
  if (!inside(folder, real)) return { refused: 'a link that leads outside the campaign folder' };
  try {
    const { handle, size } = await openRegular(real, CAMPAIGN_RUN_MAX_BYTES);
    await handle.close();
    return { path: real, size };
  } catch (err) {
    const m = (err as Error).message;
    return { refused: m.startsWith('refused: ') ? m.slice('refused: '.length).replace(`${real} `, '').replace(`${real}`, 'the file') : 'cannot be opened' };
  }
}

/** What a finished stream learned about its file: the SHA-256 of exactly the bytes it delivered. */
export interface StreamDigest {
  sha256: string;
  size: number;
  mtimeMs: number;
}

/**
 * A file read chunk by chunk on demand. `next()` reads one chunk (UTF-8 or UTF-16 with its mark,
 * split safely between characters) or returns null at the end, after which the handle is closed and `digest` is set.
 * `close()` may be called at any time and is idempotent.
 */
export class PullStream {
  private position = 0;
  private readonly decoder = chunkDecoder(); // UTF-8, or UTF-16 after its byte-order mark
  private readonly hash: Hash = createHash('sha256');
  private closed = false;
  private reading: Promise<string | null> | undefined;
  lastUsed = Date.now();
  digest: StreamDigest | undefined;

  private constructor(
    private readonly handle: FileHandle,
    private readonly size: number,
    private readonly mtimeMs: number,
    private readonly chunkBytes: number,
  ) {}

  static async open(path: string, chunkBytes: number): Promise<PullStream> {
    const { handle, size, mtimeMs } = await openRegular(path);
    return new PullStream(handle, size, mtimeMs, chunkBytes);
  }

  get isClosed(): boolean {
    return this.closed;
  }

  next(): Promise<string | null> {
    // one read at a time: a page that asks twice without waiting gets the chunks in order
    const run = (this.reading ?? Promise.resolve(null)).catch(() => null).then(() => this.read());
    this.reading = run;
    return run;
  }

  private async read(): Promise<string | null> {
    this.lastUsed = Date.now();
    for (;;) {
      if (this.closed) return null;
      const buffer = Buffer.allocUnsafe(this.chunkBytes);
      const { bytesRead } = await this.handle.read(buffer, 0, this.chunkBytes, this.position);
      if (bytesRead === 0) {
        const rest = this.decoder.end();
        this.digest = { sha256: this.hash.digest('hex'), size: this.position, mtimeMs: this.mtimeMs };
        await this.close();
        return rest.length > 0 ? rest : null;
      }
      this.position += bytesRead;
      const bytes = buffer.subarray(0, bytesRead);
      this.hash.update(bytes);
      const text = this.decoder.write(bytes);
      if (text.length > 0) return text;
      // a chunk that ended inside one character gives no text yet: read on
    }
  }

  async close(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    await this.handle.close().catch(() => undefined);
  }

  /** Bytes in the file when it was opened. */
  get bytes(): number {
    return this.size;
  }
}

/** SHA-256 of a regular file, pulled through the same reader as the streams. */
export async function sha256Regular(path: string): Promise<StreamDigest> {
  const s = await PullStream.open(path, 1 << 20);
  try {
    while ((await s.next()) !== null);
  } finally {
    await s.close();
  }
  return s.digest!;
}
