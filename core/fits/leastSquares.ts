/**
 * Small least-squares solvers for the fits: straight line and polynomials by the normal equations
 * (solved with partial-pivot Gaussian elimination; the fits here have at most 3 parameters on
 * centred data, where the normal equations are well conditioned). Draper & Smith, Applied Regression
 * Analysis, 3rd ed., ch. 1–2.
 */

export interface LineFit {
  slope: number;
  intercept: number;
  /** Standard error of the slope, from the residual variance with n − 2 degrees of freedom. */
  slopeStderr: number;
  /** Largest absolute residual. */
  maxResidual: number;
  n: number;
}

/** Ordinary least-squares straight line y = a + b·x. Needs n ≥ 2 distinct x. */
export function fitLine(x: ArrayLike<number>, y: ArrayLike<number>, from = 0, to = x.length): LineFit {
  const n = to - from;
  let sx = 0;
  let sy = 0;
  for (let i = from; i < to; i++) {
    sx += x[i]!;
    sy += y[i]!;
  }
  const mx = sx / n;
  const my = sy / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = from; i < to; i++) {
    const dx = x[i]! - mx;
    sxx += dx * dx;
    sxy += dx * (y[i]! - my);
  }
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  let sse = 0;
  let maxResidual = 0;
  for (let i = from; i < to; i++) {
    const r = y[i]! - (intercept + slope * x[i]!);
    sse += r * r;
    maxResidual = Math.max(maxResidual, Math.abs(r));
  }
  const slopeStderr = n > 2 ? Math.sqrt(sse / (n - 2) / sxx) : Number.NaN;
  return { slope, intercept, slopeStderr, maxResidual, n };
}

/** Least-squares polynomial of the given degree; coefficients lowest power first. Returns undefined when singular. */
export function fitPolynomial(x: ArrayLike<number>, y: ArrayLike<number>, degree: number): number[] | undefined {
  const k = degree + 1;
  const n = x.length;
  if (n < k) return undefined;
  // centre and scale x for conditioning, then map the coefficients back
  let mx = 0;
  for (let i = 0; i < n; i++) mx += x[i]!;
  mx /= n;
  let sc = 0;
  for (let i = 0; i < n; i++) sc = Math.max(sc, Math.abs(x[i]! - mx));
  if (!(sc > 0)) return undefined;
  const A: number[][] = Array.from({ length: k }, () => new Array<number>(k + 1).fill(0));
  for (let i = 0; i < n; i++) {
    const t = (x[i]! - mx) / sc;
    const pw: number[] = [1];
    for (let j = 1; j < 2 * k; j++) pw.push(pw[j - 1]! * t);
    for (let r = 0; r < k; r++) {
      for (let c = 0; c < k; c++) A[r]![c]! += pw[r + c]!;
      A[r]![k]! += pw[r]! * y[i]!;
    }
  }
  const u = solve(A);
  if (!u) return undefined;
  // p(x) = Σ u_j ((x − mx)/sc)^j → expand to powers of x
  const out = new Array<number>(k).fill(0);
  for (let j = 0; j < k; j++) {
    const cj = u[j]! / Math.pow(sc, j);
    // (x − mx)^j = Σ_i C(j,i) x^i (−mx)^(j−i)
    for (let i = 0; i <= j; i++) out[i]! += cj * binomial(j, i) * Math.pow(-mx, j - i);
  }
  return out;
}

function binomial(n: number, k: number): number {
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return r;
}

/** Gaussian elimination with partial pivoting on an augmented matrix. */
function solve(A: number[][]): number[] | undefined {
  const k = A.length;
  for (let col = 0; col < k; col++) {
    let piv = col;
    for (let r = col + 1; r < k; r++) if (Math.abs(A[r]![col]!) > Math.abs(A[piv]![col]!)) piv = r;
    if (Math.abs(A[piv]![col]!) < 1e-300) return undefined;
    [A[col], A[piv]] = [A[piv]!, A[col]!];
    for (let r = col + 1; r < k; r++) {
      const f = A[r]![col]! / A[col]![col]!;
      for (let c = col; c <= k; c++) A[r]![c]! -= f * A[col]![c]!;
    }
  }
  const x = new Array<number>(k).fill(0);
  for (let r = k - 1; r >= 0; r--) {
    let s = A[r]![k]!;
    for (let c = r + 1; c < k; c++) s -= A[r]![c]! * x[c]!;
    x[r] = s / A[r]![r]!;
  }
  return x.every(Number.isFinite) ? x : undefined;
}

/** Vertex of the parabola through three points (x_i, y_i): returns {x, y} or undefined if they are collinear. */
export function parabolaVertex(x: [number, number, number], y: [number, number, number]): { x: number; y: number } | undefined {
  const p = fitPolynomial(x, y, 2);
  if (!p || !(p[2]! < 0 || p[2]! > 0)) return undefined;
  const xv = -p[1]! / (2 * p[2]!);
  return { x: xv, y: p[0]! + p[1]! * xv + p[2]! * xv * xv };
}

export interface LineRegression {
  slope: number;
  intercept: number;
  varSlope: number;
  varIntercept: number;
  covariance: number;
  /** Σ w·r²; with w = 1/u² its expectation is n − 2. */
  chi2: number;
  n: number;
}

/**
 * Weighted least-squares line y = a + b·x with weights w (1/u² for known standard uncertainties, or all 1).
 * Parameter covariance (Draper & Smith ch. 9; JCGM 100:2008 H.3): with unit weights it is scaled by
 * the residual variance s² = Σr²/(n − 2); with 1/u² weights by max(1, χ²/(n − 2)) (the Birge ratio),
 * so scatter larger than the stated uncertainties widens the standard errors rather than being hidden.
 */
export function regressLine(x: ArrayLike<number>, y: ArrayLike<number>, w?: ArrayLike<number>, from = 0, to = x.length): LineRegression | undefined {
  const n = to - from;
  if (n < 2) return undefined;
  let sw = 0;
  let swx = 0;
  let swy = 0;
  for (let i = from; i < to; i++) {
    const wi = w ? w[i]! : 1;
    sw += wi;
    swx += wi * x[i]!;
    swy += wi * y[i]!;
  }
  const mx = swx / sw;
  const my = swy / sw;
  let sxx = 0;
  let sxy = 0;
  for (let i = from; i < to; i++) {
    const wi = w ? w[i]! : 1;
    sxx += wi * (x[i]! - mx) ** 2;
    sxy += wi * (x[i]! - mx) * (y[i]! - my);
  }
  if (!(sxx > 0)) return undefined;
  const slope = sxy / sxx;
  const intercept = my - slope * mx;
  let chi2 = 0;
  for (let i = from; i < to; i++) chi2 += (w ? w[i]! : 1) * (y[i]! - intercept - slope * x[i]!) ** 2;
  const dof = n - 2;
  const scale = dof > 0 ? (w ? Math.max(1, chi2 / dof) : chi2 / dof) : Number.NaN;
  const varSlope = scale / sxx;
  const varIntercept = scale * (1 / sw + (mx * mx) / sxx);
  const covariance = (-scale * mx) / sxx;
  return { slope, intercept, varSlope, varIntercept, covariance, chi2, n };
}

/**
 * Straight line y = a + b·x with errors in both variables by the effective-variance method
 * (Orear, Am. J. Phys. 50 (1982) 912; ISO/TS 28037:2010 §7 for the same model): each point is
 * weighted by 1/(u_y² + b²·u_x²), the slope iterated to a fixed point from the unweighted fit.
 * Without stated uncertainties (uy undefined) it is the ordinary fit with the residual variance
 * (Draper & Smith ch. 1), which already holds the scatter of both variables. With stated random
 * uncertainties the covariance is scaled by the Birge ratio max(1, χ²/(n − 2)) as in regressLine.
 * `sigmaFloor` (unweighted fits only): an independent estimate of the points' scatter (e.g. the robust
 * estimate from the whole branch); the residual variance is not taken below its square, because a range
 * chosen for its small residuals understates the scatter it was chosen from.
 */
export function regressLineEV(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  uy?: ArrayLike<number>,
  ux?: ArrayLike<number>,
  sigmaFloor = 0,
): LineRegression | undefined {
  const ols = regressLine(x, y);
  if (ols && !uy && ols.n > 2) {
    const s2 = ols.chi2 / (ols.n - 2);
    const f = s2 > 0 ? Math.max(1, (sigmaFloor * sigmaFloor) / s2) : 1;
    if (f > 1) return { ...ols, varSlope: ols.varSlope * f, varIntercept: ols.varIntercept * f, covariance: ols.covariance * f };
  }
  if (!ols || !uy) return ols;
  let fit = ols;
  const n = x.length;
  for (let it = 0; it < 6; it++) {
    const w = new Array<number>(n);
    for (let i = 0; i < n; i++) {
      const v = uy[i]! ** 2 + (ux ? fit.slope ** 2 * ux[i]! ** 2 : 0);
      if (!(v > 0)) return ols;
      w[i] = 1 / v;
    }
    const next = regressLine(x, y, w);
    if (!next) return fit;
    const done = Math.abs(next.slope - fit.slope) <= 1e-12 * Math.max(1, Math.abs(next.slope));
    fit = next;
    if (done) break;
  }
  return fit;
}

export interface QuadraticRegression {
  /** Coefficients c0 + c1·x + c2·x². */
  c: [number, number, number];
  /** 3 × 3 covariance of the coefficients. */
  cov: number[][];
  n: number;
}

/**
 * Weighted least-squares parabola with the covariance of its coefficients: (XᵀWX)⁻¹ scaled by the
 * residual variance (unit weights) or by the Birge ratio max(1, χ²/(n − 3)) (weights 1/u²).
 * Draper & Smith ch. 5 and 9. x is centred internally for conditioning and mapped back exactly.
 */
export function regressQuadratic(x: ArrayLike<number>, y: ArrayLike<number>, w?: ArrayLike<number>): QuadraticRegression | undefined {
  const n = x.length;
  if (n < 4) return undefined;
  let sw = 0;
  let m = 0;
  for (let i = 0; i < n; i++) {
    sw += w ? w[i]! : 1;
    m += (w ? w[i]! : 1) * x[i]!;
  }
  m /= sw;
  // normal equations in t = x − m
  const A = [
    [0, 0, 0],
    [0, 0, 0],
    [0, 0, 0],
  ];
  const B = [0, 0, 0];
  for (let i = 0; i < n; i++) {
    const wi = w ? w[i]! : 1;
    const t = x[i]! - m;
    const p = [1, t, t * t];
    for (let r = 0; r < 3; r++) {
      for (let c = 0; c < 3; c++) A[r]![c]! += wi * p[r]! * p[c]!;
      B[r]! += wi * p[r]! * y[i]!;
    }
  }
  const inv = invert3(A);
  if (!inv) return undefined;
  const d = [0, 1, 2].map((r) => inv[r]![0]! * B[0]! + inv[r]![1]! * B[1]! + inv[r]![2]! * B[2]!);
  let chi2 = 0;
  for (let i = 0; i < n; i++) {
    const t = x[i]! - m;
    chi2 += (w ? w[i]! : 1) * (y[i]! - d[0]! - d[1]! * t - d[2]! * t * t) ** 2;
  }
  const dof = n - 3;
  const scale = w ? Math.max(1, chi2 / dof) : chi2 / dof;
  // back to powers of x: c0 = d0 − d1·m + d2·m², c1 = d1 − 2·d2·m, c2 = d2 (a linear map J)
  const J = [
    [1, -m, m * m],
    [0, 1, -2 * m],
    [0, 0, 1],
  ];
  const c = [0, 1, 2].map((r) => J[r]![0]! * d[0]! + J[r]![1]! * d[1]! + J[r]![2]! * d[2]!) as [number, number, number];
  const cov = [0, 1, 2].map((r) =>
    [0, 1, 2].map((s) => {
      let v = 0;
      for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) v += J[r]![a]! * inv[a]![b]! * J[s]![b]!;
      return v * scale;
    }),
  );
  return { c, cov, n };
}

function invert3(A: number[][]): number[][] | undefined {
  const [a, b, c] = A[0]!;
  const [d, e, f] = A[1]!;
  const [g, h, k] = A[2]!;
  const det = a! * (e! * k! - f! * h!) - b! * (d! * k! - f! * g!) + c! * (d! * h! - e! * g!);
  if (!(Math.abs(det) > 0) || !Number.isFinite(det)) return undefined;
  return [
    [(e! * k! - f! * h!) / det, (c! * h! - b! * k!) / det, (b! * f! - c! * e!) / det],
    [(f! * g! - d! * k!) / det, (a! * k! - c! * g!) / det, (c! * d! - a! * f!) / det],
    [(d! * h! - e! * g!) / det, (b! * g! - a! * h!) / det, (a! * e! - b! * d!) / det],
  ];
}
