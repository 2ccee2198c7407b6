import { resolve, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { densityAltitude, isaAtmosphere, moistAirDensity } from '../../core/physics/air.ts';
import { InputError } from '../../core/contract/messages.ts';
import { KNOT_MPS, projectStallSpeed } from '../../core/fullscale/stallSpeed.ts';
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
    expect(r.density_altitude_m).toBeLessThan(0); // CIPM dry air is 0.04 % denser than the ISO 2533 ideal gas
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
