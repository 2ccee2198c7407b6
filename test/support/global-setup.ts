/**
 * Vitest global setup: builds the renderer once (when its output is missing or older than its
 * sources) before any suite that serves it. The build runs in a child process: inside the vitest
 * process it would share @vitejs/plugin-vue's compile cache with the component tests and break them.
 */
import { execFileSync } from 'node:child_process';
import { join, resolve } from 'node:path';
import { rendererIsStale } from '../../app/start.ts';

const ROOT = resolve(__dirname, '../..');

export default function setup(): void {
  if (!rendererIsStale()) return;
  process.stderr.write('building the renderer for the tests…\n');
  execFileSync(process.execPath, [join(ROOT, 'node_modules', 'vite', 'bin', 'vite.js'), 'build', '--logLevel', 'warn'], { cwd: ROOT, stdio: 'inherit' });
}
