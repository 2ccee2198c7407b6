import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { POINT_COLUMNS } from '../../core/reduction/engine.ts';
import { ROUNDING_NOTE } from '../../core/formats/reportTable.ts';
import { runCli } from '../support/cli.ts';

const ROOT = resolve(__dirname, '../..');
const S = (p: string) => join(ROOT, 'sample-runs', p);



function tmp(name: string, text: string | Buffer): string {
  const dir = mkdtempSync(join(tmpdir(), 'sweepbook-cli-'));
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
}

// The keys docs/data-format.md §8 names; the output may carry more, never fewer.
const POINT_KEYS = ['alpha_deg', 'alpha_uncorrected_deg', 'q_pa', 'q_uncorrected_pa', 'v_mps', 'mach', 'reynolds', 'rho_kgm3', 'mu_pas', 'cl', 'cd', 'cm', 'cl_uncorrected', 'cd_uncorrected', 'cm_uncorrected', 'eps_solid', 'eps_wake', 'samples', 'v_uncorrected_mps', 'mach_uncorrected', 'reynolds_uncorrected'];
const FIT_KEYS = ['cl_alpha_per_deg', 'cl_alpha_stderr_per_deg', 'alpha_zero_lift_deg', 'cl_max', 'alpha_cl_max_deg', 'linear_range_deg', 'cd0', 'k_induced', 'oswald_e', 'ld_max', 'cl_at_ld_max', 'cm_alpha_per_deg'];
const FACTOR_KEYS = ['sigma', 'delta', 'tau1', 'tau2', 'solid_blockage_k'];

describe('sweepbook reduce (command line, docs/data-format.md §8)', () => {
  it('prints the contract JSON with every key, and only JSON on stdout', async () => {
    const r = await runCli('reduce', S('run-101-clean.csv'), '--setup', S('setup-3d.json'), '--tare', S('windoff-tare.csv'), '--format', 'json');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.run.name).toBe('101');
    expect(doc.run.configuration).toBe('clean');
    expect(doc.points).toHaveLength(15);
    for (const p of doc.points) for (const k of POINT_KEYS) expect(p, k).toHaveProperty(k);
    for (const k of FIT_KEYS) expect(doc.fit).toHaveProperty(k);
    for (const k of FACTOR_KEYS) expect(doc.factors).toHaveProperty(k);
    expect(doc.factors.sigma).toBeNull(); // 3D
    expect(doc.factors.delta).toBeGreaterThan(0.1);
    expect(Array.isArray(doc.warnings)).toBe(true);
    expect(doc.fit.cl_alpha_per_deg).toBeGreaterThan(0.05);
  });

  it('gives the run name from the file when there is no "# run:" line, and null configuration', async () => {
    const p = tmp('sweep-7.csv', 'alpha,dp_pitot,lift,drag\n0,500,10,1\n2,500,30,1.2\n');
    const r = await runCli('reduce', p, '--setup', S('setup-3d.json'));
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.run.name).toBe('sweep-7');
    expect(doc.run.configuration).toBeNull();
    expect(doc.points[0].samples).toBe(1);
  });

  it('writes CSV with --format csv and to a file with --out', async () => {
    const out = join(mkdtempSync(join(tmpdir(), 'sweepbook-out-')), 'points.csv');
    const r = await runCli('reduce', S('run-201-section.csv'), '--setup', S('setup-2d.json'), '--format', 'csv', '--out', out);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe('');
    const all = readFileSync(out, 'utf8').trim().split('\n');
    const lines = all.filter((l) => !l.startsWith('#'));
    expect(lines[0]!.split(',').slice(0, 4)).toEqual(['point', 'samples', 'alpha_deg', 'cl']);
    expect(lines).toHaveLength(14);
    // the run's name and configuration first, then the provenance
    expect(all.slice(0, 2)).toEqual(['# run: 201', '# configuration: 2D section, clean']);
    expect(all[2]).toMatch(/^# tool: sweepbook \d+\.\d+\.\d+$/);
    expect(all.some((l) => l.startsWith('# run: run-201-section.csv sha256 '))).toBe(true);
    expect(all).toContain(`# ${ROUNDING_NOTE}`);
  });

  it("writes the CSV's numbers rounded by the report rule, each within half a unit in its last place of the JSON's", async () => {
    const args = [S('run-101-clean.csv'), '--setup', S('setup-3d.json'), '--tare', S('windoff-tare.csv')];
    const csv = await runCli('reduce', ...args, '--format', 'csv');
    const json = await runCli('reduce', ...args);
    expect(csv.code, csv.stderr).toBe(0);
    const doc = JSON.parse(json.stdout) as { points: Record<string, number | string | null>[] };
    const [header, ...rows] = Papa.parse<string[]>(csv.stdout, { comments: '#', skipEmptyLines: true }).data;
    expect(header).toEqual([...POINT_COLUMNS]);
    expect(rows).toHaveLength(doc.points.length);
    let compared = 0;
    rows.forEach((row, i) =>
      row.forEach((cell, j) => {
        const ref = doc.points[i]![header![j]!];
        if (typeof ref === 'string' || ref === null || ref === undefined) return expect(cell).toBe(ref ?? '');
        const mantissa = cell.replace(/^-/, '').replace(/e.*$/i, '');
        // at most 7 significant digits, except counts and line numbers, written whole
        if (!['samples', 'line'].includes(header![j]!)) expect(mantissa.replace('.', '').replace(/^0+/, '').length, cell).toBeLessThanOrEqual(7);
        const decimals = mantissa.includes('.') ? mantissa.split('.')[1]!.length : 0;
        const trailingZeros = decimals === 0 ? (/0+$/.exec(mantissa)?.[0].length ?? 0) : 0;
        const scale = /e/i.test(cell) ? 10 ** Number(cell.split(/e/i)[1]) : 1;
        // rounded to the last digit written (tens, hundreds… when an integer ends in zeros)
        const place = 10 ** (trailingZeros - decimals) * scale;
        expect(Math.abs(Number(cell) - ref), `${header![j]} point ${i}: ${cell} vs ${ref}`).toBeLessThanOrEqual(place / 2 + Math.abs(ref) * 1e-12);
        compared++;
      }),
    );
    expect(compared).toBeGreaterThan(30 * rows.length);
  });

  it('is reproducible: with SOURCE_DATE_EPOCH set, two reductions give byte-identical JSON and CSV', async () => {
    const before = process.env['SOURCE_DATE_EPOCH'];
    process.env['SOURCE_DATE_EPOCH'] = '1764547200';
    try {
      const args = [S('run-104-clean-timehistory.csv'), '--setup', S('setup-3d.json'), '--tare', S('windoff-tare.csv')];
      const a = await runCli('reduce', ...args);
      const b = await runCli('reduce', ...args);
      expect(a.stdout.length).toBeGreaterThan(1000);
      expect(b.stdout).toBe(a.stdout);
      const c = await runCli('reduce', ...args, '--format', 'csv');
      const d = await runCli('reduce', ...args, '--format', 'csv');
      expect(d.stdout).toBe(c.stdout);
      const doc = JSON.parse(a.stdout);
      expect(doc.provenance.reduced_at).toBe('2025-12-01T00:00:00.000Z');
      const sha = createHash('sha256').update(readFileSync(S('run-104-clean-timehistory.csv'))).digest('hex');
      expect(doc.provenance.inputs).toContainEqual({ role: 'run', name: 'run-104-clean-timehistory.csv', sha256: sha });
      expect(doc.provenance.setup.model.chord_m).toBe(0.225);
      expect(doc.provenance.factors.delta).toBe(doc.factors.delta);
    } finally {
      if (before === undefined) delete process.env['SOURCE_DATE_EPOCH'];
      else process.env['SOURCE_DATE_EPOCH'] = before;
    }
  });

  it('--no-corrections reports the measured values as the corrected ones and null factors', async () => {
    const r = await runCli('reduce', S('run-101-clean.csv'), '--setup', S('setup-3d.json'), '--no-corrections');
    const doc = JSON.parse(r.stdout);
    expect(doc.points[3].cl).toBe(doc.points[3].cl_uncorrected);
    expect(doc.factors).toEqual({ sigma: null, delta: null, tau1: null, tau2: null, solid_blockage_k: null });
  });

  it.each([
    ['a missing required column', 'no-drag.csv', 'alpha,dp_pitot,lift\n1,500,10\n', ['no-drag.csv:1', 'missing required column "drag"']],
    ['an unknown unit', 'unit.csv', '# run: 1\nalpha,dp_pitot [bar2],lift,drag\n1,500,10,1\n', ['unit.csv:2:2', 'bar2']],
    ['an empty file', 'empty.csv', '', ['empty.csv', 'empty']],
  ])('refuses %s with file, line and column on stderr, exit 1, no stack trace', async (_what, name, text, parts) => {
    const r = await runCli('reduce', tmp(name, text), '--setup', S('setup-3d.json'));
    expect(r.code).toBe(1);
    expect(r.stdout).toBe('');
    for (const p of parts) expect(r.stderr).toContain(p);
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it('refuses a binary file', async () => {
    const r = await runCli('reduce', tmp('x.csv', Buffer.from([0x50, 0x4b, 0x03, 0x04, 0, 0, 0, 1, 2, 3])), '--setup', S('setup-3d.json'));
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('binary');
  });

  it('refuses a malformed setup naming the field and what was expected', async () => {
    const bad = JSON.parse(readFileSync(S('setup-3d.json'), 'utf8'));
    bad.model.chord_m = -0.2;
    const r = await runCli('reduce', S('run-101-clean.csv'), '--setup', tmp('setup.json', JSON.stringify(bad)));
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('model.chord_m');
    expect(r.stderr).toContain('positive');
  });

  it('refuses an unknown setup key, naming the nearest known one', async () => {
    const bad = JSON.parse(readFileSync(S('setup-3d.json'), 'utf8'));
    bad.tunnel.widht_m = 1.2;
    const r = await runCli('reduce', S('run-101-clean.csv'), '--setup', tmp('setup.json', JSON.stringify(bad)));
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('tunnel.widht_m');
    expect(r.stderr).toContain('did you mean "width_m"');
  });

  it('names the line and column of a JSON syntax error in the setup', async () => {
    const r = await runCli('reduce', S('run-101-clean.csv'), '--setup', tmp('setup.json', '{\n  "model": {,\n}'));
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/setup\.json:2:\d+/);
  });

  it('names a file that does not exist', async () => {
    const r = await runCli('reduce', '/nonexistent/run.csv', '--setup', S('setup-3d.json'));
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('/nonexistent/run.csv: no such file');
  });

  it('reduces the good rows of a file with bad rows and names the bad lines in warnings', async () => {
    const p = tmp('bad-rows.csv', '# run: 9\nalpha,dp_pitot,lift,drag\n0,500,10,1\n2,oops,30,1.2\n4,500,50,1.5\n');
    const r = await runCli('reduce', p, '--setup', S('setup-3d.json'), '--no-corrections');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.points).toHaveLength(2);
    expect(doc.warnings.some((w: string) => w.includes('bad-rows.csv:4:2'))).toBe(true);
    expect(r.stderr).toContain('bad-rows.csv:4:2');
  });

  it('answers a wrong command line with usage and exit 2', async () => {
    expect((await runCli('reduce', S('run-101-clean.csv'))).code).toBe(2);
    expect((await runCli('frobnicate')).code).toBe(2);
    expect((await runCli('reduce', 'a.csv', '--setup', 's.json', '--format', 'xml')).stderr).toContain('--format must be json or csv');
  });

  it('runs as the installed command (bin/sweepbook.js) in a real process', () => {
    const out = execFileSync(process.execPath, [join(ROOT, 'bin', 'sweepbook.js'), 'reduce', S('run-104-clean-timehistory.csv'), '--setup', S('setup-3d.json'), '--tare', S('windoff-tare.csv')], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });
    const doc = JSON.parse(out);
    expect(doc.points).toHaveLength(15);
    expect(doc.points[0].samples).toBe(200);
    const bad = spawnSync(process.execPath, [join(ROOT, 'bin', 'sweepbook.js'), 'reduce', 'missing.csv', '--setup', S('setup-3d.json')], { encoding: 'utf8' });
    expect(bad.status).toBe(1);
    expect(bad.stderr).not.toMatch(/\n\s+at /);
  });
});
