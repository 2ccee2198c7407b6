#!/usr/bin/env node
// Installed command. Runs the bundled command line (dist/cli.mjs, built by `npm install`) when it is
// newer than every source file; otherwise compiles the TypeScript sources on the fly through tsx.
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { totalmem } from 'node:os';
import { fileURLToPath } from 'node:url';
import { getHeapStatistics } from 'node:v8';

// A run of a million points needs more than Node's default heap (about 4 GiB here): run again with a
// heap of three quarters of the machine's memory (at most 32 GiB), unless the user chose one.
const wanted = Math.min(Math.floor((totalmem() * 0.75) / 2 ** 20), 32 * 1024);
if (
  !process.env.SWEEPBOOK_HEAP_SET &&
  getHeapStatistics().heap_size_limit / 2 ** 20 < wanted * 0.9 &&
  !/max-old-space-size/.test(process.env.NODE_OPTIONS ?? '')
) {
  const child = spawnSync(process.execPath, [`--max-old-space-size=${wanted}`, ...process.execArgv, fileURLToPath(import.meta.url), ...process.argv.slice(2)], {
    stdio: 'inherit',
    env: { ...process.env, SWEEPBOOK_HEAP_SET: '1' },
  });
  process.exit(child.status ?? 1);
}

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
