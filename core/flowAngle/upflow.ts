/**
 * Flow angularity (upflow) of a test section, measured with a model run upright and inverted, and
 * its correction.
 *
 * With an upflow φ (positive up) the flow meets the upright model at α + φ and the inverted one, whose
 * own "up" points down, at α − φ: CL_upright(α) = CL(α + φ), CL_inverted(α) = CL(α − φ). The zero-lift
 * angles of the two runs (uncorrected data, alpha as set in the model's own sense) therefore differ by
 * 2φ: φ = (α0_inverted − α0_upright)/2 (Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed.,
 * Wiley 1999, test-section calibration: flow angularity from upright and inverted runs; section cited
 * from memory).
 *
 * Correction: α += φ, and lift and drag measured normal and parallel to the tunnel axis are resolved to
 * the true flow direction: L = L'·cos φ − D'·sin φ, D = D'·cos φ + L'·sin φ (a rotation of axes by φ,
 * same source; without it the lift's component CL·φ stays in the drag).
 */
import { maxOf, minOf } from '../physics/numbers.ts';

/** Lift and drag in the true flow direction from those normal and parallel to the tunnel axis (φ in rad). */
export function resolveToFlow(liftTunnel: number, dragTunnel: number, phi: number): { lift: number; drag: number } {
  if (phi === 0) return { lift: liftTunnel, drag: dragTunnel };
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  return { lift: liftTunnel * c - dragTunnel * s, drag: dragTunnel * c + liftTunnel * s };
}

export interface ZeroLiftAngle {
  /** α0 in degrees. */
  alphaDeg: number;
  /** Standard uncertainty of α0 (k = 1), degrees, from the line fit's covariance. */
  uDeg: number;
  /** Points in the fit and their α range. */
  n: number;
  rangeDeg: [number, number];
}

/**
 * Zero-lift angle α0 = −a/b of the least-squares line CL = a + b·α over the given points, with its
 * standard uncertainty by first-order propagation through the fit's covariance (JCGM 100:2008 §5.2,
 * correlated inputs): u²(α0) = [s²(a) + α0²·s²(b) + 2α0·cov(a, b)] / b², where s², cov come from the
 * residual variance with n − 2 degrees of freedom (Draper & Smith, Applied Regression Analysis, 3rd
 * ed., ch. 1). Needs at least 3 points and a non-zero slope.
 */
export function zeroLiftAngle(alphaDeg: readonly number[], cl: readonly number[]): ZeroLiftAngle | undefined {
  const n = alphaDeg.length;
  if (n < 3) return undefined;
  const mx = alphaDeg.reduce((s, x) => s + x, 0) / n;
  const my = cl.reduce((s, y) => s + y, 0) / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (alphaDeg[i]! - mx) ** 2;
    sxy += (alphaDeg[i]! - mx) * (cl[i]! - my);
  }
  if (!(sxx > 0)) return undefined;
  const b = sxy / sxx;
  if (!(Math.abs(b) > 0)) return undefined;
  const a = my - b * mx;
  let sse = 0;
  for (let i = 0; i < n; i++) sse += (cl[i]! - a - b * alphaDeg[i]!) ** 2;
  const s2 = sse / (n - 2);
  // centred form: α0 = mx − ȳ/b, and ȳ and b are uncorrelated; this equals the formula above
  const alpha0 = -a / b;
  const varMean = s2 / n;
  const varB = s2 / sxx;
  const u = Math.sqrt(varMean / (b * b) + (my * my * varB) / b ** 4);
  return { alphaDeg: alpha0, uDeg: u, n, rangeDeg: [minOf(alphaDeg), maxOf(alphaDeg)] };
}

export interface UpflowResult {
  upflow_deg: number;
  upflow_u_deg: number;
  alpha_zero_lift_upright_deg: number;
  alpha_zero_lift_inverted_deg: number;
  alpha_zero_lift_upright_u_deg: number;
  alpha_zero_lift_inverted_u_deg: number;
}

/** φ = (α0_inverted − α0_upright)/2 and u(φ) = ½·√(u²_upright + u²_inverted) (independent runs; JCGM 100:2008 eq. 10). */
export function upflowFromPair(upright: ZeroLiftAngle, inverted: ZeroLiftAngle): UpflowResult {
  return {
    upflow_deg: (inverted.alphaDeg - upright.alphaDeg) / 2,
    upflow_u_deg: 0.5 * Math.hypot(upright.uDeg, inverted.uDeg),
    alpha_zero_lift_upright_deg: upright.alphaDeg,
    alpha_zero_lift_inverted_deg: inverted.alphaDeg,
    alpha_zero_lift_upright_u_deg: upright.uDeg,
    alpha_zero_lift_inverted_u_deg: inverted.uDeg,
  };
}
