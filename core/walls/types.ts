/** Types shared by the 2D and 3D wall corrections. */

/** One point as measured in the tunnel (angles in degrees, SI otherwise). */
export interface TunnelPoint {
  alphaDeg: number;
  cl: number;
  cd: number;
  /** NaN when no pitching moment was measured. */
  cm: number;
  cy: number;
  cRoll: number;
  cYaw: number;
  q: number;
  V: number;
  mach: number;
  Re: number;
}

/** The same point as free-air-equivalent values, with the blockage terms applied to it. */
export interface CorrectedPoint extends TunnelPoint {
  epsSolid: number;
  epsWake: number;
}

/** Correction factors used for a run (the `factors` of the JSON output). */
export interface WallFactors {
  sigma: number | null;
  delta: number | null;
  tau1: number | null;
  tau2: number | null;
  solid_blockage_k: number | null;
}

export const NO_FACTORS: WallFactors = { sigma: null, delta: null, tau1: null, tau2: null, solid_blockage_k: null };

export const RAD = 180 / Math.PI;

/** Above these the classic corrections are outside their validated range (Barlow, Rae & Pope 3rd ed. §10; AGARDograph 336 §1). */
export const MAX_VALIDATED_EPSILON = 0.1;
export const MAX_VALIDATED_SPAN_RATIO = 0.8;
