/**
 * One test point as measured in the tunnel: flow state from the pitot-static and ambient readings,
 * loads resolved to wind axes, the pitching moment moved to the reference centre, and the
 * uncorrected coefficients (docs/methods.md §3–5). Pure and per point, so the uncertainty
 * propagation can call it with perturbed inputs.
 */
import { bodyToWind, transferPitch, windToBody } from '../physics/axes.ts';
import { flowState, type FlowState } from '../physics/flowState.ts';
import type { TunnelPoint } from '../walls/types.ts';
import { RAD } from '../walls/types.ts';
import { resolveToFlow } from '../flowAngle/upflow.ts';

/** Point means in SI, tares already removed from the loads. Absent loads are NaN. */
export interface PointInputs {
  alpha: number;
  dp: number;
  p: number;
  T0: number;
  rh: number;
  /** lift/drag (wind) or normal/axial (body), by the balance axes */
  force1: number;
  force2: number;
  side: number;
  pitch: number;
  roll: number;
  yaw: number;
}

export interface MeasureGeometry {
  area: number;
  chord: number;
  /** Span for rolling/yawing moments (tunnel width for 2D). */
  span: number;
  gamma: number;
  axes: 'wind' | 'body';
  offset: { x: number; z: number };
  /** Flow angle: upflow φ, rad, positive up (setup flow.upflow_deg); 0 or absent leaves the tunnel axes as they are. */
  upflow?: number;
}

export interface Measured {
  flow: FlowState;
  tunnel: TunnelPoint;
  lift: number;
  drag: number;
  /** Pitching moment at the reference centre, NaN without a pitch column. */
  pitchRef: number;
}

/** Coefficients on q_u·S (and ·c or ·b for moments): docs/methods.md §5. */
export function measure(x: PointInputs, g: MeasureGeometry): Measured {
  const flow = flowState({ p: x.p, dp: x.dp, T0: x.T0, rh: x.rh, gamma: g.gamma, chord: g.chord });
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
  const pitchRef = transferPitch(x.pitch, normal, axial, g.offset);
  // flow angle: α += φ, lift and drag resolved to the true flow direction (the moment is unchanged)
  const phi = g.upflow ?? 0;
  if (phi !== 0) ({ lift, drag } = resolveToFlow(lift, drag, phi));
  const qS = flow.q * g.area;
  return {
    flow,
    lift,
    drag,
    pitchRef,
    tunnel: {
      alphaDeg: (x.alpha + phi) * RAD,
      cl: lift / qS,
      cd: drag / qS,
      cm: pitchRef / (qS * g.chord),
      cy: x.side / qS,
      cRoll: x.roll / (qS * g.span),
      cYaw: x.yaw / (qS * g.span),
      q: flow.q,
      V: flow.V,
      mach: flow.mach,
      Re: flow.Re,
    },
  };
}
