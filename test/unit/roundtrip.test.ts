import { describe, expect, it } from 'vitest';
import { readRunText } from '../../core/formats/runFile.ts';
import { reduce } from '../../core/reduction/pipeline.ts';
import { validateSetup } from '../../core/setup/schema.ts';

/**
 * Readings synthesised from known coefficients with the textbook relations written out here
 * (q = (γ/2)pM², p0/p = (1 + (γ−1)/2·M²)^(γ/(γ−1)), NACA Report 1135; body axes by rotation through α),
 * then reduced by the engine with corrections off: the coefficients must come back.
 */
const S = 0.2025;
const c = 0.225;
const b = 0.9;
const offset = { x: 0.03, z: -0.01 };
const truth = [-4, 0, 3, 6, 9, 12].map((a) => ({ a, cl: 0.08 * (a + 2), cd: 0.02 + 0.05 * (0.08 * (a + 2)) ** 2, cm: -0.05 - 0.01 * a, cy: 0.001 * a, cr: -0.002 * a, cn: 0.0005 * a }));

function setup(axes: 'wind' | 'body') {
  return validateSetup('setup.json', {
    model: { kind: '3d', area_m2: S, chord_m: c, span_m: b, moment_ref_offset_m: offset },
    tunnel: { section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
    balance: { axes },
    ambient: { p_pa: 101325, t_c: 20, rh_pct: 50 },
    corrections: { enabled: false },
  });
}

function synthesise(axes: 'wind' | 'body', tare?: (a: number) => { n: number; ax: number; m: number }) {
  const p = 98000;
  const lines = ['# run: rt', `alpha [deg],dp_pitot [kPa],p_static [kPa],t_total [degF],rh [%],${axes === 'wind' ? 'lift [lbf],drag [N]' : 'normal [lbf],axial [N]'},side [kgf],pitch [lbf in],roll [N m],yaw [lbf ft]`];
  const qs: number[] = [];
  for (const [i, t] of truth.entries()) {
    const q = 700 + 13 * i;
    qs.push(q);
    const M2 = q / (0.7 * p);
    const dp = p * (Math.pow(1 + 0.2 * M2, 3.5) - 1);
    const al = (t.a * Math.PI) / 180;
    const L = t.cl * q * S;
    const D = t.cd * q * S;
    const N = L * Math.cos(al) + D * Math.sin(al);
    const A = -L * Math.sin(al) + D * Math.cos(al);
    const Mref = t.cm * q * S * c;
    const Mbmc = Mref + N * offset.x + A * offset.z;
    const tr = tare ? tare(t.a) : { n: 0, ax: 0, m: 0 };
    const f1 = axes === 'wind' ? L : N + tr.n;
    const f2 = axes === 'wind' ? D : A + tr.ax;
    lines.push(
      [t.a, dp / 1000, p / 1000, 68, 50, f1 / 4.4482216152605, f2, (t.cy * q * S) / 9.80665, (Mbmc + tr.m) / (4.4482216152605 * 0.0254), t.cr * q * S * b, (t.cn * q * S * b) / (4.4482216152605 * 0.3048)]
        .map((v) => v.toPrecision(15))
        .join(','),
    );
  }
  return { text: lines.join('\n') + '\n', qs };
}

describe('round trip: known coefficients → readings → reduction', () => {
  for (const axes of ['wind', 'body'] as const) {
    it(`returns the coefficients and q that made the readings (${axes} axes, mixed units)`, () => {
      const { text, qs } = synthesise(axes);
      const s = setup(axes);
      const r = reduce({ run: readRunText('rt.csv', text), setup: s.setup });
      expect(r.points).toHaveLength(truth.length);
      r.points.forEach((p, i) => {
        const t = truth[i]!;
        expect(p.q_uncorrected_pa).toBeCloseTo(qs[i]!, 6);
        expect(p.cl_uncorrected).toBeCloseTo(t.cl, 9);
        expect(p.cd_uncorrected).toBeCloseTo(t.cd, 9);
        expect(p.cm_uncorrected!).toBeCloseTo(t.cm, 9);
        expect(p.cy_uncorrected!).toBeCloseTo(t.cy, 9);
        expect(p.c_roll_uncorrected!).toBeCloseTo(t.cr, 9);
        expect(p.c_yaw_uncorrected!).toBeCloseTo(t.cn, 9);
        // corrections off: the corrected fields are the measured ones (DESIGN §3.3)
        expect(p.cl).toBe(p.cl_uncorrected);
        expect(p.eps_wake).toBeNull();
      });
      expect(r.factors).toEqual({ sigma: null, delta: null, tau1: null, tau2: null, solid_blockage_k: null });
    });
  }

  it('removes a wind-off tare interpolated in alpha, in the balance axes', () => {
    // weight tare of a body-axis balance: N = −W cos α, A = W sin α, M = −W·d·cos α (W = 20 N, d = 0.01 m)
    const tareFn = (a: number) => {
      const al = (a * Math.PI) / 180;
      return { n: -20 * Math.cos(al), ax: 20 * Math.sin(al), m: -0.2 * Math.cos(al) };
    };
    // a tare holds every load channel the run uses (data contract); side, roll and yaw tares are zero here
    const tareLines = ['alpha [deg],normal [N],axial [N],pitch [N m],side,roll,yaw'];
    for (let a = -6; a <= 14; a += 0.5) {
      const t = tareFn(a);
      tareLines.push([a, t.n, t.ax, t.m, 0, 0, 0].join(','));
    }
    const tare = readRunText('tare.csv', tareLines.join('\n'));
    const { text } = synthesise('body', tareFn);
    const r = reduce({ run: readRunText('rt.csv', text), setup: setup('body').setup, tare });
    r.points.forEach((p, i) => {
      // linear interpolation of cos/sin over 0.5° steps is good to ~1e-5 of the tare
      expect(p.cl_uncorrected).toBeCloseTo(truth[i]!.cl, 4);
      expect(p.cm_uncorrected!).toBeCloseTo(truth[i]!.cm, 4);
    });
    expect(r.warnings.join('\n')).not.toContain('outside the tare sweep');
  });

  it('warns when a point lies outside the tare sweep, naming it, and uses the end value', () => {
    const tare = readRunText('tare.csv', 'alpha,normal,axial,side,pitch,roll,yaw\n0,1,0,0,0,0,0\n5,1,0,0,0,0,0\n');
    const { text } = synthesise('body');
    const r = reduce({ run: readRunText('rt.csv', text), setup: setup('body').setup, tare });
    const w = r.warnings.filter((x) => x.includes('outside the tare sweep'));
    expect(w).toHaveLength(4); // −4°, 6°, 9°, 12°
    expect(w[0]).toContain('rt.csv:3');
  });
});

describe('speed range', () => {
  it('skips a point whose readings give Mach 1 or more (a unit slip), naming it, and warns above Mach 0.3', () => {
    const s = setup('wind');
    const text = '# run: fast\nalpha,dp_pitot [kPa],p_static [kPa],t_total,rh,lift,drag\n0,8,98,20,50,100,5\n2,9,98,20,50,300,6\n4,120,98,20,50,500,7\n';
    const r = reduce({ run: readRunText('fast.csv', text), setup: s.setup });
    expect(r.points).toHaveLength(2);
    expect(r.warnings.join('\n')).toMatch(/fast\.csv:5: point 5 \(line 5\) skipped: the pitot readings give Mach 1\.\d\d/);
    expect(r.warnings.join('\n')).toMatch(/Mach number up to 0\.3\d/);
  });
});
