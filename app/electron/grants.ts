/**
 * Files the user chose in a dialog or dropped on the window, and the files a validated campaign names
 * inside its folder. The renderer only ever holds an opaque id; the main process reads and writes only
 * paths in this table, so a compromised page cannot ask for /etc/passwd or overwrite a raw run file.
 * A grant never widens: a read grant is never written, and a path granted for reading is refused as a
 * write target under any name (hard or symbolic link) it is given.
 */
import { randomUUID } from 'node:crypto';
import { stat } from 'node:fs/promises';
import { basename, resolve } from 'node:path';
import type { StreamDigest } from './safeFiles.ts';

export interface Grant {
  id: string;
  path: string;
  name: string;
  /** What the user allowed: reading a chosen run, or writing a chosen save target. */
  mode: 'read' | 'write';
  /** The SHA-256 learnt while the file was last streamed, with the size and time it had then. */
  digest?: StreamDigest;
}

/** Device and inode of a file, or undefined where it does not exist or the system has no inodes. */
async function identity(path: string): Promise<string | undefined> {
  try {
    const s = await stat(path);
    return s.ino === 0 ? undefined : `${s.dev}:${s.ino}`;
  } catch {
    return undefined;
  }
}

export class FileGrants {
  private readonly byId = new Map<string, Grant>();
  /** `mode path` → grant: one lookup per grant, so opening a campaign of many runs stays linear. */
  private readonly byPath = new Map<string, Grant>();
  /** Identities of every file granted for reading (raw runs, setups, tares). */
  private readonly readIdentities = new Set<string>();

  grant(path: string, mode: Grant['mode']): Grant {
    const abs = resolve(path);
    const key = `${mode} ${abs}`;
    const known = this.byPath.get(key);
    if (known) return known;
    const g: Grant = { id: randomUUID(), path: abs, name: basename(abs), mode };
    this.byId.set(g.id, g);
    this.byPath.set(key, g);
    return g;
  }

  /** A read grant that also remembers the file's identity, so no other name for it can become a write target. */
  async grantRead(path: string): Promise<Grant> {
    const g = this.grant(path, 'read');
    const id = await identity(g.path);
    if (id) this.readIdentities.add(id);
    return g;
  }

  /** True when the path was granted for reading only (a raw run file): it is never written. */
  isReadGrant(path: string): boolean {
    return this.byPath.has(`read ${resolve(path)}`);
  }

  /**
   * Why `path` may not be written, or undefined: a file granted for reading (by this or another name),
   * a folder, or anything that is not a regular file.
   */
  async writeProblem(path: string): Promise<string | undefined> {
    const abs = resolve(path);
    if (this.isReadGrant(abs)) return `${abs} is a raw run file (or a setup or tare) and is never overwritten`;
    let s;
    try {
      s = await stat(abs);
    } catch {
      return undefined; // a new file
    }
    if (s.isDirectory()) return `${abs} is a folder`;
    if (!s.isFile()) return `${abs} is not a regular file`;
    if (s.ino !== 0 && this.readIdentities.has(`${s.dev}:${s.ino}`))
      return `${abs} is another name for a raw run file (or a setup or tare), which is never overwritten`;
    return undefined;
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
