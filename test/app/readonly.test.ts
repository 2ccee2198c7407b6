import { cpSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, utimesSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { writeFileAtomic } from '../../app/files/atomic.ts';
import { parseCampaign, serializeCampaign } from '../../core/formats/campaign.ts';
import { runCli } from '../support/cli.ts';

/**
 * Raw run files are opened read-only and never written (docs/architecture.md §9): after reductions to JSON
 * and CSV, a projection, refused attempts to write over an input, and a campaign saved in the same
 * folder, every raw file has its bytes and its modification time unchanged.
 */
const ROOT = resolve(__dirname, '../..');

const made: string[] = [];
const tempFolder = (prefix: string) => {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  made.push(dir);
  return dir;
};
afterAll(() => made.forEach((d) => rmSync(d, { recursive: true, force: true })));

/** A copy of sample-runs/ whose files carry a modification time far in the past, so any write shows. */
function sampleCopy(): string {
  const dir = tempFolder('sweepbook-readonly-');
  cpSync(join(ROOT, 'sample-runs'), dir, { recursive: true });
  const past = new Date('2001-02-03T04:05:06Z');
  for (const name of readdirSync(dir)) utimesSync(join(dir, name), past, past);
  return dir;
}

function snapshot(dir: string): Map<string, { bytes: Buffer; mtimeMs: number }> {
  return new Map(readdirSync(dir).map((name) => [name, { bytes: readFileSync(join(dir, name)), mtimeMs: statSync(join(dir, name)).mtimeMs }]));
}

describe('raw run files are never written', () => {
  it('keeps every raw file byte for byte, with its modification time, through reduce, project, refused overwrites and a campaign save', async () => {
    const dir = sampleCopy();
    const out = tempFolder('sweepbook-readonly-out-');
    const f = (name: string) => join(dir, name);
    const before = snapshot(dir);
    expect([...before.keys()].filter((n) => n.endsWith('.csv')).length).toBeGreaterThanOrEqual(6);

    const runs: [string, string, string[]][] = [
      ['run-101-clean.csv', 'setup-3d.json', ['--tare', f('windoff-tare.csv')]],
      ['run-102-flap10.csv', 'setup-3d.json', []],
      ['run-104-clean-timehistory.csv', 'setup-3d.json', ['--tare', f('windoff-tare.csv')]],
      ['run-201-section.csv', 'setup-2d.json', []],
    ];
    for (const [run, setup, extra] of runs) {
      for (const format of ['json', 'csv']) {
        const target = join(out, `${run}.${format}`);
        const r = await runCli('reduce', f(run), '--setup', f(setup), ...extra, '--format', format, '--out', target);
        expect(r.code, r.stderr).toBe(0);
        expect(readFileSync(target, 'utf8').length).toBeGreaterThan(500);
      }
    }
    const p = await runCli('project', f('run-101-clean.csv'), '--setup', f('setup-3d.json'), '--mass-kg', '600', '--wing-area-m2', '10');
    expect(p.code, p.stderr).toBe(0);

    // an --out that names an input, directly or by another spelling of its path, is refused before anything is read
    for (const target of [f('run-101-clean.csv'), join(dir, '.', 'run-101-clean.csv'), f('setup-3d.json'), f('windoff-tare.csv')]) {
      const r = await runCli('reduce', f('run-101-clean.csv'), '--setup', f('setup-3d.json'), '--tare', f('windoff-tare.csv'), '--out', target);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(/is one of the input files/);
    }

    // a campaign saved beside the runs (with its backup) touches only the campaign
    const campaignPath = f('sweepbook-campaign.json');
    const campaign = parseCampaign(campaignPath, readFileSync(campaignPath, 'utf8'));
    await writeFileAtomic(campaignPath, serializeCampaign({ ...campaign, name: `${campaign.name} (saved again)` }), { backup: true });

    const after = snapshot(dir);
    for (const [name, b] of before) {
      if (name === 'sweepbook-campaign.json') continue;
      const a = after.get(name);
      expect(a, name).toBeDefined();
      expect(a!.bytes.equals(b.bytes), `${name} bytes`).toBe(true);
      expect(a!.mtimeMs, `${name} modification time`).toBe(b.mtimeMs);
    }
    // nothing new in the folder but the campaign's backup
    expect([...after.keys()].filter((n) => !before.has(n))).toEqual(['sweepbook-campaign.json.bak']);
    expect(readFileSync(f('sweepbook-campaign.json.bak')).equals(before.get('sweepbook-campaign.json')!.bytes)).toBe(true);
  });
});
