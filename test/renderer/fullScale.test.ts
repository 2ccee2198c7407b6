// @vitest-environment happy-dom
/// <reference path="../../renderer/src/env.d.ts" />
/**
 * The full-scale estimate: the form checked by core as it is typed, each run's stall and lift-off speeds
 * from its CLmax by core's projection, the changes against the baseline, and the view with its cautions.
 */
import { flushPromises, mount } from '@vue/test-utils';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { nextTick } from 'vue';
import { attempt } from '../../core/contract/messages.ts';
import { CAUTIONS, KNOT_MPS, projectStallSpeed } from '../../core/fullscale/stallSpeed.ts';
import type { ReductionResult } from '../../core/reduction/pipeline.ts';
import FullScaleView from '../../renderer/src/components/FullScaleView.vue';
import { checkInputs, emptyDraft, numberOf, projectRuns, SECTION_REASON, stallChanges, type FullScaleDraft } from '../../renderer/src/logic/fullScale.ts';
import { APP } from '../../renderer/src/state/context.ts';
import { appContext, openedSample } from './support.ts';

vi.mock('chart.js', async () => (await import('./chartMock.ts')).default);

function draft(patch: Partial<FullScaleDraft>): FullScaleDraft {
  return { ...emptyDraft(), ...patch };
}

/** A reduced result reduced to what the projection reads; CLmax and Reynolds numbers invented. */
function result(clMax: number | null, kind: '2d' | '3d' = '3d', warnings: string[] = []): ReductionResult {
  return {
    run: { name: 'r', configuration: null },
    points: [{ cl: 0.5, reynolds: 4.0e5 }, { cl: clMax ?? 0.9, reynolds: 4.2e5 }, { cl: 0.7, reynolds: 4.1e5 }],
    fit: { cl_max: clMax },
    corrections: { enabled: true, kind, wake: 'classic' },
    warnings,
  } as unknown as ReductionResult;
}

describe('full-scale form', () => {
  it('reads plain numbers only: no decimal comma, so "1,000" is refused rather than read as 1', () => {
    expect(numberOf(' 750 ')).toBe(750);
    expect(numberOf('-12.5')).toBe(-12.5);
    expect(numberOf('−12.5')).toBe(-12.5);
    expect(numberOf('1e3')).toBe(1000);
    expect(numberOf('')).toBeUndefined();
    expect(numberOf('1,000')).toBeNaN();
    expect(numberOf('12 kg')).toBeNaN();
  });

  it('places core\'s own message beside each field it refuses, several at once', () => {
    const check = checkInputs(draft({ mass: '-5', wingArea: '12', altitude: '25000', rh: '120' }));
    expect(check.ok).toBe(false);
    // the very messages core gives for these inputs, field by field
    const coreSays = (input: Parameters<typeof projectStallSpeed>[0]) => {
      const r = attempt(() => projectStallSpeed(input));
      return r.ok ? null : r.errors[0]!;
    };
    expect(coreSays({ massKg: -5, wingAreaM2: 12, clMax: 1 })!.field).toBe('mass-kg');
    expect(check.byField.mass).toBe(coreSays({ massKg: -5, wingAreaM2: 12, clMax: 1 })!.message);
    expect(check.byField.altitude).toBe(coreSays({ massKg: 1, wingAreaM2: 12, clMax: 1, pressureAltitudeM: 25000 })!.message);
    expect(check.byField.rh).toBe(coreSays({ massKg: 1, wingAreaM2: 12, clMax: 1, rhPct: 120 })!.message);
    expect(Object.keys(check.byField).sort()).toEqual(['altitude', 'mass', 'rh']);
  });

  it('says which temperature a refused ISA deviation gives', () => {
    const check = checkInputs(draft({ mass: '750', wingArea: '12', temperatureMode: 'isa-deviation', isaDeviation: '80' }));
    // ISO 2533: 15 °C at 0 m, so +80 K gives 95 °C, beyond core's −90 to 60 °C
    expect(check.byField.isaDeviation).toMatch(/^the outside air temperature this gives, 95\.0 °C: expected −90 to 60 °C$/);
    expect(checkInputs(draft({ mass: '750', wingArea: '12', temperature: '75' })).byField.temperature).toBe('expected −90 to 60 °C');
  });

  it('waits for mass and wing area without calling them errors', () => {
    const check = checkInputs(emptyDraft());
    expect(check.ok).toBe(false);
    expect(check.missing).toEqual(['mass', 'wingArea']);
    expect(check.byField).toEqual({});
  });
});

describe('full-scale projection per run', () => {
  // an invented light aircraft on a warm day
  const inputs = draft({ mass: '750', wingArea: '11.5', altitude: '1500', temperature: '30', rh: '60', liftOffFactor: '1.15' });

  it('gives each run core\'s projection of its own CLmax, and says why a run has none', () => {
    const check = checkInputs(inputs);
    expect(check.ok).toBe(true);
    const rows = projectRuns(check, [
      { file: 'a.csv', label: 'a', result: result(1.42) },
      { file: 'b.csv', label: 'b', result: result(null, '3d', ['r: CLmax: no peak was reached within the sweep']) },
      { file: 'c.csv', label: 'c', result: result(1.6, '2d') },
      { file: 'd.csv', label: 'd', result: null },
    ]);
    const expected = projectStallSpeed({ massKg: 750, wingAreaM2: 11.5, clMax: 1.42, pressureAltitudeM: 1500, tempC: 30, rhPct: 60, liftOffFactor: 1.15, modelReynolds: 4.2e5 });
    expect(rows[0]!.projection).toEqual(expected);
    expect(rows[0]!.reynolds).toBe(4.2e5);
    expect(rows[1]!.projection).toBeNull();
    expect(rows[1]!.reason).toBe('r: CLmax: no peak was reached within the sweep');
    expect(rows[2]!.reason).toBe(SECTION_REASON);
    expect(rows[3]!.reason).toBe('not reduced');
  });

  it('common practice: the lift equation at CLmax', () => {
    // V_s = √(2·m·g0/(ρ·S·CLmax)), by hand with the ISO 2533:1975 standard atmosphere (troposphere:
    // T = 288.15 − 0.0065·H, p = 101325·(T/288.15)^(g0/(0.0065·R)), ρ = p/(R·T), R = 287.05287 J/(kg K),
    // g0 = 9.80665 m/s²), dry air at standard temperature. At 0 m ρ = 1.2250 and at 2000 m ρ = 1.0065
    // kg/m³, as ISO 2533 tabulates. Core uses CIPM-2007 (compressibility and CO2 included), whose dry-air
    // density differs from the ideal-gas ISO value by about 0.05 %, so V_s by about 0.03 %: 0.1 % allowed.
    const m = 1000;
    const S = 15;
    const clMax = 1.5;
    for (const H of [0, 2000]) {
      const T = 288.15 - 0.0065 * H;
      const p = 101325 * Math.pow(T / 288.15, 9.80665 / (0.0065 * 287.05287));
      const rho = p / (287.05287 * T);
      const vHand = Math.sqrt((2 * m * 9.80665) / (rho * S * clMax));
      const check = checkInputs(draft({ mass: String(m), wingArea: String(S), altitude: String(H), rh: '0' }));
      const [row] = projectRuns(check, [{ file: 'a.csv', label: 'a', result: result(clMax) }]);
      const v = row!.projection!.v_stall_mps;
      expect(Math.abs(v / vHand - 1)).toBeLessThan(1e-3);
      // knots: 1 kt = 1852/3600 m/s exactly (NIST SP 811)
      expect(row!.projection!.v_stall_kt).toBeCloseTo(v / (1852 / 3600), 12);
      // lift-off at the default factor 1.2 (common practice 1.1–1.3)
      expect(row!.projection!.v_lift_off_mps).toBeCloseTo(1.2 * v, 12);
      // standard day: the density altitude is the pressure altitude, within the CIPM/ideal-gas difference
      expect(Math.abs(row!.projection!.density_altitude_m - H)).toBeLessThan(15);
    }
    // the hand values themselves: 26.68 m/s at sea level (√(19613.3/27.5625)), 29.43 m/s at 2000 m
    expect(Math.sqrt((2 * 1000 * 9.80665) / (1.225 * 15 * 1.5))).toBeCloseTo(26.6757, 3);
  });

  it('shows how each configuration changes the stall speed against the baseline', () => {
    const check = checkInputs(inputs);
    const rows = projectRuns(check, [
      { file: 'clean.csv', label: 'clean', result: result(1.2) },
      { file: 'flap.csv', label: 'flap', result: result(1.5) },
      { file: 'bad.csv', label: 'bad', result: result(null) },
    ]);
    const { base, changes } = stallChanges(rows, 'clean.csv');
    expect(base!.file).toBe('clean.csv');
    expect(changes.map((c) => c.file)).toEqual(['flap.csv']);
    // at the same weight, area and air V_s ∝ 1/√CLmax: V_flap/V_clean − 1 = √(1.2/1.5) − 1 = −10.56 %
    expect(changes[0]!.deltaPct).toBeCloseTo(100 * (Math.sqrt(1.2 / 1.5) - 1), 10);
    expect(changes[0]!.deltaMps).toBeCloseTo(rows[1]!.projection!.v_stall_mps - rows[0]!.projection!.v_stall_mps, 12);
    expect(changes[0]!.deltaClMax).toBeCloseTo(0.3, 12);
    expect(stallChanges(rows, 'bad.csv')).toEqual({ base: null, changes: [] });
  });
});

describe('full-scale view', () => {
  beforeEach(() => {
    document.body.innerHTML = '';
  });

  async function mounted() {
    const ctx = appContext();
    ctx.host.nextCampaign = await openedSample(ctx.host);
    await ctx.wb.openCampaign();
    const w = mount(FullScaleView as never, { global: { provide: { [APP as symbol]: ctx } }, attachTo: document.body } as never);
    await flushPromises();
    return { ctx, w };
  }

  it('keeps core\'s cautions on screen, whatever is typed', async () => {
    const { w } = await mounted();
    const box = w.find('.cautions-box');
    expect(box.attributes('role')).toBe('note');
    expect(box.findAll('li').map((li) => li.text())).toEqual(CAUTIONS);
    expect(box.find('button').exists()).toBe(false);
    await w.find('#fs-mass').setValue('-1');
    expect(w.find('.cautions-box').findAll('li').length).toBe(CAUTIONS.length);
  });

  it('shows each ticked run\'s stall and lift-off speeds as core computes them, and the changes against the baseline', async () => {
    const { ctx, w } = await mounted();
    // before the aircraft is given: CLmax per run, no speeds, and no error yet
    expect(w.find('tr[data-run="run-103-flap20.csv"] td[data-col="v-stall"]').text()).toBe('—');
    expect(w.findAll('.field-error').length).toBe(0);

    // an invented light aircraft on a hot, humid day
    await w.find('#fs-mass').setValue('680');
    await w.find('#fs-wingArea').setValue('10.2');
    await w.find('#fs-altitude').setValue('1200');
    await w.find('#fs-temperature').setValue('32');
    await w.find('#fs-rh').setValue('70');
    const r103 = ctx.wb.state.entries['run-103-flap20.csv']!.result!;
    const peak = r103.points.reduce((a, b) => (b.cl! > a.cl! ? b : a));
    const core = projectStallSpeed({ massKg: 680, wingAreaM2: 10.2, clMax: r103.fit.cl_max!, pressureAltitudeM: 1200, tempC: 32, rhPct: 70, modelReynolds: peak.reynolds });
    const row = w.find('tr[data-run="run-103-flap20.csv"]');
    expect(Number(row.find('td[data-col="v-stall"]').attributes('data-value'))).toBe(core.v_stall_mps);
    expect(row.find('td[data-col="v-stall"]').text()).toBe(core.v_stall_mps.toFixed(1));
    expect(row.find('td[data-col="v-stall-kt"]').text()).toBe(core.v_stall_kt.toFixed(1));
    expect(row.find('td[data-col="v-stall-eas"]').text()).toBe(core.v_stall_eas_mps.toFixed(1));
    expect(row.find('td[data-col="v-lift-off"]').text()).toBe(core.v_lift_off_mps.toFixed(1));
    expect(row.find('td[data-col="cl-max"]').text()).toBe(r103.fit.cl_max!.toFixed(4));
    expect(w.find('[data-air="rho"]').text()).toBe(core.rho_kgm3.toFixed(4));
    expect(w.find('[data-air="density-altitude"]').text()).toBe(core.density_altitude_m.toFixed(0));
    // the 2D section run says why it has no aircraft CLmax
    expect(w.find('tr[data-run="run-201-section.csv"] td[data-col="cl-max"]').text()).toBe(`— ${SECTION_REASON}`);

    // the sample's baseline is the clean run: the 20° flap lowers the stall speed
    expect(ctx.wb.state.campaign.baseline).toBe('run-101-clean.csv');
    const clean = ctx.wb.state.entries['run-101-clean.csv']!.result!.fit.cl_max!;
    const dv = w.find('table.changes tr[data-run="run-103-flap20.csv"] td[data-col="dv-pct"]');
    expect(Number(dv.attributes('data-value'))).toBeCloseTo(100 * (Math.sqrt(clean / r103.fit.cl_max!) - 1), 9);
    expect(Number(dv.attributes('data-value'))).toBeLessThan(0);
  });

  it('names the refused field as the user types, with core\'s message', async () => {
    const { w } = await mounted();
    await w.find('#fs-wingArea').setValue('10');
    await w.find('#fs-mass').setValue('0');
    expect(w.find('#fs-mass').attributes('aria-invalid')).toBe('true');
    expect(w.find('#fs-mass-msg .field-error').text()).toBe('Aircraft mass: expected a positive number (aircraft mass, kg)');
    expect(w.find('tr[data-run="run-101-clean.csv"] td[data-col="v-stall"]').text()).toBe('—');
    // switching to an ISA deviation shows that field, checked the same way
    await w.find('input[value="isa-deviation"]').setValue(true);
    await nextTick();
    expect(w.find('#fs-temperature').exists()).toBe(false);
    await w.find('#fs-isaDeviation').setValue('abc');
    expect(w.find('#fs-isaDeviation-msg .field-error').text()).toMatch(/^Deviation from standard temperature: /);
    await w.find('#fs-isaDeviation').setValue('15');
    await w.find('#fs-mass').setValue('700');
    expect(w.findAll('.field-error').length).toBe(0);
    expect(w.find('[data-air="isa-deviation"]').text()).toBe('+15.0');
    const kt = Number(w.find('tr[data-run="run-101-clean.csv"] td[data-col="v-stall-kt"]').attributes('data-value'));
    const ms = Number(w.find('tr[data-run="run-101-clean.csv"] td[data-col="v-stall"]').attributes('data-value'));
    expect(kt * KNOT_MPS).toBeCloseTo(ms, 12);
  });
});
