/**
 * Generated setup files for the fuzz tests: a valid setup (3D, 2D, body axes, minimal) bent by a few
 * object-level mutations (fields removed, wrong-typed, zero, negative or absurd geometry, unknown and
 * misspelt keys, deep junk, odd enum values and factors), then written as JSON and optionally damaged
 * as text (truncated, BOMs, UTF-16, comments, NaN literals, deep nesting, noise). Plain data throughout.
 */
import fc from 'fast-check';
import { SETUP_2D, SETUP_3D } from './inputs.ts';

export interface SetupCase {
  bytes: Uint8Array;
  /** The object before any text damage (null when the text was replaced by noise). */
  object: unknown;
  /** The text is the object's JSON, undamaged (a BOM aside). */
  intact: boolean;
  /** Why the setup must be refused, when the generator knows it must (bad geometry, wrong-typed values). */
  mustReject: string | null;
  withTare: boolean;
  noCorrections: boolean;
  format: 'json' | 'csv';
}

type Obj = Record<string, unknown>;

const BASES: readonly Obj[] = [
  SETUP_3D,
  SETUP_2D,
  { ...structuredClone(SETUP_3D), balance: { axes: 'body' } },
  {
    model: { kind: '3d', area_m2: 0.2025, chord_m: 0.225, span_m: 0.9 },
    tunnel: { section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
    balance: { axes: 'wind' },
    ambient: { p_pa: 99180, t_c: 18.6, rh_pct: 52 },
    uncertainty: { dp_pitot_pa: 1, force_n: 0.05, alpha_deg: 0.02, area_rel: 0.002 },
  },
];

/** Setup fields that must be positive numbers (volume may also be null). */
export const GEOMETRY = ['model.area_m2', 'model.chord_m', 'model.span_m', 'model.volume_m3', 'tunnel.width_m', 'tunnel.height_m'] as const;

const ABSURD_NUMBERS = [0, -0, -1, -1e-9, 5e-324, -5e-324, 1e-300, 1e-12, 1e-6, 1e-3, 1e3, 1e6, 1e12, 1e30, 1e150, 1e300, 1.7976931348623157e308, -1e308] as const;

/** Nested junk deep enough to hurt a recursive walker. */
function deep(depth: number, asArray: boolean): unknown {
  let v: unknown = 1;
  for (let i = 0; i < depth; i++) v = asArray ? [v] : { x: v };
  return v;
}

const junkArb: fc.Arbitrary<unknown> = fc.oneof(
  { arbitrary: fc.constantFrom<unknown>('0.225', '0.225 m', '', 'NaN', 'Infinity', true, false, null, [], {}, [0.2, 0.3], { value: 0.2 }, -1, 0, '__proto__', 'constructor'), weight: 4 },
  { arbitrary: fc.constantFrom(...ABSURD_NUMBERS), weight: 3 },
  { arbitrary: fc.jsonValue({ maxDepth: 3 }), weight: 2 },
  { arbitrary: fc.tuple(fc.integer({ min: 50, max: 3000 }), fc.boolean()).map(([d, a]) => deep(d, a)), weight: 1 },
);

type SetupMutation =
  | { kind: 'delete'; p: number }
  | { kind: 'set'; p: number; value: unknown }
  | { kind: 'geometry'; field: (typeof GEOMETRY)[number]; value: number | string | null }
  | { kind: 'misspell'; p: number; at: number }
  | { kind: 'unknownKey'; p: number; key: string; value: unknown }
  | { kind: 'enum'; field: string; value: string }
  | { kind: 'factor'; field: string; value: number | null | string };

const mutationArb: fc.Arbitrary<SetupMutation> = fc.oneof(
  fc.record({ kind: fc.constant('delete' as const), p: fc.nat() }),
  { arbitrary: fc.record({ kind: fc.constant('set' as const), p: fc.nat(), value: junkArb }), weight: 2 },
  {
    arbitrary: fc.record({
      kind: fc.constant('geometry' as const),
      field: fc.constantFrom(...GEOMETRY),
      value: fc.oneof(fc.constantFrom(...ABSURD_NUMBERS), fc.double({ noNaN: true, noDefaultInfinity: true }), fc.constantFrom('0.3', null)),
    }),
    weight: 3,
  },
  fc.record({ kind: fc.constant('misspell' as const), p: fc.nat(), at: fc.nat() }),
  fc.record({
    kind: fc.constant('unknownKey' as const),
    p: fc.nat(),
    key: fc.oneof(fc.constantFrom('__proto__', 'constructor', 'toString', '', 'chord', 'area', 'Kind', 'width', 'hieght_m', 'p_Pa'), fc.string({ unit: 'grapheme', maxLength: 8 })),
    value: junkArb,
  }),
  fc.record({
    kind: fc.constant('enum' as const),
    field: fc.constantFrom('model.kind', 'balance.axes', 'corrections.wake', 'tunnel.section', 'model.loading', 'corrections.enabled'),
    value: fc.constantFrom('2d', '3d', '2D', 'wind', 'body', 'stability', 'classic', 'maskell', 'uniform', 'elliptic', 'open-jet', 'closed-rectangular', ''),
  }),
  fc.record({
    kind: fc.constant('factor' as const),
    field: fc.constantFrom('corrections.delta', 'corrections.tau1', 'corrections.tau2', 'corrections.solid_blockage_k', 'flow.gamma', 'ambient.p_pa', 'ambient.t_c', 'ambient.rh_pct', 'model.moment_ref_offset_m.x'),
    value: fc.oneof(fc.constantFrom(...ABSURD_NUMBERS, null, '0.1', 1, 1.0001, 2, 100, -273.15, -100, 200)),
  }),
);

/** Every path in an object tree (objects and leaves), root excluded. */
function paths(o: unknown, prefix: string[] = [], out: string[][] = []): string[][] {
  if (o && typeof o === 'object' && !Array.isArray(o)) {
    for (const k of Object.keys(o)) {
      out.push([...prefix, k]);
      if (prefix.length < 4) paths((o as Obj)[k], [...prefix, k], out);
    }
  }
  return out;
}

/** Set a key as an own property, even "__proto__". */
function put(o: Obj, key: string, value: unknown): void {
  Object.defineProperty(o, key, { value, enumerable: true, writable: true, configurable: true });
}

function parentOf(root: Obj, path: string[], create: boolean): Obj | undefined {
  let o: unknown = root;
  for (const k of path.slice(0, -1)) {
    let next = (o as Obj)[k];
    if ((!next || typeof next !== 'object' || Array.isArray(next)) && create) {
      next = {};
      put(o as Obj, k, next);
    }
    if (!next || typeof next !== 'object' || Array.isArray(next)) return undefined;
    o = next;
  }
  return o as Obj;
}

function applyMutation(s: Obj, m: SetupMutation): void {
  const all = paths(s);
  const pick = (p: number) => all[p % Math.max(1, all.length)];
  switch (m.kind) {
    case 'delete': {
      const p = pick(m.p);
      if (p) delete parentOf(s, p, false)?.[p[p.length - 1]!];
      return;
    }
    case 'set': {
      const p = pick(m.p);
      const parent = p && parentOf(s, p, false);
      if (parent) put(parent, p[p.length - 1]!, m.value);
      return;
    }
    case 'misspell': {
      const p = pick(m.p);
      const parent = p && parentOf(s, p, false);
      if (!parent) return;
      const key = p[p.length - 1]!;
      const i = m.at % Math.max(1, key.length);
      const typo = key.slice(0, i) + key.slice(i + 1, i + 2) + key.slice(i, i + 1) + key.slice(i + 2); // swap two letters
      if (typo === key) return;
      const v = parent[key];
      delete parent[key];
      put(parent, typo, v);
      return;
    }
    case 'unknownKey': {
      const objects = [[], ...all].filter((p) => {
        const v = p.length === 0 ? s : parentOf(s, [...p, '_'], false);
        return v !== undefined;
      });
      const p = objects[m.p % objects.length]!;
      const target = p.length === 0 ? s : parentOf(s, [...p, '_'], false)!;
      put(target, m.key, m.value);
      return;
    }
    case 'geometry':
    case 'enum':
    case 'factor': {
      const p = m.field.split('.');
      put(parentOf(s, p, true)!, p[p.length - 1]!, m.value);
      return;
    }
  }
}

/** When the object certainly breaks the contract on geometry, the reason; the reader must then refuse it. */
export function geometryProblem(s: unknown): string | null {
  if (!s || typeof s !== 'object') return null;
  for (const f of GEOMETRY) {
    const [a, b] = f.split('.') as [string, string];
    const parent = (s as Obj)[a];
    if (!parent || typeof parent !== 'object' || Array.isArray(parent) || !Object.prototype.hasOwnProperty.call(parent, b)) continue;
    const v = (parent as Obj)[b];
    if (f === 'model.volume_m3' && v === null) continue;
    if (typeof v !== 'number' || !(v > 0)) return `${f} = ${JSON.stringify(v)?.slice(0, 40)}`;
  }
  const model = (s as Obj).model as Obj | undefined;
  if (model && typeof model === 'object' && !('chord_m' in model)) return 'model.chord_m missing';
  return null;
}

type TextDamage =
  | { kind: 'none' }
  | { kind: 'truncate'; at: number }
  | { kind: 'insert'; at: number; text: string }
  | { kind: 'bom' | 'utf16le' | 'comment' | 'nanLiteral' | 'trailingComma' | 'duplicateKey' | 'trailingJunk' }
  | { kind: 'nest'; depth: number }
  | { kind: 'noise'; text: string };

const textDamageArb: fc.Arbitrary<TextDamage> = fc.oneof(
  { arbitrary: fc.constant({ kind: 'none' as const }), weight: 12 },
  fc.record({ kind: fc.constant('truncate' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), text: fc.oneof(fc.constantFrom('"', '{', '}', ']', ',', ':', '\u0000', '\\', 'NaN', '\n'), fc.string({ unit: 'binary', maxLength: 4 })) }),
  fc.constantFrom(
    { kind: 'bom' as const },
    { kind: 'utf16le' as const },
    { kind: 'comment' as const },
    { kind: 'nanLiteral' as const },
    { kind: 'trailingComma' as const },
    { kind: 'duplicateKey' as const },
    { kind: 'trailingJunk' as const },
  ),
  fc.record({ kind: fc.constant('nest' as const), depth: fc.integer({ min: 10, max: 200_000 }) }),
  fc.record({ kind: fc.constant('noise' as const), text: fc.oneof(fc.string({ unit: 'binary', maxLength: 200 }), fc.constantFrom('', ' ', '\n', 'null', '[]', '0', '"setup"', '{}', '{"model":null}')) }),
);

function damage(text: string, d: TextDamage): Uint8Array {
  const b = (s: string) => new Uint8Array(Buffer.from(s, 'utf8'));
  switch (d.kind) {
    case 'none':
      return b(text);
    case 'truncate':
      return b(text.slice(0, d.at % Math.max(1, text.length)));
    case 'insert': {
      const at = d.at % Math.max(1, text.length);
      return b(text.slice(0, at) + d.text + text.slice(at));
    }
    case 'bom':
      return b('\ufeff' + text);
    case 'utf16le':
      return new Uint8Array(Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]));
    case 'comment':
      return b(text.replace('{', '{\n  // setup of the tunnel\n'));
    case 'nanLiteral':
      return b(text.replace(/: (\d+(\.\d+)?)/, ': NaN'));
    case 'trailingComma':
      return b(text.replace(/\n}\s*$/, ',\n}\n'));
    case 'duplicateKey':
      return b(text.replace('"model": {', '"model": {"kind": "2d", "chord_m": -1},\n  "model": {'));
    case 'trailingJunk':
      return b(text + '\n}garbage');
    case 'nest':
      return b('['.repeat(d.depth) + text + ']'.repeat(d.depth));
    case 'noise':
      return b(d.text);
  }
}

export const setupCaseArb: fc.Arbitrary<SetupCase> = fc
  .record({
    base: fc.nat(BASES.length - 1),
    mutations: fc.array(mutationArb, { maxLength: 4 }),
    text: textDamageArb,
    withTare: fc.boolean(),
    noCorrections: fc.oneof({ arbitrary: fc.constant(false), weight: 5 }, { arbitrary: fc.constant(true), weight: 1 }),
    format: fc.constantFrom('json' as const, 'csv' as const),
  })
  .map((g) => {
    const s = structuredClone(BASES[g.base]!) as Obj;
    for (const m of g.mutations) applyMutation(s, m);
    const text = JSON.stringify(s, null, 2) + '\n';
    const intact = g.text.kind === 'none' || g.text.kind === 'bom';
    return {
      bytes: damage(text, g.text),
      object: g.text.kind === 'noise' ? null : s,
      intact,
      mustReject: intact ? geometryProblem(s) : null,
      withTare: g.withTare,
      noCorrections: g.noCorrections,
      format: g.format,
    };
  });
