/**
 * Series styles. Three cues, each with one job:
 * - colour follows the run: every reduced run has its own, never shared with another reduced run (runs
 *   that failed or are still reading take none). The first eight are the set of Okabe & Ito, "Color
 *   Universal Design" (J*FLY, 2002/2008), chosen to stay distinct under the common colour-vision
 *   deficiencies and ordered so the most contrasting on white come first; beyond eight, further hues
 *   are spread by the golden angle (common practice for open-ended categorical colours) at alternating
 *   lightness, so no two runs ever share a colour however many are shown.
 * - marker follows the configuration, so configurations differ even in grey-scale print.
 * - the repeat of a configuration (its second, third… reduced run) is drawn with open markers, a larger
 *   ring and its own dash pattern, so a repeat lying exactly on its twin still shows as a ring around it.
 */

export const RUN_COLOURS = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#000000', '#F0E442'] as const;

export const MARKERS = ['circle', 'rect', 'triangle', 'rectRot', 'star', 'crossRot', 'cross', 'rectRounded'] as const;
export type Marker = (typeof MARKERS)[number];

/** Canvas dash patterns in pixels by repeat: solid, dashed, dotted, dash-dot, long dash, dash-dot-dot. */
export const DASHES: readonly (readonly number[])[] = [[], [8, 4], [2, 3], [10, 3, 2, 3], [14, 5], [8, 3, 2, 3, 2, 3]];

export interface SeriesStyle {
  colour: string;
  marker: Marker;
  dash: readonly number[];
  /** 0 for the first reduced run of its configuration, 1 for the second, … */
  repeat: number;
  /** Filled markers for a configuration's first run, open rings for its repeats. */
  filled: boolean;
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

function hslHex(h: number, s: number, l: number): string {
  // HSL to RGB, CSS Color Module Level 3 §4.2.4
  const a = s * Math.min(l, 1 - l);
  const f = (n: number) => {
    const k = (n + h / 30) % 12;
    const c = l - a * Math.max(-1, Math.min(k - 3, 9 - k, 1));
    return Math.round(c * 255)
      .toString(16)
      .padStart(2, '0');
  };
  return `#${f(0)}${f(8)}${f(4)}`.toUpperCase();
}

/** Colours of the slots past the eighth, grown in order on demand so the sequence is always the same. */
const extra: string[] = [];
const used = new Set<string>(RUN_COLOURS);

/**
 * Colour of a colour slot: Okabe-Ito for the first eight, then golden-angle hues at three lightnesses.
 * A hue that rounds to a colour already given out is nudged in lightness until it is new, so distinct
 * slots always give distinct colours.
 */
export function colourOf(slot: number): string {
  const s = Math.max(0, Math.floor(slot));
  if (s < RUN_COLOURS.length) return RUN_COLOURS[s]!;
  while (extra.length <= s - RUN_COLOURS.length) {
    const k = extra.length;
    const hue = (k * 137.50776405) % 360;
    let lightness = [0.38, 0.5, 0.3][k % 3]!;
    let c = hslHex(hue, 0.72, lightness);
    while (used.has(c)) {
      lightness = lightness > 0.55 ? 0.25 : lightness + 0.004;
      c = hslHex(hue, 0.72, lightness);
    }
    used.add(c);
    extra.push(c);
  }
  return extra[s - RUN_COLOURS.length]!;
}

export function styleFor(colourSlot: number, configurationSlot: number, repeat = 0): SeriesStyle {
  return {
    colour: colourOf(colourSlot),
    marker: MARKERS[configurationSlot % MARKERS.length]!,
    dash: DASHES[repeat % DASHES.length]!,
    repeat,
    filled: repeat === 0,
  };
}

export interface StyledRun {
  file: string;
  configuration: string | null;
  /** Colour slot the user chose (kept in the campaign), if any. */
  chosen?: number;
}

/**
 * Styles of the reduced runs, in campaign order. A run's chosen slot is honoured when no earlier run
 * holds it; every other run takes the lowest free slot, so colours stay unique and runs that are not
 * reduced (failed, still reading, missing) use none up.
 */
export function assignStyles(runs: readonly StyledRun[], configurations: readonly string[]): Map<string, SeriesStyle> {
  const taken = new Set<number>();
  const slots = new Map<string, number>();
  for (const r of runs) {
    if (r.chosen !== undefined && !taken.has(r.chosen)) {
      taken.add(r.chosen);
      slots.set(r.file, r.chosen);
    }
  }
  let next = 0;
  for (const r of runs) {
    if (slots.has(r.file)) continue;
    while (taken.has(next)) next++;
    taken.add(next);
    slots.set(r.file, next);
  }
  const repeats = new Map<string, number>();
  const out = new Map<string, SeriesStyle>();
  for (const r of runs) {
    const key = r.configuration ?? '';
    const repeat = repeats.get(key) ?? 0;
    repeats.set(key, repeat + 1);
    out.set(r.file, styleFor(slots.get(r.file)!, Math.max(0, configurations.indexOf(key)), repeat));
  }
  return out;
}
