/**
 * Standard uncertainties (k = 1) of each point's corrected q, V, α, CL, CD and Cm by the GUM
 * first-order law of propagation (JCGM 100:2008 eq. 10; AIAA S-071A-1999 §4), inputs taken as
 * uncorrelated: u²(y) = Σ (∂y/∂x_i)²·u²(x_i). The sensitivity coefficients are central differences
 * through the real reduction of the point — measurement, flow state, coefficients and the wall
 * corrections with the run's factors and curvature slope held fixed. Each input's u² combines the
 * instrument's standard uncertainty from the setup with the random term of the point's own sample
 * scatter, (s/√n)²; instrument terms apply to the setup's ambient values too when a column is absent.
 * The result also keeps the random part apart from the systematic shifts (inputs common to every point
 * of a run), because a fit must be weighted by the first and must carry the second afterwards.
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
  /** The random part (point to point) of α (deg), CL, CD, Cm: what weights a fit. */
  random: { alphaDeg: number; cl: number; cd: number; cm: number };
  /** One shift per systematic input (common to every point): propagated to the fitted characteristics afterwards. */
  systematic: SystematicShift[];
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
  /** Name of the input, for the systematic terms reported to the fits. */
  name: string;
  /**
   * `random`: differs from point to point (the point's own sample scatter, balance and moment readings,
   * the setting of each angle); `systematic`: common to every point of the run (transducer calibration
   * of the pressures, temperature and humidity, the reference area and chord, the incidence zero).
   */
  kind: 'random' | 'systematic';
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

/** The inputs of one point with their standard uncertainties (SI), each split into its random and systematic parts. */
function inputsOf(x: PointInputs, g: MeasureGeometry, spec: UncertaintySpec, spread: Spread, correct: Correct): Input[] {
  const rnd = (ch: Channel) => spread.sd(ch) / Math.sqrt(spread.n);
  const at = (patch: Partial<PointInputs>) => evaluate({ ...x, ...patch }, g, correct);
  const [f1, f2] = g.axes === 'wind' ? (['lift', 'drag'] as const) : (['normal', 'axial'] as const);
  const rel = (v: number) => Math.max(Math.abs(v), 1) * 1e-6;
  const alpha = (h: number) => at({ alpha: x.alpha + h });
  const dp = (h: number) => at({ dp: x.dp + h });
  const p = (h: number) => at({ p: x.p + h });
  const T0 = (h: number) => at({ T0: x.T0 + h });
  const rh = (h: number) => at({ rh: x.rh + h });
  const list: Input[] = [
    // the point's own sample scatter, (s/√n)², is random for every channel
    { name: 'alpha scatter', kind: 'random', u: Math.hypot(spec.alpha_deg !== undefined ? spec.alpha_deg * DEG : 0, rnd('alpha')), shifted: alpha, step: 1e-6 },
    { name: 'dp_pitot scatter', kind: 'random', u: rnd('dp_pitot'), shifted: dp, step: rel(x.dp) },
    { name: 'p_static scatter', kind: 'random', u: rnd('p_static'), shifted: p, step: rel(x.p) },
    { name: 't_total scatter', kind: 'random', u: rnd('t_total'), shifted: T0, step: rel(x.T0) },
    { name: 'rh scatter', kind: 'random', u: rnd('rh'), shifted: rh, step: 1e-6 },
    { name: f1, kind: 'random', u: Math.hypot(spec.force_n ?? 0, rnd(f1)), shifted: (h) => at({ force1: x.force1 + h }), step: rel(x.force1) },
    { name: f2, kind: 'random', u: Math.hypot(spec.force_n ?? 0, rnd(f2)), shifted: (h) => at({ force2: x.force2 + h }), step: rel(x.force2) },
    { name: 'dp_pitot calibration', kind: 'systematic', u: spec.dp_pitot_pa ?? 0, shifted: dp, step: rel(x.dp) },
    { name: 'p_static calibration', kind: 'systematic', u: spec.p_static_pa ?? 0, shifted: p, step: rel(x.p) },
    { name: 't_total calibration', kind: 'systematic', u: spec.t_total_c ?? 0, shifted: T0, step: rel(x.T0) },
    { name: 'rh calibration', kind: 'systematic', u: spec.rh_pct !== undefined ? spec.rh_pct / 100 : 0, shifted: rh, step: 1e-6 },
    { name: 'alpha offset', kind: 'systematic', u: (spec.alpha_offset_deg ?? 0) * DEG, shifted: alpha, step: 1e-6 },
    {
      name: 'area',
      kind: 'systematic',
      u: (spec.area_rel ?? 0) * g.area,
      shifted: (h) => evaluate(x, { ...g, area: g.area + h }, correct),
      step: g.area * 1e-6,
    },
    {
      name: 'chord',
      kind: 'systematic',
      u: (spec.chord_rel ?? 0) * g.chord,
      shifted: (h) => evaluate(x, { ...g, chord: g.chord + h }, correct),
      step: g.chord * 1e-6,
    },
  ];
  if (Number.isFinite(x.pitch))
    list.push({
      name: 'pitch',
      kind: 'random',
      u: Math.hypot(spec.moment_nm ?? 0, rnd('pitch')),
      shifted: (h) => at({ pitch: x.pitch + h }),
      step: rel(x.pitch),
    });
  return list.filter((i) => i.u > 0);
}

const KEYS = ['q', 'V', 'alphaDeg', 'cl', 'cd', 'cm'] as const;

/** Shift of one point's corrected outputs by one systematic input moved by its standard uncertainty. */
export interface SystematicShift {
  input: string;
  alphaDeg: number;
  cl: number;
  cd: number;
  cm: number;
}

/** First-order (GUM) standard uncertainties of one point's corrected outputs. */
export function propagatePoint(x: PointInputs, g: MeasureGeometry, spec: UncertaintySpec, spread: Spread, correct: Correct): PointUncertainty {
  const sum: Record<(typeof KEYS)[number], number> = { q: 0, V: 0, alphaDeg: 0, cl: 0, cd: 0, cm: 0 };
  const random: Record<(typeof KEYS)[number], number> = { q: 0, V: 0, alphaDeg: 0, cl: 0, cd: 0, cm: 0 };
  const systematic: SystematicShift[] = [];
  for (const input of inputsOf(x, g, spec, spread, correct)) {
    const up = input.shifted(input.step);
    const down = input.shifted(-input.step);
    const shift = { q: 0, V: 0, alphaDeg: 0, cl: 0, cd: 0, cm: 0 };
    for (const k of KEYS) {
      const c = (up[k] - down[k]) / (2 * input.step);
      if (!Number.isFinite(c)) continue;
      shift[k] = c * input.u;
      sum[k] += shift[k] ** 2;
      if (input.kind === 'random') random[k] += shift[k] ** 2;
    }
    if (input.kind === 'systematic') systematic.push({ input: input.name, alphaDeg: shift.alphaDeg, cl: shift.cl, cd: shift.cd, cm: shift.cm });
  }
  return {
    u_q_pa: Math.sqrt(sum.q),
    u_v_mps: Math.sqrt(sum.V),
    u_alpha_deg: Math.sqrt(sum.alphaDeg),
    u_cl: Math.sqrt(sum.cl),
    u_cd: Math.sqrt(sum.cd),
    u_cm: Number.isFinite(x.pitch) ? Math.sqrt(sum.cm) : null,
    random: { alphaDeg: Math.sqrt(random.alphaDeg), cl: Math.sqrt(random.cl), cd: Math.sqrt(random.cd), cm: Math.sqrt(random.cm) },
    systematic,
  };
}
