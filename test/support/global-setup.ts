/**
 * Vitest global setup: builds the renderer once (when its output is missing or older than its
 * sources) before any suite that serves it. The build runs in a child process: inside the vitest
 * process it would share @vitejs/plugin-vue's compile cache with the component tests and break them.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';

const ROOT = resolve(__dirname, '../..');

function newest(dir: string): number {
  let t = 0;
  for (const name of readdirSync(dir)) {
    const p = join(dir, name);
    const s = statSync(p);
    t = Math.max(t, s.isDirectory() ? newest(p) : s.mtimeMs);
  }
  return t;
}

export default function setup(): void {
  const index = join(ROOT, 'dist', 'renderer', 'index.html');
  if (existsSync(index) && statSync(index).mtimeMs >= Math.max(newest(join(ROOT, 'renderer')), newest(join(ROOT, 'core')))) return;
  process.stderr.write('building the renderer for the tests…\n');
  execFileSync(process.execPath, [join(ROOT, 'node_modules', 'vite', 'bin', 'vite.js'), 'build', '--logLevel', 'warn'], { cwd: ROOT, stdio: 'inherit' });
}
