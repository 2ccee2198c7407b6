/**
 * Running per-point statistics of every channel (mean, sample standard deviation, count), updated
 * one sample at a time by Welford's algorithm (Welford, Technometrics 4 (1962) 419; Knuth, TAOCP
 * vol. 2, 3rd ed., §4.2.2), so a time-history file never has to be held in memory.
 */

export interface PointStats {
  /** The `point` value of the file (or the row's line number when the file has no point column). */
  key: string;
  /** Physical line of the point's first sample. */
  line: number;
  /** Samples averaged. */
  n: number;
  /** Channel means in SI, in the reader's channel order. */
  mean: Float64Array;
  /** Sample standard deviations (n − 1 in the denominator; 0 for one sample). */
  std: Float64Array;
}

interface Running {
  key: string;
  line: number;
  n: number;
  mean: Float64Array;
  m2: Float64Array;
}

/** Grouping tolerance on α within one point, rad: 0.2° (real encoders jitter by about 0.1° within a point). */
export const POINT_ALPHA_TOL_RAD = (0.2 * Math.PI) / 180;

/** A point whose samples lay at two angles and were split (a point id restarted for a return sweep). */
export interface PointSplit {
  key: string;
  /** First line of the earlier point, and of the new one. */
  firstLine: number;
  line: number;
  /** The two angles, rad. */
  alphaBefore: number;
  alphaAfter: number;
}

export class PointAccumulator {
  private readonly width: number;
  private readonly byKey = new Map<string, Running>();
  private readonly order: Running[] = [];
  private last: Running | undefined;
  /** Slot of α among the channels (−1: no α, no split by angle). */
  private readonly alphaSlot: number;
  private readonly alphaTol: number;
  /** Points split because their samples lay at two angles. */
  readonly splits: PointSplit[] = [];

  constructor(width: number, alphaSlot = -1, alphaTol = POINT_ALPHA_TOL_RAD) {
    this.width = width;
    this.alphaSlot = alphaSlot;
    this.alphaTol = alphaTol;
  }

  get size(): number {
    return this.order.length;
  }

  /**
   * Fold one sample (values in channel order) into the point named `key`. With an α channel, a key that
   * comes back after other points starts a new point of the same name (a return sweep, a repeat point),
   * and so does a sample whose α lies more than the tolerance from its point's mean α (a constant point
   * column through a sweep); a change of angle is recorded in `splits`. Samples of two angles, or of two
   * visits, are never averaged.
   */
  add(key: string, line: number, values: ArrayLike<number>): void {
    let p = this.last;
    const a = this.alphaSlot;
    if (p === undefined || p.key !== key) {
      const earlier = this.byKey.get(key);
      if (earlier !== undefined && a >= 0) {
        // the id comes back after other points: a new test point (a return sweep or a repeat point),
        // never averaged with the earlier one; named when it lies at another angle
        if (Math.abs(values[a]! - earlier.mean[a]!) > this.alphaTol)
          this.splits.push({ key, firstLine: earlier.line, line, alphaBefore: earlier.mean[a]!, alphaAfter: values[a]! });
        p = this.open(key, line);
      } else p = earlier ?? this.open(key, line);
      this.last = p;
    } else if (a >= 0 && p.n > 0 && Math.abs(values[a]! - p.mean[a]!) > this.alphaTol) {
      this.splits.push({ key, firstLine: p.line, line, alphaBefore: p.mean[a]!, alphaAfter: values[a]! });
      p = this.open(key, line);
      this.last = p;
    }
    const n = ++p.n;
    const mean = p.mean;
    const m2 = p.m2;
    for (let i = 0; i < this.width; i++) {
      const x = values[i]!;
      const d = x - mean[i]!;
      mean[i] = mean[i]! + d / n;
      m2[i] = m2[i]! + d * (x - mean[i]!);
    }
  }

  private open(key: string, line: number): Running {
    const p: Running = { key, line, n: 0, mean: new Float64Array(this.width), m2: new Float64Array(this.width) };
    this.byKey.set(key, p);
    this.order.push(p);
    return p;
  }

  /** Points in order of first appearance. */
  result(): PointStats[] {
    return this.order.map((p) => {
      const std = new Float64Array(this.width);
      if (p.n > 1) for (let i = 0; i < this.width; i++) std[i] = Math.sqrt(Math.max(0, p.m2[i]!) / (p.n - 1));
      return { key: p.key, line: p.line, n: p.n, mean: p.mean, std };
    });
  }
}
