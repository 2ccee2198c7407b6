/**
 * Wall-correction factors and blockage terms under the symbols the methods use (Barlow, Rae & Pope,
 * Low-Speed Wind Tunnel Testing, 3rd ed., ch. 10): σ the 2D streamline-curvature parameter, δ the
 * lift-interference (boundary-correction) factor, τ1 the tunnel factor of solid blockage, τ2 the
 * streamline-curvature factor, K the body-shape factor of solid blockage, ε_sb and ε_wb the solid- and
 * wake-blockage terms. The titles are the setup form's labels (core/setup/schema.ts), so a factor reads
 * the same on every view. Values are written to four significant digits everywhere (numberFormat.ts).
 */
import type { ReductionResult } from '../../../core/index.ts';
import { formatQuantity } from './numberFormat.ts';

type Factors = ReductionResult['factors'];

export const FACTOR_SYMBOLS: Record<keyof Factors, { symbol: string; title: string }> = {
  sigma: { symbol: 'σ', title: 'streamline-curvature parameter of a 2D section, (π²/48)(c/h)²' },
  delta: { symbol: 'δ', title: 'lift-interference factor' },
  tau1: { symbol: 'τ1', title: 'solid-blockage tunnel factor' },
  tau2: { symbol: 'τ2', title: 'streamline-curvature factor' },
  solid_blockage_k: { symbol: 'K', title: 'solid-blockage shape factor' },
};

/** Blockage terms of each point (JSON eps_solid, eps_wake). */
export const BLOCKAGE_SYMBOLS = {
  eps_solid: { symbol: 'ε_sb', title: 'solid-blockage term' },
  eps_wake: { symbol: 'ε_wb', title: 'wake-blockage term' },
} as const;

export interface FactorEntry {
  key: string;
  symbol: string;
  title: string;
  text: string;
}

/** The factors a result applied, symbol and value ("δ = 0.1250"), leaving out those not used. */
export function factorEntries(factors: Factors): FactorEntry[] {
  const out: FactorEntry[] = [];
  for (const [key, value] of Object.entries(factors) as [keyof Factors, number | null][]) {
    if (value === null || value === undefined) continue;
    const name = FACTOR_SYMBOLS[key] ?? { symbol: key, title: key };
    out.push({ key, symbol: name.symbol, title: name.title, text: formatQuantity('factor', value) });
  }
  return out;
}

/** "δ = 0.125, τ1 = 0.84" for one line of a provenance block. */
export function factorLine(factors: Factors): string {
  return factorEntries(factors)
    .map((f) => `${f.symbol} = ${f.text}`)
    .join(', ');
}
