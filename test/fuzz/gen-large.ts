/**
 * A few large inputs, built rather than generated, for the "never hangs" property at sizes the random
 * cases do not reach: a long but ordinary time history, a long sweep without a point column, an unclosed
 * quote early in a long file, an over-long line, too many columns, and a setup nested a million deep.
 */
import type { RunCase } from './gen-runfile.ts';
import type { SetupCase } from './gen-setup.ts';

export type LargeCase = { label: string } & ({ kind: 'run'; make: () => RunCase } | { kind: 'setup'; make: () => SetupCase });

const bytes = (s: string) => new Uint8Array(Buffer.from(s, 'utf8'));
const run = (text: string, cuts: number[] = []): RunCase => ({ bytes: bytes(text), cuts, setupKey: 'wind3d', role: 'run', noCorrections: false, format: 'json' });

/** Invented sweep data: CL = 0.08·(α + 2) on q = 500 Pa, S = 0.2025 m² (not a measurement). */
function sweepRows(n: number, withPoint: boolean, samplesPerPoint = 1): string {
  const lines = [withPoint ? 'point,alpha,dp_pitot,lift,drag' : 'alpha,dp_pitot,lift,drag'];
  for (let i = 0; i < n; i++) {
    const k = Math.floor(i / samplesPerPoint);
    const a = -4 + (14 * i) / n;
    const lift = (500 * 0.2025 * 0.08 * (a + 2)).toFixed(4);
    lines.push(`${withPoint ? `${k + 1},` : ''}${a.toFixed(6)},500,${lift},${(500 * 0.2025 * 0.01).toFixed(4)}`);
  }
  return lines.join('\n') + '\n';
}

export const LARGE_CASES: readonly LargeCase[] = [
  { label: 'a 1 MB time history, 200 points of 150 samples, in 64 kB chunks', kind: 'run', make: () => run(sweepRows(30_000, true, 150), Array.from({ length: 16 }, (_, i) => (i + 1) * 65_536)) },
  { label: 'a sweep of 20,000 points (no point column), all in the linear range', kind: 'run', make: () => run(sweepRows(20_000, false)) },
  {
    label: 'an unclosed quote on line 2 of a 200 kB file',
    kind: 'run',
    make: () => {
      const rows = sweepRows(8_000, false).split('\n');
      rows[1] = rows[1]!.replace(',', ',"');
      return run(rows.join('\n'));
    },
  },
  { label: 'a line of 1.1 million characters', kind: 'run', make: () => run(`alpha,dp_pitot,lift,drag\n1,500,${'9'.repeat(1_100_000)},1\n`) },
  { label: '1,200 columns', kind: 'run', make: () => run(`alpha,dp_pitot,lift,drag,${Array.from({ length: 1_196 }, (_, i) => `c${i}`).join(',')}\n1,500,10,1\n`) },
  {
    label: 'a setup nested a million levels deep',
    kind: 'setup',
    make: () => ({ bytes: bytes(`{"model":${'['.repeat(1_000_000)}${']'.repeat(1_000_000)}}`), object: null, intact: false, mustReject: null, withTare: false, noCorrections: false, format: 'json' }),
  },
];
