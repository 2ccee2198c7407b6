import { spawnSync } from 'node:child_process';
import { chmodSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { removeStaleTemps, writeFileAtomic } from '../../app/files/atomic.ts';

/** app/files/atomic.ts beyond the kill test (test/fuzz/saves.test.ts): backups, permissions, leftovers. */
const made: string[] = [];
const folder = () => {
  const dir = mkdtempSync(join(tmpdir(), 'sweepbook-atomic-'));
  made.push(dir);
  return dir;
};
afterAll(() => made.forEach((d) => rmSync(d, { recursive: true, force: true })));

/** The pid of a process that has ended (a short-lived child, waited for). */
function deadPid(): number {
  const r = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(r.stdout);
}

describe('writeFileAtomic', () => {
  it('replaces the file, keeps the previous version as .bak, and leaves no temp file', async () => {
    const dir = folder();
    const f = join(dir, 'c.json');
    await writeFileAtomic(f, 'one\n', { backup: true });
    expect(readdirSync(dir)).toEqual(['c.json']); // nothing to back up yet
    await writeFileAtomic(f, 'two\n', { backup: true });
    await writeFileAtomic(f, 'three\n', { backup: true });
    expect(readFileSync(f, 'utf8')).toBe('three\n');
    expect(readFileSync(`${f}.bak`, 'utf8')).toBe('two\n');
    expect(readdirSync(dir).sort()).toEqual(['c.json', 'c.json.bak']);
  });

  it("keeps the file's permissions", async () => {
    if (process.platform === 'win32') return;
    const dir = folder();
    const f = join(dir, 'c.json');
    writeFileSync(f, 'old');
    chmodSync(f, 0o640);
    await writeFileAtomic(f, 'new', { backup: true });
    expect(statSync(f).mode & 0o777).toBe(0o640);
  });

  it('removes temp files of writers that died, and only those of this file', async () => {
    const dir = folder();
    const f = join(dir, 'c.json');
    const dead = deadPid();
    const stale = [`.c.json.${dead}.1.0a0b0c0d.tmp`, `.c.json.bak.${dead}.2.0a0b0c0e.tmp`];
    const alive = `.c.json.${process.ppid}.3.0a0b0c0f.tmp`; // our parent is running: a writer still at work
    const other = `.d.json.${dead}.1.0a0b0c10.tmp`; // another file's
    for (const n of [...stale, alive, other]) writeFileSync(join(dir, n), 'partial');
    await writeFileAtomic(f, 'content', { backup: true });
    expect(readdirSync(dir).sort()).toEqual([alive, other, 'c.json'].sort());
    expect(await removeStaleTemps(f)).toEqual([]);
  });

  it('leaves the old file and no temp file when the save fails', async () => {
    const dir = folder();
    const f = join(dir, 'c.json');
    writeFileSync(f, 'old');
    // a folder in the way of the backup makes step 3 fail after the temp file was written
    mkdirSync(`${f}.bak`);
    writeFileSync(join(`${f}.bak`, 'x'), 'x');
    await expect(writeFileAtomic(f, 'new', { backup: true })).rejects.toThrow();
    expect(readFileSync(f, 'utf8')).toBe('old');
    expect(readdirSync(dir).filter((n) => n.endsWith('.tmp'))).toEqual([]);
  });

  it('never replaces a folder, FIFO or device node with a file', async () => {
    const dir = folder();
    const fifo = join(dir, 'pipe');
    spawnSync('mkfifo', [fifo]);
    await expect(writeFileAtomic(fifo, 'x')).rejects.toThrow(/not a regular file/);
    expect(statSync(fifo).isFIFO()).toBe(true);
    mkdirSync(join(dir, 'sub'));
    await expect(writeFileAtomic(join(dir, 'sub'), 'x')).rejects.toMatchObject({ code: 'EISDIR' });
    expect(statSync(join(dir, 'sub')).isDirectory()).toBe(true);
    expect(readdirSync(dir).filter((n) => n.endsWith('.tmp'))).toEqual([]);
  });
});
