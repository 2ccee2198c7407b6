/**
 * Drag polar and lift-to-drag ratio of one branch's linear range.
 */
import { regressLineEV, regressQuadratic } from './leastSquares.ts';

/** Oswald efficiencies outside this span are physically unusual for a wing (common practice; Raymer, Aircraft Design, §12.6 gives 0.7–0.85 typical). */
export const OSWALD_PLAUSIBLE: readonly [number, number] = [0.3, 1.2];

export interface PolarFit {
  cd0: number;
  k: number;
  cd0_stderr: number | null;
  k_stderr: number | null;
  cambered: { cd_min: number; cl_min_drag: number; cl_min_drag_stderr: number | null; k: number; k_stderr: number | null } | null;
  oswald_e: number | null;
  oswald_e_stderr: number | null;
  /** Which polar gave e. */
  oswald_source: 'cambered polar' | 'polar through CL = 0' | null;
  warnings: string[];
}

/**
 * CD = CD0 + k·CL² by a line in CL² (effective variance for the CL scatter: u_x = 2|CL|·u_CL), and the
 * cambered polar CD = CDmin + k'·(CL − CL_mindrag)² by a weighted parabola in CL. Oswald e = 1/(π·A·k)
 * (Prandtl lifting-line induced drag; Anderson, Fundamentals of Aerodynamics, §5.3) takes k' from the
 * cambered polar whenever CL_mindrag differs from zero by more than two of its standard errors (a cambered
 * wing's polar is not centred on CL = 0, and fitting CD0 + k·CL² to it biases k), else k.
 */
export function dragPolar(cl: readonly number[], cd: readonly number[], kind: '2d' | '3d', aspectRatio: number, uCl?: readonly number[], uCd?: readonly number[], sigmaCd = 0): PolarFit | undefined {
  const x = cl.map((c) => c * c);
  const ux = uCl ? cl.map((c, i) => 2 * Math.abs(c) * uCl[i]!) : undefined;
  const line = regressLineEV(x, cd, uCd, ux, sigmaCd);
  if (!line) return undefined;
  const sqrtOrNull = (v: number) => (Number.isFinite(v) && v >= 0 ? Math.sqrt(v) : null);
  const out: PolarFit = {
    cd0: line.intercept,
    k: line.slope,
    cd0_stderr: sqrtOrNull(line.varIntercept),
    k_stderr: sqrtOrNull(line.varSlope),
    cambered: null,
    oswald_e: null,
    oswald_e_stderr: null,
    oswald_source: null,
    warnings: [],
  };
  const w = uCd ? cd.map((_, i) => 1 / (uCd[i]! ** 2 + (uCl ? (2 * line.slope * cl[i]! * uCl[i]!) ** 2 : 0))) : undefined;
  const q = regressQuadratic(cl, cd, w && w.every((v) => Number.isFinite(v) && v > 0) ? w : undefined);
  if (q && q.c[2] > 0) {
    const [c0, c1, c2] = q.c;
    const clmd = -c1 / (2 * c2);
    // delta method on CL_mindrag = −c1/(2·c2) (JCGM 100:2008 eq. 13)
    const g1 = -1 / (2 * c2);
    const g2 = c1 / (2 * c2 * c2);
    const v = g1 * g1 * q.cov[1]![1]! + g2 * g2 * q.cov[2]![2]! + 2 * g1 * g2 * q.cov[1]![2]!;
    out.cambered = { cd_min: c0 - (c1 * c1) / (4 * c2), cl_min_drag: clmd, cl_min_drag_stderr: sqrtOrNull(v), k: c2, k_stderr: sqrtOrNull(q.cov[2]![2]!) };
  }
  if (kind === '3d') {
    const c = out.cambered;
    const useCambered = c !== null && c.cl_min_drag_stderr !== null && Math.abs(c.cl_min_drag) > 2 * c.cl_min_drag_stderr;
    const k = useCambered ? c!.k : out.k;
    const kse = useCambered ? c!.k_stderr : out.k_stderr;
    if (k > 0) {
      out.oswald_e = 1 / (Math.PI * aspectRatio * k);
      out.oswald_e_stderr = kse === null ? null : (out.oswald_e * kse) / k;
      out.oswald_source = useCambered ? 'cambered polar' : 'polar through CL = 0';
      if (out.oswald_e < OSWALD_PLAUSIBLE[0] || out.oswald_e > OSWALD_PLAUSIBLE[1]) {
        out.warnings.push(`Oswald efficiency ${out.oswald_e.toFixed(2)} (from the ${out.oswald_source}) lies outside ${OSWALD_PLAUSIBLE[0]}–${OSWALD_PLAUSIBLE[1]}, the usual span for a wing; check the aspect ratio, the drag tare and the linear range`);
      }
    } else {
      out.warnings.push('the drag polar has no positive CL² term; Oswald efficiency is not given');
    }
  }
  return out;
}

export interface LdMax {
  ld_max: number;
  cl_at_ld_max: number;
  /** Random standard uncertainty of L/D at the best point: q and the reference area cancel in CL/CD. */
  u: number | null;
}

/**
 * (L/D)max from the points (ordered by rising α), refined by a parabola in CL through the best point
 * and its neighbours when the vertex lies between them (common practice).
 */
export function ldMax(cl: readonly number[], cd: readonly number[], uCl?: readonly number[], uCd?: readonly number[]): LdMax | undefined {
  const n = cl.length;
  let best = -1;
  for (let i = 0; i < n; i++) if (cd[i]! > 0 && (best < 0 || cl[i]! / cd[i]! > cl[best]! / cd[best]!)) best = i;
  if (best < 0) return undefined;
  const ld = cl[best]! / cd[best]!;
  // u(L/D)/(L/D) = √((u_CL/CL)² + (u_CD/CD)²) with the random parts only (GUM eq. 12, uncorrelated)
  const u = uCl && uCd ? Math.abs(ld) * Math.hypot(uCl[best]! / cl[best]!, uCd[best]! / cd[best]!) : null;
  const out: LdMax = { ld_max: ld, cl_at_ld_max: cl[best]!, u: u !== null && Number.isFinite(u) ? u : null };
  if (best > 0 && best < n - 1 && cd[best - 1]! > 0 && cd[best + 1]! > 0) {
    const xs: [number, number, number] = [cl[best - 1]!, cl[best]!, cl[best + 1]!];
    const ys: [number, number, number] = [cl[best - 1]! / cd[best - 1]!, ld, cl[best + 1]! / cd[best + 1]!];
    if (xs[0] < xs[1] && xs[1] < xs[2]) {
      const v = vertex(xs, ys);
      if (v && v.x >= xs[0] && v.x <= xs[2]) {
        out.ld_max = v.y;
        out.cl_at_ld_max = v.x;
      }
    }
  }
  return out;
}

function vertex(x: [number, number, number], y: [number, number, number]): { x: number; y: number } | undefined {
  // Lagrange form: p(t) = a·t² + b·t + c through three points
  const [x0, x1, x2] = x;
  const [y0, y1, y2] = y;
  const d = (x0 - x1) * (x0 - x2) * (x1 - x2);
  const a = (x2 * (y1 - y0) + x1 * (y0 - y2) + x0 * (y2 - y1)) / d;
  const b = (x2 * x2 * (y0 - y1) + x1 * x1 * (y2 - y0) + x0 * x0 * (y1 - y2)) / d;
  const c = (x1 * x2 * (x1 - x2) * y0 + x2 * x0 * (x2 - x0) * y1 + x0 * x1 * (x0 - x1) * y2) / d;
  if (!(a < 0)) return undefined;
  const xv = -b / (2 * a);
  return { x: xv, y: c - (b * b) / (4 * a) };
}
