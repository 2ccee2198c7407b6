/**
 * The setup file (data contract v1, DESIGN §3.2): model geometry, tunnel section, balance axes, gas,
 * ambient defaults, wall-correction choices. Validated with zod; every problem names its field.
 */
import { z } from 'zod';
import { InputError, type Notice } from './messages.ts';

const positive = (what: string) => z.number({ error: `expected a number (${what})` }).finite().positive({ error: `expected a positive number (${what})` });
const finite = (what: string) => z.number({ error: `expected a number (${what})` }).finite();
const optionalFactor = (what: string) => z.number({ error: `expected a number or null (${what})` }).finite().nullable().optional();

const modelSchema = z.strictObject({
  kind: z.enum(['2d', '3d'], { error: 'expected "2d" (a wing spanning the tunnel) or "3d"' }),
  name: z.string().optional(),
  area_m2: positive('reference area, m²').optional(),
  chord_m: positive('reference chord, m'),
  span_m: positive('span, m').optional(),
  volume_m3: positive('model volume, m³').nullable().optional(),
  moment_ref_offset_m: z
    .strictObject({ x: finite('metres toward the nose'), z: finite('metres up') })
    .optional(),
  loading: z.enum(['elliptic', 'uniform'], { error: 'expected "elliptic" or "uniform"' }).optional(),
});

const tunnelSchema = z.strictObject({
  name: z.string().optional(),
  section: z.literal('closed-rectangular', { error: 'expected "closed-rectangular" (the only section supported so far)' }),
  width_m: positive('test-section width, m'),
  height_m: positive('test-section height, m'),
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

export const setupSchema = z.strictObject({
  $schema: z.string().optional(),
  note: z.string().optional(),
  model: modelSchema,
  tunnel: tunnelSchema,
  balance: z.strictObject({ axes: z.enum(['wind', 'body'], { error: 'expected "wind" (lift/drag columns) or "body" (normal/axial columns)' }) }),
  flow: z.strictObject({ gamma: finite('ratio of specific heats').min(1.0001).max(2) }).optional(),
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
  try {
    json = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch (err) {
    const { line, column } = jsonErrorPlace(text, err);
    throw new InputError({ file, line, column, message: `not valid JSON (${(err as Error).message})` });
  }
  return validateSetup(file, json);
}

/** Validate an already-parsed setup object. Throws InputError naming the field. */
export function validateSetup(file: string, json: unknown): SetupResult {
  const parsed = setupSchema.safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw new InputError({ file, field: fieldPath(issue.path) || '(top level)', message: describeIssue(issue) });
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

function describeIssue(issue: z.core.$ZodIssue): string {
  if (issue.code === 'unrecognized_keys') {
    const key = issue.keys[0]!;
    const near = nearest(key, knownKeys(issue.path));
    const where = fieldPath([...issue.path, key]);
    return `unknown key "${where}"${near ? `; did you mean "${near}"?` : ''}`;
  }
  if (issue.code === 'invalid_type' && issue.input === undefined) return `missing; ${issue.message}`;
  return issue.message;
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

/** Line and column of a JSON.parse error, from V8's "at position N" when it gives one. */
function jsonErrorPlace(text: string, err: unknown): { line?: number; column?: number } {
  const m = /position (\d+)/.exec(String((err as Error)?.message));
  if (!m) return {};
  const pos = Number(m[1]);
  const before = text.slice(0, pos);
  const line = before.split('\n').length;
  const column = pos - before.lastIndexOf('\n');
  return { line, column };
}
