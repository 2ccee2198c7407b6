/**
 * Geometry of the setup editor's cross-section sketch: the test section seen from upstream, its
 * boundaries (solid walls drawn full, free jet boundaries dashed), corner fillets, and the model's span
 * to scale (a half model from its reflection wall). Pure: the component only draws what this returns.
 */
import { compact, fixed as toDecimals } from './numberFormat.ts';

export type Side = 'floor' | 'ceiling' | 'left' | 'right';
export type Kind = 'solid' | 'free';

export interface SketchInput {
  section: string;
  width: number | null;
  height: number | null;
  diameter: number | null;
  boundaries: Partial<Record<Side, string>>;
  fillet: number | null;
  kind: string;
  span: number | null;
  mounting: string;
  reflectionWall: string;
}

export interface SketchSegment {
  /** SVG path data in the drawing's own units (the view box). */
  d: string;
  kind: Kind;
  label: string;
}

export interface Sketch {
  viewBox: string;
  walls: SketchSegment[];
  /** The model's span as a line, or null when it is not known. */
  model: { x1: number; y1: number; x2: number; y2: number; label: string } | null;
  /** Dimension texts placed outside the section. */
  dims: { x: number; y: number; text: string; anchor: 'middle' | 'start' | 'end' }[];
  /** Why nothing can be drawn, or null. */
  empty: string | null;
  /** One line describing the drawing for screen readers. */
  summary: string;
}

const VIEW = 200; // the longer side of the section is drawn VIEW units long
const PAD = 34;
/** Extra room on the left for the height's label. */
const LEFT = 50;

const num = (v: number | null) => (v !== null && Number.isFinite(v) && v > 0 ? v : null);
const kindOf = (v: string | undefined, fallback: Kind): Kind => (v === 'free' ? 'free' : v === 'solid' ? 'solid' : fallback);
const fmt = (m: number) => `${compact(m, 3)} m`;

/** The sketch for the form's current values; never throws on half-typed input. */
export function sectionSketch(inp: SketchInput): Sketch {
  const circular = inp.section === 'closed-circular' || inp.section === 'open-circular';
  const blank = (why: string): Sketch => ({
    viewBox: `${-LEFT} 0 ${VIEW + 2 * PAD + LEFT} ${VIEW + 2 * PAD}`,
    walls: [],
    model: null,
    dims: [],
    empty: why,
    summary: why,
  });
  if (circular) {
    const D = num(inp.diameter);
    if (D === null) return blank('Enter the diameter to see the section.');
    const r = VIEW / 2;
    const cx = PAD + r;
    const cy = PAD + r;
    const k: Kind = inp.section === 'closed-circular' ? 'solid' : 'free';
    const walls: SketchSegment[] = [
      {
        d: `M ${cx - r} ${cy} A ${r} ${r} 0 1 0 ${cx + r} ${cy} A ${r} ${r} 0 1 0 ${cx - r} ${cy}`,
        kind: k,
        label: k === 'solid' ? 'solid wall' : 'free jet boundary',
      },
    ];
    const s = num(inp.span);
    const scale = VIEW / D;
    const model =
      s !== null && inp.kind !== '2d'
        ? { x1: cx - (s * scale) / 2, y1: cy, x2: cx + (s * scale) / 2, y2: cy, label: `span ${fmt(s)} = ${toDecimals(s / D, 2)} D` }
        : null;
    return {
      viewBox: `${-LEFT} 0 ${VIEW + 2 * PAD + LEFT} ${VIEW + 2 * PAD}`,
      walls,
      model,
      dims: [{ x: cx, y: PAD + VIEW + 22, text: `D = ${fmt(D)}`, anchor: 'middle' }],
      empty: null,
      summary: `${k === 'solid' ? 'Closed' : 'Open'} circular section, diameter ${fmt(D)}${model ? `, ${model.label}` : ''}.`,
    };
  }
  const B = num(inp.width);
  const H = num(inp.height);
  if (B === null || H === null) return blank('Enter the width and height to see the section.');
  const scale = VIEW / Math.max(B, H);
  const w = B * scale;
  const h = H * scale;
  const x0 = PAD + (VIEW - w) / 2;
  const y0 = PAD + (VIEW - h) / 2;
  const fixed: Kind | null = inp.section === 'closed-rectangular' ? 'solid' : inp.section === 'open-rectangular' ? 'free' : null;
  const side = (s: Side): Kind => fixed ?? kindOf(inp.boundaries[s], 'solid');
  const f = Math.min(num(inp.fillet) ?? 0, Math.min(B, H) / 2) * scale;
  // corners clockwise from the top left; each side runs between its fillets
  const walls: SketchSegment[] = [
    { d: `M ${x0 + f} ${y0} L ${x0 + w - f} ${y0}`, kind: side('ceiling'), label: 'ceiling' },
    { d: `M ${x0 + w} ${y0 + f} L ${x0 + w} ${y0 + h - f}`, kind: side('right'), label: 'right' },
    { d: `M ${x0 + w - f} ${y0 + h} L ${x0 + f} ${y0 + h}`, kind: side('floor'), label: 'floor' },
    { d: `M ${x0} ${y0 + h - f} L ${x0} ${y0 + f}`, kind: side('left'), label: 'left' },
  ];
  if (f > 0) {
    const corner: Kind = 'solid';
    walls.push(
      { d: `M ${x0} ${y0 + f} L ${x0 + f} ${y0}`, kind: corner, label: 'fillet' },
      { d: `M ${x0 + w - f} ${y0} L ${x0 + w} ${y0 + f}`, kind: corner, label: 'fillet' },
      { d: `M ${x0 + w} ${y0 + h - f} L ${x0 + w - f} ${y0 + h}`, kind: corner, label: 'fillet' },
      { d: `M ${x0 + f} ${y0 + h} L ${x0} ${y0 + h - f}`, kind: corner, label: 'fillet' },
    );
  }
  const cx = x0 + w / 2;
  const cy = y0 + h / 2;
  let model: Sketch['model'] = null;
  const s = inp.kind === '2d' ? B : num(inp.span);
  if (s !== null) {
    const L = s * scale;
    if (inp.kind !== '2d' && inp.mounting === 'half') {
      const wall = inp.reflectionWall as Side;
      const label = `semi-span ${fmt(s)} from the ${wall}`;
      if (wall === 'floor') model = { x1: cx, y1: y0 + h, x2: cx, y2: y0 + h - Math.min(L, h), label };
      else if (wall === 'ceiling') model = { x1: cx, y1: y0, x2: cx, y2: y0 + Math.min(L, h), label };
      else if (wall === 'left') model = { x1: x0, y1: cy, x2: x0 + Math.min(L, w), y2: cy, label };
      else if (wall === 'right') model = { x1: x0 + w, y1: cy, x2: x0 + w - Math.min(L, w), y2: cy, label };
    } else {
      const half = Math.min(L, w) / 2;
      model = {
        x1: cx - half,
        y1: cy,
        x2: cx + half,
        y2: cy,
        label: inp.kind === '2d' ? 'wing spanning the width' : `span ${fmt(s)} = ${toDecimals(s / B, 2)} B`,
      };
    }
  }
  const free = walls.filter((x) => x.kind === 'free' && x.label !== 'fillet').map((x) => x.label);
  return {
    viewBox: `${-LEFT} 0 ${VIEW + 2 * PAD + LEFT} ${VIEW + 2 * PAD}`,
    walls,
    model,
    dims: [
      { x: cx, y: y0 + h + 22, text: `B = ${fmt(B)}`, anchor: 'middle' },
      { x: x0 - 6, y: cy - 8, text: `H =`, anchor: 'end' },
      { x: x0 - 6, y: cy + 8, text: fmt(H), anchor: 'end' },
    ],
    empty: null,
    summary: `Rectangular section ${fmt(B)} × ${fmt(H)}${f > 0 ? ` with ${fmt(f / scale)} corner fillets` : ''}; ${free.length ? `free boundary: ${free.join(', ')}` : 'all walls solid'}${model ? `; ${model.label}` : ''}.`,
  };
}
