/** A short description of the machine a benchmark ran on, for the report and docs/performance.md. */
import { readFileSync } from 'node:fs';
import { availableParallelism, cpus, loadavg, totalmem } from 'node:os';

export interface Machine {
  cpus: number;
  cpuModel: string;
  memoryGiB: number;
  node: string;
  platform: string;
}

export function describeMachine(): Machine {
  let model = cpus()[0]?.model ?? 'unknown';
  try {
    const m = /^model name\s*:\s*(.+)$/m.exec(readFileSync('/proc/cpuinfo', 'utf8'));
    if (m) model = m[1]!.trim();
  } catch {
    // not Linux: the os module's name will do
  }
  return {
    cpus: availableParallelism(),
    cpuModel: model,
    memoryGiB: Math.round((totalmem() / 2 ** 30) * 10) / 10,
    node: process.version,
    platform: `${process.platform} ${process.arch}`,
  };
}

export function loadAverage(): string {
  return loadavg()
    .map((x) => x.toFixed(2))
    .join(' ');
}
