/**
 * Wind-off points inside a run, zero readings and the dynamic-pressure source, before any load is
 * reduced to coefficients:
 *
 * - the pressure source: `q` (the facility's own dynamic pressure), else `dp_pitot`, else
 *   `dp_contraction` × `flow.contraction_factor`; a notice names the one used when several are present;
 * - a point whose q is below 5 % of the median q of the run's points is wind-off, never reduced;
 * - wind-off points at three or more distinct alphas become the run's tare when none is given;
 * - wind-off points at one alpha at the very start and/or end of the file are zero readings: their
 *   loads minus the tare at their alpha give the balance's zero shift, interpolated linearly in file
 *   order (or in the `time` column) between a start and an end reading, constant with one;
 * - any other wind-off point is left out with a warning naming its line.
 *
 * Balance zero-drift removal by readings before and after the run is common practice (Barlow, Rae &
 * Pope, Low-Speed Wind Tunnel Testing, 3rd ed., 1999, §7 on balance tares and zeros); the 5 % wind-off
 * threshold and the linear interpolation are the data contract's choice.
 *
 * Everything here is a pure function of the read points, so it is tested on its own.
 */
import { BODY_LOADS, PRESSURE_SOURCES, WIND_LOADS, type Channel } from '../formats/channels.ts';
import type { PointStats } from '../formats/pointStats.ts';
import type { RunData } from '../formats/runFile.ts';
import { WIND_OFF_FRACTION } from '../formats/runFile.ts';
import { InputError, type Notice } from '../contract/messages.ts';
import type { Setup } from '../setup/schema.ts';
import { missingChannelMessage } from '../formats/columnMap.ts';

const RAD = 180 / Math.PI;

/** Which pressure column gives q, by the contract's precedence; undefined when the file has none. */
export function pressureSource(channels: readonly Channel[]): Channel | undefined {
  return PRESSURE_SOURCES.find((c) => channels.includes(c));
}

/**
 * The pitot impact pressure p0 − p that gives dynamic pressure q at static pressure p, so that a
 * facility's logged q (taken as (γ/2)·p·M², data contract) enters the one flow-state computation:
 * M² = 2q/(γp), p0/p = (1 + (γ−1)/2·M²)^(γ/(γ−1)) (isentropic flow, NACA Report 1135, eqs. 44 and 48).
 * A q that is not positive is returned as it is, so the point is refused downstream as wind-off.
 */
export function impactPressureFromQ(q: number, p: number, gamma: number): number {
  if (!(q > 0) || !(p > 0)) return q;
  const m2 = (2 * q) / (gamma * p);
  return p * ((1 + ((gamma - 1) / 2) * m2) ** (gamma / (gamma - 1)) - 1);
}

/** A point's dynamic pressure as the source gives it (near enough for telling wind-off from wind-on). */
export function roughQ(source: Channel, value: number, contractionFactor: number | undefined): number {
  return source === 'dp_contraction' ? value * (contractionFactor ?? Number.NaN) : value;
}

/** Median of the finite values; NaN when there are none. */
export function median(values: readonly number[]): number {
  const v = values.filter(Number.isFinite).sort((a, b) => a - b);
  if (v.length === 0) return Number.NaN;
  const m = v.length >> 1;
  return v.length % 2 === 1 ? v[m]! : (v[m - 1]! + v[m]!) / 2;
}

/** Wind-off flags: q below 5 % of the median q of the points (data contract). */
export function classifyWindOff(q: readonly number[]): boolean[] {
  const threshold = WIND_OFF_FRACTION * median(q);
  return q.map((x) => !(x >= threshold) || !(threshold > 0));
}

/**
 * Two points pooled into one: counts add, means are weighted, and the sums of squared deviations
 * combine with the between-means term (Chan, Golub & LeVeque, "Updating formulae and a pairwise
 * algorithm for computing sample variances", Stanford CS report STAN-CS-79-773, 1979).
 */
export function poolPoints(a: PointStats, b: PointStats): PointStats {
  const n = a.n + b.n;
  const w = a.mean.length;
  const mean = new Float64Array(w);
  const std = new Float64Array(w);
  for (let i = 0; i < w; i++) {
    const d = b.mean[i]! - a.mean[i]!;
    mean[i] = a.mean[i]! + (d * b.n) / n;
    const m2 = a.std[i]! ** 2 * (a.n - 1) + b.std[i]! ** 2 * (b.n - 1) + (d * d * a.n * b.n) / n;
    std[i] = n > 1 ? Math.sqrt(Math.max(0, m2) / (n - 1)) : 0;
  }
  return { key: a.key, line: a.line, n, mean, std };
}

/**
 * Consecutive wind-off points within the alpha tolerance of the first, pooled into one. Needed only
 * for files grouped without a point column, where a wind-off point's noisy pressure may have split
 * its samples (the reader cannot know the run's median q while streaming).
 */
export function poolWindOffRuns(
  points: readonly PointStats[],
  off: readonly boolean[],
  alphaIndex: number,
  tolRad: number,
): { points: PointStats[]; off: boolean[] } {
  const outP: PointStats[] = [];
  const outOff: boolean[] = [];
  let firstAlpha = Number.NaN;
  points.forEach((p, i) => {
    const last = outP.length - 1;
    if (off[i] && last >= 0 && outOff[last] && Math.abs(p.mean[alphaIndex]! - firstAlpha) <= tolRad) {
      outP[last] = poolPoints(outP[last]!, p);
      return;
    }
    outP.push(p);
    outOff.push(off[i]!);
    firstAlpha = p.mean[alphaIndex]!;
  });
  return { points: outP, off: outOff };
}

/** Number of distinct alphas, values closer than `tol` to the previous distinct one counting as one. */
export function distinctAlphas(alphas: readonly number[], tol: number): number {
  const a = [...alphas].sort((x, y) => x - y);
  let n = 0;
  let last = Number.NEGATIVE_INFINITY;
  for (const x of a) {
    if (x - last > tol) {
      n++;
      last = x;
    }
  }
  return n;
}

export type WindOffRole = 'on' | 'zero-start' | 'zero-end' | 'tare' | 'excluded';

/**
 * The role of every point: wind-on; a zero reading at the start or end (the leading or trailing
 * wind-off points, all at one alpha); part of the embedded tare (the other wind-off points, when they
 * span at least three distinct alphas and no tare file is given); or excluded.
 */
export function windOffRoles(alphas: readonly number[], off: readonly boolean[], tolRad: number, tareGiven: boolean): WindOffRole[] {
  const n = alphas.length;
  const roles: WindOffRole[] = off.map((o) => (o ? 'excluded' : 'on'));
  const firstOn = off.indexOf(false);
  if (firstOn < 0) return roles;
  const lastOn = off.lastIndexOf(false);
  // extremes by a loop: a run's alphas may be too many to spread into Math.max
  const spanOf = (from: number, to: number) => {
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = from; i < to; i++) {
      lo = Math.min(lo, alphas[i]!);
      hi = Math.max(hi, alphas[i]!);
    }
    return hi - lo;
  };
  const oneAlpha = (from: number, to: number) => to > from && distinctAlphas(alphas.slice(from, to), tolRad) === 1 && spanOf(from, to) <= tolRad;
  if (oneAlpha(0, firstOn)) for (let i = 0; i < firstOn; i++) roles[i] = 'zero-start';
  if (oneAlpha(lastOn + 1, n)) for (let i = lastOn + 1; i < n; i++) roles[i] = 'zero-end';
  const rest = roles.map((r, i) => (r === 'excluded' ? i : -1)).filter((i) => i >= 0);
  if (
    !tareGiven &&
    distinctAlphas(
      rest.map((i) => alphas[i]!),
      tolRad,
    ) >= 3
  )
    for (const i of rest) roles[i] = 'tare';
  return roles;
}

/**
 * Balance zero shift at each position: one reading gives a constant shift; a start and an end
 * reading give a shift linear in position between them (held at the end values outside).
 * `start`/`end`: position and shift per load channel.
 */
export function zeroShiftAt(
  position: number,
  start: { at: number; shift: Float64Array } | undefined,
  end: { at: number; shift: Float64Array } | undefined,
): Float64Array | undefined {
  if (!start && !end) return undefined;
  if (!start || !end || end.at === start.at) return (start ?? end)!.shift;
  const t = Math.min(1, Math.max(0, (position - start.at) / (end.at - start.at)));
  return start.shift.map((s, i) => s + t * (end.shift[i]! - s));
}

/** Tare loads at an alpha, by channel; from core/reduction/tare.ts or zero without a tare. */
export type TareLookup = (alpha: number) => Map<Channel, number> | undefined;

export interface PreparedRun {
  /** The run with wind-on points only, the pressure source turned into `dp_pitot`, zero shift removed from the loads. */
  run: RunData;
  /** The wind-off sweep of the run, as a tare, when it serves as one. */
  embeddedTare: RunData | undefined;
  notices: Notice[];
  /** Pressure column used for q. */
  source: Channel;
}

/**
 * Prepare a read run for the reduction: choose the pressure source, find the wind-off points, take
 * the embedded tare when no tare is given, remove the balance zero drift, and give every remaining
 * wind-on point a `dp_pitot` mean (the impact pressure of its q). `tareLookup(tareRun)` builds the
 * tare interpolation for the zero readings; it is given the embedded tare when there is one.
 */
export function prepareRun(run: RunData, setup: Setup, tare: RunData | undefined, tareLookup: (t: RunData) => TareLookup): PreparedRun {
  const notices: Notice[] = [];
  const source = pressureSource(run.channels);
  if (source === undefined) {
    throw new InputError({ file: run.file, line: run.headerLine, message: 'no dynamic-pressure column: the run needs "q", "dp_pitot" or "dp_contraction"' });
  }
  const present = PRESSURE_SOURCES.filter((c) => run.channels.includes(c));
  if (present.length > 1)
    notices.push({
      file: run.file,
      message: `pressure columns ${present.map((c) => `"${c}"`).join(', ')} are all present: q is taken from "${source}" (order of precedence q, dp_pitot, dp_contraction)`,
    });
  const factor = setup.flow.contraction_factor;
  if (source === 'dp_contraction' && factor === undefined) {
    throw new InputError({
      file: run.file,
      field: 'flow.contraction_factor',
      message:
        'the run gives q by "dp_contraction", so the setup must give flow.contraction_factor (q per unit contraction pressure drop, from the facility calibration)',
    });
  }
  requireChannels(run, setup);
  const idx = (c: Channel) => run.channels.indexOf(c);
  const si = idx(source);
  const ai = idx('alpha');
  const tol = ((setup.grouping?.alpha_tol_deg ?? 0.2) * Math.PI) / 180;
  let points = run.points;
  let off = classifyWindOff(points.map((p) => roughQ(source, p.mean[si]!, factor)));
  if (run.grouped && ai >= 0) ({ points, off } = poolWindOffRuns(points, off, ai, tol));

  // the run's load channels: those of the balance axes the file carries
  const loads = (setup.balance.axes === 'wind' ? WIND_LOADS : BODY_LOADS).filter((c) => run.channels.includes(c));
  const alphas = points.map((p) => (ai >= 0 ? p.mean[ai]! : Number.NaN));
  const roles = ai >= 0 ? windOffRoles(alphas, off, tol, tare !== undefined) : off.map((o) => (o ? ('excluded' as const) : ('on' as const)));
  const pick = (role: WindOffRole) => points.filter((_, i) => roles[i] === role);

  let embeddedTare: RunData | undefined;
  const tarePoints = pick('tare');
  if (tarePoints.length > 0) {
    embeddedTare = { ...run, points: tarePoints, warnings: [], file: run.file };
    const lines = tarePoints.map((p) => p.line);
    notices.push({
      file: run.file,
      message: `no tare file given: the run's own wind-off points (${tarePoints.length}, at ${distinctAlphas(
        tarePoints.map((p) => p.mean[ai]!),
        tol,
      )} angles, lines ${lines[0]}–${lines[lines.length - 1]}) are used as its tare`,
    });
  }
  const label = source === 'q' ? 'dynamic pressure q' : source === 'dp_pitot' ? 'pitot impact pressure' : 'q from dp_contraction';
  const runMedian = median(points.map((p) => roughQ(source, p.mean[si]!, factor)));
  for (const p of pick('excluded')) {
    const q = roughQ(source, p.mean[si]!, factor);
    const why =
      tare && tarePoints.length === 0 && roles.some((r) => r === 'excluded')
        ? "; a tare file is given, so the run's wind-off points are not used as its tare"
        : '';
    notices.push({
      file: run.file,
      line: p.line,
      message: `point ${p.key} (line ${p.line}) skipped: wind-off (${label} ${q.toPrecision(4)} Pa, below ${WIND_OFF_FRACTION * 100} % of the run's median ${runMedian.toPrecision(4)} Pa); not reduced to coefficients${why}`,
    });
  }

  // zero readings: loads minus the tare at their alpha give the shift
  const ti = idx('time');
  const position = (p: PointStats) => (ti >= 0 ? p.mean[ti]! : p.line);
  const lookup = tare ? tareLookup(tare) : embeddedTare ? tareLookup(embeddedTare) : undefined;
  const reading = (role: WindOffRole) => {
    const zs = pick(role);
    if (zs.length === 0) return undefined;
    const z = zs.reduce(poolPoints);
    const t = lookup?.(z.mean[ai]!);
    const shift = Float64Array.from(loads, (c) => z.mean[idx(c)]! - (t?.get(c) ?? 0));
    return { at: position(z), shift, line: z.line };
  };
  const start = reading('zero-start');
  const end = reading('zero-end');
  if (start || end) {
    const fmt = (r: { shift: Float64Array }) => loads.map((c, k) => `${c} ${r.shift[k]!.toPrecision(3)}`).join(', ');
    notices.push({
      file: run.file,
      message: `balance zero drift removed: ${start ? `start reading at line ${start.line} (${fmt(start)})` : ''}${start && end ? ', ' : ''}${end ? `end reading at line ${end.line} (${fmt(end)})` : ''} in SI units; ${start && end ? `interpolated linearly in ${ti >= 0 ? 'the time column' : 'file order'}` : 'one reading: a constant shift'}`,
    });
  }

  // wind-on points, with dp_pitot from the source and the zero shift removed
  const pi = idx('p_static');
  const gamma = setup.flow.gamma;
  const pAmbient = setup.ambient.p_pa;
  let channels = run.channels;
  let dpIndex = idx('dp_pitot');
  if (dpIndex < 0) {
    channels = [...run.channels, 'dp_pitot'];
    dpIndex = channels.length - 1;
  }
  const width = channels.length;
  const on = points
    .filter((_, i) => roles[i] === 'on')
    .map((p) => {
      const shift = zeroShiftAt(position(p), start, end);
      // unchanged points are passed on as they are: a copy per point doubled the memory of large runs
      if (source === 'dp_pitot' && !shift && width === p.mean.length) return p;
      const mean = new Float64Array(width);
      const std = new Float64Array(width);
      mean.set(p.mean);
      std.set(p.std);
      if (source !== 'dp_pitot') {
        const q = roughQ(source, p.mean[si]!, factor);
        const pStatic = pi >= 0 ? p.mean[pi]! : (pAmbient ?? Number.NaN);
        const dp = impactPressureFromQ(q, pStatic, gamma);
        mean[dpIndex] = dp;
        // first order: the spread of q carried through dp/dq ≈ dp/q
        std[dpIndex] = q > 0 ? (p.std[si]! * (source === 'dp_contraction' ? factor! : 1) * dp) / q : 0;
      }
      if (shift) loads.forEach((c, k) => (mean[idx(c)] = mean[idx(c)]! - shift[k]!));
      return { ...p, mean, std };
    });
  if (on.length === 0) {
    // named by the first point, as any run where no point reduces
    const first = points[0]!;
    const q = roughQ(source, first.mean[si]!, factor);
    const why =
      q > 0
        ? `${label} ${q.toPrecision(4)} Pa is below ${WIND_OFF_FRACTION * 100} % of the run's median`
        : `${label} ${q.toFixed(3)} Pa is not positive (wind off?)`;
    const more = points.length > 1 ? ` (and ${points.length - 1} more points skipped)` : '';
    throw new InputError({
      file: run.file,
      line: first.line,
      message: `no point could be reduced: point ${first.key} (line ${first.line}) skipped: ${why}${more}; every point is wind-off (is the pressure column right, and its unit?)`,
    });
  }
  if (source !== 'dp_pitot' && present.length === 1)
    notices.push({
      file: run.file,
      message: `q is taken from "${source}"${source === 'dp_contraction' ? ` × flow.contraction_factor ${factor}` : ' as the facility logged it'}`,
    });
  return { run: { ...run, channels, points: on }, embeddedTare, notices, source };
}

/**
 * Checks of a tare against the run it serves: it holds every load channel the run uses (else it
 * would leave some loads untared), and it is wind-off (a pressure column whose median q exceeds 5 %
 * of the run's median q marks a wind-on file given by mistake).
 */
export function checkTare(run: RunData, tare: RunData, setup: Setup): void {
  const loads = (setup.balance.axes === 'wind' ? WIND_LOADS : BODY_LOADS).filter((c) => run.channels.includes(c));
  for (const c of loads) {
    if (!tare.channels.includes(c)) {
      throw new InputError({
        file: tare.file,
        line: tare.headerLine,
        message: `the tare has no "${c}" column, which the run ${basename(run.file)} uses; a tare must hold every load channel of the run (found: ${tare.channels.join(', ') || 'none'})`,
      });
    }
  }
  const ts = pressureSource(tare.channels);
  const rs = pressureSource(run.channels);
  if (ts === undefined || rs === undefined) return;
  const factor = setup.flow.contraction_factor;
  const tq = median(tare.points.map((p) => roughQ(ts, p.mean[tare.channels.indexOf(ts)]!, factor)));
  const rq = median(run.points.map((p) => roughQ(rs, p.mean[run.channels.indexOf(rs)]!, factor)));
  if (tq > WIND_OFF_FRACTION * rq) {
    throw new InputError({
      file: tare.file,
      line: tare.headerLine,
      message: `the tare is a wind-on file: its median q (${tq.toPrecision(3)} Pa, from "${ts}") exceeds ${WIND_OFF_FRACTION * 100} % of the run's (${rq.toPrecision(3)} Pa); a tare is a wind-off sweep`,
    });
  }
}

/**
 * Stop when a column the reduction needs is absent, listing every column of the file with the
 * closest matches, so the column map can be written from the message.
 */
export function requireChannels(run: RunData, setup: Setup): void {
  const has = (c: Channel) => run.channels.includes(c);
  const missing = (c: string, why: string): never => {
    throw new InputError({ file: run.file, line: run.headerLine, message: missingChannelMessage(c, why, run.headerCells ?? []) });
  };
  if (!has('alpha')) missing('alpha', 'angle of attack');
  const [f1, f2, other1, other2, axes, otherAxes] =
    setup.balance.axes === 'wind'
      ? (['lift', 'drag', 'normal', 'axial', 'wind', 'body'] as const)
      : (['normal', 'axial', 'lift', 'drag', 'body', 'wind'] as const);
  for (const c of [f1, f2]) {
    if (!has(c))
      missing(
        c,
        has(other1) && has(other2)
          ? `the setup says balance.axes "${axes}", but the file has ${other1}/${other2} columns: set balance.axes to "${otherAxes}"`
          : `the setup says balance.axes "${axes}"`,
      );
  }
}

function basename(f: string): string {
  return f.replace(/^.*[\\/]/, '');
}

/** Alpha in degrees, for messages. */
export function deg(rad: number): string {
  return (rad * RAD).toFixed(2);
}
