/**
 * The setup file (data contract v1, DESIGN §3.2): model geometry, tunnel section, balance axes, gas,
 * ambient defaults, wall-correction choices. Validated with zod; every problem names its field.
 */
import { z } from 'zod';
import { InputError, type Notice } from '../contract/messages.ts';

const positive = (what: string) => z.number({ error: `expected a number (${what})` }).finite().positive({ error: `expected a positive number (${what})` });
const finite = (what: string) => z.number({ error: `expected a number (${what})` }).finite();
/**
 * Geometry within a sanity range (common sense, no published source): no wind-tunnel model or test section
 * is smaller than 0.1 mm or larger than 1 km, so lengths lie in [1e-4, 1e3] m, areas in [1e-8, 1e6] m² and
 * volumes in [1e-12, 1e9] m³. A mistyped exponent (1e-300, 1e300) then gets a message naming the field
 * instead of overflowing coefficients and uncertainties downstream (fuzz finding).
 */
const geometry = (what: string, unit: 'm' | 'm²' | 'm³') => {
  const [lo, hi] = unit === 'm' ? [1e-4, 1e3] : unit === 'm²' ? [1e-8, 1e6] : [1e-12, 1e9];
  const error = `expected ${lo} to ${hi} ${unit} (${what})`;
  return positive(`${what}, ${unit}`).min(lo, { error }).max(hi, { error });
};
/**
 * Sane ranges for the numbers a person types into a setup (common sense, no published bound): wide
 * enough for every closed test section and model, narrow enough that a slipped decimal point (δ = 11.5
 * for 0.115) gets a message naming the field instead of a reduction with α of 130°. Typical values, from
 * memory of Barlow, Rae & Pope, Low-Speed Wind Tunnel Testing (3rd ed.) ch. 9–10: δ 0.1–0.14 for closed
 * rectangular sections (negative only for open jets), τ1 0.8–0.95, τ2 0–0.3, K 0.74 (2D) to about 1.
 */
export const SETUP_RANGES = {
  delta: [-0.5, 0.5],
  tau1: [0, 2],
  tau2: [0, 1],
  solid_blockage_k: [0.1, 2],
  /** Moment-reference offset, in reference chords either way. */
  moment_ref_offset_chords: 10,
  p_pa: [1e3, 5e6],
} as const;
const ranged = (what: string, [lo, hi]: readonly [number, number]) => {
  const error = `expected ${lo} to ${hi} (${what})`;
  return z.number({ error: `expected a number or null (${what})` }).finite().min(lo, { error }).max(hi, { error }).nullable().optional();
};
/** A standard uncertainty: zero or more, and at most `hi` (far beyond any instrument worth the name). */
const uncertain = (what: string, hi: number) => finite(what).nonnegative().max(hi, { error: `expected 0 to ${hi} (${what})` }).optional();

const modelSchema = z.strictObject({
  kind: z.enum(['2d', '3d'], { error: 'expected "2d" (a wing spanning the tunnel) or "3d"' }),
  name: z.string().optional(),
  area_m2: geometry('reference area', 'm²').optional(),
  chord_m: geometry('reference chord', 'm'),
  span_m: geometry('span', 'm').optional(),
  volume_m3: geometry('model volume', 'm³').nullable().optional(),
  moment_ref_offset_m: z
    .strictObject({ x: finite('metres toward the nose'), z: finite('metres up') })
    .optional(),
  loading: z.enum(['elliptic', 'uniform'], { error: 'expected "elliptic" or "uniform"' }).optional(),
}).superRefine((m, ctx) => {
  // the moment reference lies on or near the model: within SETUP_RANGES.moment_ref_offset_chords chords of the balance centre
  const limit = SETUP_RANGES.moment_ref_offset_chords * m.chord_m;
  for (const axis of ['x', 'z'] as const) {
    const v = m.moment_ref_offset_m?.[axis];
    if (v !== undefined && Math.abs(v) > limit) {
      ctx.addIssue({ code: 'custom', path: ['moment_ref_offset_m', axis], message: `expected within ±${limit.toPrecision(3)} m (${SETUP_RANGES.moment_ref_offset_chords} reference chords of ${m.chord_m} m)` });
    }
  }
});

const tunnelSchema = z.strictObject({
  name: z.string().optional(),
  section: z.literal('closed-rectangular', { error: 'expected "closed-rectangular" (the only section supported so far)' }),
  width_m: geometry('test-section width', 'm'),
  height_m: geometry('test-section height', 'm'),
});

const uncertaintySchema = z.strictObject({
  dp_pitot_pa: uncertain('Pa', 1e4),
  p_static_pa: uncertain('Pa', 1e5),
  t_total_c: uncertain('K or °C difference', 50),
  rh_pct: uncertain('% RH', 100),
  force_n: uncertain('N', 1e5),
  moment_nm: uncertain('N m', 1e5),
  alpha_deg: uncertain('deg', 10),
  area_rel: uncertain('relative, e.g. 0.002', 0.5),
  chord_rel: uncertain('relative, e.g. 0.002', 0.5),
});

export const setupSchema = z.strictObject({
  $schema: z.string().optional(),
  note: z.string().optional(),
  model: modelSchema,
  tunnel: tunnelSchema,
  balance: z.strictObject({ axes: z.enum(['wind', 'body'], { error: 'expected "wind" (lift/drag columns) or "body" (normal/axial columns)' }) }),
  flow: z.strictObject({ gamma: finite('ratio of specific heats').min(1.0001).max(2) }).optional(),
  ambient: z
    .strictObject({
      p_pa: positive('static pressure, Pa').min(SETUP_RANGES.p_pa[0], { error: `expected ${SETUP_RANGES.p_pa[0]} to ${SETUP_RANGES.p_pa[1]} Pa (static pressure)` }).max(SETUP_RANGES.p_pa[1], { error: `expected ${SETUP_RANGES.p_pa[0]} to ${SETUP_RANGES.p_pa[1]} Pa (static pressure)` }).optional(),
      t_c: finite('°C').min(-100).max(200).optional(),
      rh_pct: finite('%').min(0).max(100).optional(),
    })
    .optional(),
  corrections: z
    .strictObject({
      enabled: z.boolean({ error: 'expected true or false' }).optional(),
      wake: z.enum(['classic', 'maskell'], { error: 'expected "classic" or "maskell"' }).optional(),
      solid_blockage_k: ranged('solid-blockage shape factor K', SETUP_RANGES.solid_blockage_k),
      delta: ranged('lift-interference factor δ', SETUP_RANGES.delta),
      tau1: ranged('solid-blockage tunnel factor τ1', SETUP_RANGES.tau1),
      tau2: ranged('streamline-curvature factor τ2', SETUP_RANGES.tau2),
    })
    .optional(),
  uncertainty: uncertaintySchema.optional(),
});

export type SetupInput = z.infer<typeof setupSchema>;

/** The setup with defaults filled in; what the engine works from. */
export interface Setup {
  note?: string;
  model: {
    kind: '2d' | '3d';
    name?: string;
    /** Reference area used for coefficients, m² (chord × tunnel width for 2D). */
    area_m2: number;
    chord_m: number;
    /** Model span (3D) or tunnel width (2D), m. */
    span_m: number;
    volume_m3: number | null;
    moment_ref_offset_m: { x: number; z: number };
    loading: 'elliptic' | 'uniform';
  };
  tunnel: { name?: string; section: 'closed-rectangular'; width_m: number; height_m: number };
  balance: { axes: 'wind' | 'body' };
  flow: { gamma: number };
  ambient: { p_pa?: number; t_c?: number; rh_pct?: number };
  corrections: {
    enabled: boolean;
    wake: 'classic' | 'maskell';
    solid_blockage_k: number;
    delta: number | null;
    tau1: number | null;
    tau2: number | null;
  };
  uncertainty: SetupInput['uncertainty'] | null;
}

/** Default solid-blockage shape factors: Barlow, Rae & Pope 3rd ed. §9.2 (K1 = 0.74, wing spanning the tunnel) and §10.1 (typical wing/body, 0.96 as in DESIGN §3.2). */
export const DEFAULT_SOLID_BLOCKAGE_K = { '2d': 0.74, '3d': 0.96 } as const;

export interface SetupResult {
  setup: Setup;
  warnings: Notice[];
}

/** Parse and validate setup JSON text. Throws InputError naming the file and the field. */
export function parseSetup(file: string, text: string): SetupResult {
  let json: unknown;
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  try {
    json = JSON.parse(body);
  } catch (err) {
    // Located by our own scan of the text after the BOM: V8 names no position for some errors
    // ("Unexpected end of JSON input", "Unexpected token 'x', ... is not valid JSON"), found by the fuzz tests.
    const { line, column } = jsonErrorPlace(body, err);
    throw new InputError({ file, line, column, message: `not valid JSON (${(err as Error).message})` });
  }
  return validateSetup(file, json);
}

/** Validate an already-parsed setup object. Throws InputError naming the field. */
export function validateSetup(file: string, json: unknown): SetupResult {
  const parsed = setupSchema.safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw new InputError({ file, field: fieldPath(issue.path) || '(top level)', message: describeIssue(issue, json) });
  }
  const s = parsed.data;
  const warnings: Notice[] = [];
  const m = s.model;
  let area: number;
  let span: number;
  if (m.kind === '2d') {
    area = m.chord_m * s.tunnel.width_m;
    span = s.tunnel.width_m;
    if (m.area_m2 !== undefined && Math.abs(m.area_m2 - area) > 1e-6 * area) {
      warnings.push({
        file,
        field: 'model.area_m2',
        message: `${m.area_m2} m² differs from chord × tunnel width = ${round(area)} m²; a 2D model's reference area is chord × width, so the given area is not used`,
      });
    }
  } else {
    if (m.area_m2 === undefined) throw new InputError({ file, field: 'model.area_m2', message: 'required for a 3d model (reference area, m²)' });
    if (m.span_m === undefined) throw new InputError({ file, field: 'model.span_m', message: 'required for a 3d model (span, m)' });
    area = m.area_m2;
    span = m.span_m;
  }
  const c = s.corrections ?? {};
  return {
    warnings,
    setup: {
      note: s.note,
      model: {
        kind: m.kind,
        name: m.name,
        area_m2: area,
        chord_m: m.chord_m,
        span_m: span,
        volume_m3: m.volume_m3 ?? null,
        moment_ref_offset_m: m.moment_ref_offset_m ?? { x: 0, z: 0 },
        loading: m.loading ?? 'elliptic',
      },
      tunnel: s.tunnel,
      balance: s.balance,
      flow: { gamma: s.flow?.gamma ?? 1.4 },
      ambient: s.ambient ?? {},
      corrections: {
        enabled: c.enabled ?? true,
        wake: c.wake ?? 'classic',
        solid_blockage_k: c.solid_blockage_k ?? DEFAULT_SOLID_BLOCKAGE_K[m.kind],
        delta: c.delta ?? null,
        tau1: c.tau1 ?? null,
        tau2: c.tau2 ?? null,
      },
      uncertainty: s.uncertainty ?? null,
    },
  };
}

function round(x: number): string {
  return Number(x.toPrecision(6)).toString();
}

function fieldPath(path: ReadonlyArray<PropertyKey>): string {
  return path.map((p) => (typeof p === 'number' ? `[${p}]` : String(p))).join('.').replace(/\.\[/g, '[');
}

/** Known keys at a setup path, for "did you mean" suggestions. */
function knownKeys(path: ReadonlyArray<PropertyKey>): string[] {
  let schema: z.ZodType = setupSchema;
  for (const p of path) {
    const inner = unwrap(schema);
    if (!(inner instanceof z.ZodObject)) return [];
    const next = (inner.shape as Record<string, z.ZodType>)[String(p)];
    if (!next) return [];
    schema = next;
  }
  const inner = unwrap(schema);
  return inner instanceof z.ZodObject ? Object.keys(inner.shape) : [];
}

function unwrap(schema: z.ZodType): z.ZodType {
  let s: z.ZodType = schema;
  while (s instanceof z.ZodOptional || s instanceof z.ZodNullable) s = s.unwrap() as z.ZodType;
  return s;
}

function describeIssue(issue: z.core.$ZodIssue, json: unknown): string {
  if (issue.code === 'unrecognized_keys') {
    const key = issue.keys[0]!;
    const near = nearest(key, knownKeys(issue.path));
    const where = fieldPath([...issue.path, key]);
    return `unknown key "${where}"${near ? `; did you mean "${near}"?` : ''}`;
  }
  // zod 4 leaves `issue.input` out of its issues, so every wrong-typed value was called "missing"
  // (fuzz finding: "chord_m": "0.2" read as missing); look the value up in the parsed JSON instead
  if (issue.code === 'invalid_type') {
    const found = valueAt(json, issue.path);
    return found.present ? `${issue.message}, not ${describeValue(found.value)}` : `missing; ${issue.message}`;
  }
  return issue.message;
}

/** The value at a path of the parsed JSON, if there is one (own properties only). */
function valueAt(json: unknown, path: ReadonlyArray<PropertyKey>): { present: boolean; value?: unknown } {
  let v = json;
  for (const p of path) {
    if (v === null || typeof v !== 'object' || !Object.prototype.hasOwnProperty.call(v, p)) return { present: false };
    v = (v as Record<PropertyKey, unknown>)[p];
  }
  return { present: v !== undefined, value: v };
}

/** A short description of a JSON value for a message: `the text "0.2"`, `null`, `a list`. */
function describeValue(v: unknown): string {
  if (typeof v === 'string') return `the text ${JSON.stringify(v.length > 24 ? `${v.slice(0, 24)}…` : v)}`;
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'object') return 'an object';
  return String(v);
}

/** The known key closest to `key` by edit distance, if it is close enough to be a likely typo. */
export function nearest(key: string, known: string[]): string | undefined {
  let best: string | undefined;
  let bestD = Infinity;
  for (const k of known) {
    const d = editDistance(key.toLowerCase(), k.toLowerCase());
    if (d < bestD) {
      bestD = d;
      best = k;
    }
  }
  return best !== undefined && bestD <= Math.max(2, Math.floor(key.length / 2)) ? best : undefined;
}

function editDistance(a: string, b: string): number {
  const prev = new Array<number>(b.length + 1);
  for (let j = 0; j <= b.length; j++) prev[j] = j;
  for (let i = 1; i <= a.length; i++) {
    let diag = prev[0]!;
    prev[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const tmp = prev[j]!;
      prev[j] = Math.min(prev[j]! + 1, prev[j - 1]! + 1, diag + (a[i - 1] === b[j - 1] ? 0 : 1));
      diag = tmp;
    }
  }
  return prev[b.length]!;
}

/** Line and column (1-based) of a JSON syntax error: where {@link jsonErrorOffset} stops, else V8's "at position N". */
function jsonErrorPlace(text: string, err: unknown): { line: number; column: number } {
  let pos = jsonErrorOffset(text);
  if (pos === undefined) {
    const m = /position (\d+)/.exec(String((err as Error)?.message));
    pos = m ? Math.min(Number(m[1]), text.length) : 0;
  }
  const before = text.slice(0, pos);
  const line = before.split('\n').length;
  const column = pos - before.lastIndexOf('\n');
  return { line, column };
}

/**
 * Offset of the first character at which `text` stops being JSON (RFC 8259 grammar), or undefined when
 * it is valid. A loop with an explicit stack, so deeply nested junk cannot overflow the call stack.
 */
export function jsonErrorOffset(text: string): number | undefined {
  const n = text.length;
  let i = 0;
  const stack: number[] = []; // 123 "{" or 91 "["
  const ws = () => {
    while (i < n) {
      const c = text.charCodeAt(i);
      if (c !== 32 && c !== 9 && c !== 10 && c !== 13) break;
      i++;
    }
  };
  const digits = () => {
    const from = i;
    while (i < n && text.charCodeAt(i) >= 48 && text.charCodeAt(i) <= 57) i++;
    return i > from;
  };
  /** Scan a string starting at its opening quote; false leaves i at the offending character. */
  const string = (): boolean => {
    i++;
    while (i < n) {
      const c = text.charCodeAt(i);
      if (c === 34) {
        i++;
        return true;
      }
      if (c < 32) return false;
      if (c === 92) {
        const e = text[i + 1];
        if (e === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 2, i + 6))) return (i += 2), false;
          i += 6;
        } else if (e !== undefined && '"\\/bfnrt'.includes(e)) i += 2;
        else return (i += 1), false;
      } else i++;
    }
    return false;
  };
  const number = (): boolean => {
    if (text[i] === '-') i++;
    if (text[i] === '0') i++;
    else if (!digits()) return false;
    if (text[i] === '.') {
      i++;
      if (!digits()) return false;
    }
    if (text[i] === 'e' || text[i] === 'E') {
      i++;
      if (text[i] === '+' || text[i] === '-') i++;
      if (!digits()) return false;
    }
    return true;
  };
  let state: 'value' | 'key' | 'after' = 'value';
  for (;;) {
    ws();
    if (state === 'value') {
      const c = text[i];
      if (c === '{' || c === '[') {
        stack.push(c.charCodeAt(0));
        i++;
        ws();
        if (text[i] === (c === '{' ? '}' : ']')) {
          stack.pop();
          i++;
          state = 'after';
        } else state = c === '{' ? 'key' : 'value';
      } else if (c === '"') {
        if (!string()) return i;
        state = 'after';
      } else if (c === '-' || (c !== undefined && c >= '0' && c <= '9')) {
        if (!number()) return i;
        state = 'after';
      } else {
        const word = ['true', 'false', 'null'].find((w) => w[0] === c);
        if (!word) return i;
        for (let k = 0; k < word.length; k++, i++) if (text[i] !== word[k]) return i;
        state = 'after';
      }
    } else if (state === 'key') {
      if (text[i] !== '"' || !string()) return i;
      ws();
      if (text[i] !== ':') return i;
      i++;
      state = 'value';
    } else {
      const top = stack[stack.length - 1];
      if (top === undefined) return i < n ? i : undefined;
      const c = text[i];
      if (c === ',') {
        i++;
        state = top === 123 ? 'key' : 'value';
        if (top === 123) ws();
      } else if (c === (top === 123 ? '}' : ']')) {
        stack.pop();
        i++;
      } else return i;
    }
  }
}
