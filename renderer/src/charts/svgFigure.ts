/**
 * A plot as an SVG figure for reports (vector, scales without blur): titled axes with round ticks, the
 * runs in their colours, markers and dashes, return sweeps thin with arrowheads, the fitted lines and
 * CLmax marks when they are shown, a legend with the key to those marks, notes on marks a fit cannot
 * give, and a provenance block in legible type below. Drawn as the window draws them (markGlyphs.ts).
 * Pure string building: no DOM, so it is tested as text.
 */
import type { Series } from './plotConfig.ts';
import type { Range } from '../logic/zoom.ts';
import { maxOf, minOf } from '../../../core/index.ts';
import { arrowSegments, markKey, markNotes, segmentFalls, type KeyEntry } from '../logic/plotMarks.ts';
import { arrowHead, clMaxGlyph, FALLING_LINE_PX, FIT_LINE_ALPHA, FIT_LINE_PX, RISING_LINE_PX, type Px } from './markGlyphs.ts';

export interface SvgFigureOptions {
  title: string;
  xTitle: string;
  yTitle: string;
  series: readonly Series[];
  limits?: { x?: Range; y?: Range };
  width: number;
  height: number;
  /** Physical size for the width/height attributes (the drawing stays laid out in px by its viewBox). */
  mm?: { width: number; height: number } | null;
  /** Provenance lines, drawn at 12 px below the legend. */
  provenance: readonly string[];
}

const esc = (t: string) => t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');

/** A round step (1, 2, 2.5 or 5 × 10ⁿ) giving about `target` intervals over the span (common practice). */
export function niceStep(span: number, target = 6): number {
  if (!(span > 0) || !Number.isFinite(span)) return 1;
  const raw = span / target;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const f = raw / mag;
  return (f <= 1 ? 1 : f <= 2 ? 2 : f <= 2.5 ? 2.5 : f <= 5 ? 5 : 10) * mag;
}

/** Ticks at round values inside [min, max]. */
export function niceTicks(min: number, max: number): number[] {
  const step = niceStep(max - min);
  const out: number[] = [];
  for (let v = Math.ceil(min / step - 1e-9) * step; v <= max + step * 1e-9; v += step) out.push(Math.abs(v) < step * 1e-9 ? 0 : Number(v.toPrecision(12)));
  return out;
}

function extent(values: number[]): Range {
  if (values.length === 0) return { min: 0, max: 1 };
  let min = minOf(values);
  let max = maxOf(values);
  if (min === max) {
    min -= 1;
    max += 1;
  }
  const step = niceStep(max - min);
  return { min: Math.floor(min / step) * step, max: Math.ceil(max / step) * step };
}

function marker(kind: string, x: number, y: number, r: number, fill: string, stroke: string): string {
  const a = `fill="${fill}" stroke="${stroke}" stroke-width="1.4"`;
  switch (kind) {
    case 'rect':
    case 'rectRounded':
      return `<rect x="${(x - r).toFixed(1)}" y="${(y - r).toFixed(1)}" width="${2 * r}" height="${2 * r}" ${a}/>`;
    case 'triangle':
      return `<polygon points="${x.toFixed(1)},${(y - r * 1.2).toFixed(1)} ${(x + r).toFixed(1)},${(y + r * 0.8).toFixed(1)} ${(x - r).toFixed(1)},${(y + r * 0.8).toFixed(1)}" ${a}/>`;
    case 'rectRot':
      return `<polygon points="${x.toFixed(1)},${(y - r * 1.3).toFixed(1)} ${(x + r * 1.3).toFixed(1)},${y.toFixed(1)} ${x.toFixed(1)},${(y + r * 1.3).toFixed(1)} ${(x - r * 1.3).toFixed(1)},${y.toFixed(1)}" ${a}/>`;
    case 'cross':
    case 'crossRot':
    case 'star':
      return `<path d="M${(x - r).toFixed(1)} ${(y - r).toFixed(1)}L${(x + r).toFixed(1)} ${(y + r).toFixed(1)}M${(x + r).toFixed(1)} ${(y - r).toFixed(1)}L${(x - r).toFixed(1)} ${(y + r).toFixed(1)}" stroke="${stroke}" stroke-width="1.8" fill="none"/>`;
    default:
      return `<circle cx="${x.toFixed(1)}" cy="${y.toFixed(1)}" r="${r}" ${a}/>`;
  }
}

/** Lines no wider than about `chars` characters, broken after a " · " or ", " (else at a space). */
export function wrapLines(lines: readonly string[], chars: number): string[] {
  const out: string[] = [];
  for (const line of lines) {
    let rest = line;
    let first = true;
    while (rest.length > chars) {
      const head = rest.slice(0, chars);
      const cut = Math.max(head.lastIndexOf(' · '), head.lastIndexOf(', '), head.lastIndexOf(' ('));
      const at = cut > chars / 3 ? cut + (head[cut] === ' ' && head[cut + 1] === '(' ? 0 : 2) : head.lastIndexOf(' ') > 0 ? head.lastIndexOf(' ') : chars;
      out.push((first ? '' : '    ') + rest.slice(0, at).trimEnd());
      rest = rest.slice(at).trimStart();
      first = false;
    }
    out.push((first ? '' : '    ') + rest);
  }
  return out;
}

const pts = (p: readonly Px[]) => p.map((q) => `${q.x.toFixed(1)},${q.y.toFixed(1)}`).join(' ');
const dashAttr = (dash: readonly number[]) => (dash.length ? ` stroke-dasharray="${dash.join(' ')}"` : '');
const KEY_GREY = '#4a5058';

/** The small drawing of a key entry, centred at (x, y), 30 px wide. */
function keySwatch(kind: KeyEntry['kind'], x: number, y: number): string {
  if (kind === 'return') {
    const head = arrowHead({ x: x + 26, y }, { x: x + 4, y })!;
    return `<line x1="${x}" y1="${y}" x2="${x + 30}" y2="${y}" stroke="${KEY_GREY}" stroke-width="${FALLING_LINE_PX}"/><polygon points="${pts(head)}" fill="${KEY_GREY}"/>`;
  }
  if (kind === 'fit')
    return `<line x1="${x + 3}" y1="${y}" x2="${x + 27}" y2="${y}" stroke="${KEY_GREY}" stroke-opacity="${FIT_LINE_ALPHA}" stroke-width="${FIT_LINE_PX}" stroke-linecap="round"/>`;
  const g = clMaxGlyph({ x: x + 15, y: y + 4 });
  return `<line x1="${g.bar[0].x}" y1="${g.bar[0].y}" x2="${g.bar[1].x}" y2="${g.bar[1].y}" stroke="${KEY_GREY}" stroke-width="3" stroke-linecap="round"/><polygon points="${pts(g.caret)}" fill="${KEY_GREY}"/>`;
}

/** The path of the segments (i − 1 → i) that `take` selects, joined where they follow each other. */
function segmentPath(xy: readonly Px[], take: (i: number) => boolean): string {
  let d = '';
  let open = false;
  for (let i = 1; i < xy.length; i++) {
    if (!take(i)) {
      open = false;
      continue;
    }
    if (!open) d += `M${xy[i - 1]!.x.toFixed(1)} ${xy[i - 1]!.y.toFixed(1)}`;
    d += `L${xy[i]!.x.toFixed(1)} ${xy[i]!.y.toFixed(1)}`;
    open = true;
  }
  return d;
}

export function svgFigure(o: SvgFigureOptions): string {
  const key = markKey(o.series, o.series[0]?.plot ?? '');
  const legendRows = Math.ceil((o.series.length + key.length) / 3);
  // 12 px DejaVu Sans runs about 7 px a character
  const chars = Math.floor((o.width - 48) / 7);
  const notes = wrapLines(markNotes(o.series), chars);
  const provenance = wrapLines(o.provenance, chars);
  const provH = (notes.length + provenance.length) * 16 + 12;
  const plot = { left: 80, top: 44, right: o.width - 24, bottom: o.height - 56 - legendRows * 20 - provH };
  const xs = o.series.flatMap((s) => [
    ...s.points.map((p) => p.x),
    ...(s.marks?.fitLine?.points.map((p) => p.x) ?? []),
    ...(s.marks?.clMax ? [s.marks.clMax.x] : []),
  ]);
  const ys = o.series.flatMap((s) => [
    ...s.points.map((p) => p.y),
    ...(s.marks?.fitLine?.points.map((p) => p.y) ?? []),
    ...(s.marks?.clMax ? [s.marks.clMax.y + (s.marks.clMax.yu ?? 0)] : []),
  ]);
  const xr = o.limits?.x ?? extent(xs);
  const yr = o.limits?.y ?? extent(ys);
  // room above the highest CLmax for its caret (about 16 px), unless the user chose the range
  const tops = o.series.flatMap((s) => (s.marks?.clMax ? [s.marks.clMax.y + (s.marks.clMax.yu ?? 0)] : []));
  if (!o.limits?.y && tops.length && ((yr.max - maxOf(tops)) / (yr.max - yr.min)) * (plot.bottom - plot.top) < 16) {
    yr.max += niceStep(yr.max - yr.min);
  }
  const px = (x: number) => plot.left + ((x - xr.min) / (xr.max - xr.min)) * (plot.right - plot.left);
  const py = (y: number) => plot.bottom - ((y - yr.min) / (yr.max - yr.min)) * (plot.bottom - plot.top);
  const parts: string[] = [];
  parts.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${o.mm ? `${o.mm.width}mm` : o.width}" height="${o.mm ? `${o.mm.height}mm` : o.height}" viewBox="0 0 ${o.width} ${o.height}" font-family="DejaVu Sans, Arial, sans-serif">`,
  );
  parts.push(`<rect width="100%" height="100%" fill="#ffffff"/>`);
  parts.push(`<text x="${o.width / 2}" y="26" text-anchor="middle" font-size="17" font-weight="bold">${esc(o.title)}</text>`);
  parts.push(
    `<clipPath id="plot-area"><rect x="${plot.left}" y="${plot.top}" width="${plot.right - plot.left}" height="${plot.bottom - plot.top}"/></clipPath>`,
  );
  for (const t of niceTicks(xr.min, xr.max)) {
    const x = px(t).toFixed(1);
    parts.push(
      `<line x1="${x}" y1="${plot.top}" x2="${x}" y2="${plot.bottom}" stroke="#e3e6ea"/><text x="${x}" y="${plot.bottom + 18}" text-anchor="middle" font-size="13">${esc(String(t))}</text>`,
    );
  }
  for (const t of niceTicks(yr.min, yr.max)) {
    const y = py(t).toFixed(1);
    parts.push(
      `<line x1="${plot.left}" y1="${y}" x2="${plot.right}" y2="${y}" stroke="#e3e6ea"/><text x="${plot.left - 8}" y="${(py(t) + 4).toFixed(1)}" text-anchor="end" font-size="13">${esc(String(t))}</text>`,
    );
  }
  parts.push(`<rect x="${plot.left}" y="${plot.top}" width="${plot.right - plot.left}" height="${plot.bottom - plot.top}" fill="none" stroke="#888"/>`);
  parts.push(
    `<text x="${(plot.left + plot.right) / 2}" y="${plot.bottom + 40}" text-anchor="middle" font-size="14" font-weight="bold">${esc(o.xTitle)}</text>`,
  );
  parts.push(
    `<text transform="translate(22 ${(plot.top + plot.bottom) / 2}) rotate(-90)" text-anchor="middle" font-size="14" font-weight="bold">${esc(o.yTitle)}</text>`,
  );
  parts.push(`<g clip-path="url(#plot-area)">`);
  // fitted lines under everything, as on screen
  for (const s of o.series) {
    const f = s.marks?.fitLine;
    if (!f || f.points.length < 2) continue;
    const d = f.points.map((p, i) => `${i ? 'L' : 'M'}${px(p.x).toFixed(1)} ${py(p.y).toFixed(1)}`).join('');
    parts.push(
      `<path class="fit-line" d="${d}" fill="none" stroke="${s.style.colour}" stroke-opacity="${FIT_LINE_ALPHA}" stroke-width="${FIT_LINE_PX}" stroke-linecap="round"><title>${esc(`${s.label}: ${f.text}`)}</title></path>`,
    );
  }
  for (const s of o.series) {
    // open rings stay see-through, so a repeat lying on its twin shows both
    const fill = s.style.filled ? s.style.colour : 'none';
    const r = s.style.filled ? 4 : 5.5;
    const xy = s.points.map((p) => ({ x: px(p.x), y: py(p.y) }));
    if (s.joined !== false && s.points.length > 1) {
      const sweep = s.sweep;
      const rising = sweep ? segmentPath(xy, (i) => !segmentFalls(sweep, i)) : segmentPath(xy, () => true);
      if (rising) parts.push(`<path d="${rising}" fill="none" stroke="${s.style.colour}" stroke-width="${RISING_LINE_PX}"${dashAttr(s.style.dash)}/>`);
      if (sweep) {
        const falling = segmentPath(xy, (i) => segmentFalls(sweep, i));
        if (falling)
          parts.push(
            `<path class="branch-falling" d="${falling}" fill="none" stroke="${s.style.colour}" stroke-width="${FALLING_LINE_PX}"${dashAttr(s.style.dash)}/>`,
          );
        for (const i of arrowSegments(sweep.branchOf)) {
          const head = arrowHead(xy[i - 1]!, xy[i]!);
          if (head) parts.push(`<polygon class="sweep-arrow" points="${pts(head)}" fill="${s.style.colour}"/>`);
        }
      }
    }
    for (const p of xy) parts.push(marker(s.style.marker, p.x, p.y, r, fill, s.style.colour));
  }
  for (const s of o.series) {
    const m = s.marks?.clMax;
    if (!m) continue;
    const at = { x: px(m.x), y: py(m.y) };
    const c = s.style.colour;
    const bars: string[] = [];
    if (m.yu !== null) {
      const [y0, y1] = [py(m.y - m.yu), py(m.y + m.yu)];
      bars.push(
        `M${at.x.toFixed(1)} ${y0.toFixed(1)}L${at.x.toFixed(1)} ${y1.toFixed(1)}M${(at.x - 3).toFixed(1)} ${y0.toFixed(1)}L${(at.x + 3).toFixed(1)} ${y0.toFixed(1)}M${(at.x - 3).toFixed(1)} ${y1.toFixed(1)}L${(at.x + 3).toFixed(1)} ${y1.toFixed(1)}`,
      );
    }
    if (m.xu !== null) {
      const [x0, x1] = [px(m.x - m.xu), px(m.x + m.xu)];
      bars.push(
        `M${x0.toFixed(1)} ${at.y.toFixed(1)}L${x1.toFixed(1)} ${at.y.toFixed(1)}M${x0.toFixed(1)} ${(at.y - 3).toFixed(1)}L${x0.toFixed(1)} ${(at.y + 3).toFixed(1)}M${x1.toFixed(1)} ${(at.y - 3).toFixed(1)}L${x1.toFixed(1)} ${(at.y + 3).toFixed(1)}`,
      );
    }
    const g = clMaxGlyph(at, m.yu !== null ? py(m.y + m.yu) : undefined);
    parts.push(
      `<g class="clmax-mark" data-cl-max="${m.y}" data-alpha="${m.x}">${bars.length ? `<path d="${bars.join('')}" stroke="${c}" stroke-width="1.4" fill="none"/>` : ''}<line x1="${g.bar[0].x.toFixed(1)}" y1="${g.bar[0].y.toFixed(1)}" x2="${g.bar[1].x.toFixed(1)}" y2="${g.bar[1].y.toFixed(1)}" stroke="${c}" stroke-width="3" stroke-linecap="round"/><polygon points="${pts(g.caret)}" fill="${c}" stroke="#ffffff" stroke-width="1"/><title>${esc(`${s.label}: ${m.text}`)}</title></g>`,
    );
  }
  parts.push(`</g>`);
  const legendTop = plot.bottom + 62;
  const colW = (o.width - 48) / 3;
  const cell = (i: number) => ({ x: 24 + (i % 3) * colW, y: legendTop + Math.floor(i / 3) * 20 });
  o.series.forEach((s, i) => {
    const { x, y } = cell(i);
    parts.push(`<line x1="${x}" y1="${y}" x2="${x + 30}" y2="${y}" stroke="${s.style.colour}" stroke-width="1.8"${dashAttr(s.style.dash)}/>`);
    parts.push(marker(s.style.marker, x + 15, y, s.style.filled ? 4 : 5, s.style.filled ? s.style.colour : '#ffffff', s.style.colour));
    parts.push(`<text x="${x + 38}" y="${y + 4}" font-size="13">${esc(s.label)}</text>`);
  });
  key.forEach((k, j) => {
    const { x, y } = cell(o.series.length + j);
    parts.push(
      `<g class="key" data-key="${k.kind}">${keySwatch(k.kind, x, y)}<text x="${x + 38}" y="${y + 4}" font-size="12" fill="#444b55">${esc(k.text)}</text></g>`,
    );
  });
  const notesTop = legendTop + legendRows * 20 + 8;
  if (notes.length) {
    parts.push(`<g class="mark-notes" font-size="12" fill="#333">`);
    notes.forEach((l, i) => parts.push(`<text x="24" y="${notesTop + i * 16}">${esc(l)}</text>`));
    parts.push(`</g>`);
  }
  const provTop = notesTop + notes.length * 16;
  parts.push(`<g class="provenance" font-size="12" fill="#333">`);
  provenance.forEach((l, i) => parts.push(`<text x="24" y="${provTop + i * 16}">${esc(l)}</text>`));
  parts.push(`</g></svg>`);
  return parts.join('\n') + '\n';
}
