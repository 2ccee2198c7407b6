/**
 * Writes the bundled demonstration campaign (`npm run samples`). Everything here is INVENTED: a
 * fictional tunnel, a fictional model and made-up "true" coefficient curves, turned into raw readings
 * with seeded noise. It exists to show the tool working; it is not a measurement of anything.
 *
 * Scenario: the Kestrel Moor Polytechnic low-speed tunnel (closed rectangular section 1.2 m wide,
 * 0.9 m high) testing the KM-7 rectangular wing (span 0.9 m, chord 0.225 m) with a 25 % plain flap,
 * on a wind-axis strain-gauge balance, plus a 2D section insert of the same aerofoil.
 */
import { createHash } from 'node:crypto';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { dynamicPressure, machFromImpactPressure } from '../core/physics/pitot.ts';
import { normal } from '../test/support/random.ts';
import { fitCalibration, parseLoadings } from '../core/balance/calibrate.ts';
import { outputsFromLoads } from '../core/balance/convert.ts';
import { validateBalance, type BalanceDocument } from '../core/balance/document.ts';
import { windToBody } from '../core/physics/axes.ts';

const HERE = dirname(fileURLToPath(import.meta.url));
const NOTE = 'invented demonstration data (Sweepbook sample campaign); not a measurement';
const GAMMA = 1.4;

/** Seeded normal noise of a given standard deviation, so the files never change between runs. */
function rng(seed: number) {
  const z = normal(seed);
  return (sd: number) => sd * z();
}

/** Invented tunnel-measured coefficient curves of one configuration. */
interface Truth {
  alpha0: number; // zero-lift angle, deg
  slope: number; // per deg
  bend: number; // α where the curve starts to bend, deg
  curvature: number; // per deg²
  cd0: number;
  k: number;
  cm0: number;
  dcmdcl: number;
}

function coefficients(t: Truth, alphaDeg: number) {
  const over = Math.max(0, alphaDeg - t.bend);
  const cl = t.slope * (alphaDeg - t.alpha0) - t.curvature * over * over;
  const cd = t.cd0 + t.k * cl * cl + 0.0035 * over * over;
  const cm = t.cm0 + t.dcmdcl * cl - 0.003 * over * over;
  return { cl, cd, cm };
}

const MODEL = { area: 0.2025, chord: 0.225, span: 0.9 };
const WEIGHT_N = 14.2; // model weight seen by the balance (invented)
const CG_AFT_M = 0.012; // model c.g. aft of the balance moment centre (invented)

/** Wind-off loads on a wind-axis balance: the model's weight and its moment about the balance centre. */
function weightTare(alphaDeg: number) {
  const a = (alphaDeg * Math.PI) / 180;
  return { lift: -WEIGHT_N, drag: 0, pitch: -WEIGHT_N * CG_AFT_M * Math.cos(a) };
}

const ALPHAS = [-6, -4, -2, 0, 2, 4, 6, 8, 10, 11, 12, 13, 14, 15, 16];

interface Ambient {
  p: number;
  t: number;
  rh: number;
  dp: number;
}

function readings(truth: Truth, alphaDeg: number, amb: Ambient, noise: (sd: number) => number) {
  const dp = amb.dp + noise(1.5);
  const p = amb.p + noise(4);
  const mach = machFromImpactPressure(p, dp, GAMMA);
  const q = dynamicPressure(p, mach, GAMMA);
  const c = coefficients(truth, alphaDeg);
  const tare = weightTare(alphaDeg);
  const qs = q * MODEL.area;
  return {
    alpha: alphaDeg + noise(0.01),
    dp,
    p,
    t: amb.t + noise(0.05),
    rh: amb.rh + noise(0.3),
    lift: c.cl * qs + tare.lift + noise(0.15),
    drag: c.cd * qs + tare.drag + noise(0.03),
    pitch: c.cm * qs * MODEL.chord + tare.pitch + noise(0.02),
  };
}

const fmt = (x: number, d: number) => x.toFixed(d);

function header(meta: Record<string, string>): string[] {
  return Object.entries(meta).map(([k, v]) => `# ${k}: ${v}`);
}

function writeRun(name: string, lines: string[]) {
  const path = join(HERE, name);
  mkdirSync(dirname(path), { recursive: true });
  writeFileSync(path, lines.join('\n') + '\n');
}

const CLEAN: Truth = { alpha0: -2.1, slope: 0.0735, bend: 8, curvature: 0.0095, cd0: 0.0125, k: 0.078, cm0: -0.04, dcmdcl: -0.09 };
const FLAP10: Truth = { ...CLEAN, alpha0: -5.6, bend: 7, cd0: 0.0185, k: 0.077, cm0: -0.115 };
const FLAP20: Truth = { ...CLEAN, alpha0: -8.4, bend: 6, curvature: 0.0105, cd0: 0.0290, k: 0.076, cm0: -0.185 };

function sweepRun(file: string, run: string, configuration: string, truth: Truth, amb: Ambient, seed: number) {
  const noise = rng(seed);
  const lines = [
    ...header({ run, configuration, date: '2026-11-30', tunnel: 'Kestrel Moor Polytechnic LST (fictional)', model: 'KM-7 wing', note: NOTE }),
    'alpha [deg],dp_pitot [Pa],p_static [Pa],t_total [degC],rh [%],lift [N],drag [N],pitch [N m]',
  ];
  for (const a of ALPHAS) {
    const r = readings(truth, a, amb, noise);
    lines.push([fmt(r.alpha, 3), fmt(r.dp, 2), fmt(r.p, 1), fmt(r.t, 2), fmt(r.rh, 1), fmt(r.lift, 3), fmt(r.drag, 4), fmt(r.pitch, 4)].join(','));
  }
  writeRun(file, lines);
}

/** The flap-10 run as the acquisition PC of a partner lab writes it: semicolons, decimal commas, kPa, °F, lbf. */
function sweepRunContinental(file: string, run: string, configuration: string, truth: Truth, amb: Ambient, seed: number) {
  const noise = rng(seed);
  const lines = [
    ...header({ run, configuration, date: '2026-11-30', model: 'KM-7 wing', note: NOTE }),
    'Alpha [deg];DP_Pitot [kPa];P_Static [kPa];T_Total [degF];RH [%];Lift [lbf];Drag [lbf];Pitch [lbf in]',
  ];
  const dec = (x: number, d: number) => fmt(x, d).replace('.', ',');
  for (const a of ALPHAS) {
    const r = readings(truth, a, amb, noise);
    lines.push(
      [dec(r.alpha, 3), dec(r.dp / 1000, 5), dec(r.p / 1000, 4), dec(r.t * 1.8 + 32, 2), dec(r.rh, 1), dec(r.lift / 4.4482216152605, 4), dec(r.drag / 4.4482216152605, 5), dec(r.pitch / 0.112984829, 4)].join(';'),
    );
  }
  writeRun(file, lines);
}

/** Raw time history: every sample of every point, with a point column (200 samples at each of the 15 angles). */
function timeHistoryRun(file: string, run: string, configuration: string, truth: Truth, amb: Ambient, seed: number) {
  const noise = rng(seed);
  const lines = [
    ...header({ run, configuration, date: '2026-12-01', model: 'KM-7 wing', sampling: '200 samples per point at 100 Hz', note: NOTE }),
    'point,time [s],alpha [deg],dp_pitot [Pa],p_static [Pa],t_total [degC],rh [%],lift [N],drag [N],pitch [N m]',
  ];
  let time = 0;
  ALPHAS.forEach((a, k) => {
    for (let s = 0; s < 200; s++) {
      const r = readings(truth, a, amb, noise);
      // sample-level turbulence and balance noise, bigger than the per-point scatter of the averaged runs
      lines.push(
        [k + 1, fmt(time, 2), fmt(r.alpha, 3), fmt(r.dp + noise(6), 2), fmt(r.p, 1), fmt(r.t, 2), fmt(r.rh, 1), fmt(r.lift + noise(1.2), 3), fmt(r.drag + noise(0.2), 4), fmt(r.pitch + noise(0.08), 4)].join(','),
      );
      time += 0.01;
    }
    time += 4;
  });
  writeRun(file, lines);
}

function tareRun(file: string, seed: number) {
  const noise = rng(seed);
  const lines = [
    ...header({ run: '100', configuration: 'wind-off tare', date: '2026-11-30', model: 'KM-7 wing', note: NOTE }),
    'alpha [deg],lift [N],drag [N],pitch [N m]',
  ];
  for (let a = -8; a <= 18; a += 2) {
    const t = weightTare(a);
    lines.push([fmt(a + noise(0.01), 3), fmt(t.lift + noise(0.05), 3), fmt(t.drag + noise(0.01), 4), fmt(t.pitch + noise(0.005), 4)].join(','));
  }
  writeRun(file, lines);
}

/** 2D section insert: chord 0.3 m spanning the 1.2 m width; invented section curves (cl slope near 0.1 per deg). */
function sectionRun(file: string, seed: number) {
  const noise = rng(seed);
  const truth: Truth = { alpha0: -2.0, slope: 0.104, bend: 9, curvature: 0.02, cd0: 0.0095, k: 0.006, cm0: -0.045, dcmdcl: 0 };
  const lines = [
    ...header({ run: '201', configuration: '2D section, clean', date: '2026-12-01', model: 'KM-7 section insert, quarter-chord moment', note: NOTE }),
    'alpha [deg]\tdp_pitot [Pa]\tp_static [Pa]\tt_total [degC]\trh [%]\tlift [N]\tdrag [N]\tpitch [N m]',
  ];
  const area = 0.3 * 1.2;
  for (const a of [-4, -2, 0, 2, 4, 6, 8, 10, 11, 12, 13, 14, 15]) {
    const dp = 420 + noise(1);
    const p = 99250 + noise(3);
    const q = dynamicPressure(p, machFromImpactPressure(p, dp, GAMMA), GAMMA);
    const c = coefficients(truth, a);
    lines.push([fmt(a, 2), fmt(dp, 2), fmt(p, 1), fmt(19.4 + noise(0.05), 2), fmt(47 + noise(0.3), 1), fmt(c.cl * q * area + noise(0.2), 3), fmt(c.cd * q * area + noise(0.02), 4), fmt(c.cm * q * area * 0.3 + noise(0.01), 4)].join('\t'));
  }
  writeRun(file, lines);
}

function writeJson(name: string, value: unknown) {
  writeFileSync(join(HERE, name), JSON.stringify(value, null, 2) + '\n');
}

export function generate(): void {
  const amb: Ambient = { p: 99180, t: 18.6, rh: 52, dp: 610 };
  tareRun('windoff-tare.csv', 7);
  sweepRun('run-101-clean.csv', '101', 'clean', CLEAN, amb, 101);
  sweepRunContinental('run-102-flap10.csv', '102', 'flap 10', FLAP10, { ...amb, t: 19.1 }, 102);
  sweepRun('run-103-flap20.csv', '103', 'flap 20', FLAP20, { ...amb, t: 19.4, rh: 50 }, 103);
  timeHistoryRun('run-104-clean-timehistory.csv', '104', 'clean (time history)', CLEAN, { ...amb, t: 20.2, rh: 48 }, 104);
  sectionRun('run-201-section.csv', 201);
  writeJson('setup-3d.json', {
    note: `${NOTE}. Kestrel Moor Polytechnic low-speed tunnel and KM-7 wing are fictional.`,
    model: { kind: '3d', name: 'KM-7 rectangular wing, 25 % plain flap', area_m2: 0.2025, chord_m: 0.225, span_m: 0.9, volume_m3: 0.0021, moment_ref_offset_m: { x: -0.0169, z: 0 } },
    tunnel: { name: 'Kestrel Moor Polytechnic LST (fictional)', section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
    balance: { axes: 'wind' },
    flow: { gamma: 1.4 },
    ambient: { p_pa: 99180, t_c: 18.6, rh_pct: 52 },
    corrections: { enabled: true, wake: 'classic', solid_blockage_k: 0.96, delta: null, tau1: null, tau2: null },
  });
  writeJson('setup-2d.json', {
    note: `${NOTE}. 2D insert of the fictional KM-7 section spanning the test section.`,
    model: { kind: '2d', name: 'KM-7 section insert', chord_m: 0.3, volume_m3: 0.0042, moment_ref_offset_m: { x: 0, z: 0 } },
    tunnel: { name: 'Kestrel Moor Polytechnic LST (fictional)', section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
    balance: { axes: 'wind' },
    ambient: { p_pa: 99250, t_c: 19.4, rh_pct: 47 },
    corrections: { enabled: true, solid_blockage_k: 0.74 },
  });
  writeCampaign();
  balanceAndFlowSamples(amb);
}

const sha256 = (name: string) => createHash('sha256').update(readFileSync(join(HERE, name))).digest('hex');

/** The campaign file that opens the whole demonstration at once (format: docs/data-format.md). */
function writeCampaign() {
  const setup = (name: string) => JSON.parse(readFileSync(join(HERE, name), 'utf8'));
  const run = (file: string, configuration: string, setupKey: string, tare: string | null) => ({ file, sha256: sha256(file), configuration, setup: setupKey, tare, visible: true });
  writeJson('sweepbook-campaign.json', {
    format: 'sweepbook-campaign',
    version: 1,
    name: 'KM-7 wing, flap study (invented demonstration campaign)',
    note: NOTE,
    setups: { 'KM-7 wing': setup('setup-3d.json'), 'KM-7 section': setup('setup-2d.json') },
    runs: [
      run('run-101-clean.csv', 'clean', 'KM-7 wing', 'windoff-tare.csv'),
      run('run-102-flap10.csv', 'flap 10', 'KM-7 wing', 'windoff-tare.csv'),
      run('run-103-flap20.csv', 'flap 20', 'KM-7 wing', 'windoff-tare.csv'),
      run('run-104-clean-timehistory.csv', 'clean', 'KM-7 wing', 'windoff-tare.csv'),
      run('run-201-section.csv', '2D section', 'KM-7 section', null),
    ],
    tares: [{ file: 'windoff-tare.csv', sha256: sha256('windoff-tare.csv') }],
    mappings: {},
    baseline: 'run-101-clean.csv',
  });
}

// --- balance calibration, raw bridge outputs, upflow pair, repeat runs ---

/**
 * The KM-7 tests on the Polytechnic's sting balance "B3", which logs bridge outputs (mV/V) instead of
 * loads: its calibration loadings, the balance file fitted from them, a run and a wind-off tare in raw
 * outputs; an upright/inverted pair for the tunnel's upflow (an invented 0.35° up); six repeat runs of
 * the clean wing. All invented.
 */
function balanceAndFlowSamples(amb: Ambient) {
  // the invented "true" balance, in the outputs_from_loads form: outputs (mV/V) from normal (N), axial (N), pitch (N m)
  const truthDoc: BalanceDocument = {
    format: 'sweepbook-balance',
    version: 1,
    loads: ['normal', 'axial', 'pitch'],
    load_units: ['N', 'N', 'N m'],
    outputs: ['r1', 'r2', 'r3'],
    natural_zeros: [0.1182, -0.4315, 0.0267],
    form: 'outputs_from_loads',
    linear: [
      [5.0e-3, 2.0e-4, 1.2e-2],
      [3.0e-4, 2.2e-2, -8.0e-4],
      [6.0e-4, -5.0e-4, 9.5e-2],
    ],
    //        N²       N·A      N·M      A²       A·M      M²
    quadratic: [
      [1.5e-6, 4.0e-6, 0, 0, 2.0e-5, 4.0e-5],
      [2.5e-6, 0, 1.0e-5, 1.2e-5, 0, 0],
      [0, 6.0e-6, 3.0e-5, 0, 0, 2.0e-4],
    ],
  };
  const truth = validateBalance('truth', truthDoc);
  const fs = [200, 40, 10];
  const noise = rng(300);
  const loadings: number[][] = [[0, 0, 0], [0, 0, 0], [0, 0, 0]];
  for (let k = 0; k < 3; k++) for (const f of [-1, -0.5, 0.5, 1]) loadings.push(fs.map((s, i) => (i === k ? f * s : 0)));
  for (let j = 0; j < 3; j++) for (let k = j + 1; k < 3; k++) for (const fj of [-0.7, 0.7]) for (const fk of [-0.7, -0.35, 0.35, 0.7]) loadings.push(fs.map((s, i) => (i === j ? fj * s : i === k ? fk * s : 0)));
  for (const m of [[0.5, 0.5, 0.5], [-0.5, 0.4, -0.6], [0.8, -0.3, 0.2]]) loadings.push(m.map((x, i) => x * fs[i]!));
  const lines = [
    ...header({ balance: 'KM-7 sting balance B3 (fictional)', date: '2026-11-20', note: NOTE }),
    'loading,normal [N],axial [N],pitch [N m],r1 [mV/V],r2 [mV/V],r3 [mV/V]',
    ...loadings.map((F, i) => [i + 1, ...F.map((x) => fmt(x, 3)), ...outputsFromLoads(truth, F).map((r) => fmt(r + noise(1.5e-5), 6))].join(',')),
  ];
  writeRun('balance-b3-loadings.csv', lines);
  const fitted = fitCalibration(parseLoadings('balance-b3-loadings.csv', lines.join('\n'), ['normal', 'axial', 'pitch'], ['r1', 'r2', 'r3']), 'outputs_from_loads');
  writeJson('balance-b3.json', { ...fitted.document, note: `${NOTE}. ${fitted.document.note}` });

  // run 301: the clean wing on B3, bridge outputs only, 20 samples per point; tare 300 in raw outputs too
  const sampleOutputs = (lift: number, drag: number, pitch: number, alphaDeg: number) => {
    const { normal, axial } = windToBody(lift, drag, (alphaDeg * Math.PI) / 180);
    return outputsFromLoads(truth, [normal, axial, pitch]).map((r) => fmt(r + noise(4e-5), 6));
  };
  const raw = [
    ...header({ run: '301', configuration: 'clean (balance B3, raw outputs)', date: '2026-12-01', tunnel: 'Kestrel Moor Polytechnic LST (fictional)', model: 'KM-7 wing', balance: 'B3, bridge outputs in mV/V', note: NOTE }),
    'point,alpha [deg],dp_pitot [Pa],p_static [Pa],t_total [degC],rh [%],r1 [mV/V],r2 [mV/V],r3 [mV/V]',
  ];
  ALPHAS.forEach((a, k) => {
    for (let s = 0; s < 20; s++) {
      const r = readings(CLEAN, a, amb, noise);
      // buffeting: the loads of each sample swing about the point's mean, more so past the stall
      const swing = a > 12 ? 4 : 1;
      raw.push([k + 1, fmt(r.alpha, 3), fmt(r.dp + noise(5), 2), fmt(r.p, 1), fmt(r.t, 2), fmt(r.rh, 1), ...sampleOutputs(r.lift + noise(3 * swing), r.drag + noise(0.4 * swing), r.pitch + noise(0.3 * swing), r.alpha)].join(','));
    }
  });
  writeRun('run-301-raw-outputs.csv', raw);
  const tare = [
    ...header({ run: '300', configuration: 'wind-off tare (balance B3, raw outputs)', date: '2026-12-01', model: 'KM-7 wing', note: NOTE }),
    'point,alpha [deg],r1 [mV/V],r2 [mV/V],r3 [mV/V]',
  ];
  for (let a = -8, k = 1; a <= 18; a += 2, k++) {
    for (let s = 0; s < 5; s++) {
      const t = weightTare(a);
      tare.push([k, fmt(a, 3), ...sampleOutputs(t.lift, t.drag, t.pitch, a)].join(','));
    }
  }
  writeRun('windoff-tare-raw.csv', tare);
  writeJson('setup-3d-raw.json', {
    note: `${NOTE}. The KM-7 wing on the fictional sting balance B3, which logs bridge outputs; balance-b3.json converts every sample to loads.`,
    model: { kind: '3d', name: 'KM-7 rectangular wing, 25 % plain flap', area_m2: 0.2025, chord_m: 0.225, span_m: 0.9, volume_m3: 0.0021, moment_ref_offset_m: { x: -0.0169, z: 0 } },
    tunnel: { name: 'Kestrel Moor Polytechnic LST (fictional)', section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
    balance: { axes: 'body', calibration: 'balance-b3.json' },
    flow: { gamma: 1.4 },
    ambient: { p_pa: 99180, t_c: 18.6, rh_pct: 52 },
    corrections: { enabled: true, wake: 'classic', solid_blockage_k: 0.96, delta: null, tau1: null, tau2: null },
  });

  // runs 401/402: upright and inverted, loads with the weight tare already removed, tunnel upflow 0.35°
  const PHI = 0.35;
  for (const [file, run, sign, seed] of [['run-401-upright.csv', '401', 1, 411], ['run-402-inverted.csv', '402', -1, 412]] as const) {
    // a careful flow-angularity run: long averages, so a third of the other runs' scatter
    const n0 = rng(seed);
    const n = (sd: number) => n0(sd / 3);
    const out = [
      ...header({ run, configuration: sign > 0 ? 'clean, upright' : 'clean, inverted', date: '2026-12-02', tunnel: 'Kestrel Moor Polytechnic LST (fictional)', model: 'KM-7 wing', loads: 'weight tare already removed', note: `${NOTE}; made with an upflow of ${PHI}° for the upflow example` }),
      'alpha [deg],dp_pitot [Pa],p_static [Pa],t_total [degC],rh [%],lift [N],drag [N],pitch [N m]',
    ];
    const phi = (sign * PHI * Math.PI) / 180;
    for (const a of [-6, -5, -4, -3, -2, -1, 0, 1, 2, 3, 4, 5, 6]) {
      const r = readings(CLEAN, a + sign * PHI, amb, n);
      const t = weightTare(a + sign * PHI);
      const L = r.lift - t.lift;
      const D = r.drag - t.drag;
      // loads normal and parallel to the tunnel axis: the inverse of L = L'cos φ − D'sin φ, D = D'cos φ + L'sin φ
      const Lt = L * Math.cos(phi) + D * Math.sin(phi);
      const Dt = D * Math.cos(phi) - L * Math.sin(phi);
      out.push([fmt(a + n(0.005), 3), fmt(r.dp, 2), fmt(r.p, 1), fmt(r.t, 2), fmt(r.rh, 1), fmt(Lt, 3), fmt(Dt, 4), fmt(r.pitch - t.pitch, 4)].join(','));
    }
    writeRun(file, out);
  }

  // runs 501–506: six repeats of the clean wing on another day; each repeat has its own small offsets
  const day = rng(500);
  for (let i = 0; i < 6; i++) {
    const shift = { alpha0: CLEAN.alpha0 + day(0.02), cd0: CLEAN.cd0 + day(0.0002), cm0: CLEAN.cm0 + day(0.001) };
    sweepRun(`run-50${i + 1}-repeat.csv`, `50${i + 1}`, 'clean (repeat)', { ...CLEAN, ...shift }, { ...amb, dp: 610 + day(2) }, 501 + i);
  }
}
// --- end of balance calibration, raw bridge outputs, upflow pair, repeat runs ---

// --- a return sweep ---
/**
 * Run 107: the clean wing swept up through the stall and straight back down (a return sweep), with an
 * invented stall hysteresis: on the way down the flow stays separated until about 9°, so between 9° and
 * 15° the falling branch lies below the rising one and its drag above. Not part of the sample campaign;
 * imported to show the sweep branches in the plots.
 */
function returnSweepRun(file: string, amb: Ambient, seed: number) {
  const noise = rng(seed);
  const up = [-4, -2, 0, 2, 4, 6, 8, 9, 10, 11, 12, 13, 14, 15, 16];
  const down = [15, 14, 13, 12, 11, 10, 9, 8, 6, 4, 2, 0, -2, -4];
  // separated-flow lift loss on the falling branch: zero at 9° and at 15.5°, largest (0.16) near 12.5°
  const loss = (a: number) => (a > 9 && a < 15.5 ? 0.16 * Math.sin((Math.PI * (a - 9)) / 6.5) : 0);
  const lines = [
    ...header({
      run: '107',
      configuration: 'clean',
      date: '2026-12-02',
      tunnel: 'Kestrel Moor Polytechnic LST (fictional)',
      model: 'KM-7 wing',
      sweep: 'alpha up to 16 deg and back down to -4 deg (return sweep)',
      note: `${NOTE}; made with an invented stall hysteresis for the sweep-branch example`,
    }),
    'alpha [deg],dp_pitot [Pa],p_static [Pa],t_total [degC],rh [%],lift [N],drag [N],pitch [N m]',
  ];
  for (const [a, falling] of [...up.map((a) => [a, false] as const), ...down.map((a) => [a, true] as const)]) {
    const r = readings(CLEAN, a, amb, noise);
    const qs = dynamicPressure(r.p, machFromImpactPressure(r.p, r.dp, GAMMA), GAMMA) * MODEL.area;
    const dCl = falling ? loss(a) : 0;
    const lift = r.lift - dCl * qs;
    const drag = r.drag + 0.25 * dCl * qs;
    lines.push([fmt(r.alpha, 3), fmt(r.dp, 2), fmt(r.p, 1), fmt(r.t, 2), fmt(r.rh, 1), fmt(lift, 3), fmt(drag, 4), fmt(r.pitch, 4)].join(','));
  }
  writeRun(file, lines);
}
// --- end of a return sweep ---

generate();
returnSweepRun('run-107-clean-return-sweep.csv', { p: 99180, t: 18.9, rh: 51, dp: 610 }, 107);
