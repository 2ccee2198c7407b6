/**
 * `npm run docs:setup`: writes docs/setup.md and docs/setup.schema.json from the setup schema
 * (core/setup/schema.ts). `--check` writes nothing and exits 1 when either file is stale.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { setupJsonSchemaText, setupMarkdown } from '../core/setup/docs.ts';

const root = resolve(import.meta.dirname, '..');
const files = [
  { path: resolve(root, 'docs/setup.md'), text: setupMarkdown() },
  { path: resolve(root, 'docs/setup.schema.json'), text: setupJsonSchemaText() },
];
const check = process.argv.includes('--check');
let stale = 0;
for (const f of files) {
  let old: string | null;
  try {
    old = readFileSync(f.path, 'utf8');
  } catch {
    old = null;
  }
  if (old === f.text) continue;
  stale++;
  if (check) console.error(`stale: ${f.path} (run npm run docs:setup)`);
  else {
    writeFileSync(f.path, f.text);
    console.error(`wrote ${f.path}`);
  }
}
process.exitCode = check && stale > 0 ? 1 : 0;
