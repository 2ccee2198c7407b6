/**
 * Vitest global setup: builds the renderer once (when its output is missing or older than its
 * sources) before any suite that serves it, so parallel suites never build into the same folder.
 */
import { ensureRendererBuilt } from '../../app/start.ts';

export default async function setup(): Promise<void> {
  await ensureRendererBuilt((line) => process.stderr.write(`${line}\n`));
}
