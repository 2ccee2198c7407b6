/**
 * Crash-safe file writes: the new content goes to a temporary file in the same folder, is flushed to
 * disk, and is renamed over the target (rename is atomic on POSIX file systems and on NTFS for files
 * in one folder). With `backup`, the previous version is kept beside it as `<name>.bak`.
 */
import { copyFile, open, rename, unlink } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';

export async function writeFileAtomic(path: string, data: string | Uint8Array, options: { backup?: boolean } = {}): Promise<void> {
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${Date.now()}.tmp`);
  const handle = await open(tmp, 'w');
  try {
    await handle.writeFile(data);
    await handle.sync();
  } finally {
    await handle.close();
  }
  try {
    if (options.backup) {
      try {
        await copyFile(path, `${path}.bak`);
      } catch (err) {
        if ((err as { code?: string }).code !== 'ENOENT') throw err;
      }
    }
    await rename(tmp, path);
  } catch (err) {
    await unlink(tmp).catch(() => undefined);
    throw err;
  }
}
