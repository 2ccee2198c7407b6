/**
 * The run-file reader alone, as the command line drives it (1 MiB utf8 chunks into core's streaming
 * reader), without the reduction: shows how much of the end-to-end time is reading.
 * Prints {rows, points, read_ms, cpu_ms} (cpu: user + system time of the read, steadier than wall time on a busy machine). Usage (bundled by the bench): node read-only.mjs RUN.csv
 */
import { createReadStream } from 'node:fs';
import { readRun } from '../../core/reduction/engine.ts';

async function* chunks(path: string): AsyncGenerator<string> {
  for await (const chunk of createReadStream(path, { encoding: 'utf8', highWaterMark: 1 << 20 })) yield chunk as string;
}

async function main(): Promise<void> {
  const file = process.argv[2]!;
  const t0 = performance.now();
  const c0 = process.cpuUsage();
  const run = await readRun(file, chunks(file));
  const ms = performance.now() - t0;
  const cpu = process.cpuUsage(c0);
  if (!run.ok) throw new Error(JSON.stringify(run.errors));
  process.stdout.write(JSON.stringify({ rows: run.value.rowsRead, points: run.value.points.length, read_ms: Math.round(ms), cpu_ms: Math.round((cpu.user + cpu.system) / 1000) }) + '\n');
}

void main();
