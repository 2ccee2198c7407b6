/**
 * Standard uncertainties (k = 1) of each point's corrected q, V, α, CL, CD and Cm by the GUM
 * first-order law of propagation (JCGM 100:2008 eq. 10; AIAA S-071A-1999 §4), inputs taken as
 * uncorrelated: u²(y) = Σ (∂y/∂x_i)²·u²(x_i). The sensitivity coefficients are central differences
 * through the real reduction of the point — measurement, flow state, coefficients and the wall
 * corrections with the run's factors and curvature slope held fixed. Each input's u² combines the
 * instrument's standard uncertainty from the setup with the random term of the point's own sample
 * scatter, (s/√n)²; instrument terms apply to the setup's ambient values too when a column is absent.
 */
import type { Channel } from '../formats/channels.ts';
import { evaluatePoint as measure, type PointGeometry as MeasureGeometry, type PointInputs } from '../reduction/pointChain.ts';
import type { SetupInput } from '../setup/schema.ts';
import type { TunnelPoint } from '../walls/types.ts';

export type UncertaintySpec = NonNullable<SetupInput['uncertainty']>;

export interface PointUncertainty {
  u_q_pa: number;
  u_v_mps: number;
  u_alpha_deg: number;
  u_cl: number;
  u_cd: number;
  u_cm: number | null;
}

/** The corrected quantities whose uncertainty is reported. */
export interface Outputs {
  q: number;
  V: number;
  alphaDeg: number;
  cl: number;
  cd: number;
  cm: number;
}

export type Correct = (p: TunnelPoint) => Outputs;

/** Sample standard deviation (SI) and count of the point's channels. */
export interface Spread {
  n: number;
  sd: (ch: Channel) => number;
}

interface Input {
  /** Standard uncertainty in SI. */
  u: number;
  /** Returns the outputs with this input moved by h. */
  shifted: (h: number) => Outputs;
  /** Step for the central difference. */
  step: number;
}

const DEG = Math.PI / 180;

/** Evaluate the reduction of one point with the given inputs and geometry. */
export function evaluate(x: PointInputs, g: MeasureGeometry, correct: Correct): Outputs {
  return correct(measure(x, g).tunnel);
}

/** The inputs of one point with their standard uncertainties (SI). */
function inputsOf(x: PointInputs, g: MeasureGeometry, spec: UncertaintySpec, spread: Spread, correct: Correct): Input[] {
  const rnd = (ch: Channel) => spread.sd(ch) / Math.sqrt(spread.n);
  const comb = (instr: number | undefined, ch: Channel) => Math.hypot(instr ?? 0, rnd(ch));
  const at = (patch: Partial<PointInputs>) => evaluate({ ...x, ...patch }, g, correct);
  const [f1, f2] = g.axes === 'wind' ? (['lift', 'drag'] as const) : (['normal', 'axial'] as const);
  const rel = (v: number) => Math.max(Math.abs(v), 1) * 1e-6;
  const list: Input[] = [
    { u: comb(spec.alpha_deg !== undefined ? spec.alpha_deg * DEG : undefined, 'alpha'), shifted: (h) => at({ alpha: x.alpha + h }), step: 1e-6 },
    { u: comb(spec.dp_pitot_pa, 'dp_pitot'), shifted: (h) => at({ dp: x.dp + h }), step: rel(x.dp) },
    { u: comb(spec.p_static_pa, 'p_static'), shifted: (h) => at({ p: x.p + h }), step: rel(x.p) },
    { u: comb(spec.t_total_c, 't_total'), shifted: (h) => at({ T0: x.T0 + h }), step: rel(x.T0) },
    { u: comb(spec.rh_pct !== undefined ? spec.rh_pct / 100 : undefined, 'rh'), shifted: (h) => at({ rh: x.rh + h }), step: 1e-6 },
    { u: comb(spec.force_n, f1), shifted: (h) => at({ force1: x.force1 + h }), step: rel(x.force1) },
    { u: comb(spec.force_n, f2), shifted: (h) => at({ force2: x.force2 + h }), step: rel(x.force2) },
    {
      u: (spec.area_rel ?? 0) * g.area,
      shifted: (h) => evaluate(x, { ...g, area: g.area + h }, correct),
      step: g.area * 1e-6,
    },
    {
      u: (spec.chord_rel ?? 0) * g.chord,
      shifted: (h) => evaluate(x, { ...g, chord: g.chord + h }, correct),
      step: g.chord * 1e-6,
    },
  ];
  if (Number.isFinite(x.pitch)) list.push({ u: comb(spec.moment_nm, 'pitch'), shifted: (h) => at({ pitch: x.pitch + h }), step: rel(x.pitch) });
  return list.filter((i) => i.u > 0);
}

const KEYS = ['q', 'V', 'alphaDeg', 'cl', 'cd', 'cm'] as const;

/** First-order (GUM) standard uncertainties of one point's corrected outputs. */
export function propagatePoint(x: PointInputs, g: MeasureGeometry, spec: UncertaintySpec, spread: Spread, correct: Correct): PointUncertainty {
  const sum: Record<(typeof KEYS)[number], number> = { q: 0, V: 0, alphaDeg: 0, cl: 0, cd: 0, cm: 0 };
  for (const input of inputsOf(x, g, spec, spread, correct)) {
    const up = input.shifted(input.step);
    const down = input.shifted(-input.step);
    for (const k of KEYS) {
      const c = (up[k] - down[k]) / (2 * input.step);
      if (Number.isFinite(c)) sum[k] += (c * input.u) ** 2;
    }
  }
  return {
    u_q_pa: Math.sqrt(sum.q),
    u_v_mps: Math.sqrt(sum.V),
    u_alpha_deg: Math.sqrt(sum.alphaDeg),
    u_cl: Math.sqrt(sum.cl),
    u_cd: Math.sqrt(sum.cd),
    u_cm: Number.isFinite(x.pitch) ? Math.sqrt(sum.cm) : null,
  };
}
