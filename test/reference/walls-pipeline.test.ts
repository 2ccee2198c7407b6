import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readRunText } from '../../core/formats/runFile.ts';
import { reduce } from '../../core/reduction/pipeline.ts';
import { validateSetup } from '../../core/setup/schema.ts';
import { sectionFactors } from '../../core/walls/sectionFactors.ts';
import { chooseWallMethod } from '../../core/walls/registry.ts';

const SAMPLES = resolve(__dirname, '../../sample-runs');
const run = readRunText('run-101-clean.csv', readFileSync(join(SAMPLES, 'run-101-clean.csv'), 'utf8'));
const sample = JSON.parse(readFileSync(join(SAMPLES, 'setup-3d.json'), 'utf8'));
const withSetup = (edit: (s: typeof sample) => void) => {
  const s = JSON.parse(JSON.stringify(sample));
  edit(s);
  return validateSetup('setup.json', s).setup;
};

describe('sections and mountings through the reduction stages (no pipeline change: registered wall methods)', () => {
  it('an open jet is corrected by the free-jet method: no wake blockage, negative solid blockage, a smaller angle', () => {
    const setup = withSetup((s) => (s.tunnel = { section: 'open-rectangular', width_m: 1.2, height_m: 0.9 }));
    expect('method' in chooseWallMethod(setup) && chooseWallMethod(setup)).toMatchObject({ method: { id: '3d-free-jet' } });
    const r = reduce({ run, setup });
    expect(r.corrections.method).toBe('3d-free-jet');
    const p = r.points.find((x) => x.alpha_uncorrected_deg > 3.9 && x.alpha_uncorrected_deg < 4.1)!;
    expect(p.eps_wake).toBe(0);
    expect(p.eps_solid!).toBeLessThan(0);
    expect(p.alpha_deg!).toBeLessThan(p.alpha_uncorrected_deg);
    expect(r.warnings.join('\n')).toMatch(/wake blockage is taken as zero/);
  });

  it('Maskell asked for in an open jet reports its fallback to the free-jet method with the reason', () => {
    const setup = withSetup((s) => {
      s.tunnel = { section: 'open-circular', diameter_m: 1.4 };
      s.corrections.wake = 'maskell';
    });
    const r = reduce({ run, setup });
    expect(r.corrections.method).toBe('3d-free-jet');
    expect(r.corrections.fallback).toMatch(/derived for closed sections/);
    expect(r.factors.delta).toBeCloseTo(-0.125, 12);
  });

  it('a half model gets the mirrored full model’s factors and the same S/C, V/C as its own', () => {
    const setup = withSetup((s) => Object.assign(s.model, { mounting: 'half', reflection_wall: 'floor', span_m: 0.45, area_m2: 0.10125, volume_m3: 0.00105 }));
    const r = reduce({ run, setup });
    const mirrored = sectionFactors({
      tunnel: { shape: 'rectangular', width: 1.8, height: 1.2, boundaries: { floor: 'solid', ceiling: 'solid', left: 'solid', right: 'solid' }, fillet: 0 },
      mounting: { kind: 'full' },
      span: 0.9,
      chord: 0.225,
      loading: 'elliptic',
    });
    expect(r.factors.delta).toBeCloseTo(mirrored.delta, 12);
    expect(r.factors.tau2).toBeCloseTo(mirrored.tau2, 12);
    // ε_sb of the half model in the real section = that of the mirrored model (2V in 2C)
    const p = r.points[0]!;
    expect(p.eps_solid!).toBeCloseTo((0.96 * mirrored.tau1 * 0.0021) / Math.pow(2.16, 1.5), 14);
  });

  it('fillets raise the wake blockage by B·H/C through the whole reduction', () => {
    const plain = reduce({ run, setup: withSetup(() => undefined) });
    const filleted = reduce({ run, setup: withSetup((s) => (s.tunnel.fillet_m = 0.15)) });
    plain.points.forEach((p, i) => expect(filleted.points[i]!.eps_wake! / p.eps_wake!).toBeCloseTo(1.08 / (1.08 - 0.045), 2));
  });
});
