/**
 * Error bars: each point's standard uncertainties (k = 1) along the plotted axes. CL, CD, Cm and α
 * carry the engine's own per-point values (core/uncertainty.ts, null without an `uncertainty` block in
 * the setup); L/D is not propagated by the engine, so it is propagated here from u(CL) and u(CD).
 */

/** What the bars mean, said once wherever they are shown. */
export const ERROR_BAR_NOTE = 'Error bars: ± one standard uncertainty (k = 1, about 68 % coverage) from the setup\'s instrument uncertainties and each point\'s sample scatter.';

/** Why the toggle is off when no run carries uncertainties. */
export const NO_UNCERTAINTY_NOTE = 'No run shown carries uncertainties: give its setup instrument uncertainties (Setup view, "Instrument uncertainties").';

/**
 * Standard uncertainty of L/D = CL/CD by the GUM first-order law (JCGM 100:2008 eq. 10), inputs taken
 * as uncorrelated: ∂(L/D)/∂CL = 1/CD, ∂(L/D)/∂CD = −CL/CD², so
 *   u(L/D) = √( (u(CL)/CD)² + (CL·u(CD)/CD²)² ).
 * Written without dividing by CL, so it holds at zero lift. Neglecting the covariance of CL and CD (both
 * scale with the same q and S, whose error cancels in the ratio) makes this an upper estimate.
 * Null when an input is missing or CD is zero.
 */
export function ldUncertainty(cl: number | null, cd: number | null, uCl: number | null, uCd: number | null): number | null {
  if (cl === null || cd === null || uCl === null || uCd === null || cd === 0) return null;
  const u = Math.hypot(uCl / cd, (cl * uCd) / (cd * cd));
  return Number.isFinite(u) ? u : null;
}

/** A point of a plotted series, with its standard uncertainties along x and y where known. */
export interface PlotPoint {
  x: number;
  y: number;
  /** Standard uncertainty along x (k = 1); absent when unknown. */
  xu?: number;
  /** Standard uncertainty along y (k = 1); absent when unknown. */
  yu?: number;
}

/** A point with its uncertainties attached where they are finite and not negative. */
export function withUncertainty(x: number, y: number, xu: number | null | undefined, yu: number | null | undefined): PlotPoint {
  const p: PlotPoint = { x, y };
  if (xu !== null && xu !== undefined && Number.isFinite(xu) && xu >= 0) p.xu = xu;
  if (yu !== null && yu !== undefined && Number.isFinite(yu) && yu >= 0) p.yu = yu;
  return p;
}

/** Whether any point of any series has an uncertainty to draw. */
export function anyUncertainty(series: readonly { points: readonly PlotPoint[] }[]): boolean {
  return series.some((s) => s.points.some((p) => p.xu !== undefined || p.yu !== undefined));
}

/** The ends of a point's bars in data units: [x − u, x + u] and [y − u, y + u], null where there is none. */
export function barEnds(p: PlotPoint): { x: [number, number] | null; y: [number, number] | null } {
  return {
    x: p.xu !== undefined && p.xu > 0 ? [p.x - p.xu, p.x + p.xu] : null,
    y: p.yu !== undefined && p.yu > 0 ? [p.y - p.yu, p.y + p.yu] : null,
  };
}
