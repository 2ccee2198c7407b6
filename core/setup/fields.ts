/**
 * The setup's fields as a flat list, derived from the one schema (core/setup/schema.ts) through its
 * JSON Schema: path, label, unit, help, type, allowed values, default and range. The window's setup
 * form, docs/setup.md and docs/setup.schema.json are built from this; nothing here lists a field by hand.
 */
import { z } from 'zod';
import type { SetupFieldMeta, SetupFormKind } from './fieldMeta.ts';
import { setupSchema } from './schema.ts';

export type { SetupFormKind } from './fieldMeta.ts';

/** One leaf field of the setup file. */
export interface SetupFieldInfo {
  /** Dotted path in the setup file, e.g. "model.moment_ref_offset_m.x". */
  path: string;
  /** The top-level block it belongs to ('' for top-level fields such as `note`). */
  block: string;
  /** The block's heading. */
  group: string;
  label: string;
  unit: string;
  help: string;
  details: string;
  type: 'number' | 'string' | 'boolean';
  /** Allowed values of a choice, with their labels. */
  choices: { value: string; label: string }[] | null;
  /** Whether `null` is accepted (for a factor: computed by the engine). */
  nullable: boolean;
  /** Required in the file (no default, not optional). */
  required: boolean;
  /** The default, when the schema has one; `defaultText` says it in words. */
  default: unknown;
  defaultText: string;
  /** Range of a number, from the schema's checks. */
  min: number | null;
  max: number | null;
  minExclusive: boolean;
  maxExclusive: boolean;
  /** How the window's form edits it, or null when the form does not show it. */
  form: SetupFormKind | null;
}

/** A node of the JSON Schema zod writes, with our metadata keys (zod copies `.meta()` into it). */
interface Node extends SetupFieldMeta {
  type?: string | string[];
  enum?: unknown[];
  const?: unknown;
  anyOf?: Node[];
  properties?: Record<string, Node>;
  required?: string[];
  default?: unknown;
  minimum?: number;
  maximum?: number;
  exclusiveMinimum?: number;
  exclusiveMaximum?: number;
}

let cachedInput: Node | undefined;
/** The setup schema as JSON Schema (draft 2020-12) of the file as written, metadata included. */
export function setupJsonSchemaRaw(): Node & Record<string, unknown> {
  cachedInput ??= z.toJSONSchema(setupSchema, { io: 'input' }) as Node;
  return cachedInput as Node & Record<string, unknown>;
}

let cachedFields: readonly SetupFieldInfo[] | undefined;
/** Every leaf field of the setup, in schema order. */
export function setupFields(): readonly SetupFieldInfo[] {
  if (cachedFields) return cachedFields;
  const out: SetupFieldInfo[] = [];
  const root = setupJsonSchemaRaw();
  const walk = (node: Node, path: string[], block: string, group: string, required: boolean, inherited: unknown) => {
    const value = nonNull(node);
    if (value.type === 'object' && value.properties) {
      const req = new Set(value.required ?? []);
      const defaults = (node.default ?? inherited) as Record<string, unknown> | undefined;
      for (const [key, child] of Object.entries(value.properties)) {
        const childBlock = path.length === 0 ? (child.properties || nonNull(child).properties ? key : '') : block;
        const childGroup = path.length === 0 ? (nonNull(child).group ?? child.group ?? '') : group;
        walk(child, [...path, key], childBlock, childGroup, required && req.has(key), defaults?.[key]);
      }
      return;
    }
    out.push(leaf(node, path, block, group, required, inherited));
  };
  walk(root, [], '', '', true, undefined);
  cachedFields = out;
  return out;
}

/** The non-null member of a nullable node (zod writes `anyOf: [T, {type: "null"}]` or `type: [T, "null"]`), else the node. */
function nonNull(node: Node): Node {
  if (Array.isArray(node.type)) {
    const types = node.type.filter((t) => t !== 'null');
    return { ...node, type: types.length === 1 ? types[0] : undefined };
  }
  const members = node.anyOf?.filter((n) => n.type !== 'null');
  return members && members.length === 1 ? { ...members[0]!, ...withoutAnyOf(node) } : node;
}

function withoutAnyOf(node: Node): Node {
  const { anyOf: _members, ...rest } = node;
  return rest;
}

function leaf(node: Node, path: string[], block: string, group: string, required: boolean, inherited: unknown): SetupFieldInfo {
  const v = nonNull(node);
  const nullable = (node.anyOf?.some((n) => n.type === 'null') ?? false) || (Array.isArray(node.type) && node.type.includes('null'));
  const values = v.enum ?? (v.const !== undefined ? [v.const] : null);
  const type: SetupFieldInfo['type'] = v.type === 'number' || v.type === 'integer' ? 'number' : v.type === 'boolean' ? 'boolean' : 'string';
  const choices = values ? orderedChoices(values.map(String), v.choices) : null;
  const dflt = node.default !== undefined ? node.default : inherited;
  const kind: SetupFormKind = v.formKind ?? (choices ? 'choice' : type === 'boolean' ? 'flag' : type === 'number' ? 'number' : 'text');
  return {
    path: path.join('.'),
    block,
    group,
    label: v.label ?? path[path.length - 1]!,
    unit: v.unit ?? '',
    help: v.help ?? '',
    details: v.details ?? '',
    type,
    choices,
    nullable,
    required: required && dflt === undefined,
    default: dflt,
    defaultText: v.defaultText ?? '',
    min: v.minimum ?? v.exclusiveMinimum ?? null,
    max: v.maximum ?? v.exclusiveMaximum ?? null,
    minExclusive: v.minimum === undefined && v.exclusiveMinimum !== undefined,
    maxExclusive: v.maximum === undefined && v.exclusiveMaximum !== undefined,
    form: v.form === false ? null : kind,
  };
}

/** Choices in the order the metadata lists them (the form's order), then any value it does not label. */
function orderedChoices(values: string[], labels: Record<string, string> | undefined): { value: string; label: string }[] {
  const order = labels ? Object.keys(labels).filter((k) => values.includes(k)) : [];
  for (const v of values) if (!order.includes(v)) order.push(v);
  return order.map((value) => ({ value, label: labels?.[value] ?? value }));
}

/** The heading of each top-level block, in schema order. */
export function setupGroups(): { block: string; group: string; details: string }[] {
  const root = setupJsonSchemaRaw();
  return Object.entries(root.properties ?? {})
    .filter(([, n]) => nonNull(n).type === 'object')
    .map(([block, n]) => ({ block, group: nonNull(n).group ?? block, details: nonNull(n).details ?? '' }));
}
