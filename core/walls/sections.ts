/**
 * Test sections and mountings as the wall corrections see them. A setup's tunnel (rectangular with
 * solid or free sides, or circular) and mounting (full model, or half model on a reflection plane)
 * become one image problem: a section with the model's span along B and its lift along H, the model
 * at the centre. A half model is replaced by the full model mirrored across its reflection wall, in
 * the section mirrored across that wall (twice the span, area and volume in twice the section area;
 * Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing, 3rd ed. (1999), half-model testing in the 3D
 * boundary-correction chapter), so S/C and V/C are unchanged and only the images differ.
 */

export type Boundary = 'solid' | 'free';
export type Wall = 'floor' | 'ceiling' | 'left' | 'right';
export interface Boundaries {
  floor: Boundary;
  ceiling: Boundary;
  left: Boundary;
  right: Boundary;
}

export type TunnelSection =
  { shape: 'rectangular'; width: number; height: number; boundaries: Boundaries; fillet: number } | { shape: 'circular'; diameter: number; boundary: Boundary };

export type Mounting = { kind: 'full' } | { kind: 'half'; wall: Wall };

/** A rectangle in the model's frame: span along B between the walls at y = ∓B/2, lift along H between z = ∓H/2. */
export interface RectImageSection {
  shape: 'rectangular';
  B: number;
  H: number;
  spanLo: Boundary;
  spanHi: Boundary;
  liftLo: Boundary;
  liftHi: Boundary;
}
export interface CircImageSection {
  shape: 'circular';
  R: number;
  boundary: Boundary;
}
export type ImageSection = RectImageSection | CircImageSection;

export interface ImageProblem {
  section: ImageSection;
  /** Span of the (mirrored, for a half model) lifting system, m. */
  span: number;
  /** 2 for a half model (mirrored full model), else 1. */
  mirror: 1 | 2;
}

export const ALL_SOLID: Boundaries = { floor: 'solid', ceiling: 'solid', left: 'solid', right: 'solid' };

/** Cross-section area C: B·H − 2f² for a rectangle with four 45° corner fillets of leg f, πD²/4 for a circle. */
export function sectionArea(t: TunnelSection): number {
  return t.shape === 'circular' ? (Math.PI * t.diameter * t.diameter) / 4 : t.width * t.height - 2 * t.fillet * t.fillet;
}

/** True when every boundary is a solid wall (the classic closed section). */
export function isClosed(t: TunnelSection): boolean {
  return t.shape === 'circular' ? t.boundary === 'solid' : Object.values(t.boundaries).every((b) => b === 'solid');
}

/** True when at least one boundary is free (the jet can expand, so there is no far-field continuity speed-up). */
export function hasFreeBoundary(t: TunnelSection): boolean {
  return !isClosed(t);
}

const OPPOSITE: Record<Wall, Wall> = { floor: 'ceiling', ceiling: 'floor', left: 'right', right: 'left' };

/**
 * The image problem of a model in a tunnel. Full model: span along the width. Half model on the
 * floor or ceiling: span vertical, mirrored section 2H (span) × B (lift) bounded along the span by
 * the opposite wall and its mirror; on a side wall: 2B (span) × H. Assumes the mounting was checked
 * by {@link checkMounting}.
 */
export function imageProblem(t: TunnelSection, m: Mounting, span: number): ImageProblem {
  if (t.shape === 'circular') return { section: { shape: 'circular', R: t.diameter / 2, boundary: t.boundary }, span, mirror: 1 };
  const b = t.boundaries;
  if (m.kind === 'full') {
    return { section: { shape: 'rectangular', B: t.width, H: t.height, spanLo: b.left, spanHi: b.right, liftLo: b.floor, liftHi: b.ceiling }, span, mirror: 1 };
  }
  const far = b[OPPOSITE[m.wall]];
  const section: RectImageSection =
    m.wall === 'floor' || m.wall === 'ceiling'
      ? { shape: 'rectangular', B: 2 * t.height, H: t.width, spanLo: far, spanHi: far, liftLo: b.left, liftHi: b.right }
      : { shape: 'rectangular', B: 2 * t.width, H: t.height, spanLo: far, spanHi: far, liftLo: b.floor, liftHi: b.ceiling };
  return { section, span: 2 * span, mirror: 2 };
}

/** A refusal or a caution about the tunnel or the mounting, naming the setup field. */
export interface SectionNotice {
  field: string;
  message: string;
}

/** Span ratio above which the lift-interference correction is outside its validated range (BRP 3rd ed. §10, AGARDograph 336 §1). */
export const MAX_SPAN_RATIO = 0.8;
/** Fillet area above this fraction of B·H: images of the plain rectangle no longer describe the section well (common practice, no published limit). */
export const MAX_FILLET_AREA_FRACTION = 0.1;

/**
 * Geometry checks of a model in a section: errors refuse the setup, cautions are reported with the
 * results. `kind` is the model kind; `span` the 3D span (semi-span for a half model).
 */
export function checkMounting(
  t: TunnelSection,
  m: Mounting,
  kind: '2d' | '3d',
  span: number | undefined,
): { errors: SectionNotice[]; cautions: SectionNotice[] } {
  const errors: SectionNotice[] = [];
  const cautions: SectionNotice[] = [];
  if (t.shape === 'rectangular') {
    const f = t.fillet;
    if (f > 0 && 2 * f >= Math.min(t.width, t.height)) {
      errors.push({
        field: 'tunnel.fillet_m',
        message: `${f} m corner fillets leave no flat wall between them in a ${t.width} m × ${t.height} m section (each leg must be under half the shorter side, ${Math.min(t.width, t.height) / 2} m)`,
      });
    } else if ((2 * f * f) / (t.width * t.height) > MAX_FILLET_AREA_FRACTION) {
      cautions.push({
        field: 'tunnel.fillet_m',
        message: `the fillets take ${((200 * f * f) / (t.width * t.height)).toFixed(1)} % of the section area; the factors come from the images of the plain rectangle, which is only approximate for fillets this large`,
      });
    }
  }
  if (kind === '2d') {
    if (t.shape === 'circular')
      errors.push({ field: 'tunnel.section', message: 'a 2d model (a wing spanning the tunnel between its side walls) needs a rectangular section' });
    else if (t.boundaries.left === 'free' || t.boundaries.right === 'free') {
      errors.push({
        field: `tunnel.boundaries.${t.boundaries.left === 'free' ? 'left' : 'right'}`,
        message: 'a 2d model spans the width between solid side walls; a free side boundary cannot hold it',
      });
    }
    if (m.kind === 'half') errors.push({ field: 'model.mounting', message: 'a 2d model spans the whole width; "half" applies to 3d models only' });
    return { errors, cautions };
  }
  if (m.kind === 'half') {
    if (t.shape === 'circular') {
      errors.push({
        field: 'model.mounting',
        message: 'a half model needs a flat reflection wall: use a rectangular section (a circular section has no flat wall)',
      });
      return { errors, cautions };
    }
    if (t.boundaries[m.wall] === 'free') {
      errors.push({
        field: 'model.reflection_wall',
        message: `the ${m.wall} is a free boundary in this section; a half model must stand on a solid reflection wall`,
      });
      return { errors, cautions };
    }
  }
  if (span === undefined) return { errors, cautions };
  const room = t.shape === 'circular' ? t.diameter : m.kind === 'full' ? t.width : m.wall === 'floor' || m.wall === 'ceiling' ? t.height : t.width;
  const what = t.shape === 'circular' ? 'the diameter' : m.kind === 'full' ? 'the tunnel width' : `the distance from the ${m.wall} to the opposite wall`;
  const ratio = span / room;
  if (ratio >= 1) {
    errors.push({
      field: 'model.span_m',
      message: `${m.kind === 'half' ? 'the semi-span' : 'the span'} ${span} m does not fit: it must be less than ${what}, ${room} m`,
    });
  } else if (ratio > MAX_SPAN_RATIO) {
    cautions.push({
      field: 'model.span_m',
      message: `the ${m.kind === 'half' ? 'semi-span' : 'span'} is ${ratio.toFixed(2)} of ${what}, above the ${MAX_SPAN_RATIO} for which the lift-interference correction is validated; results are given but treat them with caution`,
    });
  }
  return { errors, cautions };
}

/** The section of a setup's (validated) tunnel block. */
export function tunnelSectionOf(t: {
  section: string;
  width_m: number;
  height_m: number;
  diameter_m?: number;
  boundaries?: Boundaries;
  fillet_m?: number;
}): TunnelSection {
  if (t.section === 'closed-circular' || t.section === 'open-circular') {
    return { shape: 'circular', diameter: t.diameter_m ?? t.width_m, boundary: t.section === 'closed-circular' ? 'solid' : 'free' };
  }
  const all: Boundary = t.section === 'open-rectangular' ? 'free' : 'solid';
  return {
    shape: 'rectangular',
    width: t.width_m,
    height: t.height_m,
    boundaries: t.boundaries ?? { floor: all, ceiling: all, left: all, right: all },
    fillet: t.fillet_m ?? 0,
  };
}

/** The mounting of a setup's (validated) model block. */
export function mountingOf(m: { mounting?: 'full' | 'half'; reflection_wall?: Wall }): Mounting {
  return m.mounting === 'half' && m.reflection_wall ? { kind: 'half', wall: m.reflection_wall } : { kind: 'full' };
}
