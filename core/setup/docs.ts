/**
 * The setup's reference documents, derived from the schema: docs/setup.md (a table per block) and
 * docs/setup.schema.json (JSON Schema 2020-12 for editors and scripts). Written by `npm run docs:setup`;
 * test/unit/setup-docs.test.ts fails when the files in docs/ differ from what this produces.
 */
import { setupFields, setupGroups, setupJsonSchemaRaw, type SetupFieldInfo } from './fields.ts';

const GENERATED = 'Generated from core/setup/schema.ts by `npm run docs:setup`; edit the schema, not this file.';

/** docs/setup.md */
export function setupMarkdown(): string {
  const fields = setupFields();
  const lines: string[] = [
    '# Setup file reference',
    '',
    `<!-- ${GENERATED} -->`,
    '',
    'Every field of the setup file (JSON; its place in the data contract is [data-format.md §4](data-format.md#4-setup-file-json)):',
    'meaning, unit, default and the values accepted. Values are SI in the unit shown. A field with a default',
    'may be left out; a *required* one must be given. Unknown keys are refused with a message naming the key',
    'and the nearest known one; a wrong type or value names the field and what was expected, and nothing is',
    'reduced with a bad setup. The same description in machine-readable form is',
    '[setup.schema.json](setup.schema.json) (JSON Schema 2020-12): a setup that starts with',
    '`"$schema": "…/setup.schema.json"` gets completion and checks in editors that read JSON Schema.',
    '',
  ];
  let section = 0;
  const table = (rows: readonly SetupFieldInfo[]) => {
    lines.push('| field | meaning | unit | default | accepted |', '|---|---|---|---|---|');
    for (const f of rows) lines.push(`| \`${f.path}\` | ${cell(meaning(f))} | ${cell(f.unit)} | ${cell(defaultOf(f))} | ${cell(accepted(f))} |`);
    lines.push('');
  };
  const top = fields.filter((f) => f.block === '');
  if (top.length > 0) {
    lines.push(`## ${++section}. Top level`, '');
    table(top);
  }
  for (const g of setupGroups()) {
    const rows = fields.filter((f) => f.block === g.block);
    if (rows.length === 0) continue;
    lines.push(`## ${++section}. \`${g.block}\`: ${g.group}`, '');
    if (g.details) lines.push(g.details, '');
    table(rows);
  }
  return lines.join('\n');
}

function meaning(f: SetupFieldInfo): string {
  const sentences = [f.help ? `${f.label} (${f.help})` : f.label, f.details];
  if (f.choices && f.choices.some((c) => c.label !== c.value)) sentences.push(`Values: ${f.choices.map((c) => `\`${c.value}\` ${c.label}`).join('; ')}`);
  return sentenceJoin(sentences);
}

/** Texts joined as sentences, each ending in a full stop. */
function sentenceJoin(texts: (string | undefined)[]): string {
  return texts
    .filter((t): t is string => !!t)
    .map((t) => (/[.!?]$/.test(t) ? t : `${t}.`))
    .join(' ');
}

/** A number as people write it in a range: 1e-8 and 1e6 rather than 0.00000001 and 1000000. */
function num(x: number): string {
  return x !== 0 && (Math.abs(x) >= 1e5 || Math.abs(x) < 1e-3) ? x.toExponential().replace('e+', 'e') : String(x);
}

function defaultOf(f: SetupFieldInfo): string {
  if (f.defaultText) return f.defaultText;
  if (f.default !== undefined) return f.default === null ? '`null`' : `\`${JSON.stringify(f.default)}\``;
  return f.required ? '*required*' : '—';
}

function accepted(f: SetupFieldInfo): string {
  const orNull = f.nullable ? ' or `null`' : '';
  if (f.choices) return f.choices.map((c) => `\`${JSON.stringify(c.value)}\``).join(', ') + orNull;
  if (f.type === 'boolean') return '`true`, `false`';
  if (f.type === 'string') return 'text';
  const lo = f.min === null ? null : `${f.minExclusive ? '>' : '≥'} ${num(f.min)}`;
  const hi = f.max === null ? null : `${f.maxExclusive ? '<' : '≤'} ${num(f.max)}`;
  const range = f.min !== null && f.max !== null && !f.minExclusive && !f.maxExclusive ? `${num(f.min)} to ${num(f.max)}` : [lo, hi].filter(Boolean).join(', ');
  return (range ? `number, ${range}` : 'number') + orNull;
}

function cell(text: string): string {
  return text.replace(/\|/g, '\\|').replace(/\n/g, ' ');
}

/** The metadata keys of the schema that become `title`/`description` or serve the form only. */
const META_KEYS = ['label', 'unit', 'help', 'details', 'choices', 'defaultText', 'formKind', 'form', 'group'] as const;

/** docs/setup.schema.json: the input schema with our metadata turned into `title` and `description`. */
export function setupJsonSchema(): Record<string, unknown> {
  const raw = JSON.parse(JSON.stringify(setupJsonSchemaRaw())) as Record<string, unknown>;
  const tidy = (node: unknown): void => {
    if (Array.isArray(node)) return node.forEach(tidy);
    if (node === null || typeof node !== 'object') return;
    const n = node as Record<string, unknown>;
    const title = (n['label'] ?? n['group']) as string | undefined;
    const choices = n['choices'] as Record<string, string> | undefined;
    const description = sentenceJoin([
      n['help'] as string | undefined,
      n['details'] as string | undefined,
      n['unit'] && n['unit'] !== '–' ? `Unit: ${String(n['unit'])}.` : undefined,
      n['defaultText'] ? `Default: ${String(n['defaultText'])}.` : undefined,
      choices
        ? `Values: ${Object.entries(choices)
            .map(([v, l]) => `"${v}" ${l}`)
            .join('; ')}.`
        : undefined,
    ]);
    for (const k of META_KEYS) delete n[k];
    if (title) n['title'] = title;
    if (description) n['description'] = description;
    for (const v of Object.values(n)) tidy(v);
  };
  tidy(raw);
  const { $schema, ...rest } = raw;
  return {
    $schema,
    title: 'Sweepbook setup file',
    description: `Model, tunnel, balance, gas, ambient defaults, wall-correction choices and instrument uncertainties for one reduction (docs/setup.md). ${GENERATED}`,
    ...rest,
  };
}

/** The text of docs/setup.schema.json. */
export function setupJsonSchemaText(): string {
  return `${JSON.stringify(setupJsonSchema(), null, 2)}\n`;
}
