import { createHash } from 'node:crypto';
import { execFileSync } from 'node:child_process';
import { linkSync, mkdirSync, mkdtempSync, readFileSync, statSync, symlinkSync, truncateSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it, vi } from 'vitest';
import { FileGrants } from '../../app/electron/grants.ts';
import { MAX_OPEN_STREAMS, registerIpc } from '../../app/electron/ipc.ts';

/**
 * The main process's file handlers driven as a compromised page would drive them (Electron faked):
 * campaign paths confined to the campaign folder, grants that never widen, write targets refused,
 * pulled streams that are freed.
 */
const ROOT = resolve(__dirname, '../..');
const appEvent = { senderFrame: { url: 'app://sweepbook/index.html' } } as never;
const SAMPLE = JSON.parse(readFileSync(join(ROOT, 'sample-runs', 'sweepbook-campaign.json'), 'utf8'));

/** A valid campaign naming `files` (the sample's setups, no tares). */
function campaignText(files: string[]): string {
  const setup = SAMPLE.runs[0].setup as string;
  return JSON.stringify({ ...SAMPLE, tares: [], runs: files.map((file) => ({ file, sha256: null, setup, tare: null })) }, null, 2);
}

function host(dialogPaths: { open?: string[]; save?: string } = {}) {
  const grants = new FileGrants();
  const recent: string[] = [];
  const dialog = {
    showOpenDialog: vi.fn(async () => ({ canceled: !dialogPaths.open, filePaths: dialogPaths.open ?? [] })),
    showSaveDialog: vi.fn(async () => ({ canceled: !dialogPaths.save, filePath: dialogPaths.save })),
  };
  const handlers = registerIpc({
    ipcMain: { handle: vi.fn() },
    dialog: dialog as never,
    window: () => undefined,
    grants,
    recent: { list: async () => recent, add: async (p) => void recent.unshift(p) },
    sampleCampaignPath: join(ROOT, 'sample-runs', 'sweepbook-campaign.json'),
    setDirty: vi.fn(),
    print: vi.fn(),
  });
  const call = (channel: string, ...args: unknown[]) => handlers.get(channel)!(appEvent, ...args) as Promise<unknown>;
  return { grants, call, dialogPaths };
}

type Opened = { id: string; text: string; runs: { file: string; id: string | null; sha256: string | null; refused?: string }[] };

/** A campaign folder holding one good run, a run in a sub-folder, a FIFO and a link out, beside a file outside it. */
function hostileFolder() {
  const parent = mkdtempSync(join(tmpdir(), 'sweepbook-confine-'));
  const dir = join(parent, 'campaign');
  mkdirSync(join(dir, 'sub'), { recursive: true });
  const run = readFileSync(join(ROOT, 'sample-runs', 'run-101-clean.csv'));
  writeFileSync(join(dir, 'ok.csv'), run);
  writeFileSync(join(dir, 'sub', 'deeper.csv'), run);
  writeFileSync(join(parent, 'outside.csv'), 'secret,1\n');
  execFileSync('mkfifo', [join(dir, 'fifo.csv')]);
  symlinkSync('/etc/passwd', join(dir, 'link.csv'));
  symlinkSync(join(dir, 'ok.csv'), join(dir, 'inner-link.csv'));
  const files = [
    'ok.csv',
    'sub/deeper.csv',
    'inner-link.csv',
    '../outside.csv',
    '/etc/passwd',
    '/dev/zero',
    'fifo.csv',
    'link.csv',
    '\\\\host\\share\\run.csv',
    'C:/runs/run.csv',
    'sub/../../outside.csv',
    'missing.csv',
  ];
  const campaign = join(dir, 'c.json');
  writeFileSync(campaign, campaignText(files));
  return { parent, dir, campaign, files };
}

describe('campaign paths are confined to the campaign folder', () => {
  it('opens only regular files inside the folder and lists every other path as refused with its reason, without hanging', async () => {
    const f = hostileFolder();
    const h = host({ open: [f.campaign] });
    const opened = (await h.call('campaign:open')) as Opened;
    const by = Object.fromEntries(opened.runs.map((r) => [r.file, r]));
    for (const ok of ['ok.csv', 'sub/deeper.csv', 'inner-link.csv']) {
      expect(by[ok]!.id, ok).not.toBeNull();
      expect(by[ok]!.sha256).toBe(
        createHash('sha256')
          .update(readFileSync(join(f.dir, 'ok.csv')))
          .digest('hex'),
      );
    }
    expect(by['../outside.csv']!.refused).toMatch(/leaves the campaign folder/);
    expect(by['sub/../../outside.csv']!.refused).toMatch(/leaves the campaign folder/);
    expect(by['/etc/passwd']!.refused).toMatch(/absolute path/);
    expect(by['/dev/zero']!.refused).toMatch(/absolute path/);
    expect(by['fifo.csv']!.refused).toMatch(/not a regular file/);
    expect(by['link.csv']!.refused).toMatch(/outside the campaign folder/);
    expect(by['\\\\host\\share\\run.csv']!.refused).toMatch(/backslash/);
    expect(by['C:/runs/run.csv']!.refused).toMatch(/drive-letter/);
    expect(by['missing.csv']!.refused).toMatch(/not found/);
    for (const r of opened.runs) if (r.refused) expect(r.id, r.file).toBeNull();
    for (const p of ['/etc/passwd', join(f.parent, 'outside.csv'), join(f.dir, 'fifo.csv'), '/dev/zero']) expect(h.grants.isReadGrant(p), p).toBe(false);
  }, 15_000);

  it('touches no listed file before the campaign document is valid', async () => {
    const f = hostileFolder();
    writeFileSync(f.campaign, JSON.stringify({ format: 'sweepbook-campaign', version: 1, runs: [{ file: 'ok.csv' }] }));
    const h = host({ open: [f.campaign] });
    const opened = (await h.call('campaign:open')) as Opened;
    expect(opened.runs).toEqual([]);
    expect(h.grants.isReadGrant(join(f.dir, 'ok.csv'))).toBe(false);
  });

  it('does not widen the grants when the page adds a path, saves and reopens from the recent list', async () => {
    const f = hostileFolder();
    writeFileSync(f.campaign, campaignText(['ok.csv']));
    const h = host({ open: [f.campaign] });
    const opened = (await h.call('campaign:open')) as Opened;
    await h.call('campaign:save', campaignText(['ok.csv', '/etc/passwd', '../outside.csv']), { id: opened.id });
    const again = (await h.call('campaign:open-recent', f.campaign)) as Opened;
    expect(again.runs.filter((r) => r.id !== null).map((r) => r.file)).toEqual(['ok.csv']);
    expect(h.grants.isReadGrant('/etc/passwd')).toBe(false);
    expect(h.grants.isReadGrant(join(f.parent, 'outside.csv'))).toBe(false);
  });

  it('refuses a campaign file that is a FIFO or far too large, before reading it', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sweepbook-campaign-'));
    const fifo = join(dir, 'c.json');
    execFileSync('mkfifo', [fifo]);
    await expect(host({ open: [fifo] }).call('campaign:open')).rejects.toThrow(/not a regular file/);
    const big = join(dir, 'big.json');
    writeFileSync(big, '');
    truncateSync(big, 65 << 20); // sparse: no 65 MB are written
    await expect(host({ open: [big] }).call('campaign:open')).rejects.toThrow(/at most 64\.0 MiB/);
  }, 15_000);

  it('opens a campaign of 1,000 runs, each granted once', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sweepbook-many-'));
    const files = Array.from({ length: 1000 }, (_, i) => `r${i}.csv`);
    for (const file of files) writeFileSync(join(dir, file), 'alpha,dp_pitot,lift,drag\n0,500,10,1\n');
    writeFileSync(join(dir, 'c.json'), campaignText(files));
    const opened = (await host({ open: [join(dir, 'c.json')] }).call('campaign:open')) as Opened;
    expect(opened.runs).toHaveLength(1000);
    expect(new Set(opened.runs.map((r) => r.id)).size).toBe(1000);
    expect(opened.runs.every((r) => r.id !== null)).toBe(true);
  }, 30_000);
});

describe('write targets', () => {
  it('Save As refuses a raw run file of the open campaign (by any name), a folder and a FIFO', async () => {
    const f = hostileFolder();
    writeFileSync(f.campaign, campaignText(['ok.csv']));
    const ok = join(f.dir, 'ok.csv');
    const before = readFileSync(ok, 'utf8');
    linkSync(ok, join(f.dir, 'hard-link.csv'));
    const h = host({ open: [f.campaign] });
    await h.call('campaign:open');
    for (const target of [ok, join(f.dir, 'hard-link.csv'), join(f.dir, 'sub'), join(f.dir, 'fifo.csv')]) {
      h.dialogPaths.save = target;
      await expect(h.call('campaign:save', '{}', { saveAs: true }), target).rejects.toThrow(/refused/);
      await expect(h.call('export:save', 'points.csv', 'a,b\n', 'text/csv'), target).rejects.toThrow(/refused/);
    }
    expect(readFileSync(ok, 'utf8')).toBe(before);
    expect(statSync(join(f.dir, 'fifo.csv')).isFIFO()).toBe(true);
    expect(statSync(join(f.dir, 'sub')).isDirectory()).toBe(true);
  }, 15_000);
});

describe('pulled streams', () => {
  async function chosenRun(text: string) {
    const dir = mkdtempSync(join(tmpdir(), 'sweepbook-stream-'));
    const run = join(dir, 'run.csv');
    writeFileSync(run, text);
    const h = host({ open: [run] });
    const [c] = (await h.call('runs:choose')) as { id: string }[];
    return { h, run, id: c!.id };
  }

  it('reads nothing before the page asks: a chunk is read when pulled', async () => {
    const { h, run, id } = await chosenRun('a'.repeat(100_000));
    const stream = await h.call('file:open-stream', id, 4096);
    writeFileSync(run, 'b'.repeat(100_000)); // same file, changed after opening, before the first pull
    expect(await h.call('file:next-chunk', stream)).toBe('b'.repeat(4096));
    await h.call('file:close-stream', stream);
  });

  it('frees a stream the page abandons or closes, and at most a few stay open', async () => {
    const { h, id } = await chosenRun('x'.repeat(100_000));
    const first = await h.call('file:open-stream', id, 4096);
    await h.call('file:next-chunk', first);
    await h.call('file:close-stream', first);
    await expect(h.call('file:next-chunk', first)).rejects.toThrow(/unknown or closed stream/);
    const opened: unknown[] = [];
    for (let i = 0; i < MAX_OPEN_STREAMS + 2; i++) opened.push(await h.call('file:open-stream', id, 4096));
    await expect(h.call('file:next-chunk', opened[0])).rejects.toThrow(/unknown or closed stream/);
    await expect(h.call('file:next-chunk', opened.at(-1))).resolves.toBe('x'.repeat(4096));
  });

  it('hashes while streaming: file:sha256 after a full read is the hash of the bytes the page got, without a second read', async () => {
    const text = 'alpha,lift\n' + '1,2\n'.repeat(20_000);
    const { h, run, id } = await chosenRun(text);
    utimesSync(run, 1_700_000_000, 1_700_000_000); // whole seconds, so they can be set again exactly
    const stream = await h.call('file:open-stream', id, 4096);
    let got = '';
    for (let c = await h.call('file:next-chunk', stream); c !== null; c = await h.call('file:next-chunk', stream)) got += c as string;
    expect(got).toBe(text);
    // same size and time, other bytes: a second read would see them
    writeFileSync(run, text.replace('alpha', 'ALPHA'));
    utimesSync(run, 1_700_000_000, 1_700_000_000);
    expect(await h.call('file:sha256', id)).toBe(createHash('sha256').update(text).digest('hex'));
  });

  it('streams a UTF-16 file with its byte-order mark as text', async () => {
    const text = 'alpha,lift\n' + '1,2µ\n'.repeat(5000);
    const { h, run, id } = await chosenRun('');
    writeFileSync(run, Buffer.from('\ufeff' + text, 'utf16le'));
    const stream = await h.call('file:open-stream', id, 4097); // odd: code units split across chunks
    let got = '';
    for (let c = await h.call('file:next-chunk', stream); c !== null; c = await h.call('file:next-chunk', stream)) got += c as string;
    expect(got).toBe(text);
  });

  it('refuses to stream a FIFO or device the user dropped, without hanging', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'sweepbook-fifo-'));
    const fifo = join(dir, 'run.csv');
    execFileSync('mkfifo', [fifo]);
    const h = host();
    const c = (await h.call('file:adopt-dropped', fifo)) as { id: string };
    await expect(h.call('file:open-stream', c.id, 4096)).rejects.toThrow(/not a regular file/);
    await expect(h.call('file:sha256', c.id)).rejects.toThrow(/not a regular file/);
  }, 15_000);
});
