/**
 * Geometry of the marks drawn over the points, in pixels, shared by the canvas (plugins.ts) and the SVG
 * figure (svgFigure.ts) so both draw the same shapes:
 * - an arrowhead in the middle of a segment, pointing the way the sweep went;
 * - the CLmax mark: a short level bar at the fitted CLmax, a caret above it pointing down at it, and
 *   its standard uncertainties as bars with end caps.
 */

export interface Px {
  x: number;
  y: number;
}

/** Arrowhead length and half-width, px. */
export const ARROW = { length: 10, halfWidth: 4.5 } as const;
/** Segments shorter than this on screen get no arrowhead (it would hide the points). */
export const ARROW_MIN_SEGMENT_PX = 16;

/** The three corners of an arrowhead centred on the middle of the segment a → b, tip towards b; null for a short segment. */
export function arrowHead(a: Px, b: Px): [Px, Px, Px] | null {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const len = Math.hypot(dx, dy);
  if (!(len >= ARROW_MIN_SEGMENT_PX)) return null;
  const ux = dx / len;
  const uy = dy / len;
  const mx = (a.x + b.x) / 2;
  const my = (a.y + b.y) / 2;
  const tip = { x: mx + (ux * ARROW.length) / 2, y: my + (uy * ARROW.length) / 2 };
  const back = { x: mx - (ux * ARROW.length) / 2, y: my - (uy * ARROW.length) / 2 };
  return [tip, { x: back.x - uy * ARROW.halfWidth, y: back.y + ux * ARROW.halfWidth }, { x: back.x + uy * ARROW.halfWidth, y: back.y - ux * ARROW.halfWidth }];
}

/** Half-length of the CLmax level bar, and the caret's height and half-width, px. */
export const CLMAX = { bar: 9, caret: 9, caretHalf: 5.5, gap: 3 } as const;

/**
 * The CLmax mark at pixel `at`: the level bar's ends and the caret's corners (apex down, above the bar
 * and above the top of the uncertainty bar when there is one, `top` in pixels).
 */
export function clMaxGlyph(at: Px, top?: number): { bar: [Px, Px]; caret: [Px, Px, Px] } {
  const apexY = Math.min(at.y, top ?? at.y) - CLMAX.gap;
  return {
    bar: [
      { x: at.x - CLMAX.bar, y: at.y },
      { x: at.x + CLMAX.bar, y: at.y },
    ],
    caret: [
      { x: at.x, y: apexY },
      { x: at.x - CLMAX.caretHalf, y: apexY - CLMAX.caret },
      { x: at.x + CLMAX.caretHalf, y: apexY - CLMAX.caret },
    ],
  };
}

/** Line width of a falling (return) branch against the normal 1.8 px. */
export const FALLING_LINE_PX = 0.9;
export const RISING_LINE_PX = 1.8;
/** Fitted lines: a broad, pale stroke in the run's colour under the points. */
export const FIT_LINE_PX = 6;
export const FIT_LINE_ALPHA = 0.3;

/** A colour "#rrggbb" with an alpha, as CSS rgba(). */
export function withAlpha(hex: string, alpha: number): string {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) return hex;
  return `rgba(${parseInt(m[1]!, 16)},${parseInt(m[2]!, 16)},${parseInt(m[3]!, 16)},${alpha})`;
}
