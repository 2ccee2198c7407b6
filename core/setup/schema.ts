/**
 * The setup file (data contract v1, DESIGN §3.2): model geometry, tunnel section, balance axes, gas,
 * ambient defaults, wall-correction choices. Validated with zod; every problem names its field.
 */
import { z } from 'zod';
import { InputError, type Notice } from '../contract/messages.ts';
import { checkBalanceAxes, validateBalance, type Balance } from '../balance/document.ts';

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
const optionalFactor = (what: string) => z.number({ error: `expected a number or null (${what})` }).finite().nullable().optional();

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
});

const tunnelSchema = z.strictObject({
  name: z.string().optional(),
  section: z.literal('closed-rectangular', { error: 'expected "closed-rectangular" (the only section supported so far)' }),
  width_m: geometry('test-section width', 'm'),
  height_m: geometry('test-section height', 'm'),
});

const uncertaintySchema = z.strictObject({
  dp_pitot_pa: finite('Pa').nonnegative().optional(),
  p_static_pa: finite('Pa').nonnegative().optional(),
  t_total_c: finite('K or °C difference').nonnegative().optional(),
  rh_pct: finite('% RH').nonnegative().optional(),
  force_n: finite('N').nonnegative().optional(),
  moment_nm: finite('N m').nonnegative().optional(),
  alpha_deg: finite('deg').nonnegative().optional(),
  area_rel: finite('relative, e.g. 0.002').nonnegative().optional(),
  chord_rel: finite('relative, e.g. 0.002').nonnegative().optional(),
});

// --- balance calibration: a balance file's path (relative to the setup file) or the document inline ---
const calibrationSchema = z.union([z.string().min(1), z.record(z.string(), z.unknown())], {
  error: 'expected the path of a balance file (relative to the setup file) or a balance document',
});
/** A balance calibration named by path, still to be read by the host (core reads no files). */
export interface CalibrationPath {
  path: string;
}
// --- end of balance calibration ---

export const setupSchema = z.strictObject({
  $schema: z.string().optional(),
  note: z.string().optional(),
  model: modelSchema,
  tunnel: tunnelSchema,
  balance: z.strictObject({
    axes: z.enum(['wind', 'body'], { error: 'expected "wind" (lift/drag columns) or "body" (normal/axial columns)' }),
    // --- balance calibration and flow angle (raw bridge outputs; upflow) ---
    calibration: calibrationSchema.optional(),
  }),
  flow: z
    .strictObject({
      gamma: finite('ratio of specific heats').min(1.0001).max(2).optional(),
      upflow_deg: finite('upflow angle, degrees, positive up').min(-10, { error: 'expected −10 to 10 degrees (upflow angle)' }).max(10, { error: 'expected −10 to 10 degrees (upflow angle)' }).optional(),
    })
    // --- end of balance calibration and flow angle ---
    .optional(),
  ambient: z
    .strictObject({
      p_pa: positive('static pressure, Pa').optional(),
      t_c: finite('°C').min(-100).max(200).optional(),
      rh_pct: finite('%').min(0).max(100).optional(),
    })
    .optional(),
  corrections: z
    .strictObject({
      enabled: z.boolean({ error: 'expected true or false' }).optional(),
      wake: z.enum(['classic', 'maskell'], { error: 'expected "classic" or "maskell"' }).optional(),
      solid_blockage_k: optionalFactor('solid-blockage shape factor'),
      delta: optionalFactor('lift-interference factor δ'),
      tau1: optionalFactor('solid-blockage tunnel factor τ1'),
      tau2: optionalFactor('streamline-curvature factor τ2'),
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
  balance: {
    axes: 'wind' | 'body';
    /** Balance calibration: checked (inline, or read by the host), a path still to read, or null (loads in the run). */
    calibration: Balance | CalibrationPath | null;
  };
  /** `upflow_deg`: flow angularity φ, positive up, applied before wall corrections (0 by default). */
  flow: { gamma: number; upflow_deg: number };
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
      balance: { axes: s.balance.axes, calibration: setupCalibration(file, s.balance.axes, s.balance.calibration) },
      flow: { gamma: s.flow?.gamma ?? 1.4, upflow_deg: s.flow?.upflow_deg ?? 0 },
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

/** The setup's calibration: an inline document checked here, a path kept for the host to read. */
function setupCalibration(file: string, axes: 'wind' | 'body', c: string | Record<string, unknown> | undefined): Balance | CalibrationPath | null {
  if (c === undefined) return null;
  if (typeof c === 'string') return { path: c };
  const b = validateBalance(file, c, 'balance.calibration.');
  checkBalanceAxes(b, axes);
  return b;
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
