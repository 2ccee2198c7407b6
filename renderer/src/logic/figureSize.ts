/**
 * The size of an exported figure: a few presets for where a figure goes (a report's text width or
 * column, a full landscape page, a slide, the screen) or a width × height typed in mm or px.
 *
 * A size in mm is a physical size: the SVG carries it in its width/height attributes (`160mm`) over a
 * drawing laid out in px, so a report pastes it at that size; the PNG is rendered at 300 dpi for it.
 * The drawing's type has fixed px sizes (12 px provenance, larger axis titles), laid out at 96 px per
 * inch (CSS px), where 12 px prints at 9 pt. A small figure would leave no room for the plot under its
 * legend and provenance block, so the layout is never narrower than 600 px nor lower than 420 px: the
 * drawing is then scaled down into the physical size and its type prints smaller (said beside the
 * choice, `printedPt`).
 */

export type SizeUnit = 'mm' | 'px';

export interface FigureSize {
  width: number;
  height: number;
  unit: SizeUnit;
}

export interface FigurePreset extends FigureSize {
  id: string;
  label: string;
}

/** Common practice for A4 reports (text width about 160 mm, a column about 85 mm) and 16:9 slides. */
export const FIGURE_PRESETS: readonly FigurePreset[] = [
  { id: 'text-width', label: 'Report, text width', width: 160, height: 110, unit: 'mm' },
  { id: 'column', label: 'Report, one column', width: 85, height: 70, unit: 'mm' },
  { id: 'page', label: 'Full page, A4 landscape', width: 257, height: 170, unit: 'mm' },
  { id: 'slide', label: 'Slide, 16:9', width: 1280, height: 720, unit: 'px' },
  { id: 'screen', label: 'Screen', width: 1400, height: 900, unit: 'px' },
];

export const DEFAULT_PRESET = 'screen';

/** CSS px per mm (96 px per inch). */
export const PX_PER_MM = 96 / 25.4;
/** The smallest layout the drawing keeps its plot area readable in. */
export const MIN_LAYOUT = { width: 600, height: 420 } as const;
/** Raster resolution of a PNG given in mm. */
export const PRINT_DPI = 300;
/** Accepted ranges of a typed size. */
export const LIMITS = { mm: { min: 30, max: 600 }, px: { min: 300, max: 6000 } } as const;

export interface FigureLayout {
  /** Size of the drawing in px (the SVG's viewBox, the chart's canvas in CSS px). */
  width: number;
  height: number;
  /** Physical size for the SVG's width/height attributes; null for a size in px. */
  mm: { width: number; height: number } | null;
  /** Device pixels per layout px of the PNG (300 dpi for a size in mm, 1 for px). */
  pixelRatio: number;
  /** Printed size of the 12 px provenance type at the physical size, pt; null for a size in px. */
  printedPt: number | null;
}

/** The layout of a figure of a given size (see the module comment). */
export function figureLayout(size: FigureSize): FigureLayout {
  if (size.unit === 'px') return { width: Math.round(size.width), height: Math.round(size.height), mm: null, pixelRatio: 1, printedPt: null };
  const w = size.width * PX_PER_MM;
  const h = size.height * PX_PER_MM;
  const scale = Math.max(1, MIN_LAYOUT.width / w, MIN_LAYOUT.height / h);
  const width = Math.round(w * scale);
  const height = Math.round(h * scale);
  // 1 pt = 1/72 in; a layout px prints at (size.width / width) mm
  const printedPt = (12 * (size.width / width) * 72) / 25.4;
  return { width, height, mm: { width: size.width, height: size.height }, pixelRatio: ((size.width / 25.4) * PRINT_DPI) / width, printedPt };
}

/** A typed size checked: the problem in words, or null. */
export function sizeProblem(size: FigureSize): string | null {
  const lim = LIMITS[size.unit];
  for (const [name, v] of [
    ['width', size.width],
    ['height', size.height],
  ] as const) {
    if (!Number.isFinite(v)) return `The ${name} must be a number of ${size.unit}.`;
    if (v < lim.min || v > lim.max) return `The ${name} must be ${lim.min} to ${lim.max} ${size.unit}, not ${v}.`;
  }
  return null;
}

/** "160 × 110 mm" */
export function sizeText(size: FigureSize): string {
  return `${size.width} × ${size.height} ${size.unit}`;
}

/** A file-name part for a size: "160x110mm". */
export function sizeStem(size: FigureSize): string {
  return `${size.width}x${size.height}${size.unit}`;
}

/** The least height of the plot area itself, px: below it the curves cannot be read. */
export const MIN_PLOT_HEIGHT = 240;

/**
 * A layout enlarged (proportions kept) until the plot area keeps MIN_PLOT_HEIGHT under what the drawing
 * puts around it. `around(width)` is the height the title, axes, legend and provenance block take at a
 * layout width (the provenance wraps into fewer lines on a wider layout). The physical size stays; the
 * type prints smaller, and `printedPt` says how small.
 */
export function fitLayout(layout: FigureLayout, around: (width: number) => number): FigureLayout {
  let { width, height } = layout;
  for (let i = 0; i < 6; i++) {
    const need = around(width) + MIN_PLOT_HEIGHT;
    if (height >= need) break;
    const k = need / height;
    width = Math.round(width * k);
    height = Math.ceil(height * k);
  }
  if (width === layout.width) return layout;
  const mm = layout.mm;
  return {
    width,
    height,
    mm,
    pixelRatio: mm ? ((mm.width / 25.4) * PRINT_DPI) / width : 1,
    printedPt: mm ? (12 * (mm.width / width) * 72) / 25.4 : null,
  };
}
