/**
 * A plot as an SVG figure for reports (vector, scales without blur): titled axes with round ticks, the
 * runs in their colours, markers and dashes, a legend, and a provenance block in legible type below.
 * Pure string building: no DOM, so it is tested as text.
 */
import type { Series } from './plotConfig.ts';
import type { Range } from '../logic/zoom.ts';
import { maxOf, minOf } from '../../../core/index.ts';

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

export function svgFigure(o: SvgFigureOptions): string {
  const legendRows = Math.ceil(o.series.length / 3);
  // 12 px DejaVu Sans runs about 7 px a character
  const provenance = wrapLines(o.provenance, Math.floor((o.width - 48) / 7));
  const provH = provenance.length * 16 + 12;
  const plot = { left: 80, top: 44, right: o.width - 24, bottom: o.height - 56 - legendRows * 20 - provH };
  const xs = o.series.flatMap((s) => s.points.map((p) => p.x));
  const ys = o.series.flatMap((s) => s.points.map((p) => p.y));
  const xr = o.limits?.x ?? extent(xs);
  const yr = o.limits?.y ?? extent(ys);
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
  for (const s of o.series) {
    // open rings stay see-through, so a repeat lying on its twin shows both
    const fill = s.style.filled ? s.style.colour : 'none';
    const r = s.style.filled ? 4 : 5.5;
    if (s.joined !== false && s.points.length > 1) {
      const d = s.points.map((p, i) => `${i ? 'L' : 'M'}${px(p.x).toFixed(1)} ${py(p.y).toFixed(1)}`).join('');
      parts.push(
        `<path d="${d}" fill="none" stroke="${s.style.colour}" stroke-width="1.8"${s.style.dash.length ? ` stroke-dasharray="${s.style.dash.join(' ')}"` : ''}/>`,
      );
    }
    for (const p of s.points) parts.push(marker(s.style.marker, px(p.x), py(p.y), r, fill, s.style.colour));
  }
  parts.push(`</g>`);
  const legendTop = plot.bottom + 62;
  const colW = (o.width - 48) / 3;
  o.series.forEach((s, i) => {
    const x = 24 + (i % 3) * colW;
    const y = legendTop + Math.floor(i / 3) * 20;
    parts.push(
      `<line x1="${x}" y1="${y}" x2="${x + 30}" y2="${y}" stroke="${s.style.colour}" stroke-width="1.8"${s.style.dash.length ? ` stroke-dasharray="${s.style.dash.join(' ')}"` : ''}/>`,
    );
    parts.push(marker(s.style.marker, x + 15, y, s.style.filled ? 4 : 5, s.style.filled ? s.style.colour : '#ffffff', s.style.colour));
    parts.push(`<text x="${x + 38}" y="${y + 4}" font-size="13">${esc(s.label)}</text>`);
  });
  const provTop = legendTop + legendRows * 20 + 8;
  parts.push(`<g class="provenance" font-size="12" fill="#333">`);
  provenance.forEach((l, i) => parts.push(`<text x="24" y="${provTop + i * 16}">${esc(l)}</text>`));
  parts.push(`</g></svg>`);
  return parts.join('\n') + '\n';
}
