/**
 * How the desktop shell is built: the main process and the preload are bundled by esbuild into
 * CommonJS (a sandboxed preload must be CommonJS, and the package is "type": "module", see
 * TOOLCHAIN.md), the renderer by Vite into dist/renderer. `npm run build` runs both; `npm start`
 * builds what is missing. Packaging targets for installers are listed for a machine with the
 * Electron binary; none are built here.
 */
import { build } from 'esbuild';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const ROOT = dirname(fileURLToPath(import.meta.url));

export const electronBuild = {
  outDir: join(ROOT, 'dist', 'electron'),
  entries: { main: join(ROOT, 'app', 'electron', 'main.ts'), preload: join(ROOT, 'app', 'electron', 'preload.ts') },
  /** Installer targets per platform (for a packaging step on a machine with the Electron binary). */
  targets: { linux: ['AppImage', 'deb'], win: ['nsis'], mac: ['dmg'] },
  /** Files shipped in the app folder beside dist/. */
  files: ['dist/**', 'sample-runs/**', 'package.json'],
} as const;

export async function buildElectron(): Promise<void> {
  for (const [name, entry] of Object.entries(electronBuild.entries)) {
    await build({
      entryPoints: [entry],
      outfile: join(electronBuild.outDir, `${name}.cjs`),
      bundle: true,
      platform: 'node',
      format: 'cjs',
      target: 'node20',
      external: ['electron'],
      sourcemap: true,
      logLevel: 'warning',
    });
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  await buildElectron();
  console.error(`built ${Object.keys(electronBuild.entries).join(' and ')} into ${electronBuild.outDir}`);
}
