/**
 * Provenance carried by every export: the tool and its version, each input file's name and SHA-256,
 * the canonical setup, the correction method and factors, and the time of reduction. The time comes
 * from SOURCE_DATE_EPOCH when the host sets it (reproducible-builds.org convention), so the same
 * inputs give byte-identical outputs.
 */
import type { ReductionResult } from '../reduction/pipeline.ts';
import type { Setup } from '../setup/schema.ts';

export interface InputFile {
  role: 'run' | 'setup' | 'tare' | 'columns';
  name: string;
  sha256: string;
}

export interface Provenance {
  tool: string;
  version: string;
  reduced_at: string;
  inputs: InputFile[];
  corrections: ReductionResult['corrections'];
  factors: ReductionResult['factors'];
  setup: Setup;
}

/** ISO 8601 time of reduction: SOURCE_DATE_EPOCH (seconds) when given, else the clock. */
export function reductionTime(sourceDateEpoch: string | undefined, now: () => Date = () => new Date()): string {
  if (sourceDateEpoch !== undefined && /^\d+$/.test(sourceDateEpoch.trim())) return new Date(Number(sourceDateEpoch.trim()) * 1000).toISOString();
  return now().toISOString();
}

export function provenanceOf(result: ReductionResult, setup: Setup, meta: { version: string; reducedAt: string; inputs: InputFile[] }): Provenance {
  return {
    tool: 'sweepbook',
    version: meta.version,
    reduced_at: meta.reducedAt,
    inputs: meta.inputs,
    corrections: result.corrections,
    factors: result.factors,
    setup: canonical(setup) as Setup,
  };
}

/** A copy with object keys sorted and undefined members dropped, so the same setup always prints the same. */
export function canonical(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(canonical);
  if (value !== null && typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const k of Object.keys(value as object).sort()) {
      const v = (value as Record<string, unknown>)[k];
      if (v !== undefined) out[k] = canonical(v);
    }
    return out;
  }
  return value;
}

/** Provenance as `# key: value` lines for the head of a CSV export. */
export function provenanceLines(p: Provenance): string[] {
  const lines = [`tool: ${p.tool} ${p.version}`, `reduced_at: ${p.reduced_at}`];
  for (const f of p.inputs) lines.push(`${f.role}: ${f.name} sha256 ${f.sha256}`);
  lines.push(`corrections: ${JSON.stringify(p.corrections)}`);
  lines.push(`factors: ${JSON.stringify(p.factors)}`);
  lines.push(`setup_canonical: ${JSON.stringify(p.setup)}`);
  return lines;
}
