/**
 * Solid-blockage shape factor K on the normalisation of the computed τ1. τ1 (imageSums.ts,
 * rectImages.ts, circular.ts) is the image sum of a point source-doublet of strength U·V_model, so
 * the model must be represented by its real doublet strength μ = U·V·(1 + k1), k1 the coefficient of
 * longitudinal added mass: K = 1 + k1 ≥ 1 (Glauert, ARC R&M 1566 (1933) §5; the doublet–added-mass
 * relation of Lamb, Hydrodynamics, 6th ed. (1932) §§92, 114–115, 373; used for blockage by
 * Herriot, NACA Report 995 (1950)). A sphere: k1 = 0.5, K = 1.5. Thin wings and slender bodies: K → 1.
 */

/**
 * Longitudinal added-mass coefficient k1 of a prolate spheroid of fineness ratio f = length/diameter
 * (Lamb §373): e = √(1 − 1/f²), α0 = (2(1 − e²)/e³)·(½·ln((1 + e)/(1 − e)) − e), k1 = α0/(2 − α0).
 * f = 1 (sphere) gives 0.5; f = 6 gives 0.045; f → ∞ gives 0.
 */
export function prolateSpheroidK1(fineness: number): number {
  if (!(fineness >= 1)) throw new RangeError('fineness ratio must be at least 1');
  if (fineness - 1 < 1e-6) return 0.5;
  const e = Math.sqrt(1 - 1 / (fineness * fineness));
  const alpha0 = ((2 * (1 - e * e)) / (e * e * e)) * (0.5 * Math.log((1 + e) / (1 - e)) - e);
  return alpha0 / (2 - alpha0);
}

/** K = 1 + k1 of the equivalent prolate spheroid of this fineness ratio. */
export function shapeFactorK(fineness: number): number {
  return 1 + prolateSpheroidK1(fineness);
}

/**
 * Fineness ratio assumed when the setup gives neither `solid_blockage_k` nor `model.fineness_ratio`:
 * 6, a typical model fuselage (common practice, no published source), K = 1.045. The earlier default
 * 0.96 was a chart value on another normalisation of τ1 and understated ε_sb by 8.9 %.
 */
export const DEFAULT_FINENESS_RATIO = 6;
