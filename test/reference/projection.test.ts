import { resolve, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { densityAltitude, isaAtmosphere, moistAirDensity } from '../../core/physics/air.ts';
import { InputError } from '../../core/contract/messages.ts';
import { densityAltitudeOf, KNOT_MPS, projectStallSpeed, TRIM_CAUTION } from '../../core/fullscale/stallSpeed.ts';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { runCli } from '../support/cli.ts';

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('standard atmosphere for the projection (ISO 2533:1975)', () => {
  // ISO 2533:1975 Table 5 (geopotential altitude), pressure in Pa and density in kg/m³ (values as tabulated; from memory)
  it.each([
    [1500, 84556.0, 1.05807],
    [15000, 12044.6, 0.193674],
    [20000, 5474.89, 0.0880349],
  ])('at %d m: p and ρ as tabulated', (H, p, rho) => {
    const s = isaAtmosphere(H);
    expect(rel(s.p, p)).toBeLessThan(2e-5);
    expect(rel(s.rho, rho)).toBeLessThan(2e-5);
  });

  it('gives back the altitude of a standard density as its density altitude, above and below the tropopause', () => {
    for (const H of [-500, 0, 1000, 4500, 11000, 14000, 19000]) expect(densityAltitude(isaAtmosphere(H).rho)).toBeCloseTo(H, 3);
  });
});

describe('stall-speed projection', () => {
  const base = { massKg: 750, wingAreaM2: 12.5, clMax: 1.5 };

  it('refuses zero, negative and NaN inputs, naming the option', () => {
    for (const bad of [{ massKg: 0 }, { massKg: -1 }, { wingAreaM2: Number.NaN }, { clMax: 0 }, { rhPct: 120 }, { pressureAltitudeM: 30000 }, { liftOffFactor: 0.9 }]) {
      expect(() => projectStallSpeed({ ...base, ...bad })).toThrow(InputError);
    }
    try {
      projectStallSpeed({ ...base, massKg: -5 });
    } catch (e) {
      expect((e as InputError).notice.field).toBe('mass-kg');
    }
  });

  it('agrees with the lift equation evaluated independently at sea level, standard day, dry air (common practice)', () => {
    const r = projectStallSpeed(base);
    // independent: ρ from CIPM-2007 at 101 325 Pa, 288.15 K, dry; W = m·g0 with g0 = 9.806 65 m/s² (ISO 2533 Table 1)
    const rho = moistAirDensity(101325, 288.15, 0);
    const vs = Math.sqrt((2 * 750 * 9.80665) / (rho * 12.5 * 1.5));
    expect(rel(r.v_stall_mps, vs)).toBeLessThan(1e-12);
    expect(r.v_stall_kt).toBeCloseTo(vs / (1852 / 3600), 10);
    expect(KNOT_MPS).toBeCloseTo(0.514444, 6); // NIST SP 811 B.8: knot = 0.514 444 m/s
    // one density model for the day and for the altitude scale: a standard day at sea level is 0 m (the old
    // mix of CIPM-2007 for ρ and the ISO 2533 ideal gas for the scale put it at about −3 m)
    expect(r.density_altitude_m).toBe(0);
    expect(r.cautions.join(' ')).toMatch(/not certified/);
  });

  it('raises the stall speed on a hot, humid, high day (lower density, higher density altitude)', () => {
    const std = projectStallSpeed(base);
    const hot = projectStallSpeed({ ...base, pressureAltitudeM: 1500, tempC: 35, rhPct: 80 });
    expect(hot.rho_kgm3).toBeLessThan(std.rho_kgm3);
    expect(hot.v_stall_mps).toBeGreaterThan(std.v_stall_mps);
    expect(hot.density_altitude_m).toBeGreaterThan(2500);
    // EAS stall speed depends only on W/S and CLmax
    expect(hot.v_stall_eas_mps).toBeCloseTo(std.v_stall_eas_mps * Math.sqrt(1.225 / 1.225), 0);
  });

  it('applies an ISA deviation to the standard temperature at the pressure altitude', () => {
    const r = projectStallSpeed({ ...base, pressureAltitudeM: 2000, isaDeviationC: 15 });
    expect(r.temperature_c).toBeCloseTo(15 - 6.5 * 2 + 15, 10);
    expect(r.isa_deviation_c).toBeCloseTo(15, 10);
  });

  it('gives the density altitude on the same density model at every altitude of ISO 2533 (dry standard days map to their own altitude)', () => {
    for (const H of [-500, 0, 1500, 4000, 11000, 15000]) {
      const s = isaAtmosphere(H);
      expect(densityAltitudeOf(moistAirDensity(s.p, s.T, 0))).toBeCloseTo(H, 2);
    }
    expect(densityAltitudeOf(0.0001)).toBeNaN(); // beyond the table: not a made-up altitude
  });

  it('states the dry-air assumption when no humidity is given and gives V_s in saturated air beside it (higher: humid air is less dense)', () => {
    const dry = projectStallSpeed({ ...base, tempC: 30 });
    expect(dry.dry_air_assumed).toBe(true);
    expect(dry.v_stall_saturated_mps!).toBeGreaterThan(dry.v_stall_mps);
    // independent: CIPM-2007 saturated density at 101 325 Pa and 30 °C
    const rhoSat = moistAirDensity(101325, 303.15, 1);
    expect(rel(dry.v_stall_saturated_mps!, Math.sqrt((2 * 750 * 9.80665) / (rhoSat * 12.5 * 1.5)))).toBeLessThan(1e-12);
    expect(dry.cautions.join(' ')).toMatch(/dry air was assumed/);
    const humid = projectStallSpeed({ ...base, tempC: 30, rhPct: 60 });
    expect(humid.dry_air_assumed).toBe(false);
    expect(humid.v_stall_saturated_mps).toBeNull();
  });

  it('gives u(V_s) = ½·V_s·u(CLmax)/CLmax (GUM eq. 12, V_s ∝ CLmax^−½) and the trim caution for a model CLmax', () => {
    const r = projectStallSpeed({ ...base, clMaxU: 0.03, clMaxFrom: 'model test' });
    expect(r.v_stall_u_mps!).toBeCloseTo((0.5 * r.v_stall_mps * 0.03) / 1.5, 12);
    expect(r.cautions).toContain(TRIM_CAUTION);
    expect(projectStallSpeed({ ...base, clMaxFrom: 'given' }).cautions).not.toContain(TRIM_CAUTION);
    expect(projectStallSpeed(base).v_stall_u_mps).toBeNull();
  });

  it('scales the lift-off speed by the factor (1.2 by default)', () => {
    const r = projectStallSpeed({ ...base, liftOffFactor: 1.15 });
    expect(r.v_lift_off_mps).toBeCloseTo(1.15 * r.v_stall_mps, 12);
    expect(projectStallSpeed(base).lift_off_factor).toBe(1.2);
  });
});

describe('sweepbook project (command line)', () => {
  const S = (p: string) => join(resolve(__dirname, '../..'), 'sample-runs', p);

  it('prints the contract keys and the cautions, using the run fit CLmax', async () => {
    const r = await runCli('project', S('run-103-flap20.csv'), '--setup', S('setup-3d.json'), '--tare', S('windoff-tare.csv'), '--mass-kg', '750', '--wing-area-m2', '12.5', '--pressure-altitude-m', '1500', '--temp-c', '30', '--rh-pct', '70');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    for (const k of ['rho_kgm3', 'density_altitude_m', 'cl_max', 'v_stall_mps', 'v_stall_kt', 'cautions']) expect(doc).toHaveProperty(k);
    expect(doc.cautions.length).toBeGreaterThanOrEqual(3);
    expect(doc.run.configuration).toBe('flap 20');
    expect(doc.cl_max).toBeGreaterThan(1);
    expect(r.stderr).toContain('caution:');
  });

  it('refuses a 2D section\'s CLmax unless --cl-max is given (exit 1, saying why)', async () => {
    const r = await runCli('project', S('run-201-section.csv'), '--setup', S('setup-2d.json'), '--mass-kg', '750', '--wing-area-m2', '12.5');
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(/2D section.*--cl-max/);
    const ok = await runCli('project', S('run-201-section.csv'), '--setup', S('setup-2d.json'), '--mass-kg', '750', '--wing-area-m2', '12.5', '--cl-max', '1.3');
    expect(ok.code).toBe(0);
  });

  it('passes on every warning of the reduction, uses the first rising branch of a return sweep and gives u(V_s) with stated uncertainties', async () => {
    // the sample run followed by its own points in reverse: a return sweep, which makes the reduction warn
    const dir = mkdtempSync(join(tmpdir(), 'sweepbook-project-'));
    const lines = readFileSync(S('run-101-clean.csv'), 'utf8').trimEnd().split('\n');
    const head = lines.filter((l) => l.startsWith('#') || !/^[-\d]/.test(l.trim()));
    const data = lines.filter((l) => !head.includes(l));
    writeFileSync(join(dir, 'return.csv'), [...head, ...data, ...data.slice(0, -1).reverse()].join('\n') + '\n');
    const setup = JSON.parse(readFileSync(S('setup-3d.json'), 'utf8')) as Record<string, unknown>;
    setup['uncertainty'] = { dp_pitot_pa: 0.5, force_n: 0.05, alpha_deg: 0.02, area_rel: 0.002 };
    writeFileSync(join(dir, 'setup.json'), JSON.stringify(setup));
    const r = await runCli('project', join(dir, 'return.csv'), '--setup', join(dir, 'setup.json'), '--mass-kg', '600', '--wing-area-m2', '10', '--rh-pct', '50');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.warnings.join(' ')).toMatch(/sweep branches/);
    expect(r.stderr).toMatch(/warning: .*sweep branches/);
    const single = JSON.parse((await runCli('project', S('run-101-clean.csv'), '--setup', join(dir, 'setup.json'), '--mass-kg', '600', '--wing-area-m2', '10', '--rh-pct', '50')).stdout);
    expect(doc.cl_max).toBeCloseTo(single.cl_max, 10); // the rising branch's CLmax, whatever the return sweep did
    expect(doc.cl_max_u).toBeGreaterThan(0);
    expect(doc.v_stall_u_mps).toBeCloseTo((0.5 * doc.v_stall_mps * doc.cl_max_u) / doc.cl_max, 10);
    expect(doc.dry_air_assumed).toBe(false);
  });

  it('uses --cl-max as given', async () => {
    const r = await runCli('project', S('run-101-clean.csv'), '--setup', S('setup-3d.json'), '--mass-kg', '600', '--wing-area-m2', '10', '--cl-max', '1.42');
    const doc = JSON.parse(r.stdout);
    expect(doc.cl_max).toBe(1.42);
    expect(doc.cl_max_source).toContain('given');
  });

  it('refuses missing or malformed options with usage (exit 2) and bad values naming the option (exit 1)', async () => {
    expect((await runCli('project', S('run-101-clean.csv'), '--setup', S('setup-3d.json'), '--wing-area-m2', '10')).code).toBe(2);
    expect((await runCli('project', S('run-101-clean.csv'), '--setup', S('setup-3d.json'), '--mass-kg', 'heavy', '--wing-area-m2', '10')).stderr).toContain('--mass-kg must be a number');
    const neg = await runCli('project', S('run-101-clean.csv'), '--setup', S('setup-3d.json'), '--mass-kg=-3', '--wing-area-m2', '10');
    expect(neg.code).toBe(1);
    expect(neg.stderr).toContain('--mass-kg');
  });
});
