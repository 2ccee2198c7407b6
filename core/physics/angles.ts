/** Angle conversions, named for what they convert (SI inside: radians; degrees only at the edges). */

/** Degrees per radian: multiply an angle in radians by this to get degrees. */
export const DEG_PER_RAD = 180 / Math.PI;

/** Radians per degree: multiply an angle in degrees by this to get radians. */
export const RAD_PER_DEG = Math.PI / 180;
