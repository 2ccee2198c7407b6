/**
 * Known-good inputs the fuzz cases are built on or paired with: the invented sample campaign's run
 * and setup files, a body-axes copy of a run, and setups whose wall-correction factors are given as
 * numbers (computed once here by the engine's own image sums) so that thousands of reductions stay fast.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { windToBody } from '../../core/physics/axes.ts';
import { factors3d } from '../../core/walls/wall3d.ts';

export const ROOT = fileURLToPath(new URL('../..', import.meta.url));
export const sample = (name: string) => join(ROOT, 'sample-runs', name);
export const sampleText = (name: string) => readFileSync(sample(name), 'utf8');

export const RUN_3D = sampleText('run-101-clean.csv');
export const RUN_2D = sampleText('run-201-section.csv');
export const TARE_3D = sampleText('windoff-tare.csv');

/** Texts the run-file generator starts from (the time history cut to its first 120 samples). */
export const SEED_RUNS: readonly string[] = [
  RUN_3D,
  sampleText('run-102-flap10.csv'),
  sampleText('run-103-flap20.csv'),
  RUN_2D,
  TARE_3D,
  sampleText('run-104-clean-timehistory.csv').split('\n').slice(0, 128).join('\n') + '\n',
];

/** run-101 resolved to body axes (N = L cos α + D sin α, A = −L sin α + D cos α), for body-axes setups. */
export const RUN_3D_BODY: string = (() => {
  const lines = RUN_3D.trimEnd().split('\n');
  const h = lines.findIndex((l) => !l.startsWith('#'));
  const out = lines.slice(0, h);
  out.push('alpha [deg],dp_pitot [Pa],p_static [Pa],t_total [degC],rh [%],normal [N],axial [N],pitch [N m]');
  for (const l of lines.slice(h + 1)) {
    const [a, dp, p, t, rh, lift, drag, pitch] = l.split(',').map(Number) as number[];
    const { normal, axial } = windToBody(lift!, drag!, (a! * Math.PI) / 180);
    out.push([a, dp, p, t, rh, normal.toFixed(4), axial.toFixed(5), pitch].join(','));
  }
  return out.join('\n') + '\n';
})();

type Json = Record<string, unknown>;
const clone = <T>(x: T): T => structuredClone(x);

export const SETUP_3D: Json = JSON.parse(sampleText('setup-3d.json'));
export const SETUP_2D: Json = JSON.parse(sampleText('setup-2d.json'));

/** setup-3d with δ, τ1, τ2 given (the values the engine computes for it), so no image sums run per case. */
const SETUP_3D_FIXED: Json = (() => {
  const s = clone(SETUP_3D) as { model: Json; tunnel: Json; corrections: Json };
  const f = factors3d({
    area: s.model.area_m2 as number,
    span: s.model.span_m as number,
    chord: s.model.chord_m as number,
    width: s.tunnel.width_m as number,
    height: s.tunnel.height_m as number,
    volume: s.model.volume_m3 as number,
    k: 0.96,
    loading: 'elliptic',
    wake: 'classic',
    delta: null,
    tau1: null,
    tau2: null,
  });
  s.corrections = { ...s.corrections, delta: f.delta, tau1: f.tau1, tau2: f.tau2 };
  return s;
})();

function variant(base: Json, edit: (s: any) => void): Json {
  const s = clone(base);
  edit(s);
  return s;
}

/** Setups a fuzzed run file is reduced with; each names the known-good run that suits it (for tare cases). */
export const RUN_SETUPS = {
  wind3d: { setup: SETUP_3D_FIXED, run: RUN_3D, tare: TARE_3D },
  wind3dImages: { setup: SETUP_3D, run: RUN_3D, tare: TARE_3D },
  wind3dMaskell: { setup: variant(SETUP_3D_FIXED, (s) => (s.corrections.wake = 'maskell')), run: RUN_3D, tare: TARE_3D },
  body3d: { setup: variant(SETUP_3D_FIXED, (s) => (s.balance.axes = 'body')), run: RUN_3D_BODY, tare: undefined },
  wind2d: { setup: SETUP_2D, run: RUN_2D, tare: undefined },
  bare3d: { setup: variant(SETUP_3D_FIXED, (s) => delete s.ambient), run: RUN_3D, tare: TARE_3D },
} as const;
export type RunSetupKey = keyof typeof RUN_SETUPS;

/** The run a fuzzed setup is tried with: the sample that matches its kind and balance axes. */
export function runForSetup(setup: unknown): string {
  const s = setup as { model?: { kind?: unknown }; balance?: { axes?: unknown } } | null;
  if (s?.balance?.axes === 'body') return RUN_3D_BODY;
  return s?.model?.kind === '2d' ? RUN_2D : RUN_3D;
}
