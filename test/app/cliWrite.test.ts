import { execFileSync } from 'node:child_process';
import { lstatSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { runCli } from '../support/cli.ts';

const ROOT = resolve(__dirname, '../..');
const RUN = join(ROOT, 'sample-runs', 'run-201-section.csv');
const SETUP = join(ROOT, 'sample-runs', 'setup-2d.json');
const dir = () => mkdtempSync(join(tmpdir(), 'sweepbook-write-'));

/** The command failed cleanly: exit 1, the user's path named, no crash report, no temp file named. */
function refusedCleanly(r: { code: number; stderr: string }, path: string) {
  expect(r.code, r.stderr).toBe(1);
  expect(r.stderr).toContain(path);
  expect(r.stderr).not.toMatch(/internal error|please report|\.tmp\b/);
}

describe('reduce --out: where the command line writes', () => {
  it('refuses a folder that does not exist, naming the path given', async () => {
    const out = join(dir(), 'missing', 'points.csv');
    refusedCleanly(await runCli('reduce', RUN, '--setup', SETUP, '--out', out), out);
  });

  it('refuses a folder as the target and leaves it as it was', async () => {
    const out = join(dir(), 'results');
    mkdirSync(out);
    const r = await runCli('reduce', RUN, '--setup', SETUP, '--out', out);
    refusedCleanly(r, out);
    expect(r.stderr).toMatch(/folder/);
    expect(lstatSync(out).isDirectory()).toBe(true);
  });

  it('refuses a FIFO or a device node and never replaces the node', async () => {
    const fifo = join(dir(), 'pipe.csv');
    execFileSync('mkfifo', [fifo]);
    const r = await runCli('reduce', RUN, '--setup', SETUP, '--out', fifo);
    refusedCleanly(r, fifo);
    expect(lstatSync(fifo).isFIFO()).toBe(true);
    refusedCleanly(await runCli('reduce', RUN, '--setup', SETUP, '--out', '/dev/null'), '/dev/null');
    expect(lstatSync('/dev/null').isCharacterDevice()).toBe(true);
  });

  it('reports a write the system refuses as exit 1 naming the path (not an internal error)', async () => {
    // /proc exists but takes no new files, even for root
    refusedCleanly(await runCli('reduce', RUN, '--setup', SETUP, '--out', '/proc/points.csv'), '/proc/points.csv');
    const notFolder = join(dir(), 'file.txt');
    writeFileSync(notFolder, 'x');
    refusedCleanly(await runCli('reduce', RUN, '--setup', SETUP, '--out', join(notFolder, 'points.csv')), join(notFolder, 'points.csv'));
  });

  it('still refuses the run, setup and tare files as targets', async () => {
    const d = dir();
    const run = join(d, 'run.csv');
    writeFileSync(run, readFileSync(RUN));
    const r = await runCli('reduce', run, '--setup', SETUP, '--out', run);
    expect(r.code).toBe(2);
    expect(readFileSync(run, 'utf8')).toBe(readFileSync(RUN, 'utf8'));
  });
});

describe('reduce of several runs (--out-dir)', () => {
  it('refuses an output folder where a table would replace one of the run files, and writes nothing', async () => {
    const d = dir();
    const run = join(d, 'run-201.csv');
    writeFileSync(run, readFileSync(RUN));
    const r = await runCli('reduce', run, '--setup', SETUP, '--out-dir', d);
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('would overwrite the input');
    expect(readFileSync(run, 'utf8')).toBe(readFileSync(RUN, 'utf8'));
  });
});

describe('reduce: sizes and names of inputs', () => {
  it('refuses a setup file far larger than any setup, with a message naming it, and reads none of it into the output', async () => {
    const big = join(dir(), 'setup-big.json');
    const setup = JSON.parse(readFileSync(SETUP, 'utf8'));
    writeFileSync(big, JSON.stringify({ ...setup, note: 'x'.repeat(3 << 20) }));
    const r = await runCli('reduce', RUN, '--setup', big);
    expect(r.code).toBe(1);
    expect(r.stderr).toContain(big);
    expect(r.stderr).toMatch(/at most 1\.0 MiB/);
    expect(r.stdout).toBe('');
  });

  it('refuses δ = 11.5 (a slipped decimal point) with exit 1 naming the setup field, instead of reducing to α of 130°', async () => {
    const setup = JSON.parse(readFileSync(SETUP, 'utf8'));
    const bad = join(dir(), 'setup-typo.json');
    writeFileSync(bad, JSON.stringify({ ...setup, corrections: { ...setup.corrections, delta: 11.5 } }));
    const r = await runCli('reduce', RUN, '--setup', bad);
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('corrections.delta');
    expect(r.stdout).toBe('');
  });

  it('writes a run file named like a formula into the CSV provenance without a live formula cell', async () => {
    const d = dir();
    const run = join(d, 'a,=1+2;@SUM(A1),-2+3.csv');
    writeFileSync(run, readFileSync(RUN));
    const r = await runCli('reduce', run, '--setup', SETUP, '--format', 'csv');
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain('# run: a,');
    for (const delimiter of [',', ';', '\t']) {
      const cells = Papa.parse<string[]>(r.stdout, { delimiter }).data.flat();
      expect(cells.filter((c) => /^[=+@]/.test(c) || /^-(?!\d+(\.\d+)?([eE][+-]?\d+)?[\]}]*$)/.test(c))).toEqual([]);
    }
  });
});
