/**
 * The setup editor's form: which setup fields it shows, how typed text becomes the setup object, and
 * where core's validation message belongs. Validation itself is core's (validateSetup), run as the user
 * types; this module only decides what a text box means.
 */
import { attempt, formatNotice, type Notice } from '../../../core/index.ts';
import { setupFields, validateSetup, type SetupFormKind, type SetupResult } from '../../../core/index.ts';

export type FieldKind = SetupFormKind;

export interface SetupField {
  path: string;
  label: string;
  unit: string;
  kind: FieldKind;
  choices?: readonly { value: string; label: string }[];
  help?: string;
  group: string;
}

/**
 * The fields the form shows, in the schema's order, derived from the setup schema's metadata
 * (core/setup/schema.ts): a field added there with a label appears here without an edit.
 */
export const SETUP_FIELDS: readonly SetupField[] = setupFields().flatMap((f): SetupField[] =>
  f.form === null
    ? []
    : [
        {
          group: f.group,
          path: f.path,
          label: f.label,
          unit: f.unit,
          kind: f.form,
          ...(f.form === 'choice' && f.choices ? { choices: f.choices } : {}),
          ...(f.help ? { help: f.help } : {}),
        },
      ],
);

/** Standard uncertainties of the instruments (setup `uncertainty` block, docs/setup.md). */
export const UNCERTAINTY_GROUP: string = SETUP_FIELDS.find((f) => f.path.startsWith('uncertainty.'))!.group;

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
  // a block the form opened only because it has fields (grouping, fit) and left empty is not written
  const had = (original ?? {}) as Record<string, unknown>;
  for (const [key, value] of Object.entries(out)) {
    if (!(key in had) && value !== null && typeof value === 'object' && !Array.isArray(value) && Object.keys(value).length === 0) delete out[key];
  }
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
