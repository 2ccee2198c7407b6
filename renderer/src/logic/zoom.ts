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

/**
 * An axis range typed by the user: both ends numbers, the first below the second. Returns the range,
 * or a message saying what is wrong ("" ends keep that end automatic: null range with no message).
 */
export function typedRange(minText: string, maxText: string, axis: string): { range: Range | null; problem: string | null } {
  const a = minText.trim();
  const b = maxText.trim();
  if (a === '' && b === '') return { range: null, problem: null };
  const min = Number(a.replace(',', '.'));
  const max = Number(b.replace(',', '.'));
  if (a === '' || b === '' || !Number.isFinite(min) || !Number.isFinite(max))
    return { range: null, problem: `${axis}: give both ends as numbers, or leave both empty for the full range` };
  if (!(min < max)) return { range: null, problem: `${axis}: the lower end (${a}) must be below the upper end (${b})` };
  return { range: { min, max }, problem: null };
}
