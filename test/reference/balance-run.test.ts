/**
 * Raw bridge-output runs through the whole reduction: each sample converted by the balance (both
 * forms) before averaging, tares in raw outputs too, bad input named; the upflow correction of the
 * data contract applied in the per-point chain; repeatability pooled over six repeats.
 * Independent references: the loads of each sample are computed here by a plain loop over the
 * document's polynomial (loads_from_outputs), or taken as the loads the outputs were made from
 * (outputs_from_loads, whose forward model is evaluated by hand); the same samples written as loads
 * give the reference reduction. The balance is the invented one of test/fixtures/balance.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../core/contract/messages.ts';
import { balanceTransform } from '../../core/balance/transform.ts';
import { validateBalance, type BalanceDocument } from '../../core/balance/document.ts';
import { readRunText } from '../../core/formats/runFile.ts';
import { reduce } from '../../core/reduction/pipeline.ts';
import { validateSetup, type Setup } from '../../core/setup/schema.ts';
import { resolveToFlow } from '../../core/flowAngle/upflow.ts';
import { repeatability } from '../../core/analysis/repeatability.ts';
import type { SampleTransform } from '../../core/formats/sampleTransform.ts';
import { normal as normalRng } from '../support/random.ts';

const truthDoc: BalanceDocument = JSON.parse(readFileSync(join(__dirname, '../fixtures/balance/truth.json'), 'utf8'));

function errorOf(f: () => unknown): InputError {
  try {
    f();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('expected an InputError');
}

const products = (x: number[]) => x.flatMap((a, j) => x.slice(j).map((b) => a * b));
const matVec = (m: number[][], x: number[]) => m.map((r) => r.reduce((s, v, j) => s + v * x[j]!, 0));

function setupWith(extra: { calibration?: unknown; axes?: 'wind' | 'body'; upflow?: number } = {}): Setup {
  return validateSetup('setup.json', {
    model: { kind: '3d', area_m2: 0.2025, chord_m: 0.225, span_m: 0.9, volume_m3: 0.0021 },
    tunnel: { section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
    balance: { axes: extra.axes ?? 'body', ...(extra.calibration ? { calibration: extra.calibration } : {}) },
    flow: { gamma: 1.4, ...(extra.upflow !== undefined ? { upflow_deg: extra.upflow } : {}) },
    ambient: { p_pa: 99000, t_c: 18, rh_pct: 50 },
  }).setup;
}

/** Per-sample body loads of a sweep: a mean that follows α, and large sample-to-sample swings. */
function sweepSamples(seed: number) {
  const z = normalRng(seed);
  const points: { alpha: number; dp: number; loads: number[][] }[] = [];
  for (const alpha of [-4, -2, 0, 2, 4, 6, 8]) {
    const N = 30 + 25 * alpha;
    const A = 8 - 0.5 * alpha + 0.3 * alpha * alpha;
    const M = -2 - 0.8 * alpha;
    points.push({ alpha, dp: 600, loads: Array.from({ length: 12 }, () => [N + 60 * z(), A + 15 * z(), M + 6 * z()]) });
  }
  return points;
}

function runText(points: ReturnType<typeof sweepSamples>, cols: string, row: (loads: number[]) => number[]): string {
  const lines = [`point,alpha [deg],dp_pitot [Pa],${cols}`];
  points.forEach((p, k) => p.loads.forEach((l) => lines.push([k + 1, p.alpha, p.dp, ...row(l).map((x) => x.toPrecision(17))].join(','))));
  return lines.join('\n') + '\n';
}

describe('reader hook: a per-sample transform before averaging', () => {
  const t: SampleTransform = {
    inputs: ['a', 'b'],
    outputs: ['lift', 'drag'],
    source: 'the test transform',
    apply(raw, out) {
      if (raw[0]! < 0) return 'a is negative';
      out[0] = 2 * raw[0]!;
      out[1] = raw[0]! * raw[1]!;
      return undefined;
    },
  };
  it('averages the converted samples, not the raw ones, and keeps the header unit of a raw column as written', () => {
    const run = readRunText('r.csv', 'point,alpha,a [mV/V],b [counts],dp_pitot\n1,0,1,1,500\n1,0,3,5,500\n', { sampleTransform: t });
    expect(run.channels).toEqual(['alpha', 'dp_pitot', 'lift', 'drag']);
    const p = run.points[0]!;
    expect(Array.from(p.mean)).toEqual([0, 500, 4, 8]); // mean(a·b) = (1 + 15)/2 = 8, not mean(a)·mean(b) = 6
  });
  it('names a missing input column at the header line', () => {
    const e = errorOf(() => readRunText('r.csv', 'alpha,a,dp_pitot\n0,1,500\n', { sampleTransform: t }));
    expect(e.notice).toMatchObject({ file: 'r.csv', line: 1 });
    expect(e.notice.message).toMatch(/missing column "b".*the test transform/);
  });
  it('ignores a file column the transform replaces, with a notice', () => {
    const run = readRunText('r.csv', 'alpha,a,b,lift\n0,1,1,99\n', { sampleTransform: t });
    expect(run.points[0]!.mean[run.channels.indexOf('lift')]).toBe(2);
    expect(run.warnings[0]!.message).toMatch(/column "lift" is not used/);
  });
  it('a sample it cannot convert is named by its line and leaves its point without loads', () => {
    const run = readRunText('r.csv', '# run: 9\npoint,alpha,a,b\n1,0,1,1\n1,0,-1,1\n2,1,1,1\n', { sampleTransform: t });
    expect(run.warnings[0]).toMatchObject({ line: 4 });
    expect(run.warnings[0]!.message).toMatch(/a is negative; its point is not reduced/);
    const lift = run.channels.indexOf('lift');
    expect(Number.isNaN(run.points[0]!.mean[lift]!)).toBe(true);
    expect(run.points[1]!.mean[lift]).toBe(2);
  });
  it('reads a quoted row the same way', () => {
    const run = readRunText('r.csv', 'point,alpha,a,b\n1,0,"1",2\n1,0,3,"4"\n', { sampleTransform: t });
    expect(Array.from(run.points[0]!.mean)).toEqual([0, 4, 7]);
  });
});

describe('raw bridge-output runs through the reduction', () => {
  const points = sweepSamples(42);
  const loadsRun = readRunText(
    'loads.csv',
    runText(points, 'normal [N],axial [N],pitch [N m]', (l) => l),
  );
  const reference = reduce({ run: loadsRun, setup: setupWith() });

  it('outputs_from_loads (iterated): the same coefficients as the loads themselves, to 1e-9', () => {
    const truth = validateBalance('truth.json', truthDoc);
    // outputs made from the loads by the document's forward equation, evaluated here by hand
    const outputs = (F: number[]) => matVec(truthDoc.linear, F).map((x, i) => x + matVec(truthDoc.quadratic!, products(F))[i]! + truthDoc.natural_zeros![i]!);
    const raw = readRunText('raw.csv', runText(points, 'r1 [mV/V],r2 [mV/V],r3 [mV/V]', outputs), { sampleTransform: balanceTransform(truth) });
    const r = reduce({ run: raw, setup: setupWith({ calibration: truthDoc }) });
    expect(r.points).toHaveLength(7);
    r.points.forEach((p, i) => {
      const q = reference.points[i]!;
      for (const k of ['cl', 'cd', 'cm', 'cl_uncorrected', 'cd_uncorrected'] as const)
        expect(Math.abs(p[k]! - q[k]!)).toBeLessThan(1e-9 * Math.max(1, Math.abs(q[k]!)));
    });
    // the interactions matter: the linear part alone misses CD by more than 5 %, and converting the
    // averaged outputs instead of each sample misses it too
    const linear = validateBalance('lin.json', { ...truthDoc, quadratic: undefined });
    const rl = reduce({ run: readRunText('raw.csv', runText(points, 'r1,r2,r3', outputs), { sampleTransform: balanceTransform(linear) }), setup: setupWith() });
    expect(Math.max(...rl.points.map((p, i) => Math.abs(p.cd_uncorrected / reference.points[i]!.cd_uncorrected - 1)))).toBeGreaterThan(0.05);
    const meanOutputs = points.map((p) => outputs(p.loads[0]!).map((_, j) => p.loads.reduce((s, l) => s + outputs(l)[j]!, 0) / p.loads.length));
    const converted = meanOutputs.map((R) => {
      const s = balanceTransform(truth);
      const out = new Float64Array(3);
      s.apply(Float64Array.from(R), out);
      return out;
    });
    const meanNormal = points.map((p) => p.loads.reduce((s, l) => s + l[0]!, 0) / p.loads.length);
    expect(Math.max(...converted.map((c, i) => Math.abs(c[0]! - meanNormal[i]!)))).toBeGreaterThan(1e-3);
  });

  it('loads_from_outputs: each sample through the polynomial, as a plain loop computes it', () => {
    // an invented direct-form balance with strong interactions; outputs chosen per sample, loads follow
    const doc = {
      format: 'sweepbook-balance',
      version: 1,
      loads: ['normal', 'axial', 'pitch'],
      load_units: ['N', 'lbf', 'N m'],
      outputs: ['g1', 'g2', 'g3'],
      natural_zeros: [0.05, -0.02, 0.01],
      form: 'loads_from_outputs',
      linear: [
        [500, -20, 30],
        [4, 120, -2],
        [2, 1, 40],
      ],
      quadratic: [
        [60, 160, 0, -80, 0, 40],
        [50, -120, 30, 180, 20, 0],
        [0, 10, -16, 0, 24, 60],
      ],
    };
    const b = validateBalance('direct.json', doc);
    const z = normalRng(7);
    const samples = points.map((p) => p.loads.map(() => [0.1 + (0.05 * p.alpha) / 4 + 0.08 * z(), 0.03 + 0.05 * z(), -0.05 + 0.04 * z()]));
    const loadsOf = (R: number[]) => {
      const d = R.map((x, j) => x - doc.natural_zeros[j]!);
      const F = matVec(doc.linear, d).map((x, i) => x + matVec(doc.quadratic, products(d))[i]!);
      return [F[0]!, F[1]! * 4.4482216152605, F[2]!]; // axial written in lbf: NIST SP 811 B.8
    };
    const mk = (row: (R: number[]) => number[], cols: string) => {
      const lines = [`point,alpha [deg],dp_pitot [Pa],${cols}`];
      samples.forEach((s, k) => s.forEach((R) => lines.push([k + 1, points[k]!.alpha, 600, ...row(R).map((x) => x.toPrecision(17))].join(','))));
      return lines.join('\n');
    };
    const raw = reduce({
      run: readRunText(
        'raw.csv',
        mk((R) => R, 'g1,g2,g3'),
        { sampleTransform: balanceTransform(b) },
      ),
      setup: setupWith({ calibration: doc }),
    });
    const ref = reduce({ run: readRunText('loads.csv', mk(loadsOf, 'normal,axial,pitch')), setup: setupWith() });
    raw.points.forEach((p, i) => {
      for (const k of ['cl', 'cd', 'cm'] as const) expect(Math.abs(p[k]! - ref.points[i]![k]!)).toBeLessThan(1e-9 * Math.max(1, Math.abs(ref.points[i]![k]!)));
    });
    const linear = validateBalance('lin.json', { ...doc, quadratic: undefined });
    const rl = reduce({
      run: readRunText(
        'raw.csv',
        mk((R) => R, 'g1,g2,g3'),
        { sampleTransform: balanceTransform(linear) },
      ),
      setup: setupWith(),
    });
    expect(Math.max(...rl.points.map((p, i) => Math.abs(p.cl_uncorrected - ref.points[i]!.cl_uncorrected)))).toBeGreaterThan(0.01);
  });

  it('subtracts a tare of the same balance in raw outputs, in load space', () => {
    const truth = validateBalance('truth.json', truthDoc);
    const outputs = (F: number[]) => matVec(truthDoc.linear, F).map((x, i) => x + matVec(truthDoc.quadratic!, products(F))[i]! + truthDoc.natural_zeros![i]!);
    const tareLoads = [-12, 0.5, -0.4];
    const tareAt = (alpha: number) => [tareLoads[0]! + 0.1 * alpha, tareLoads[1]! + 0.2 * alpha, tareLoads[2]! - 0.05 * alpha]; // linear in α, so the tare's interpolation is exact
    const tareLines = (row: (F: number[]) => number[], cols: string) =>
      ['alpha [deg],' + cols, ...[-6, -3, 0, 3, 6, 9].map((a) => [a, ...row(tareAt(a)).map((x) => x.toPrecision(17))].join(','))].join('\n');
    const withTare = points.map((p) => ({ ...p, loads: p.loads.map((l) => l.map((x, j) => x + tareAt(p.alpha)[j]!)) }));
    const t = balanceTransform(truth);
    const raw = reduce({
      run: readRunText('raw.csv', runText(withTare, 'r1,r2,r3', outputs), { sampleTransform: t }),
      tare: readRunText('tare.csv', tareLines(outputs, 'r1,r2,r3'), { sampleTransform: t }),
      setup: setupWith({ calibration: truthDoc }),
    });
    raw.points.forEach((p, i) => expect(Math.abs(p.cl! - reference.points[i]!.cl!)).toBeLessThan(1e-9));
  });

  it('a sample whose iteration does not converge: named by line, its point skipped and named, the rest reduced', () => {
    // outputs some twenty times the calibrated range: the iteration diverges there (checked by hand)
    const b = validateBalance('truth.json', truthDoc);
    const text = 'point,alpha,dp_pitot,r1,r2,r3\n1,0,600,0.126,-0.7895,0.0425\n2,2,600,20,10,15\n3,4,600,0.127,-0.789,0.043\n4,6,600,0.128,-0.7885,0.0435\n';
    const r = reduce({ run: readRunText('raw.csv', text, { sampleTransform: balanceTransform(b) }), setup: setupWith({ calibration: truthDoc }) });
    expect(r.points.map((p) => p.point)).toEqual(['1', '3', '4']);
    expect(r.warnings.some((w) => /raw\.csv:3: sample not converted.*did not converge in 50 iterations/.test(w))).toBe(true);
    expect(r.warnings.some((w) => /point 2 \(line 3\) skipped/.test(w))).toBe(true);
  });

  it('a run missing a bridge output is refused at its header, naming the column', () => {
    const t = balanceTransform(validateBalance('truth.json', truthDoc));
    const e = errorOf(() => readRunText('raw.csv', 'alpha,dp_pitot,r1,r3\n0,600,0.1,0.1\n', { sampleTransform: t }));
    expect(e.message).toBe('raw.csv:1: missing column "r2" (bridge output named by the balance calibration truth.json)');
  });

  it('a setup whose inline calibration is malformed, or misses the loads balance.axes needs, is refused naming the field', () => {
    const bad = { ...truthDoc, quadratic: truthDoc.quadratic!.slice(1) };
    expect(errorOf(() => setupWith({ calibration: bad })).notice).toMatchObject({ file: 'setup.json', field: 'balance.calibration.quadratic' });
    expect(errorOf(() => setupWith({ calibration: truthDoc, axes: 'wind' })).notice.message).toMatch(/not lift and drag, which balance.axes "wind" needs/);
    expect(setupWith({ calibration: 'b3.json' }).balance.calibration).toEqual({ path: 'b3.json' });
    expect(errorOf(() => setupWith({ upflow: 45 })).notice.field).toBe('flow.upflow_deg');
  });
});

describe('upflow correction in the per-point chain (data contract: α += φ before wall corrections, L and D resolved)', () => {
  it('resolves lift and drag to the flow direction as L = L′cos φ − D′sin φ, D = D′cos φ + L′sin φ', () => {
    const phi = (0.5 * Math.PI) / 180;
    const r = resolveToFlow(100, 5, phi);
    expect(r.lift).toBeCloseTo(100 * Math.cos(phi) - 5 * Math.sin(phi), 12);
    expect(r.drag).toBeCloseTo(5 * Math.cos(phi) + 100 * Math.sin(phi), 12);
    expect(resolveToFlow(100, 5, 0)).toEqual({ lift: 100, drag: 5 });
  });
  for (const axes of ['wind', 'body'] as const) {
    it(`shifts α by φ and rotates the coefficients by φ (${axes} axes, corrections off)`, () => {
      const cols = axes === 'wind' ? 'lift,drag,pitch' : 'normal,axial,pitch';
      const text = `alpha,dp_pitot,${cols}\n-2,600,-10,3,-1\n0,600,15,2.5,-1.5\n4,600,60,4,-2.5\n8,600,100,9,-3\n`;
      const base = reduce({ run: readRunText('r.csv', text), setup: setupWith({ axes }), noCorrections: true });
      const phiDeg = 0.4;
      const up = reduce({ run: readRunText('r.csv', text), setup: setupWith({ axes, upflow: phiDeg }), noCorrections: true });
      const phi = (phiDeg * Math.PI) / 180;
      up.points.forEach((p, i) => {
        const b = base.points[i]!;
        expect(p.alpha_uncorrected_deg - b.alpha_uncorrected_deg).toBeCloseTo(phiDeg, 12);
        expect(p.cl!).toBeCloseTo(b.cl! * Math.cos(phi) - b.cd! * Math.sin(phi), 12);
        expect(p.cd!).toBeCloseTo(b.cd! * Math.cos(phi) + b.cl! * Math.sin(phi), 12);
        expect(p.cm!).toBeCloseTo(b.cm!, 12); // the moment does not depend on the flow direction
      });
    });
  }
  it('is applied before the wall corrections: corrected α = measured α + φ + the walls’ own increment', () => {
    const text = 'alpha,dp_pitot,lift,drag\n0,600,15,2.5\n4,600,60,4\n';
    const up = reduce({ run: readRunText('r.csv', text), setup: setupWith({ axes: 'wind', upflow: 0.3 }) });
    up.points.forEach((p) => expect(p.alpha_deg! - p.alpha_uncorrected_deg).toBeGreaterThan(0)); // lift interference adds to α for positive lift
    expect(up.points[0]!.alpha_uncorrected_deg).toBeCloseTo(0.3, 12);
  });
});

describe('repeatability pooled over six repeats (ISO 5725-2:1994 §7.4 pooling)', () => {
  const z = normalRng(99);
  const alphas = [-4, -2, 0, 2, 4, 6, 8, 10];
  const runs = Array.from({ length: 6 }, (_, r) => ({
    name: `R${r}`,
    alphaDeg: alphas,
    cl: alphas.map((a) => 0.08 * (a + 2) + 0.003 * z()),
    cd: alphas.map((a) => 0.012 + 0.0009 * a * a * 0.1 + 0.0004 * z()),
    cm: alphas.map(() => -0.05 + 0.001 * z()),
  }));
  it('equals the root mean of the per-angle variances when every angle has all six runs (computed here directly)', () => {
    const r = repeatability(runs);
    const variance = (v: number[]) => {
      const m = v.reduce((s, x) => s + x, 0) / v.length;
      return v.reduce((s, x) => s + (x - m) ** 2, 0) / (v.length - 1);
    };
    for (const key of ['cl', 'cd', 'cm'] as const) {
      const perAngle = alphas.map((_, i) => variance(runs.map((run) => run[key][i]!)));
      const pooled = Math.sqrt(perAngle.reduce((s, v) => s + v, 0) / alphas.length);
      expect(r[`pooled_sd_${key}`]!).toBeCloseTo(pooled, 14);
    }
    expect(r.degrees_of_freedom).toBe(alphas.length * 5);
    expect(r.points.every((p) => p.n_runs === 6)).toBe(true);
    // the scatter put in: 0.003 in CL; with 40 degrees of freedom the estimate lies within ±30 % (χ² bounds, 99 %)
    expect(r.pooled_sd_cl!).toBeGreaterThan(0.0021);
    expect(r.pooled_sd_cl!).toBeLessThan(0.0039);
  });
  it('does not count a small difference of the set angle between runs as scatter (interpolation to the common α)', () => {
    const clean = Array.from({ length: 6 }, (_, r) => {
      const a = alphas.map((x) => x + (r - 2.5) * 0.02);
      return { name: `S${r}`, alphaDeg: a, cl: a.map((x) => 0.08 * (x + 2)), cd: a.map(() => 0.012), cm: a.map(() => null) };
    });
    const r = repeatability(clean);
    expect(r.pooled_sd_cl!).toBeLessThan(1e-12);
    expect(r.pooled_sd_cm).toBeNull();
  });
  it('pools angles reached by fewer runs with their own degrees of freedom, and warns of angles with one run', () => {
    const partial = runs.map((run, i) =>
      i < 3 ? run : { ...run, alphaDeg: run.alphaDeg.slice(0, 4), cl: run.cl.slice(0, 4), cd: run.cd.slice(0, 4), cm: run.cm.slice(0, 4) },
    );
    const r = repeatability(partial);
    expect(r.degrees_of_freedom).toBe(4 * 5 + 4 * 2);
    expect(repeatability([runs[0]!, { ...runs[1]!, alphaDeg: alphas.map((a) => a + 30) }]).warnings.join(' ')).toMatch(/one run only/);
  });
});
