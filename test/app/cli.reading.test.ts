import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import readXlsxFile from 'read-excel-file/node';
import writeXlsxFile from 'write-excel-file/node';
import { runCli } from '../support/cli.ts';

const ROOT = resolve(__dirname, '../..');
const S = (p: string) => join(ROOT, 'sample-runs', p);
const dir = () => mkdtempSync(join(tmpdir(), 'sweepbook-read-'));
function tmp(name: string, text: string | Buffer): string {
  const p = join(dir(), name);
  writeFileSync(p, text);
  return p;
}

/**
 * A facility-style file, synthetic: aligned columns, a units row (mmH2O, hPa, degr. C, lb, in-lb),
 * the facility's own q, pitching moment of the opposite sign, no point ids (the angle jitters by
 * < 0.1° between samples), and the facility's own uncorrected CL and CD printed to 4 decimals,
 * computed here independently as L/(q·S) with NIST SP 811 factors (lbf 4.4482216152605 N, mmH2O 9.80665 Pa).
 */
function facilityFile(): { text: string; cl: number[]; cd: number[] } {
  const S_REF = 0.2025; // m², sample-runs/setup-3d.json
  const rows: string[] = [
    '# run: F-3',
    '# configuration: facility layout',
    'AoA       Qinf     Pbar      Tair      RH     Lift      Drag      Mz        CL_fac   CD_fac',
    'deg       mmH2O    hPa       degr. C   %      lb        lb        in-lb     -        -',
  ];
  const cl: number[] = [];
  const cd: number[] = [];
  for (const [k, a] of [-4, 0, 4, 8].entries()) {
    const qMm = 62 + k * 0.5;
    const qPa = qMm * 9.80665;
    const liftLb = 0.6 * a + 0.9;
    const dragLb = 0.05 + 0.002 * a * a;
    const cL = (liftLb * 4.4482216152605) / (qPa * S_REF);
    const cD = (dragLb * 4.4482216152605) / (qPa * S_REF);
    cl.push(Number(cL.toFixed(4)));
    cd.push(Number(cD.toFixed(4)));
    for (const j of [0, 1, 2]) {
      const jitter = [0, 0.06, -0.04][j]!;
      rows.push(
        [
          (a + jitter).toFixed(2),
          qMm.toFixed(1),
          '991.8',
          '18.6',
          '52',
          liftLb.toFixed(3),
          dragLb.toFixed(4),
          (-0.2 * a).toFixed(3),
          cL.toFixed(4),
          cD.toFixed(4),
        ]
          .map((c) => c.padEnd(9))
          .join(' '),
      );
    }
  }
  return { text: rows.join('\n') + '\n', cl, cd };
}

describe('sweepbook columns', () => {
  it('prints the columns found with the guessed channel and unit, and writes a map to edit', async () => {
    const f = facilityFile();
    const run = tmp('facility.txt', f.text);
    const map = join(dir(), 'map.json');
    const r = await runCli('columns', run, '--out', map);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('header on line 3, units row on line 4; columns aligned with spaces; 10 columns');
    expect(r.stdout).toMatch(/\n\s+2 {2}Qinf\s+mmH2O\s+q\s+sure\s+62\.0/);
    expect(r.stdout).toMatch(/\n\s+8 {2}Mz\s+in-lb\s+pitch/);
    expect(r.stderr).toContain(`wrote ${map}`);
    const written = JSON.parse(readFileSync(map, 'utf8'));
    expect(written.format).toBe('sweepbook-columns');
    expect(written.columns['Tair']).toEqual({ channel: 't_total', unit: 'degr. C' });
    expect(written.columns['CL_fac']).toBeNull();
  });

  it('refuses a file without a header, naming it', async () => {
    const r = await runCli('columns', tmp('c.csv', '# only: comments\n'));
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/c\.csv:1: no header line found/);
  });
});

describe('reduce with a column map', () => {
  it("reproduces the facility's own uncorrected CL and CD to the printed digits (synthetic facility file)", async () => {
    const f = facilityFile();
    const run = tmp('facility.txt', f.text);
    const map = join(dir(), 'map.json');
    await runCli('columns', run, '--out', map);
    const m = JSON.parse(readFileSync(map, 'utf8'));
    const unscaled = await runCli('reduce', run, '--setup', S('setup-3d.json'), '--columns', map, '--no-corrections');
    m.columns['Mz'].scale = -1; // the facility's pitching moment has the opposite sign
    writeFileSync(map, JSON.stringify(m));
    const r = await runCli('reduce', run, '--setup', S('setup-3d.json'), '--columns', map, '--no-corrections');
    expect(r.code, r.stderr).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.points.map((p: { samples: number }) => p.samples)).toEqual([3, 3, 3, 3]);
    // the facility's CL is on its q as logged: our q_uncorrected is that q, so the coefficients agree to 4 decimals
    expect(doc.points.map((p: { cl_uncorrected: number }) => Number(p.cl_uncorrected.toFixed(4)))).toEqual(f.cl);
    expect(doc.points.map((p: { cd_uncorrected: number }) => Number(p.cd_uncorrected.toFixed(4)))).toEqual(f.cd);
    // the map's scale −1 flips the moment: raw Mz = −0.2·α in-lb, so Cm falls at −4° and rises at 8°
    const cmBefore = JSON.parse(unscaled.stdout).points.map((p: { cm_uncorrected: number }) => p.cm_uncorrected);
    const cmAfter = doc.points.map((p: { cm_uncorrected: number }) => p.cm_uncorrected);
    expect(cmAfter[0]).toBeLessThan(cmBefore[0]);
    expect(cmAfter[3]).toBeGreaterThan(cmBefore[3]);
    expect(cmAfter[1]).toBeCloseTo(cmBefore[1], 12); // Mz = 0 at 0°
    expect(doc.run.name).toBe('F-3');
    expect(doc.provenance.inputs.map((i: { role: string }) => i.role)).toEqual(['setup', 'columns', 'run']);
  });

  it('exits 1 on a map naming a column the run lacks, naming the map and the key', async () => {
    const map = tmp('m.json', JSON.stringify({ format: 'sweepbook-columns', version: 1, columns: { 'Angle of attack': { channel: 'alpha' } } }));
    const r = await runCli('reduce', S('run-101-clean.csv'), '--setup', S('setup-3d.json'), '--columns', map);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/error: .*m\.json: columns\["Angle of attack"\]: names a column that .*run-101-clean\.csv does not have/);
    expect(r.stdout).toBe('');
  });

  it('exits 1 on an unknown unit in a map, naming the map, line and key', async () => {
    const map = tmp('m.json', '{"format": "sweepbook-columns", "version": 1,\n "columns": {\n  "alpha [deg]": {"channel": "alpha", "unit": "grad"}}}');
    const r = await runCli('reduce', S('run-101-clean.csv'), '--setup', S('setup-3d.json'), '--columns', map);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/m\.json:3:3: columns\["alpha \[deg\]"\]\.unit: unknown unit "grad"/);
  });

  it('exits 1 on a units row that does not parse, naming run file, line and column', async () => {
    const run = tmp('u.csv', 'alpha,dp_pitot,lift,drag\ndeg,Pa,N,parsec\n1,600,1,1\n');
    const r = await runCli('reduce', run, '--setup', S('setup-3d.json'));
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/u\.csv:2:4: column "drag" \(drag\) has unit "parsec"/);
  });
});

describe('spreadsheet run files', () => {
  it('reads the first sheet of an .xlsx file by the same rules as its CSV', async () => {
    const csv = readFileSync(S('run-101-clean.csv'), 'utf8').trim().split('\n');
    const rows = csv.map((l) => (l.startsWith('#') ? [{ value: l }] : l.split(',').map((c) => (/^-?[\d.]+$/.test(c) ? { value: Number(c) } : { value: c }))));
    const buf = (await writeXlsxFile(rows as never).toBuffer()) as Buffer;
    const xlsx = tmp('run-101.xlsx', buf);
    const a = await runCli('reduce', xlsx, '--setup', S('setup-3d.json'));
    const b = await runCli('reduce', S('run-101-clean.csv'), '--setup', S('setup-3d.json'));
    expect(a.code, a.stderr).toBe(0);
    const pa = JSON.parse(a.stdout);
    const pb = JSON.parse(b.stdout);
    expect(pa.run.name).toBe('101');
    expect(pa.points.map((p: { cl: number }) => p.cl)).toEqual(pb.points.map((p: { cl: number }) => p.cl));
    expect(pa.fit).toEqual(pb.fit);
  });

  it('refuses a file named .xlsx that is not a workbook, naming it', async () => {
    const r = await runCli('reduce', tmp('fake.xlsx', 'alpha,lift\n1,2\n'), '--setup', S('setup-3d.json'));
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/fake\.xlsx: not a readable \.xlsx workbook/);
  });
});

describe('batch reduction', () => {
  it('reduces several runs in parallel, writes one table per run and combined points and fits (CSV, XLSX), and goes on past a failing run', async () => {
    const out = join(dir(), 'out');
    const bad = tmp('broken.csv', 'nothing to see\n');
    const r = await runCli(
      'reduce',
      S('run-101-clean.csv'),
      bad,
      S('run-102-flap10.csv'),
      '--setup',
      S('setup-3d.json'),
      '--tare',
      S('windoff-tare.csv'),
      '--out-dir',
      out,
    );
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/FAILED {2}.*broken\.csv: error: .*broken\.csv:1: no data rows/);
    expect(r.stderr).toContain('wrote 2 run tables');
    for (const f of ['run-101-clean.csv', 'run-102-flap10.csv', 'points.csv', 'fits.csv', 'points.xlsx', 'fits.xlsx'])
      expect(existsSync(join(out, f)), f).toBe(true);
    const perRun = readFileSync(join(out, 'run-102-flap10.csv'), 'utf8').split('\n');
    expect(perRun.slice(0, 2)).toEqual(['# run: 102', '# configuration: flap 10']);
    const fits = readFileSync(join(out, 'fits.csv'), 'utf8').trim().split('\n');
    expect(fits).toHaveLength(4);
    expect(fits[1]).toMatch(/^101,clean,run-101-clean\.csv,ok,15,/);
    expect(fits[2]).toMatch(/^broken,,broken\.csv,failed: /);
    const pointsText = readFileSync(join(out, 'points.csv'), 'utf8');
    const points = pointsText
      .trim()
      .split('\n')
      .filter((l) => !l.startsWith('#'));
    expect(points).toHaveLength(1 + 30);
    // numbers rounded as in each run's own table: the rows of points.csv are the per-run rows behind run, configuration, file
    expect(pointsText.split('\n')[0]).toMatch(/^# numbers: rounded to the place of the standard uncertainty's second significant digit/);
    const own = perRun.filter((l) => l !== '' && !l.startsWith('#')).slice(1);
    expect(points.filter((l) => l.startsWith('102,flap 10,run-102-flap10.csv,')).map((l) => l.split(',').slice(3).join(','))).toEqual(own);
    const sheets = await readXlsxFile(join(out, 'points.xlsx'));
    expect(sheets[0]!.data.length).toBe(31);
    expect(sheets[0]!.data[1]!.slice(0, 2)).toEqual(['101', 'clean']);
  }, 60_000);

  it('asks for --out-dir when given several runs', async () => {
    const r = await runCli('reduce', S('run-101-clean.csv'), S('run-102-flap10.csv'), '--setup', S('setup-3d.json'));
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('give --out-dir DIR to reduce several');
  });
});
