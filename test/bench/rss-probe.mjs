// Peak resident memory and CPU time of a node process, for machines without /usr/bin/time: the bench
// preloads this (node --import) and reads "maxrss_kB user_s system_s" from the file it names.
import { writeFileSync } from 'node:fs';

const out = process.env.SWEEPBOOK_BENCH_RSS_FILE;
if (out) {
  process.on('exit', () => {
    const u = process.resourceUsage();
    writeFileSync(out, `${u.maxRSS} ${u.userCPUTime / 1e6} ${u.systemCPUTime / 1e6}`);
  });
}
