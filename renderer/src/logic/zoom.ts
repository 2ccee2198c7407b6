/**
 * Plot zoom as axis limits: wheel zoom about the cursor and a dragged box. Pure arithmetic on ranges,
 * so the chart wrapper only has to read pixels and apply limits.
 */

export interface Range {
  min: number;
  max: number;
}

/** Scale a range about `centre` by `factor` (< 1 zooms in), keeping the centre at the same place. */
export function zoomAbout(range: Range, centre: number, factor: number): Range {
  return { min: centre - (centre - range.min) * factor, max: centre + (range.max - centre) * factor };
}

/** Wheel delta to a zoom factor: one notch (100 px) zooms by 15 %. */
export function wheelFactor(deltaY: number): number {
  return Math.pow(1.15, Math.max(-5, Math.min(5, deltaY / 100)));
}

/** Limits of a dragged box from its two corner values; null when the box is too small to mean a zoom. */
export function boxRange(a: number, b: number, pixels: number, minPixels = 6): Range | null {
  if (Math.abs(pixels) < minPixels || a === b) return null;
  return { min: Math.min(a, b), max: Math.max(a, b) };
}
