import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readRunText } from '../../core/formats/runFile.ts';
import { reduce, reduceBases, splitStages } from '../../core/reduction/pipeline.ts';
import { STAGES } from '../../core/reduction/stages/index.ts';
import type { Stage } from '../../core/reduction/context.ts';
import { parseSetup, validateSetup } from '../../core/setup/schema.ts';
import { chooseWallMethod, requestedWallMethod, WALL_METHODS } from '../../core/walls/registry.ts';

const SAMPLES = resolve(__dirname, '../../sample-runs');
const sampleRun = (name: string) => readRunText(name, readFileSync(join(SAMPLES, name), 'utf8'));
const sampleSetup = (name: string) => parseSetup(name, readFileSync(join(SAMPLES, name), 'utf8'));

describe('the stage list', () => {
  it('names every stage and its published source (or common practice)', () => {
    for (const s of STAGES) {
      expect(s.name.length).toBeGreaterThan(2);
      expect(s.source.length).toBeGreaterThan(5);
    }
    expect(new Set(STAGES.map((s) => s.name)).size).toBe(STAGES.length);
  });

  it('runs in the documented order, the per-basis stages last', () => {
    expect(STAGES.map((s) => s.name)).toEqual([
      'required columns', 'wind-off points and zero readings', 'points', 'readings check', 'tares', 'axes and moment transfer', 'flow angle', 'flow state', 'coefficients',
      'wall corrections', 'uncertainty', 'fits',
    ]);
    const { shared, perBasis } = splitStages(STAGES);
    expect(shared.length + perBasis.length).toBe(STAGES.length);
    expect(perBasis.map((s) => s.name)).toEqual(['wall corrections', 'uncertainty', 'fits']);
  });

  it('refuses a shared stage placed after a per-basis one (it would run before it)', () => {
    const a: Stage = { name: 'a', source: 'x', perBasis: true, run: () => undefined };
    const b: Stage = { name: 'b', source: 'x', run: () => undefined };
    expect(() => splitStages([a, b])).toThrow(/"b" is shared but follows/);
  });
});

describe('one pass for both bases', () => {
  it.each([
    ['run-101-clean.csv', 'setup-3d.json'],
    ['run-104-clean-timehistory.csv', 'setup-3d.json'],
    ['run-201-section.csv', 'setup-2d.json'],
  ])('%s: the corrected and as-measured results equal two separate reductions', (runName, setupName) => {
    const run = sampleRun(runName);
    const setup = sampleSetup(setupName);
    const tare = sampleRun('windoff-tare.csv');
    const both = reduceBases({ run, setup: setup.setup, tare }, ['corrected', 'measured']);
    expect(both.corrected).toEqual(reduce({ run, setup: setup.setup, tare }));
    expect(both.measured).toEqual(reduce({ run, setup: setup.setup, tare, noCorrections: true }));
    expect(both.measured!.corrections.enabled).toBe(false);
    expect(both.measured!.points[3]!.cl).toBe(both.corrected!.points[3]!.cl_uncorrected);
  });
});

describe('wall-correction methods', () => {
  const base = {
    model: { kind: '3d', area_m2: 0.2025, chord_m: 0.225, span_m: 0.9, volume_m3: 0.0021 },
    tunnel: { section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
    balance: { axes: 'wind' },
    ambient: { p_pa: 101325, t_c: 20, rh_pct: 50 },
  };

  it('registers 2D, 3D classic and 3D Maskell, each with a source', () => {
    expect(WALL_METHODS.map((m) => m.id)).toEqual(['2d', '3d-classic', '3d-maskell', '3d-free-jet']);
    for (const m of WALL_METHODS) expect(m.source).toMatch(/Barlow|Allen|Maskell|Glauert/);
  });

  it('chooses the method the setup asks for, and each method refuses the other model kind', () => {
    const s3 = validateSetup('s', { ...base, corrections: { wake: 'maskell' } }).setup;
    expect(requestedWallMethod(s3)).toBe('3d-maskell');
    expect(chooseWallMethod(s3)).toMatchObject({ method: { id: '3d-maskell' } });
    const s2 = validateSetup('s', { ...base, model: { kind: '2d', chord_m: 0.3 } }).setup;
    expect(requestedWallMethod(s2)).toBe('2d');
    expect(WALL_METHODS.find((m) => m.id === '3d-classic')!.accepts(s2)).toMatch(/model\.kind "3d"/);
    expect(WALL_METHODS.find((m) => m.id === '2d')!.accepts(s3)).toMatch(/model\.kind "2d"/);
  });

  it('reports classic, with the reason, when a Maskell request falls back (no attached polar from three points)', () => {
    const setup = validateSetup('s', { ...base, corrections: { wake: 'maskell' } }).setup;
    const rows = ['alpha,dp_pitot,lift,drag', '0,700,10,1', '4,700,30,1.5', '8,700,50,2.5'];
    const r = reduce({ run: readRunText('three.csv', rows.join('\n')), setup });
    expect(r.corrections.wake).toBe('classic');
    expect(r.corrections.method).toBe('3d-classic');
    expect(r.corrections.fallback).toMatch(/Maskell wake blockage needs an attached-flow drag polar/);
    expect(r.warnings.some((w) => w.includes('classic wake blockage is used instead'))).toBe(true);
  });

  it('reports Maskell when it was applied', () => {
    const run = sampleRun('run-101-clean.csv');
    const setup = validateSetup('s', { ...JSON.parse(readFileSync(join(SAMPLES, 'setup-3d.json'), 'utf8')), corrections: { wake: 'maskell' } }).setup;
    const r = reduce({ run, setup });
    expect(r.corrections).toMatchObject({ wake: 'maskell', method: '3d-maskell', fallback: null });
  });
});

describe('sample scatter resolved to lift', () => {
  it('gives the standard error of CL from the scatter of the lift the body-axis samples resolve to', () => {
    // Four samples of one point whose normal- and axial-force deviations follow orthogonal patterns (zero
    // sample covariance), so the scatter of L_i = N_i cos α − A_i sin α is exactly √((s_N cos α)² + (s_A sin α)²).
    const alphaDeg = 20;
    const a = (alphaDeg * Math.PI) / 180;
    const N = [100 + 2, 100 - 2, 100 + 2, 100 - 2];
    const A = [10 + 0.1, 10 + 0.1, 10 - 0.1, 10 - 0.1];
    const rows = ['point,alpha,dp_pitot,normal,axial', ...N.map((n, i) => `1,${alphaDeg},800,${n},${A[i]}`)];
    const setup = validateSetup('s', {
      model: { kind: '3d', area_m2: 0.2, chord_m: 0.2, span_m: 1 },
      tunnel: { section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
      balance: { axes: 'body' },
      ambient: { p_pa: 101325, t_c: 20, rh_pct: 50 },
      corrections: { enabled: false },
    }).setup;
    const r = reduce({ run: readRunText('scatter.csv', rows.join('\n')), setup });
    const lift = N.map((n, i) => n * Math.cos(a) - A[i]! * Math.sin(a));
    const mean = lift.reduce((s, x) => s + x, 0) / lift.length;
    const sdLift = Math.sqrt(lift.reduce((s, x) => s + (x - mean) ** 2, 0) / (lift.length - 1));
    const p = r.points[0]!;
    expect(p.cl_scatter).toBeCloseTo(sdLift / (p.q_uncorrected_pa * 0.2) / Math.sqrt(4), 12);
    // swapping cos and sin would give about a third of this here: the check can fail
    expect(sdLift).toBeGreaterThan(1.8);
  });
});
