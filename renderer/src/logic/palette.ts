/**
 * Series styles. Colours: the eight-colour set of Okabe & Ito, "Color Universal Design" (J*FLY, 2002/2008),
 * chosen to stay distinct under the common colour-vision deficiencies; ordered so the most contrasting
 * on white come first and yellow, weakest on white, comes last. Colour follows the run; point marker and
 * dash pattern follow the configuration, so two configurations differ even in grey-scale print.
 */

export const RUN_COLOURS = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#000000', '#F0E442'] as const;

export const MARKERS = ['circle', 'rect', 'triangle', 'rectRot', 'star', 'crossRot', 'cross', 'rectRounded'] as const;
export type Marker = (typeof MARKERS)[number];

/** Canvas dash patterns in pixels: solid, dashed, dotted, dash-dot, long dash, dash-dot-dot. */
export const DASHES: readonly (readonly number[])[] = [[], [8, 4], [2, 3], [10, 3, 2, 3], [14, 5], [8, 3, 2, 3, 2, 3]];

export interface SeriesStyle {
  colour: string;
  marker: Marker;
  dash: readonly number[];
}

/** Configurations in order of first appearance; runs without one share the "(none)" slot. */
export function configurationOrder(configurations: readonly (string | null | undefined)[]): string[] {
  const seen: string[] = [];
  for (const c of configurations) {
    const key = c ?? '';
    if (!seen.includes(key)) seen.push(key);
  }
  return seen;
}

export function styleFor(runSlot: number, configurationSlot: number): SeriesStyle {
  const colour = RUN_COLOURS[((runSlot % RUN_COLOURS.length) + RUN_COLOURS.length) % RUN_COLOURS.length]!;
  return {
    colour,
    marker: MARKERS[configurationSlot % MARKERS.length]!,
    dash: DASHES[configurationSlot % DASHES.length]!,
  };
}
