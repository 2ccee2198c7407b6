/**
 * The commands calibrate, upflow and repeat, and reduce on raw bridge outputs, as a user meets them:
 * files in, one JSON document on standard output (or the balance file written), messages on standard
 * error, exit codes. The calibration is compared with numpy.linalg.lstsq (test/fixtures/balance/
 * generate.py); the upflow pair is made here with a known upflow following the data contract's model.
 */
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../support/cli.ts';
import { normal } from '../support/random.ts';

const ROOT = resolve(__dirname, '../..');
const S = (p: string) => join(ROOT, 'sample-runs', p);
const FIX = (p: string) => join(ROOT, 'test/fixtures/balance', p);
const dir = () => mkdtempSync(join(tmpdir(), 'sweepbook-analysis-'));

describe('sweepbook calibrate', () => {
  it('writes the balance document with residual statistics equal to numpy.linalg.lstsq’s, and prints only messages', async () => {
    const out = join(dir(), 'b3.json');
    const r = await runCli('calibrate', FIX('loadings.csv'), '--loads', 'normal,axial,pitch', '--outputs', 'r1,r2,r3', '--out', out);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/outputs_from_loads from 55 loadings, 9 terms per equation/);
    expect(r.stderr).toMatch(/axial +residual SD/);
    const doc = JSON.parse(readFileSync(out, 'utf8'));
    const want = JSON.parse(readFileSync(FIX('expected.json'), 'utf8')).fits.outputs_from_loads;
    expect(doc).toMatchObject({
      format: 'sweepbook-balance',
      version: 1,
      loads: ['normal', 'axial', 'pitch'],
      load_units: ['N', 'N', 'N m'],
      outputs: ['r1', 'r2', 'r3'],
      form: 'outputs_from_loads',
    });
    doc.fit.residual_sd.forEach((x: number, k: number) => expect(Math.abs(x / want.residual_sd[k] - 1)).toBeLessThan(1e-7));
    doc.fit.residual_max.forEach((x: number, k: number) => expect(Math.abs(x / want.residual_max[k] - 1)).toBeLessThan(1e-7));
    expect(doc.fit.residual_sd_pct).toHaveLength(3);
  });
  it('fits the direct form with --form loads_from_outputs and a linear balance with --linear-only', async () => {
    const out = join(dir(), 'lin.json');
    const r = await runCli(
      'calibrate',
      FIX('loadings.csv'),
      '--loads',
      'normal,axial,pitch',
      '--outputs',
      'r1,r2,r3',
      '--form',
      'loads_from_outputs',
      '--linear-only',
      '--out',
      out,
    );
    expect(r.code).toBe(0);
    const doc = JSON.parse(readFileSync(out, 'utf8'));
    expect(doc.form).toBe('loads_from_outputs');
    expect(doc.quadratic).toBeUndefined();
  });
  it('refuses a wrong command line with exit 2, and never writes over the loadings', async () => {
    expect((await runCli('calibrate', FIX('loadings.csv'), '--loads', 'normal', '--outputs', 'r1')).code).toBe(2);
    expect(
      (await runCli('calibrate', FIX('loadings.csv'), '--loads', 'normal', '--outputs', 'r1', '--form', 'both', '--out', join(dir(), 'x.json'))).code,
    ).toBe(2);
    const r = await runCli('calibrate', FIX('loadings.csv'), '--loads', 'normal,axial,pitch', '--outputs', 'r1,r2,r3', '--out', FIX('loadings.csv'));
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/never overwritten/);
  });
  it('names the file for a column the loadings lack (exit 1)', async () => {
    const r = await runCli('calibrate', FIX('loadings.csv'), '--loads', 'normal,axial,pitch', '--outputs', 'r1,r2,r9', '--out', join(dir(), 'x.json'));
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/loadings\.csv:3: no column "r9"/);
  });
});

describe('sweepbook reduce with a balance file beside the setup', () => {
  it('reduces the raw-output sample run with its raw-output tare, close to the same wing logged as loads', async () => {
    const raw = await runCli('reduce', S('run-301-raw-outputs.csv'), '--setup', S('setup-3d-raw.json'), '--tare', S('windoff-tare-raw.csv'));
    expect(raw.code).toBe(0);
    const doc = JSON.parse(raw.stdout);
    expect(doc.points).toHaveLength(15);
    expect(doc.points[0].samples).toBe(20);
    // provenance names the balance file by its SHA-256 and records its matrices (not its residual tables)
    const sha = createHash('sha256')
      .update(readFileSync(S('balance-b3.json')))
      .digest('hex');
    expect(doc.provenance.inputs).toContainEqual({ role: 'balance', name: 'balance-b3.json', sha256: sha });
    expect(doc.provenance.setup.balance.calibration).toMatchObject({ source: 'balance-b3.json', form: 'outputs_from_loads', outputs: ['r1', 'r2', 'r3'] });
    expect(doc.provenance.setup.balance.calibration.fit).toBeUndefined();
    const loads = JSON.parse((await runCli('reduce', S('run-101-clean.csv'), '--setup', S('setup-3d.json'), '--tare', S('windoff-tare.csv'))).stdout);
    // invented from the same curves with different noise: the lift-curve slope and CD0 agree within their scatter
    expect(Math.abs(doc.fit.cl_alpha_per_deg - loads.fit.cl_alpha_per_deg)).toBeLessThan(0.002);
    expect(Math.abs(doc.fit.cd0 - loads.fit.cd0)).toBeLessThan(0.001);
  });
  it('names the setup field when the balance file is missing, and the run file and column when an output is', async () => {
    const d = dir();
    const setup = JSON.parse(readFileSync(S('setup-3d-raw.json'), 'utf8'));
    writeFileSync(join(d, 'setup.json'), JSON.stringify({ ...setup, balance: { axes: 'body', calibration: 'nowhere.json' } }));
    const r = await runCli('reduce', S('run-301-raw-outputs.csv'), '--setup', join(d, 'setup.json'));
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/setup\.json: balance\.calibration: cannot read the balance file "nowhere\.json".*no such file/);
    const r2 = await runCli('reduce', S('run-101-clean.csv'), '--setup', S('setup-3d-raw.json'));
    expect(r2.code).toBe(1);
    expect(r2.stderr).toMatch(/run-101-clean\.csv:7: missing columns "r1", "r2", "r3" \(bridge outputs named by the balance calibration .*balance-b3\.json\)/);
  });
  it('names the balance file and field of a malformed balance', async () => {
    const d = dir();
    const b = JSON.parse(readFileSync(S('balance-b3.json'), 'utf8'));
    b.linear[1] = [1, 2];
    writeFileSync(join(d, 'b.json'), JSON.stringify(b));
    const setup = JSON.parse(readFileSync(S('setup-3d-raw.json'), 'utf8'));
    writeFileSync(join(d, 'setup.json'), JSON.stringify({ ...setup, balance: { axes: 'body', calibration: 'b.json' } }));
    const r = await runCli('reduce', S('run-301-raw-outputs.csv'), '--setup', join(d, 'setup.json'));
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/b\.json: linear\[1\]: 2 numbers; expected 3/);
  });
});

/** An upright/inverted pair made with upflow φ as the data contract models it, loads in the model's own frame. */
function pair(phiDeg: number, seed: number): [string, string] {
  const d = dir();
  const z = normal(seed);
  const files: string[] = [];
  for (const [name, sign] of [
    ['up.csv', 1],
    ['inv.csv', -1],
  ] as const) {
    const lines = ['# run: ' + name, 'alpha [deg],dp_pitot [Pa],lift [N],drag [N]'];
    const phi = (sign * phiDeg * Math.PI) / 180;
    for (let a = -6; a <= 6; a += 1) {
      const q = 600; // close enough to the flow-state q: both runs alike, and the zero-lift angle does not depend on q
      const alphaFlow = a + sign * phiDeg;
      const cl = 0.075 * (alphaFlow + 2.2) + 0.0003 * z();
      const cd = 0.012 + 0.06 * cl * cl + 0.00005 * z();
      const L = cl * q * 0.2025;
      const D = cd * q * 0.2025;
      // loads normal and parallel to the tunnel axis (inverse of L = L′cos φ − D′sin φ, D = D′cos φ + L′sin φ)
      lines.push([a.toFixed(3), q, (L * Math.cos(phi) + D * Math.sin(phi)).toFixed(5), (D * Math.cos(phi) - L * Math.sin(phi)).toFixed(5)].join(','));
    }
    const p = join(d, name);
    writeFileSync(p, lines.join('\n') + '\n');
    files.push(p);
  }
  return files as [string, string];
}

describe('sweepbook upflow', () => {
  for (const [phi, seed] of [
    [0.35, 1],
    [-0.6, 2],
    [1.2, 3],
  ] as const) {
    it(`recovers an upflow of ${phi}° within 0.01° from an upright/inverted pair, with its uncertainty`, async () => {
      const [up, inv] = pair(phi, seed);
      const r = await runCli('upflow', up, inv, '--setup', S('setup-3d.json'));
      expect(r.code).toBe(0);
      const doc = JSON.parse(r.stdout);
      for (const k of ['upflow_deg', 'upflow_u_deg', 'alpha_zero_lift_upright_deg', 'alpha_zero_lift_inverted_deg']) expect(typeof doc[k]).toBe('number');
      expect(Math.abs(doc.upflow_deg - phi)).toBeLessThan(0.01);
      expect(doc.upflow_u_deg).toBeGreaterThan(0);
      expect(doc.upflow_u_deg).toBeLessThan(0.01);
      expect(doc.alpha_zero_lift_upright_deg).toBeCloseTo(-2.2 - phi, 1);
      expect(doc.apply_to_setup.flow.upflow_deg).toBeCloseTo(doc.upflow_deg, 4);
    });
  }
  it('measures with no upflow applied, whatever the setup holds, and says so', async () => {
    const [up, inv] = pair(0.35, 1);
    const d = dir();
    const setup = JSON.parse(readFileSync(S('setup-3d.json'), 'utf8'));
    writeFileSync(join(d, 's.json'), JSON.stringify({ ...setup, flow: { gamma: 1.4, upflow_deg: 0.35 } }));
    const r = await runCli('upflow', up, inv, '--setup', join(d, 's.json'));
    expect(Math.abs(JSON.parse(r.stdout).upflow_deg - 0.35)).toBeLessThan(0.01);
    expect(r.stderr).toMatch(/flow\.upflow_deg 0\.35 is not applied here/);
  });
  it('finds the invented 0.35° of the sample pair, and once applied the pair agrees', async () => {
    const r = await runCli('upflow', S('run-401-upright.csv'), S('run-402-inverted.csv'), '--setup', S('setup-3d.json'));
    const doc = JSON.parse(r.stdout);
    expect(Math.abs(doc.upflow_deg - 0.35)).toBeLessThan(0.01);
    const d = dir();
    const setup = JSON.parse(readFileSync(S('setup-3d.json'), 'utf8'));
    writeFileSync(join(d, 's.json'), JSON.stringify({ ...setup, flow: { gamma: 1.4, upflow_deg: 0.35 } }));
    const up = JSON.parse((await runCli('reduce', S('run-401-upright.csv'), '--setup', join(d, 's.json'), '--no-corrections')).stdout);
    expect(up.fit.alpha_zero_lift_deg).toBeCloseTo(-2.1, 1); // the invented zero-lift angle of the clean wing
  });
  it('needs two runs and a setup (exit 2)', async () => {
    expect((await runCli('upflow', S('run-401-upright.csv'), '--setup', S('setup-3d.json'))).code).toBe(2);
    expect((await runCli('upflow', S('run-401-upright.csv'), S('run-402-inverted.csv'))).code).toBe(2);
  });
});

describe('sweepbook repeat', () => {
  it('pools the scatter of the six sample repeats per coefficient, with every angle matched', async () => {
    const files = [1, 2, 3, 4, 5, 6].map((i) => S(`run-50${i}-repeat.csv`));
    const r = await runCli('repeat', ...files, '--setup', S('setup-3d.json'), '--tare', S('windoff-tare.csv'));
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.points).toHaveLength(15);
    expect(doc.points.every((p: { n_runs: number }) => p.n_runs === 6)).toBe(true);
    expect(doc.degrees_of_freedom).toBe(75);
    for (const k of ['pooled_sd_cl', 'pooled_sd_cd', 'pooled_sd_cm']) expect(doc[k]).toBeGreaterThan(0);
    // pooled value = root of the mean per-angle variance (equal n at every angle; ISO 5725-2 §7.4)
    const pooled = Math.sqrt(doc.points.reduce((s: number, p: { sd_cl: number }) => s + p.sd_cl ** 2, 0) / doc.points.length);
    expect(doc.pooled_sd_cl).toBeCloseTo(pooled, 12);
    // the invented scatter: 0.15 N of lift on q·S ≈ 123 N, plus a 0.02° spread of zero-lift angle ≈ 0.0015
    expect(doc.pooled_sd_cl).toBeGreaterThan(0.0008);
    expect(doc.pooled_sd_cl).toBeLessThan(0.003);
    expect(r.stderr).toMatch(/pooled repeatability \(1 SD, 75 degrees of freedom\)/);
  });
  it('warns when the runs name different configurations', async () => {
    const r = await runCli('repeat', S('run-101-clean.csv'), S('run-103-flap20.csv'), '--setup', S('setup-3d.json'));
    expect(r.code).toBe(0);
    expect(r.stderr).toMatch(/different configurations \(clean, flap 20\)/);
  });
  it('needs two runs and a positive tolerance (exit 2)', async () => {
    expect((await runCli('repeat', S('run-501-repeat.csv'), '--setup', S('setup-3d.json'))).code).toBe(2);
    expect((await runCli('repeat', S('run-501-repeat.csv'), S('run-502-repeat.csv'), '--setup', S('setup-3d.json'), '--alpha-tol-deg', '-1')).code).toBe(2);
  });
});
