#!/usr/bin/env node
// Installed command. Runs the bundled command line (dist/cli.mjs, built by `npm install`) when it is
// newer than every source file; otherwise compiles the TypeScript sources on the fly through tsx.
import { existsSync, readdirSync, statSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));
const bundle = new URL('../dist/cli.mjs', import.meta.url);

function newest(dir) {
  let t = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = `${dir}/${entry.name}`;
    t = Math.max(t, entry.isDirectory() ? newest(p) : statSync(p).mtimeMs);
  }
  return t;
}

const fresh = existsSync(bundle) && statSync(bundle).mtimeMs >= Math.max(newest(`${root}core`), newest(`${root}app`), statSync(`${root}package.json`).mtimeMs);
if (fresh) {
  await import(bundle.href);
} else {
  const { register } = await import('tsx/esm/api');
  register();
  await import('../app/cli/entry.ts');
}
