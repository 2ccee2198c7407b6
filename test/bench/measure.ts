/**
 * Whole-process measurements: wall time from the parent's monotonic clock; peak resident memory and
 * CPU time (user + system) from /usr/bin/time (GNU time's %M, the child's ru_maxrss in kilobytes, and
 * %U %S), or, where that program is missing, from the process itself (node --import rss-probe.mjs;
 * the Python script writes its own). CPU time is the steadier figure when other work shares the machine.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const GNU_TIME = '/usr/bin/time';
const PROBE = new URL('./rss-probe.mjs', import.meta.url).pathname;

export interface Measurement {
  ms: number;
  rssKB: number;
  /** User + system CPU time, ms. */
  cpuMs: number;
  /** Standard output, when asked for (otherwise it goes to /dev/null). */
  stdout?: string;
}

export function hasGnuTime(): boolean {
  return existsSync(GNU_TIME);
}

/** Run `cmd args` to completion; throws with its standard error when it fails. */
export function measure(cmd: string, args: string[], opts: { captureStdout?: boolean; cwd?: string } = {}): Measurement {
  const scratch = mkdtempSync(join(tmpdir(), 'sweepbook-rss-'));
  const rssFile = join(scratch, 'rss');
  try {
    let argv: string[];
    let exe: string;
    if (hasGnuTime()) {
      exe = GNU_TIME;
      argv = ['-f', '%M %U %S', '-o', rssFile, cmd, ...args];
    } else {
      exe = cmd;
      argv = cmd === process.execPath ? ['--import', PROBE, ...args] : args;
    }
    const t0 = process.hrtime.bigint();
    const r = spawnSync(exe, argv, {
      cwd: opts.cwd,
      env: hasGnuTime() ? process.env : { ...process.env, SWEEPBOOK_BENCH_RSS_FILE: rssFile },
      stdio: ['ignore', opts.captureStdout ? 'pipe' : 'ignore', 'pipe'],
      maxBuffer: 1 << 30,
      encoding: 'utf8',
    });
    const ms = Number(process.hrtime.bigint() - t0) / 1e6;
    if (r.error) throw r.error;
    if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')} exited with ${r.status}:\n${r.stderr}`);
    // last line: "maxrss_kB user_s system_s" (GNU time may put a note about the exit above it)
    const [rss, user, system] = readFileSync(rssFile, 'utf8').trim().split('\n').pop()!.split(/\s+/).map(Number);
    return { ms, rssKB: rss!, cpuMs: (user! + system!) * 1000, stdout: opts.captureStdout ? r.stdout : undefined };
  } finally {
    rmSync(scratch, { recursive: true, force: true });
  }
}

export function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}
