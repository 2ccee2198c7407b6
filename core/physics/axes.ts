/**
 * Balance axes and moment reference (docs/data-format.md §4). Angles in radians, forces in N, moments in N m.
 * Normal force positive up, axial force positive aft, pitching moment positive nose-up.
 */

/** Body to wind axes: L = N cos α − A sin α, D = N sin α + A cos α (Barlow, Rae & Pope 3rd ed. §3.x, standard resolution). */
export function bodyToWind(normal: number, axial: number, alpha: number): { lift: number; drag: number } {
  const c = Math.cos(alpha);
  const s = Math.sin(alpha);
  return { lift: normal * c - axial * s, drag: normal * s + axial * c };
}

/** Wind to body axes, the inverse rotation: N = L cos α + D sin α, A = −L sin α + D cos α. */
export function windToBody(lift: number, drag: number, alpha: number): { normal: number; axial: number } {
  const c = Math.cos(alpha);
  const s = Math.sin(alpha);
  return { normal: lift * c + drag * s, axial: -lift * s + drag * c };
}

/**
 * Pitching moment at the moment reference centre from the balance moment centre (docs/data-format.md §4):
 * M_ref = M_bmc − N·x − A·z, with (x, z) the reference centre's offset from the balance centre,
 * x toward the nose, z up.
 */
export function transferPitch(pitchBmc: number, normal: number, axial: number, offset: { x: number; z: number }): number {
  return pitchBmc - normal * offset.x - axial * offset.z;
}
