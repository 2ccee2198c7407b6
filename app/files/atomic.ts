/**
 * Crash-safe file writes. A save that is interrupted at any instant (killed, power cut) leaves the
 * target either at its old or at its new content, never half written, and with `backup` the previous
 * version beside it as `<name>.bak`, itself never half written:
 * 1. temp files of earlier writers that died are removed;
 * 2. the new content goes to a uniquely named temp file in the same folder, created exclusively, and is
 *    flushed to disk (fsync);
 * 3. with `backup`, the current version is copied to a second temp file, flushed, and renamed over
 *    `<name>.bak` (copying straight onto the .bak could leave it truncated);
 * 4. the temp file is renamed over the target (atomic within one folder on POSIX file systems and NTFS);
 * 5. on POSIX the folder is flushed too, so the renames themselves survive a power cut
 *    (fsync(2): "an explicit fsync() on a file descriptor for the directory is also needed").
 * Tested by killing a saving process at random moments (test/fuzz/saves.test.ts, npm run fuzz).
 */
import { randomBytes } from 'node:crypto';
import { copyFile, open, readdir, rename, stat, unlink } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';

let counter = 0;

/** `.<name>.<pid>.<counter>.<random>.tmp`: unique per process and call, and tells whose it is. */
function tempName(path: string): string {
  return join(dirname(path), `.${basename(path)}.${process.pid}.${++counter}.${randomBytes(4).toString('hex')}.tmp`);
}

const TEMP = /^\.(.+)\.(\d+)\.\d+\.[0-9a-f]+\.tmp$/;

/** A temp file left by a writer older than this is stale even if its pid is in use again. */
const STALE_AFTER_MS = 24 * 3600 * 1000;

function running(pid: number): boolean {
  if (pid === process.pid) return true;
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as { code?: string }).code === 'EPERM'; // exists, owned by someone else
  }
}

/**
 * Remove temp files of `path` (and of its .bak) left by writers that died mid-save: their process is gone
 * (a pid on another machine sharing the folder looks gone too; that writer's rename then fails and its
 * save reports an error, nothing is lost). Best effort.
 */
export async function removeStaleTemps(path: string): Promise<string[]> {
  const dir = dirname(path);
  const names = new Set([basename(path), `${basename(path)}.bak`]);
  const removed: string[] = [];
  let entries: string[];
  try {
    entries = await readdir(dir);
  } catch {
    return removed;
  }
  for (const entry of entries) {
    const m = TEMP.exec(entry);
    if (!m || !names.has(m[1]!)) continue;
    const p = join(dir, entry);
    try {
      const old = Date.now() - (await stat(p)).mtimeMs > STALE_AFTER_MS;
      if (old || !running(Number(m[2]))) {
        await unlink(p);
        removed.push(p);
      }
    } catch {
      // gone already, or not ours to remove
    }
  }
  return removed;
}

/** Write `data` to a new temp file beside `target` and flush it; returns the temp file's path. */
async function writeTemp(target: string, write: (h: Awaited<ReturnType<typeof open>>) => Promise<void>, mode: number | undefined): Promise<string> {
  const tmp = tempName(target);
  const handle = await open(tmp, 'wx', mode ?? 0o666);
  try {
    if (mode !== undefined) await handle.chmod(mode);
    await write(handle);
    await handle.sync();
  } catch (err) {
    await handle.close().catch(() => undefined);
    await unlink(tmp).catch(() => undefined);
    throw err;
  }
  await handle.close();
  return tmp;
}

/** Flush a folder's entries (POSIX). Windows cannot open a folder for this; NTFS journals renames itself. */
async function syncFolder(dir: string): Promise<void> {
  if (process.platform === 'win32') return;
  let handle: Awaited<ReturnType<typeof open>> | undefined;
  try {
    handle = await open(dir, 'r');
    await handle.sync();
  } catch (err) {
    // some file systems (network shares, FUSE) refuse fsync on a folder; the rename has happened anyway
    const code = (err as { code?: string }).code;
    if (code !== 'EINVAL' && code !== 'ENOTSUP' && code !== 'EISDIR' && code !== 'EPERM' && code !== 'EACCES' && code !== 'EBADF') throw err;
  } finally {
    await handle?.close();
  }
}

/** Write `data` (text, bytes, or text in pieces for documents too long for one string) atomically. */
export async function writeFileAtomic(path: string, data: string | Uint8Array | Iterable<string>, options: { backup?: boolean } = {}): Promise<void> {
  await removeStaleTemps(path);
  let mode: number | undefined;
  try {
    const s = await stat(path);
    // a folder, FIFO or device node is never replaced by a file (renaming over it would)
    if (!s.isFile())
      throw Object.assign(new Error(`${path} is not a regular file; refused, nothing was written`), { code: s.isDirectory() ? 'EISDIR' : 'ENOTREGULAR' });
    mode = s.mode & 0o777; // keep the file's permissions across the rename
  } catch (err) {
    if ((err as { code?: string }).code !== 'ENOENT') throw err;
    mode = undefined;
  }
  const tmp = await writeTemp(
    path,
    async (h) => {
      if (typeof data === 'string' || data instanceof Uint8Array) return h.writeFile(data);
      // writeFile on an open handle writes from the current position, all of it
      for (const chunk of data) await h.writeFile(chunk);
    },
    mode,
  );
  let bakTmp: string | undefined;
  try {
    if (options.backup && mode !== undefined) {
      bakTmp = tempName(`${path}.bak`);
      try {
        await copyFile(path, bakTmp);
        const h = await open(bakTmp, 'r+');
        try {
          await h.sync();
        } finally {
          await h.close();
        }
        await rename(bakTmp, `${path}.bak`);
        bakTmp = undefined;
      } catch (err) {
        if ((err as { code?: string }).code !== 'ENOENT') throw err; // the target vanished meanwhile: nothing to back up
      }
    }
    await rename(tmp, path);
  } catch (err) {
    await unlink(tmp).catch(() => undefined);
    if (bakTmp) await unlink(bakTmp).catch(() => undefined);
    throw err;
  }
  await syncFolder(dirname(path));
}
