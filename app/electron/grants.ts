/**
 * Files the user chose in a dialog or dropped on the window. The renderer only ever holds an opaque
 * id; the main process reads and writes only paths in this table, so a compromised page cannot ask
 * for /etc/passwd or overwrite a raw run file.
 */
import { createHash, randomUUID } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { basename, resolve } from 'node:path';

export interface Grant {
  id: string;
  path: string;
  name: string;
  /** What the user allowed: reading a chosen run, or writing a chosen save target. */
  mode: 'read' | 'write';
}

export class FileGrants {
  private readonly byId = new Map<string, Grant>();

  grant(path: string, mode: Grant['mode']): Grant {
    const abs = resolve(path);
    for (const g of this.byId.values()) if (g.path === abs && g.mode === mode) return g;
    const g = { id: randomUUID(), path: abs, name: basename(abs), mode };
    this.byId.set(g.id, g);
    return g;
  }

  /** True when the path was granted for reading only (a raw run file): it is never written. */
  isReadGrant(path: string): boolean {
    const abs = resolve(path);
    for (const g of this.byId.values()) if (g.path === abs && g.mode === 'read') return true;
    return false;
  }

  /** The grant for an id, or an error that names what was refused. */
  get(id: unknown, mode: Grant['mode']): Grant {
    if (typeof id !== 'string') throw new Error('refused: file id must be a string');
    const g = this.byId.get(id);
    if (!g) throw new Error('refused: that file was not chosen by the user');
    if (mode === 'write' && g.mode !== 'write') throw new Error(`refused: ${g.name} was opened for reading and is never written`);
    return g;
  }
}

/** Stream a file's text to a callback in chunks (utf8), so big runs never sit in one string. */
export async function streamText(path: string, onChunk: (text: string) => void, chunkBytes = 1 << 20): Promise<void> {
  const stream = createReadStream(path, { encoding: 'utf8', highWaterMark: chunkBytes, flags: 'r' });
  for await (const chunk of stream) onChunk(chunk as string);
}

export async function sha256File(path: string): Promise<string> {
  const h = createHash('sha256');
  for await (const chunk of createReadStream(path, { flags: 'r' })) h.update(chunk as Buffer);
  return h.digest('hex');
}
