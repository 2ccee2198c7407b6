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

export class PointAccumulator {
  private readonly width: number;
  private readonly byKey = new Map<string, Running>();
  private readonly order: Running[] = [];
  private last: Running | undefined;

  constructor(width: number) {
    this.width = width;
  }

  get size(): number {
    return this.order.length;
  }

  /** Fold one sample (values in channel order) into the point named `key`. */
  add(key: string, line: number, values: ArrayLike<number>): void {
    let p = this.last;
    if (p === undefined || p.key !== key) {
      p = this.byKey.get(key);
      if (p === undefined) {
        p = { key, line, n: 0, mean: new Float64Array(this.width), m2: new Float64Array(this.width) };
        this.byKey.set(key, p);
        this.order.push(p);
      }
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

  /** Points in order of first appearance. */
  result(): PointStats[] {
    return this.order.map((p) => {
      const std = new Float64Array(this.width);
      if (p.n > 1) for (let i = 0; i < this.width; i++) std[i] = Math.sqrt(Math.max(0, p.m2[i]!) / (p.n - 1));
      return { key: p.key, line: p.line, n: p.n, mean: p.mean, std };
    });
  }
}
