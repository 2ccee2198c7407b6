/**
 * Wall-correction factors under the symbols the methods use (Barlow, Rae & Pope, Low-Speed Wind Tunnel
 * Testing, 3rd ed., ch. 10): σ the streamline-curvature parameter, δ the boundary-correction factor for
 * lift interference, τ1 and τ2 the tunnel-to-model size and streamwise-position factors, K the
 * body-shape factor of solid blockage. Values are written to four significant digits everywhere.
 */
import type { ReductionResult } from '../../../core/index.ts';
import { significant } from './numberFormat.ts';

type Factors = ReductionResult['factors'];

export const FACTOR_SYMBOLS: Record<keyof Factors, { symbol: string; title: string }> = {
  sigma: { symbol: 'σ', title: 'streamline-curvature parameter' },
  delta: { symbol: 'δ', title: 'boundary-correction factor (lift interference)' },
  tau1: { symbol: 'τ1', title: 'model-to-tunnel size factor' },
  tau2: { symbol: 'τ2', title: 'streamwise-position factor' },
  solid_blockage_k: { symbol: 'K', title: 'body-shape factor (solid blockage)' },
};

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
    out.push({ key, symbol: name.symbol, title: name.title, text: significant(value, 4) });
  }
  return out;
}

/** "δ = 0.125, τ1 = 0.84" for one line of a provenance block. */
export function factorLine(factors: Factors): string {
  return factorEntries(factors)
    .map((f) => `${f.symbol} = ${f.text}`)
    .join(', ');
}
