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

generate();
