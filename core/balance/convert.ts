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
 * load units; `toSI` converts them.
 */
import type { Balance } from './document.ts';
import { quadraticTerms, quadraticTermCount } from './document.ts';
import { multiply } from './matrix.ts';

/** Relative tolerance and iteration limit of the outputs_from_loads iteration (data contract). */
export const ITERATION_TOLERANCE = 1e-10;
export const ITERATION_LIMIT = 50;

export type LoadSolution = { ok: true; loads: number[]; iterations: number } | { ok: false; reason: string };

/** Loads (in the document's load units) from outputs R (natural zeros not yet removed). */
export function loadsFromOutputs(b: Balance, outputs: ArrayLike<number>): LoadSolution {
  const dR = Array.from({ length: b.outputs.length }, (_, j) => outputs[j]! - b.zeros[j]!);
  for (let j = 0; j < dR.length; j++) {
    if (!Number.isFinite(dR[j]!)) return { ok: false, reason: `bridge output "${b.outputs[j]}" is not a finite number` };
  }
  if (b.form === 'loads_from_outputs') {
    const F = multiply(b.linear, dR);
    if (b.quadratic) {
      const p = quadraticTerms(dR);
      const q = multiply(b.quadratic, p);
      for (let i = 0; i < F.length; i++) F[i] = F[i]! + q[i]!;
    }
    return finiteLoads(b, F, 0);
  }
  return iterate(b, dR);
}

/** The outputs_from_loads iteration F ← L⁻¹(ΔR − Q·p(F)). */
function iterate(b: Balance, dR: number[]): LoadSolution {
  const inv = b.linearInverse!;
  let F = multiply(inv, dR);
  if (!b.quadratic) return finiteLoads(b, F, 1);
  const p = new Float64Array(quadraticTermCount(F.length));
  const rhs = new Array<number>(dR.length);
  let lastChange = Number.NaN;
  for (let it = 1; it <= ITERATION_LIMIT; it++) {
    quadraticTerms(F, p);
    const q = multiply(b.quadratic, p);
    for (let i = 0; i < rhs.length; i++) rhs[i] = dR[i]! - q[i]!;
    const next = multiply(inv, rhs);
    let change = 0;
    let size = 0;
    for (let i = 0; i < next.length; i++) {
      change = Math.max(change, Math.abs(next[i]! - F[i]!));
      size = Math.max(size, Math.abs(next[i]!));
    }
    F = next;
    if (!Number.isFinite(change)) break;
    lastChange = size > 0 ? change / size : change;
    if (change <= ITERATION_TOLERANCE * size || size === 0) return finiteLoads(b, F, it);
  }
  return {
    ok: false,
    reason: `the balance iteration (outputs_from_loads) did not converge in ${ITERATION_LIMIT} iterations${Number.isFinite(lastChange) ? ` (last relative change ${lastChange.toExponential(1)})` : ' (the loads grew without bound)'}; the outputs lie outside the calibrated range or the quadratic terms are too large`,
  };
}

function finiteLoads(b: Balance, F: number[], iterations: number): LoadSolution {
  const bad = F.findIndex((x) => !Number.isFinite(x));
  if (bad >= 0) return { ok: false, reason: `the calibration gives "${b.loads[bad]}" = ${F[bad]}` };
  return { ok: true, loads: F, iterations };
}

/**
 * The forward model of the document: outputs R (natural zeros added back) from loads F in load units.
 * For outputs_from_loads this is the document's own equation; for loads_from_outputs it is solved by
 * the same fixed-point iteration on ΔR (used by tests and the synthetic data only).
 */
export function outputsFromLoads(b: Balance, loads: ArrayLike<number>): number[] {
  const F = Array.from(loads);
  let dR: number[];
  if (b.form === 'outputs_from_loads') {
    dR = multiply(b.linear, F);
    if (b.quadratic) {
      const q = multiply(b.quadratic, quadraticTerms(F));
      dR = dR.map((x, i) => x + q[i]!);
    }
  } else {
    throw new Error('outputsFromLoads: only the outputs_from_loads form has a closed forward model');
  }
  return dR.map((x, j) => x + b.zeros[j]!);
}
