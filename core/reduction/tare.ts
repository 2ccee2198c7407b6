/**
 * Weight tares from a wind-off sweep of the same model: loads interpolated linearly in geometric
 * alpha and subtracted in the balance's own axes (common practice; Barlow, Rae & Pope 3rd ed. §7 on
 * tares). Outside the sweep's alpha range the nearest end value is used and the caller warns.
 */
import type { Channel } from '../formats/channels.ts';
import type { RunData } from '../formats/runFile.ts';
import { InputError } from '../contract/messages.ts';
import { bracket, interpolateAt } from '../physics/numbers.ts';

export interface TareTable {
  file: string;
  /** Load channels the tare provides. */
  channels: Channel[];
  /** Alpha of each tare point, rad, ascending. */
  alpha: Float64Array;
  /** loads[c][i]: channel c at tare point i, SI. */
  loads: Float64Array[];
}

export interface TareValue {
  loads: Map<Channel, number>;
  /** True when alpha lay outside the tare sweep and an end value was used. */
  clamped: boolean;
}

/** Build the interpolation table from a read tare file, for the given balance load channels. */
export function buildTare(tare: RunData, loadChannels: readonly Channel[]): TareTable {
  const ai = tare.channels.indexOf('alpha');
  // both refusals name the tare's header line, where the missing column belongs (fuzz finding: they named no line)
  if (ai < 0) throw new InputError({ file: tare.file, line: tare.headerLine, message: 'the tare file needs an "alpha" column' });
  const present = loadChannels.filter((c) => tare.channels.includes(c));
  if (present.length === 0) {
    throw new InputError({ file: tare.file, line: tare.headerLine, message: `the tare file has none of the balance's load columns (${loadChannels.join(', ')})` });
  }
  const order = tare.points.map((p, i) => ({ a: p.mean[ai]!, i })).sort((x, y) => x.a - y.a);
  // average points that share an alpha, so the table is strictly increasing
  const alpha: number[] = [];
  const sums: number[][] = present.map(() => []);
  const counts: number[] = [];
  for (const { a, i } of order) {
    const last = alpha.length - 1;
    const same = last >= 0 && Math.abs(alpha[last]! - a) < 1e-9;
    if (!same) {
      alpha.push(a);
      counts.push(0);
      sums.forEach((s) => s.push(0));
    }
    const k = alpha.length - 1;
    counts[k]!++;
    present.forEach((c, j) => (sums[j]![k]! += tare.points[i]!.mean[tare.channels.indexOf(c)]!));
  }
  return {
    file: tare.file,
    channels: present,
    alpha: Float64Array.from(alpha),
    loads: sums.map((s) => Float64Array.from(s, (v, k) => v / counts[k]!)),
  };
}

/**
 * How far outside the sweep a point may lie before it is reported: angle-encoder noise on sweeps over
 * the same range must not flag their end points (0.05°, common practice, about the resolution of a
 * typical pitch encoder).
 */
export const ALPHA_ALLOWANCE = (0.05 * Math.PI) / 180;

/** Tare loads at geometric alpha (rad), linear between sweep points, nearest end value outside. */
export function tareAt(table: TareTable, alpha: number): TareValue {
  const a = table.alpha;
  const b = bracket(a, alpha);
  const loads = new Map<Channel, number>();
  table.channels.forEach((c, j) => loads.set(c, interpolateAt(table.loads[j]!, b)));
  const clamped = alpha < a[0]! - ALPHA_ALLOWANCE || alpha > a[a.length - 1]! + ALPHA_ALLOWANCE;
  return { loads, clamped };
}
