/**
 * The reduction pipeline (DESIGN §2): points → tares → axes and moment transfer → flow state →
 * uncorrected coefficients → wall corrections → fits. Each stage lives in its own module; this one
 * only puts them in order and assembles the contract's result (DESIGN §3.3).
 */
import { BODY_LOADS, WIND_LOADS, type Channel } from '../formats/channels.ts';
import { fitPolar, EMPTY_FIT, type FitResult } from '../fits/characteristics.ts';
import { measure, type MeasureGeometry, type PointInputs } from './measurePoint.ts';
import { InputError, formatNotice, type Notice } from '../contract/messages.ts';
import type { RunData } from '../formats/runFile.ts';
import type { Setup } from '../setup/schema.ts';
import { buildTare, tareAt, type TareTable } from './tare.ts';
import { correct2d, exceedsValidatedBlockage } from '../walls/wall2d.ts';
import { correct3d, correctPoint3d, sortedOrder } from '../walls/wall3d.ts';
import { propagatePoint, type Correct, type PointUncertainty } from '../uncertainty/propagation.ts';
import { NO_FACTORS, RAD, type CorrectedPoint, type TunnelPoint, type WallFactors } from '../walls/types.ts';

export interface PointResult {
  point: string;
  line: number;
  samples: number;
  alpha_deg: number | null;
  alpha_uncorrected_deg: number;
  q_pa: number | null;
  q_uncorrected_pa: number;
  v_mps: number | null;
  v_uncorrected_mps: number;
  mach: number | null;
  mach_uncorrected: number;
  reynolds: number | null;
  reynolds_uncorrected: number;
  rho_kgm3: number;
  mu_pas: number;
  p_static_pa: number;
  p_total_pa: number;
  t_static_k: number;
  t_total_k: number;
  rh_pct: number;
  cl: number | null;
  cd: number | null;
  cm: number | null;
  cl_uncorrected: number;
  cd_uncorrected: number;
  cm_uncorrected: number | null;
  cy: number | null;
  cy_uncorrected: number | null;
  c_roll: number | null;
  c_roll_uncorrected: number | null;
  c_yaw: number | null;
  c_yaw_uncorrected: number | null;
  ld: number | null;
  lift_n: number;
  drag_n: number;
  pitch_ref_nm: number | null;
  cl_scatter: number;
  eps_solid: number | null;
  eps_wake: number | null;
  /** Standard uncertainties (k = 1) of the corrected values; null without an uncertainty block in the setup. */
  u_q_pa: number | null;
  u_v_mps: number | null;
  u_alpha_deg: number | null;
  u_cl: number | null;
  u_cd: number | null;
  u_cm: number | null;
}

export interface ReductionResult {
  run: Record<string, unknown> & { name: string; configuration: string | null };
  points: PointResult[];
  fit: FitResult;
  factors: WallFactors;
  corrections: { enabled: boolean; kind: '2d' | '3d'; wake: 'classic' | 'maskell' | null };
  warnings: string[];
}

export interface ReduceInput {
  run: RunData;
  setup: Setup;
  /** Warnings from reading the setup, reported with the result. */
  setupWarnings?: Notice[];
  tare?: RunData;
  /** Turns corrections off for this run whatever the setup says (`--no-corrections`). */
  noCorrections?: boolean;
}

/** Upper Mach number of "low-speed" testing, where incompressible wall corrections hold (common practice). */
export const LOW_SPEED_MACH = 0.3;

/** Mean of a channel at point i, or undefined when the file has no such column. */
type Getter = (ch: Channel) => number | undefined;

/** Reduce one run. Throws InputError when the run and setup cannot be reduced together. */
export function reduce(input: ReduceInput): ReductionResult {
  const { run, setup } = input;
  const notices: Notice[] = [...(input.setupWarnings ?? []), ...run.warnings];
  const axes = setup.balance.axes;
  requireColumns(run, setup);
  const loadChannels = axes === 'wind' ? WIND_LOADS : BODY_LOADS;
  let tare: TareTable | undefined;
  if (input.tare) {
    tare = buildTare(input.tare, loadChannels);
    notices.push(...input.tare.warnings);
  }

  const S = setup.model.area_m2;
  const c = setup.model.chord_m;
  const b = setup.model.span_m;
  const gamma = setup.flow.gamma;
  const has = (ch: Channel) => run.channels.includes(ch);
  const hasPitch = has('pitch');
  const geometry: MeasureGeometry = { area: S, chord: c, span: b, gamma, axes, offset: setup.model.moment_ref_offset_m, upflow: setup.flow.upflow_deg / RAD };
  const pointInputs: PointInputs[] = [];
  const pointSpread: { n: number; sd: (ch: Channel) => number }[] = [];
  const idx = new Map(run.channels.map((ch, i) => [ch, i] as const));

  const tunnel: TunnelPoint[] = [];
  const rows: Omit<PointResult, 'alpha_deg' | 'q_pa' | 'v_mps' | 'mach' | 'reynolds' | 'cl' | 'cd' | 'cm' | 'cy' | 'c_roll' | 'c_yaw' | 'ld' | 'eps_solid' | 'eps_wake' | keyof PointUncertainty>[] = [];
  const scatter: number[] = [];
  // The first point that could not be reduced and how many were skipped, so that a run where none
  // reduces says why and where (its warnings are lost when the reduction stops; fuzz finding).
  let firstSkip: Notice | undefined;
  let skippedPoints = 0;
  const skipPoint = (n: Notice) => {
    notices.push(n);
    firstSkip ??= n;
    skippedPoints++;
  };
  for (const pt of run.points) {
    const get: Getter = (ch) => {
      const i = idx.get(ch);
      return i === undefined ? undefined : pt.mean[i];
    };
    const sd = (ch: Channel) => {
      const i = idx.get(ch);
      return i === undefined ? 0 : pt.std[i]!;
    };
    const where = `point ${pt.key} (line ${pt.line})`;
    const alpha = get('alpha')!;
    const p = get('p_static') ?? setup.ambient.p_pa!;
    const T0 = get('t_total') ?? setup.ambient.t_c! + 273.15;
    const rh = get('rh') ?? setup.ambient.rh_pct! / 100;
    const dp = get('dp_pitot')!;
    // Number.isFinite(alpha): a point's mean overflows to ±Infinity or NaN when samples near ±1.8e308 are averaged (fuzz finding)
    if (!(dp > 0) || !(p > 0) || !(T0 > 0) || !(rh >= 0) || !Number.isFinite(alpha)) {
      skipPoint({
        file: run.file,
        line: pt.line,
        message: `${where} skipped: ${!Number.isFinite(alpha) ? 'the angle of attack is not a finite number' : !(dp > 0) ? `pitot impact pressure ${dp.toPrecision(4)} Pa is not positive (wind off?)` : !(p > 0) ? 'static pressure is not positive' : !(T0 > 0) ? 'temperature is below absolute zero' : 'relative humidity is negative'}`,
      });
      continue;
    }
    // loads in the balance's axes, tares removed
    let tareLoads: Map<Channel, number> | undefined;
    if (tare) {
      const t = tareAt(tare, alpha);
      tareLoads = t.loads;
      if (t.clamped) {
        notices.push({
          file: run.file,
          line: pt.line,
          message: `${where}: α = ${(alpha * RAD).toFixed(2)}° lies outside the tare sweep (${(tare.alpha[0]! * RAD).toFixed(2)}° to ${(tare.alpha[tare.alpha.length - 1]! * RAD).toFixed(2)}°); the nearest end value is used`,
        });
      }
    }
    const load = (ch: Channel): number => {
      const v = get(ch);
      return v === undefined ? Number.NaN : v - (tareLoads?.get(ch) ?? 0);
    };
    const [f1, f2] = axes === 'wind' ? (['lift', 'drag'] as const) : (['normal', 'axial'] as const);
    const inputs: PointInputs = { alpha, dp, p, T0, rh, force1: load(f1), force2: load(f2), side: load('side'), pitch: load('pitch'), roll: load('roll'), yaw: load('yaw') };
    const m = measure(inputs, geometry);
    const { flow, tunnel: u } = m;
    const clStd = axes === 'wind' ? sd('lift') : Math.hypot(sd('normal') * Math.cos(alpha), sd('axial') * Math.sin(alpha));
    const qS = flow.q * S;
    // Readings far outside any tunnel's range (rh = 5e305 %, dp = 1e300 Pa or 1e-300 Pa, loads of 1e308 lbf, a
    // tare of ±Infinity) give a flow state or coefficients that are not finite numbers: skip the point and
    // say which quantity, instead of reporting NaN or Infinity (fuzz finding).
    if (flow.mach >= 1) {
      // the subsonic pitot relation has no meaning here; usually a unit slip (kPa read as Pa)
      skipPoint({ file: run.file, line: pt.line, message: `${where} skipped: the pitot readings give Mach ${flow.mach.toFixed(2)}, and the subsonic pitot relation does not hold at Mach 1 and above; check the unit of dp_pitot` });
      continue;
    }
    const broken = nonFiniteQuantity(m, clStd / qS, has);
    if (broken) {
      skipPoint({ file: run.file, line: pt.line, message: `${where} skipped: these readings give ${broken}; check the values and units` });
      continue;
    }
    pointInputs.push(inputs);
    pointSpread.push({ n: pt.n, sd });
    tunnel.push(u);
    scatter.push(clStd / qS / Math.sqrt(pt.n));
    rows.push({
      point: pt.key,
      line: pt.line,
      samples: pt.n,
      alpha_uncorrected_deg: u.alphaDeg,
      q_uncorrected_pa: flow.q,
      v_uncorrected_mps: flow.V,
      mach_uncorrected: flow.mach,
      reynolds_uncorrected: flow.Re,
      rho_kgm3: flow.rho,
      mu_pas: flow.mu,
      p_static_pa: flow.p,
      p_total_pa: flow.p0,
      t_static_k: flow.T,
      t_total_k: flow.T0,
      rh_pct: rh * 100,
      cl_uncorrected: u.cl,
      cd_uncorrected: u.cd,
      cm_uncorrected: orNull(u.cm),
      cy_uncorrected: orNull(u.cy),
      c_roll_uncorrected: orNull(u.cRoll),
      c_yaw_uncorrected: orNull(u.cYaw),
      lift_n: m.lift,
      drag_n: m.drag,
      pitch_ref_nm: orNull(m.pitchRef),
      cl_scatter: scatter[scatter.length - 1]!,
    });
  }
  if (tunnel.length === 0) {
    // named by the first skipped point's line and reason, so the refusal says where (fuzz finding)
    throw new InputError({
      file: run.file,
      line: firstSkip?.line ?? run.headerLine,
      message: `no point could be reduced${firstSkip ? `: ${firstSkip.message}` : ''}${skippedPoints > 1 ? ` (and ${skippedPoints - 1} more points skipped)` : ''}`,
    });
  }
  if (!hasPitch) notices.push({ file: run.file, message: 'no "pitch" column: pitching-moment coefficients are not given' });
  const maxMach = Math.max(...tunnel.map((t) => t.mach));
  if (maxMach > LOW_SPEED_MACH) {
    notices.push({ file: run.file, message: `Mach number up to ${maxMach.toFixed(2)}: above about ${LOW_SPEED_MACH} compressibility matters, and the wall corrections used here are the incompressible ones` });
  }

  // wall corrections
  const enabled = setup.corrections.enabled && !input.noCorrections;
  let corrected: CorrectedPoint[] | undefined;
  let factors: WallFactors = NO_FACTORS;
  /** The correction of one point with the run's factors fixed, for the uncertainty propagation. */
  let correctOne: Correct = (t) => t;
  const kind = setup.model.kind;
  if (enabled) {
    if (kind === '2d') {
      const g = {
        chord: c,
        height: setup.tunnel.height_m,
        width: setup.tunnel.width_m,
        volume: setup.model.volume_m3,
        k1: setup.corrections.solid_blockage_k,
      };
      if (g.volume === null) notices.push({ field: 'model.volume_m3', message: 'not given: solid blockage is skipped (ε_solid = 0)' });
      if (!hasPitch) notices.push({ file: run.file, message: 'without a pitching moment the 2D angle correction uses the cl term alone' });
      corrected = tunnel.map((p) => correct2d(p, g));
      correctOne = (t) => correct2d(t, g);
      const over = corrected.filter(exceedsValidatedBlockage).length;
      if (over > 0) notices.push({ message: `${over} point(s) have a total blockage ε above 0.1, outside the range where the 2D corrections are validated; results are given but treat them with caution` });
      factors = { sigma: ((Math.PI * Math.PI) / 48) * (c / g.height) ** 2, delta: null, tau1: null, tau2: null, solid_blockage_k: g.k1 };
    } else {
      const res = correct3d(tunnel, scatter, {
        area: S,
        span: b,
        chord: c,
        width: setup.tunnel.width_m,
        height: setup.tunnel.height_m,
        volume: setup.model.volume_m3,
        k: setup.corrections.solid_blockage_k,
        loading: setup.model.loading,
        wake: setup.corrections.wake,
        delta: setup.corrections.delta,
        tau1: setup.corrections.tau1,
        tau2: setup.corrections.tau2,
      });
      corrected = res.points;
      factors = res.factors;
      correctOne = (t) => correctPoint3d(t, res.context);
      notices.push(...res.warnings.map((message) => ({ message })));
    }
  }

  // A point whose corrected values overflow (a blockage ε of 1e299 from CD = 1e300) is dropped and named,
  // like a point whose readings are out of range (fuzz finding).
  if (corrected) {
    const keep = corrected.map((k, i) => {
      const bad = nonFiniteCorrected(k, has);
      if (bad) skipPoint({ file: run.file, line: rows[i]!.line, message: `point ${rows[i]!.point} (line ${rows[i]!.line}) skipped: the wall corrections give ${bad}; check the values and units` });
      return !bad;
    });
    for (let i = keep.length - 1; i >= 0; i--) {
      if (keep[i]) continue;
      for (const list of [rows, tunnel, scatter, pointInputs, pointSpread, corrected] as unknown[][]) list.splice(i, 1);
    }
    if (rows.length === 0) {
      throw new InputError({ file: run.file, line: firstSkip!.line, message: `no point could be reduced: ${firstSkip!.message}${skippedPoints > 1 ? ` (and ${skippedPoints - 1} more points skipped)` : ''}` });
    }
  }

  const spec = setup.uncertainty;
  const points: PointResult[] = rows.map((r, i) => {
    const k = corrected?.[i];
    const u: PointUncertainty | null = spec ? propagatePoint(pointInputs[i]!, geometry, spec, pointSpread[i]!, correctOne) : null;
    const cl = k ? k.cl : r.cl_uncorrected;
    const cd = k ? k.cd : r.cd_uncorrected;
    // one explicit literal per point: spreading `r` made 5,000-point runs spend most of their time in GC
    return {
      point: r.point,
      line: r.line,
      samples: r.samples,
      alpha_deg: k ? k.alphaDeg : r.alpha_uncorrected_deg,
      alpha_uncorrected_deg: r.alpha_uncorrected_deg,
      q_pa: k ? k.q : r.q_uncorrected_pa,
      q_uncorrected_pa: r.q_uncorrected_pa,
      v_mps: k ? k.V : r.v_uncorrected_mps,
      v_uncorrected_mps: r.v_uncorrected_mps,
      mach: k ? k.mach : r.mach_uncorrected,
      mach_uncorrected: r.mach_uncorrected,
      reynolds: k ? k.Re : r.reynolds_uncorrected,
      reynolds_uncorrected: r.reynolds_uncorrected,
      rho_kgm3: r.rho_kgm3,
      mu_pas: r.mu_pas,
      p_static_pa: r.p_static_pa,
      p_total_pa: r.p_total_pa,
      t_static_k: r.t_static_k,
      t_total_k: r.t_total_k,
      rh_pct: r.rh_pct,
      cl,
      cd,
      cm: k ? orNull(k.cm) : r.cm_uncorrected,
      cl_uncorrected: r.cl_uncorrected,
      cd_uncorrected: r.cd_uncorrected,
      cm_uncorrected: r.cm_uncorrected,
      cy: k ? orNull(k.cy) : r.cy_uncorrected,
      cy_uncorrected: r.cy_uncorrected,
      c_roll: k ? orNull(k.cRoll) : r.c_roll_uncorrected,
      c_roll_uncorrected: r.c_roll_uncorrected,
      c_yaw: k ? orNull(k.cYaw) : r.c_yaw_uncorrected,
      c_yaw_uncorrected: r.c_yaw_uncorrected,
      ld: orNull(cl / cd), // null for cd = 0 and when the ratio overflows (cd = 5e-324; fuzz finding)
      lift_n: r.lift_n,
      drag_n: r.drag_n,
      pitch_ref_nm: r.pitch_ref_nm,
      cl_scatter: r.cl_scatter,
      eps_solid: k ? k.epsSolid : null,
      eps_wake: k ? k.epsWake : null,
      // an uncertainty that overflows (model.area_m2 = 1e-300) cannot be determined: null, never Infinity (fuzz finding)
      u_q_pa: orNull(u?.u_q_pa ?? Number.NaN),
      u_v_mps: orNull(u?.u_v_mps ?? Number.NaN),
      u_alpha_deg: orNull(u?.u_alpha_deg ?? Number.NaN),
      u_cl: orNull(u?.u_cl ?? Number.NaN),
      u_cd: orNull(u?.u_cd ?? Number.NaN),
      u_cm: orNull(u?.u_cm ?? Number.NaN),
    };
  });

  // fits, on corrected values (uncorrected when corrections are off), sorted by α
  const alphas = points.map((p) => p.alpha_deg!);
  const order = sortedOrder(alphas);
  if (hasHysteresis(points.map((p) => p.alpha_uncorrected_deg))) {
    notices.push({ file: run.file, message: 'α is repeated or not monotonic in the file (a return sweep?): the fits use the points sorted by α, and hysteresis between the sweeps is not separated' });
  }
  let fit: FitResult = { ...EMPTY_FIT };
  const f = fitPolar({
    alphaDeg: order.map((i) => alphas[i]!),
    cl: order.map((i) => points[i]!.cl!),
    cd: order.map((i) => points[i]!.cd!),
    cm: order.map((i) => points[i]!.cm ?? Number.NaN),
    clScatter: order.map((i) => scatter[i]!),
    clU: spec ? order.map((i) => points[i]!.u_cl!) : undefined,
    cdU: spec ? order.map((i) => points[i]!.u_cd!) : undefined,
    kind,
    aspectRatio: (b * b) / S,
  });
  fit = f.fit;
  notices.push(...f.warnings.map((message) => ({ message })));

  const meta = run.metadata;
  const fileStem = run.file.replace(/^.*[\\/]/, '').replace(/\.[^.]*$/, '');
  return {
    run: {
      ...meta,
      name: meta['run'] ?? fileStem,
      configuration: meta['configuration'] ?? null,
      source_file: run.file.replace(/^.*[\\/]/, ''),
      tare_file: input.tare ? input.tare.file.replace(/^.*[\\/]/, '') : null,
      rows_read: run.rowsRead,
      rows_skipped: run.rowsSkipped,
    },
    points,
    fit,
    factors,
    corrections: { enabled, kind, wake: enabled && kind === '3d' ? setup.corrections.wake : null },
    warnings: notices.map(formatNotice),
  };
}

function orNull(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

/** The first corrected value that is not a finite number, described for a warning; undefined when all are. */
function nonFiniteCorrected(k: CorrectedPoint, has: (ch: Channel) => boolean): string | undefined {
  const always: [string, number][] = [['α', k.alphaDeg], ['CL', k.cl], ['CD', k.cd], ['q', k.q], ['V', k.V], ['Mach', k.mach], ['Re', k.Re], ['ε_solid', k.epsSolid], ['ε_wake', k.epsWake]];
  for (const [name, v] of always) if (!Number.isFinite(v)) return `${name} = ${v}`;
  const optional: [Channel, string, number][] = [['pitch', 'Cm', k.cm], ['side', 'CY', k.cy], ['roll', 'C_roll', k.cRoll], ['yaw', 'C_yaw', k.cYaw]];
  for (const [ch, name, v] of optional) if (has(ch) && !Number.isFinite(v)) return `${name} = ${v}`;
  return undefined;
}

/**
 * The first quantity of a measured point that is not a finite number (or, for the flow state, not
 * positive), described for a warning; undefined when all are. Moments and side force count only when
 * measured (they are NaN without their column).
 */
function nonFiniteQuantity(m: ReturnType<typeof measure>, clScatter: number, has: (ch: Channel) => boolean): string | undefined {
  const f = m.flow;
  const positive: [string, number][] = [['q', f.q], ['ρ', f.rho], ['V', f.V], ['T', f.T], ['μ', f.mu], ['Re', f.Re]];
  for (const [name, v] of positive) if (!(Number.isFinite(v) && v > 0)) return `${name} = ${v}`;
  const t = m.tunnel;
  const finite: [string, number][] = [['Mach', f.mach], ['CL', t.cl], ['CD', t.cd], ['CL scatter', clScatter], ['lift', m.lift], ['drag', m.drag]];
  for (const [name, v] of finite) if (!Number.isFinite(v)) return `${name} = ${v}`;
  const optional: [Channel, string, number][] = [['pitch', 'Cm', t.cm], ['side', 'CY', t.cy], ['roll', 'C_roll', t.cRoll], ['yaw', 'C_yaw', t.cYaw]];
  for (const [ch, name, v] of optional) if (has(ch) && !Number.isFinite(v)) return `${name} = ${v}`;
  return undefined;
}

/** True when α goes back on itself or repeats in file order. */
function hasHysteresis(alpha: number[]): boolean {
  let dir = 0;
  for (let i = 1; i < alpha.length; i++) {
    const d = Math.sign(alpha[i]! - alpha[i - 1]!);
    if (d === 0) return true;
    if (dir === 0) dir = d;
    else if (d !== dir) return true;
  }
  return false;
}

/** Stop with a message naming the header line when a column the setup needs is absent. */
function requireColumns(run: RunData, setup: Setup): void {
  const has = (ch: Channel) => run.channels.includes(ch);
  const missing = (ch: string, why: string): never => {
    throw new InputError({ file: run.file, line: run.headerLine, message: `missing required column "${ch}" (${why})` });
  };
  if (!has('alpha')) missing('alpha', 'angle of attack');
  if (!has('dp_pitot')) missing('dp_pitot', 'pitot-static impact pressure');
  if (setup.balance.axes === 'wind') {
    for (const ch of ['lift', 'drag'] as const) {
      if (!has(ch)) missing(ch, has('normal') && has('axial') ? 'the setup says balance.axes "wind", but the file has normal/axial columns: set balance.axes to "body"' : 'the setup says balance.axes "wind"');
    }
  } else {
    for (const ch of ['normal', 'axial'] as const) {
      if (!has(ch)) missing(ch, has('lift') && has('drag') ? 'the setup says balance.axes "body", but the file has lift/drag columns: set balance.axes to "wind"' : 'the setup says balance.axes "body"');
    }
  }
  const ambient: [Channel, keyof Setup['ambient'], string][] = [
    ['p_static', 'p_pa', 'static pressure'],
    ['t_total', 't_c', 'stagnation temperature'],
    ['rh', 'rh_pct', 'relative humidity'],
  ];
  for (const [ch, key, what] of ambient) {
    if (!has(ch) && setup.ambient[key] === undefined) {
      throw new InputError({
        field: `ambient.${key}`,
        file: run.file,
        line: run.headerLine,
        message: `the run has no "${ch}" column, so the setup must give the ${what} as ambient.${key}`,
      });
    }
  }
}
