/**
 * Bundles the command line into dist/cli.mjs (esbuild), so `sweepbook` starts in ~0.1 s instead of
 * compiling TypeScript on every run. Run by `npm install` (prepare) and `npm run build`;
 * bin/sweepbook.js uses the bundle only while it is newer than every source file.
 */
import { build } from 'esbuild';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..', '..');

export async function bundleCli(): Promise<string> {
  const outfile = join(ROOT, 'dist', 'cli.mjs');
  await build({
    entryPoints: [join(ROOT, 'app', 'cli', 'entry.ts')],
    outfile,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    // papaparse and zod are CommonJS/ESM mixes that call require(); give the ESM bundle one
    banner: { js: "import { createRequire as __sweepbookRequire } from 'node:module'; const require = __sweepbookRequire(import.meta.url);" },
    logLevel: 'warning',
  });
  return outfile;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const out = await bundleCli();
  process.stderr.write(`bundled the command line into ${out}\n`);
}
