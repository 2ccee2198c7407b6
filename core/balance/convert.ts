/**
 * Bridge outputs to loads, one sample at a time, in both forms of the balance document.
 *
 * loads_from_outputs:  F_i = Σ_j linear[i][j]·ΔR_j + Σ_t quadratic[i][t]·p_t(ΔR)
 * outputs_from_loads:  ΔR_i = Σ_j linear[i][j]·F_j + Σ_t quadratic[i][t]·p_t(F), solved for F by the
 *   fixed-point iteration F ← linear⁻¹·(ΔR − quadratic·p(F)) of the AIAA recommended practice
 *   (AIAA R-091-2003, "Calibration and Use of Internal Strain-Gage Balances", data-reduction section),
 *   started from the linear solution and stopped when the largest change of a load is at most 1e-10
 *   of the largest load; no convergence in 50 iterations is reported, never guessed.
 * ΔR = R − natural zeros; p_t are the products of `quadraticTerms`. Loads come out in the document's
 * load units. A converter keeps its working arrays, so a time history of millions of samples costs no
 * allocation per sample.
 */
import type { Balance } from './document.ts';
import { quadraticTerms, quadraticTermCount } from './document.ts';
import { multiply } from './matrix.ts';

/** Relative tolerance and iteration limit of the outputs_from_loads iteration (data contract). */
export const ITERATION_TOLERANCE = 1e-10;
export const ITERATION_LIMIT = 50;

export type LoadSolution = { ok: true; loads: number[] } | { ok: false; reason: string };

/** Converts outputs to loads into `out` (load units); returns undefined, or why the sample cannot be converted. */
export type Converter = (outputs: ArrayLike<number>, out: Float64Array) => string | undefined;

/** A converter for one balance, with its working arrays allocated once. */
export function loadConverter(b: Balance): Converter {
  const no = b.outputs.length;
  const nl = b.loads.length;
  const dR = new Float64Array(no);
  const L = b.form === 'loads_from_outputs' ? b.linear : b.linearInverse!;
  const Q = b.quadratic;
  const p = new Float64Array(quadraticTermCount(b.form === 'loads_from_outputs' ? no : nl));
  const rhs = new Float64Array(no);
  const next = new Float64Array(nl);
  const matVec = (m: number[][], x: ArrayLike<number>, y: Float64Array) => {
    for (let i = 0; i < m.length; i++) {
      const row = m[i]!;
      let s = 0;
      for (let j = 0; j < row.length; j++) s += row[j]! * x[j]!;
      y[i] = s;
    }
  };
  const finite = (F: Float64Array): string | undefined => {
    for (let i = 0; i < nl; i++) if (!Number.isFinite(F[i]!)) return `the calibration gives "${b.loads[i]}" = ${F[i]}`;
    return undefined;
  };
  return (outputs, out) => {
    for (let j = 0; j < no; j++) {
      dR[j] = outputs[j]! - b.zeros[j]!;
      if (!Number.isFinite(dR[j]!)) return `bridge output "${b.outputs[j]}" is not a finite number`;
    }
    if (b.form === 'loads_from_outputs') {
      matVec(L, dR, out);
      if (Q) {
        quadraticTerms(dR, p);
        for (let i = 0; i < nl; i++) {
          const row = Q[i]!;
          let s = 0;
          for (let t = 0; t < row.length; t++) s += row[t]! * p[t]!;
          out[i] = out[i]! + s;
        }
      }
      return finite(out);
    }
    // outputs_from_loads: F0 = L⁻¹ΔR, then F ← L⁻¹(ΔR − Q·p(F))
    matVec(L, dR, out);
    if (!Q) return finite(out);
    let lastChange = Number.NaN;
    for (let it = 1; it <= ITERATION_LIMIT; it++) {
      quadraticTerms(out, p);
      for (let i = 0; i < no; i++) {
        const row = Q[i]!;
        let s = 0;
        for (let t = 0; t < row.length; t++) s += row[t]! * p[t]!;
        rhs[i] = dR[i]! - s;
      }
      matVec(L, rhs, next);
      let change = 0;
      let size = 0;
      for (let i = 0; i < nl; i++) {
        change = Math.max(change, Math.abs(next[i]! - out[i]!));
        size = Math.max(size, Math.abs(next[i]!));
      }
      out.set(next);
      if (!Number.isFinite(change)) break;
      lastChange = size > 0 ? change / size : change;
      if (change <= ITERATION_TOLERANCE * size || size === 0) return finite(out);
    }
    return `the balance iteration (outputs_from_loads) did not converge in ${ITERATION_LIMIT} iterations${Number.isFinite(lastChange) ? ` (last relative change ${lastChange.toExponential(1)})` : ' (the loads grew without bound)'}; the outputs lie outside the calibrated range or the quadratic terms are too large`;
  };
}

/** Loads (in the document's load units) from outputs R (natural zeros not yet removed). */
export function loadsFromOutputs(b: Balance, outputs: ArrayLike<number>): LoadSolution {
  const out = new Float64Array(b.loads.length);
  const why = loadConverter(b)(outputs, out);
  return why === undefined ? { ok: true, loads: Array.from(out) } : { ok: false, reason: why };
}

/**
 * The outputs_from_loads document's own equation: outputs R (natural zeros added back) from loads F in
 * load units (synthetic data and round-trip checks). The loads_from_outputs form has no closed inverse.
 */
export function outputsFromLoads(b: Balance, loads: ArrayLike<number>): number[] {
  if (b.form !== 'outputs_from_loads') throw new Error('outputsFromLoads: only the outputs_from_loads form has a closed forward model');
  const F = Array.from(loads);
  let dR = multiply(b.linear, F);
  if (b.quadratic) {
    const q = multiply(b.quadratic, quadraticTerms(F));
    dR = dR.map((x, i) => x + q[i]!);
  }
  return dR.map((x, j) => x + b.zeros[j]!);
}
