/**
 * Small dense linear algebra for balance calibrations (a few components, a few dozen terms): an LU
 * inverse with partial pivoting that reports singular matrices, and least squares by Householder QR,
 * which never forms the normal equations (Golub & Van Loan, Matrix Computations, 4th ed., §3.2 and
 * §5.2–5.3). Matrices are arrays of rows.
 */
import { maxOf } from '../physics/numbers.ts';

export type Matrix = number[][];

/**
 * Inverse of a square matrix by Gaussian elimination with partial pivoting (Golub & Van Loan §3.4),
 * or undefined when a pivot falls below `1e-12 ×` the largest entry of its column before elimination
 * (the matrix is singular to working precision).
 */
export function invert(a: Matrix): Matrix | undefined {
  const n = a.length;
  const m = a.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  const colScale = Array.from({ length: n }, (_, j) => maxOf(a.map((r) => Math.abs(r[j]!))));
  for (let k = 0; k < n; k++) {
    let p = k;
    for (let i = k + 1; i < n; i++) if (Math.abs(m[i]![k]!) > Math.abs(m[p]![k]!)) p = i;
    if (!(Math.abs(m[p]![k]!) > 1e-12 * colScale[k]!)) return undefined;
    [m[k], m[p]] = [m[p]!, m[k]!];
    const piv = m[k]![k]!;
    for (let j = 0; j < 2 * n; j++) m[k]![j]! /= piv;
    for (let i = 0; i < n; i++) {
      if (i === k) continue;
      const f = m[i]![k]!;
      if (f === 0) continue;
      for (let j = 0; j < 2 * n; j++) m[i]![j]! -= f * m[k]![j]!;
    }
  }
  return m.map((row) => row.slice(n));
}

/** y = A·x. */
export function multiply(a: Matrix, x: ArrayLike<number>): number[] {
  return a.map((row) => {
    let s = 0;
    for (let j = 0; j < row.length; j++) s += row[j]! * x[j]!;
    return s;
  });
}

export interface LeastSquares {
  /** Coefficients, one row per right-hand side: coef[r][t] multiplies column t of the design. */
  coef: Matrix;
  /** Index of the first column that is (nearly) a combination of the columns before it, when the design is rank deficient. */
  dependentColumn?: number;
}

/**
 * Least squares min ‖X·b − y‖ for several right-hand sides by Householder QR of the design X (n × p,
 * n ≥ p), with columns scaled to unit length first so terms of very different size (mV/V and its
 * squares) are judged alike. A column whose remaining norm falls below 1e-10 of its own (after the
 * earlier columns are projected out) makes the design rank deficient: reported, not solved.
 * Golub & Van Loan §5.3.
 */
export function leastSquares(x: Matrix, ys: Matrix): LeastSquares {
  const n = x.length;
  const p = x[0]?.length ?? 0;
  const scale = Array.from({ length: p }, (_, j) => Math.sqrt(x.reduce((s, r) => s + r[j]! * r[j]!, 0)) || 1);
  const a = x.map((r) => r.map((v, j) => v / scale[j]!));
  const b = ys.map((y) => [...y]);
  const diag: number[] = [];
  for (let k = 0; k < p; k++) {
    let norm = 0;
    for (let i = k; i < n; i++) norm += a[i]![k]! ** 2;
    norm = Math.sqrt(norm);
    // each scaled column has unit length, so `norm` is the fraction of it left unexplained by the columns before it
    if (!(norm > 1e-10)) return { coef: [], dependentColumn: k };
    const alpha = a[k]![k]! > 0 ? -norm : norm;
    const v = new Float64Array(n);
    for (let i = k; i < n; i++) v[i] = a[i]![k]!;
    v[k] = v[k]! - alpha;
    let vv = 0;
    for (let i = k; i < n; i++) vv += v[i]! * v[i]!;
    for (let j = k; j < p; j++) {
      let s = 0;
      for (let i = k; i < n; i++) s += v[i]! * a[i]![j]!;
      const f = (2 * s) / vv;
      for (let i = k; i < n; i++) a[i]![j]! -= f * v[i]!;
    }
    for (const y of b) {
      let s = 0;
      for (let i = k; i < n; i++) s += v[i]! * y[i]!;
      const f = (2 * s) / vv;
      for (let i = k; i < n; i++) y[i]! -= f * v[i]!;
    }
    diag.push(a[k]![k]!);
  }
  const coef = b.map((y) => {
    const c = new Array<number>(p).fill(0);
    for (let k = p - 1; k >= 0; k--) {
      let s = y[k]!;
      for (let j = k + 1; j < p; j++) s -= a[k]![j]! * c[j]!;
      c[k] = s / a[k]![k]!;
    }
    return c.map((v, j) => v / scale[j]!);
  });
  return { coef };
}
