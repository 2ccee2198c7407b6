/**
 * The per-point chain of the reduction: axes and moment transfer → flow angle → flow state →
 * coefficients (docs/methods.md §3–5). Each step is a pure function of one point; the stages of
 * core/reduction/stages/ apply them to every point of a run, and the uncertainty propagation
 * re-evaluates the whole chain with perturbed inputs through {@link evaluatePoint}.
 */
import { bodyToWind, transferPitch, windToBody } from '../physics/axes.ts';
import { DEG_PER_RAD } from '../physics/angles.ts';
import { flowState, type FlowState } from '../physics/flowState.ts';
import type { TunnelPoint } from '../walls/types.ts';

/** Point means in SI, tares already removed from the loads. Absent loads are NaN. */
export interface PointInputs {
  /** Geometric angle of attack, rad. */
  alpha: number;
  /** Pitot impact pressure p0 − p, Pa. */
  dp: number;
  /** Static pressure, Pa. */
  p: number;
  /** Stagnation temperature, K. */
  T0: number;
  /** Relative humidity, fraction. */
  rh: number;
  /** lift/drag (wind) or normal/axial (body), by the balance axes */
  force1: number;
  force2: number;
  side: number;
  pitch: number;
  roll: number;
  yaw: number;
}

/** What the chain needs of the setup. */
export interface PointGeometry {
  area: number;
  chord: number;
  /** Span for rolling/yawing moments (tunnel width for 2D). */
  span: number;
  gamma: number;
  axes: 'wind' | 'body';
  offset: { x: number; z: number };
}

/** Loads in both axis systems and the pitching moment at the reference centre. */
export interface ResolvedLoads {
  lift: number;
  drag: number;
  normal: number;
  axial: number;
  /** Pitching moment at the reference centre, NaN without a pitch column. */
  pitchRef: number;
}

/** The outcome of the chain for one point. */
export interface Measured extends ResolvedLoads {
  /** Angle of attack to the flow, rad (geometric until a flow-angle correction applies). */
  alphaFlow: number;
  flow: FlowState;
  /** Uncorrected coefficients and flow state, as the wall corrections take them. */
  tunnel: TunnelPoint;
}

/**
 * Step 1, axes and moment transfer: body ↔ wind axes with the geometric α
 * (L = N cos α − A sin α, D = N sin α + A cos α) and M_ref = M_bmc − N·x − A·z (docs/data-format.md, setup
 * `moment_ref_offset_m`; Barlow, Rae & Pope 3rd ed. §3, standard resolution).
 */
export function resolveLoads(x: PointInputs, g: PointGeometry): ResolvedLoads {
  let lift: number;
  let drag: number;
  let normal: number;
  let axial: number;
  if (g.axes === 'wind') {
    lift = x.force1;
    drag = x.force2;
    ({ normal, axial } = windToBody(lift, drag, x.alpha));
  } else {
    normal = x.force1;
    axial = x.force2;
    ({ lift, drag } = bodyToWind(normal, axial, x.alpha));
  }
  return { lift, drag, normal, axial, pitchRef: transferPitch(x.pitch, normal, axial, g.offset) };
}

/**
 * Step 2, flow angle: the angle of attack to the flow. Without a flow-angularity correction it is the
 * geometric angle and the loads stay as resolved.
 */
export function flowAngle(x: PointInputs, loads: ResolvedLoads): { alphaFlow: number; loads: ResolvedLoads } {
  return { alphaFlow: x.alpha, loads };
}

/** Step 3, flow state from the pitot-static and ambient readings (docs/methods.md §3–4). */
export function pointFlow(x: PointInputs, g: PointGeometry): FlowState {
  return flowState({ p: x.p, dp: x.dp, T0: x.T0, rh: x.rh, gamma: g.gamma, chord: g.chord });
}

/** Step 4, coefficients on q_u·S (and ·c or ·b for moments): CL = L/qS, CD = D/qS, Cm = M/qSc, CY = Y/qS, Cl = l/qSb, Cn = n/qSb. */
export function coefficients(x: PointInputs, alphaFlow: number, loads: ResolvedLoads, flow: FlowState, g: PointGeometry): TunnelPoint {
  const qS = flow.q * g.area;
  return {
    alphaDeg: alphaFlow * DEG_PER_RAD,
    cl: loads.lift / qS,
    cd: loads.drag / qS,
    cm: loads.pitchRef / (qS * g.chord),
    cy: x.side / qS,
    cRoll: x.roll / (qS * g.span),
    cYaw: x.yaw / (qS * g.span),
    q: flow.q,
    V: flow.V,
    mach: flow.mach,
    Re: flow.Re,
  };
}

/** The whole chain for one point. */
export function evaluatePoint(x: PointInputs, g: PointGeometry): Measured {
  const { alphaFlow, loads } = flowAngle(x, resolveLoads(x, g));
  const flow = pointFlow(x, g);
  return { ...loads, alphaFlow, flow, tunnel: coefficients(x, alphaFlow, loads, flow, g) };
}
