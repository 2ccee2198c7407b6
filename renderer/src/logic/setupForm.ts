/**
 * The setup editor's form: which setup fields it shows, how typed text becomes the setup object, and
 * where core's validation message belongs. Validation itself is core's (validateSetup), run as the user
 * types; this module only decides what a text box means.
 */
import { attempt, formatNotice, type Notice } from '../../../core/index.ts';
import { validateSetup, type SetupResult } from '../../../core/index.ts';

export type FieldKind = 'number' | 'auto-number' | 'choice' | 'flag' | 'text';

export interface SetupField {
  path: string;
  label: string;
  unit: string;
  kind: FieldKind;
  choices?: readonly { value: string; label: string }[];
  help?: string;
  group: string;
}

/** Standard uncertainties of the instruments (setup `uncertainty` block, docs/data-format.md). */
export const UNCERTAINTY_GROUP = 'Instrument uncertainties (standard, k = 1; optional)';

// ---- tunnels and mountings ----
const SECTION_CHOICES = [
  { value: 'closed-rectangular', label: 'closed rectangular' },
  { value: 'open-rectangular', label: 'open rectangular jet' },
  { value: 'rectangular', label: 'rectangular, each side chosen' },
  { value: 'closed-circular', label: 'closed circular' },
  { value: 'open-circular', label: 'open circular jet' },
] as const;
const BOUNDARY_CHOICES = [
  { value: '', label: '—' },
  { value: 'solid', label: 'solid wall' },
  { value: 'free', label: 'free (jet boundary)' },
] as const;
// ---- end tunnels and mountings ----

export const SETUP_FIELDS: readonly SetupField[] = [
  { group: 'Model', path: 'model.kind', label: 'Model', unit: '', kind: 'choice', choices: [{ value: '3d', label: '3D model' }, { value: '2d', label: '2D wing spanning the section' }] },
  { group: 'Model', path: 'model.name', label: 'Name', unit: '', kind: 'text' },
  { group: 'Model', path: 'model.area_m2', label: 'Reference area S', unit: 'm²', kind: 'number', help: '3D only; a 2D model uses chord × tunnel width' },
  { group: 'Model', path: 'model.chord_m', label: 'Reference chord c', unit: 'm', kind: 'number' },
  { group: 'Model', path: 'model.span_m', label: 'Span b', unit: 'm', kind: 'number', help: '3D only' },
  { group: 'Model', path: 'model.volume_m3', label: 'Model volume', unit: 'm³', kind: 'number', help: 'for solid blockage; empty skips it' },
  { group: 'Model', path: 'model.moment_ref_offset_m.x', label: 'Moment reference ahead of balance centre, x', unit: 'm', kind: 'number' },
  { group: 'Model', path: 'model.moment_ref_offset_m.z', label: 'Moment reference above balance centre, z', unit: 'm', kind: 'number' },
  // ---- tunnels and mountings ----
  { group: 'Model', path: 'model.mounting', label: 'Mounting', unit: '', kind: 'choice', choices: [{ value: '', label: 'full model' }, { value: 'half', label: 'half model on a reflection wall' }] },
  { group: 'Model', path: 'model.reflection_wall', label: 'Reflection wall (half model)', unit: '', kind: 'choice', choices: [{ value: '', label: '—' }, { value: 'floor', label: 'floor' }, { value: 'ceiling', label: 'ceiling' }, { value: 'left', label: 'left wall' }, { value: 'right', label: 'right wall' }], help: 'a half model: span is the semi-span, area the half-model area' },
  { group: 'Model', path: 'model.moment_ref_xc', label: 'Moment reference aft of the leading edge', unit: 'c', kind: 'number', help: 'empty: 0.25 (quarter chord)' },
  { group: 'Model', path: 'model.fineness_ratio', label: 'Body fineness ratio (length / diameter)', unit: '–', kind: 'number', help: 'sets K = 1 + k1; empty: 6' },
  { group: 'Model', path: 'model.tail_arm_m', label: 'Tail arm (wing c/4 to tail c/4)', unit: 'm', kind: 'number', help: 'tail-on models only' },
  { group: 'Model', path: 'model.tail_cm_per_deg', label: 'Pitching moment per degree of tail angle', unit: '1/deg', kind: 'number', help: 'from runs at two tail incidences' },
  { group: 'Tunnel', path: 'tunnel.section', label: 'Section', unit: '', kind: 'choice', choices: SECTION_CHOICES },
  { group: 'Tunnel', path: 'tunnel.width_m', label: 'Test-section width B', unit: 'm', kind: 'number', help: 'rectangular sections' },
  { group: 'Tunnel', path: 'tunnel.height_m', label: 'Test-section height H', unit: 'm', kind: 'number', help: 'rectangular sections' },
  { group: 'Tunnel', path: 'tunnel.diameter_m', label: 'Diameter D', unit: 'm', kind: 'number', help: 'circular sections' },
  { group: 'Tunnel', path: 'tunnel.fillet_m', label: 'Corner fillet leg f', unit: 'm', kind: 'number', help: '45° fillets; C = B·H − 2f²' },
  ...(['floor', 'ceiling', 'left', 'right'] as const).map((side) => ({ group: 'Tunnel', path: `tunnel.boundaries.${side}`, label: `Boundary: ${side}`, unit: '', kind: 'choice' as const, choices: BOUNDARY_CHOICES, help: 'section "each side chosen" only' })),
  // ---- end tunnels and mountings ----
  { group: 'Balance', path: 'balance.axes', label: 'Balance axes', unit: '', kind: 'choice', choices: [{ value: 'wind', label: 'wind axes (lift, drag)' }, { value: 'body', label: 'body axes (normal, axial)' }] },
  { group: 'Ambient (when the run has no column)', path: 'ambient.p_pa', label: 'Static pressure p', unit: 'Pa', kind: 'number' },
  { group: 'Ambient (when the run has no column)', path: 'ambient.t_c', label: 'Stagnation temperature T₀', unit: '°C', kind: 'number' },
  { group: 'Ambient (when the run has no column)', path: 'ambient.rh_pct', label: 'Relative humidity', unit: '%', kind: 'number' },
  { group: 'Wall corrections', path: 'corrections.enabled', label: 'Apply wall corrections', unit: '', kind: 'flag' },
  { group: 'Wall corrections', path: 'corrections.wake', label: 'Wake blockage', unit: '', kind: 'choice', choices: [{ value: 'classic', label: 'classic' }, { value: 'maskell', label: 'Maskell' }] },
  { group: 'Wall corrections', path: 'corrections.solid_blockage_k', label: 'Solid-blockage shape factor K', unit: '–', kind: 'auto-number', help: 'empty: 1 + k1 of the body (3D) or 0.74 (2D)' },
  { group: 'Wall corrections', path: 'corrections.delta', label: 'Lift-interference factor δ', unit: '–', kind: 'auto-number', help: 'empty: computed for this tunnel and model' },
  { group: 'Wall corrections', path: 'corrections.tau1', label: 'Solid-blockage tunnel factor τ1', unit: '–', kind: 'auto-number', help: 'empty: computed' },
  { group: 'Wall corrections', path: 'corrections.tau2', label: 'Streamline-curvature factor τ2', unit: '–', kind: 'auto-number', help: 'empty: computed' },
  { group: UNCERTAINTY_GROUP, path: 'uncertainty.dp_pitot_pa', label: 'Pitot differential pressure', unit: 'Pa', kind: 'number', help: 'all empty: no uncertainties, fits unweighted' },
  { group: UNCERTAINTY_GROUP, path: 'uncertainty.p_static_pa', label: 'Static pressure', unit: 'Pa', kind: 'number' },
  { group: UNCERTAINTY_GROUP, path: 'uncertainty.t_total_c', label: 'Stagnation temperature', unit: 'K', kind: 'number' },
  { group: UNCERTAINTY_GROUP, path: 'uncertainty.rh_pct', label: 'Relative humidity', unit: '% RH', kind: 'number' },
  { group: UNCERTAINTY_GROUP, path: 'uncertainty.force_n', label: 'Each balance force', unit: 'N', kind: 'number' },
  { group: UNCERTAINTY_GROUP, path: 'uncertainty.moment_nm', label: 'Pitching moment', unit: 'N m', kind: 'number' },
  { group: UNCERTAINTY_GROUP, path: 'uncertainty.alpha_deg', label: 'Angle of attack', unit: 'deg', kind: 'number' },
  { group: UNCERTAINTY_GROUP, path: 'uncertainty.area_rel', label: 'Reference area, relative', unit: '–', kind: 'number', help: 'a fraction: 0.002 for 0.2 %' },
  { group: UNCERTAINTY_GROUP, path: 'uncertainty.chord_rel', label: 'Reference chord, relative', unit: '–', kind: 'number', help: 'a fraction: 0.002 for 0.2 %' },
];

export type Draft = Record<string, string | boolean>;

function getPath(obj: unknown, path: string): unknown {
  let cur: unknown = obj;
  for (const part of path.split('.')) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Record<string, unknown>)[part];
  }
  return cur;
}

function setPath(obj: Record<string, unknown>, path: string, value: unknown): void {
  const parts = path.split('.');
  let cur = obj;
  for (const part of parts.slice(0, -1)) {
    if (cur[part] === null || typeof cur[part] !== 'object') cur[part] = {};
    cur = cur[part] as Record<string, unknown>;
  }
  const last = parts[parts.length - 1]!;
  if (value === undefined) delete cur[last];
  else cur[last] = value;
}

/** Form text from a setup object. */
export function draftFrom(setup: unknown): Draft {
  const d: Draft = {};
  for (const f of SETUP_FIELDS) {
    const v = getPath(setup, f.path);
    if (f.kind === 'flag') d[f.path] = v === undefined ? true : v === true;
    else d[f.path] = v === undefined || v === null ? '' : String(v);
  }
  return d;
}

/**
 * The setup object from the form, on top of the original (fields the form does not show are kept).
 * Text that is not a number is passed on as text, so core's validation names the field.
 */
export function setupFrom(original: unknown, draft: Draft): Record<string, unknown> {
  const out = JSON.parse(JSON.stringify(original ?? {})) as Record<string, unknown>;
  for (const f of SETUP_FIELDS) {
    const raw = draft[f.path];
    if (f.kind === 'flag') {
      setPath(out, f.path, raw === true);
      continue;
    }
    const text = typeof raw === 'string' ? raw.trim() : '';
    if (text === '') {
      setPath(out, f.path, f.kind === 'auto-number' ? null : undefined);
      continue;
    }
    if (f.kind === 'number' || f.kind === 'auto-number') {
      const n = Number(text);
      setPath(out, f.path, Number.isFinite(n) && /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(text) ? n : text);
    } else {
      setPath(out, f.path, text);
    }
  }
  // an offset with neither coordinate given is left out rather than sent half-empty
  const model = out['model'] as Record<string, unknown> | undefined;
  const off = model?.['moment_ref_offset_m'] as Record<string, unknown> | undefined;
  if (off && off['x'] === undefined && off['z'] === undefined) delete model!['moment_ref_offset_m'];
  // only what the chosen section and mounting take is sent; the other boxes keep their text for switching back
  const tunnel = out['tunnel'] as Record<string, unknown> | undefined;
  if (tunnel) {
    const section = String(tunnel['section'] ?? 'closed-rectangular');
    const circular = section.endsWith('circular');
    for (const key of circular ? ['width_m', 'height_m', 'fillet_m', 'boundaries'] : ['diameter_m']) delete tunnel[key];
    if (section !== 'rectangular') delete tunnel['boundaries'];
  }
  if (model && model['mounting'] !== 'half') delete model['reflection_wall'];
  // likewise an uncertainty block with nothing in it: no block means no uncertainties, unweighted fits
  const u = out['uncertainty'];
  if (u !== null && typeof u === 'object' && Object.keys(u).length === 0) delete out['uncertainty'];
  return out;
}

export interface SetupCheck {
  ok: boolean;
  result: SetupResult | null;
  /** The message for a field, keyed by its path; '' holds problems the form has no field for. */
  byField: Record<string, string>;
  warnings: string[];
}

/** Validate with core; place the message beside the field it names. */
export function checkSetup(name: string, setup: unknown): SetupCheck {
  const r = attempt(() => validateSetup(`setup "${name}"`, setup));
  if (r.ok) {
    return { ok: true, result: r.value, byField: {}, warnings: r.value.warnings.map(formatNotice) };
  }
  const byField: Record<string, string> = {};
  for (const e of r.errors) byField[fieldOf(e)] = e.message;
  return { ok: false, result: null, byField, warnings: [] };
}

/** The form field a notice belongs to: its own path, or the closest parent shown in the form, else ''. */
export function fieldOf(notice: Notice): string {
  const field = notice.field ?? '';
  if (SETUP_FIELDS.some((f) => f.path === field)) return field;
  // unknown keys are reported at the object holding them: "unknown key \"model.chrd_m\""
  const m = /unknown key "([^"]+)"/.exec(notice.message);
  const key = m ? m[1]! : field;
  return SETUP_FIELDS.some((f) => f.path === key) ? key : '';
}
