/**
 * Provenance carried by every export. Per run it is core's record (core/formats/provenance.ts: tool and version,
 * input files with SHA-256, the setup, correction method and factors, time of reduction), the same
 * record the command line writes; an export adds when it was made and from which campaign.
 */
import { version } from '../../../package.json';
import { provenanceLines as coreLines, type Provenance as RunRecord } from '../../../core/index.ts';

export const TOOL_VERSION: string = version;

export interface RunProvenance {
  name: string;
  configuration: string | null;
  file: string;
  record: RunRecord;
}

/** The provenance of one export: when, from which campaign, and core's record of each run in it. */
export interface ExportProvenance {
  exportedAt: string;
  campaign: string;
  runs: RunProvenance[];
}

export const UNITS_NOTE =
  'units: SI (pressure Pa, speed m/s, density kg/m3, viscosity Pa s, temperature K, force N, moment N m), angles in degrees; coefficients dimensionless';
export const VALUES_NOTE = 'values are free-air corrected unless named "as measured" (*_uncorrected), which are as measured in the tunnel';
export const CAUTION =
  'Caution: model-test results at the test Reynolds number. Using them for a full-scale aircraft (stall speed, loads) needs scale-effect assessment; certified data and licensed practice govern.';

/**
 * Provenance as "key: value" lines (comment lines in CSV, rows of a sheet). With one run the run's
 * lines are core's as they are; with several, each is prefixed by its run.
 */
export function exportProvenanceLines(p: ExportProvenance): string[] {
  const lines = [`exported_by: Sweepbook ${TOOL_VERSION}`, `exported_at: ${p.exportedAt}`, `campaign: ${p.campaign}`];
  for (const r of p.runs) {
    const prefix = p.runs.length > 1 ? `run ${r.name} ` : '';
    if (p.runs.length > 1) lines.push(`run ${r.name}: ${r.file}${r.configuration ? ` (${r.configuration})` : ''}`);
    for (const l of coreLines(r.record)) lines.push(prefix + l);
  }
  lines.push(UNITS_NOTE, VALUES_NOTE);
  return lines;
}

/** One short line for a plot's footer. */
export function provenanceFooter(p: ExportProvenance): string {
  const runs = p.runs.map((r) => {
    const input = r.record.inputs.find((i) => i.role === 'run');
    return `${r.file} (sha256 ${input ? input.sha256.slice(0, 12) : '?'}…)`;
  });
  return `Sweepbook ${TOOL_VERSION} · exported ${p.exportedAt} · ${p.campaign} · ${runs.join(', ')}`;
}

/**
 * Provenance for a figure, a few legible lines: tool, time and campaign, then per run its file and
 * hash, setup, correction method and factors under their symbols. More than `maxRuns` runs are counted.
 */
export function figureProvenance(p: ExportProvenance, factorText: (r: RunRecord) => string, maxRuns = 8): string[] {
  const lines = [`Sweepbook ${TOOL_VERSION} · exported ${p.exportedAt} · campaign ${p.campaign}`];
  for (const r of p.runs.slice(0, maxRuns)) {
    const input = r.record.inputs.find((i) => i.role === 'run');
    const setup = r.record.inputs.find((i) => i.role === 'setup');
    const tare = r.record.inputs.find((i) => i.role === 'tare');
    const c = r.record.corrections;
    const method = c.enabled ? `${c.kind.toUpperCase()} wall corrections${c.wake ? `, ${c.wake} wake blockage` : ''}` : 'no wall corrections';
    const factors = factorText(r.record);
    lines.push(
      `${r.name}: ${r.file} (sha256 ${input ? input.sha256.slice(0, 12) : '?'}…) · setup ${setup ? setup.name.replace(/^.*setups\["(.*)"\]$/, '"$1"') : '?'} · ${tare ? `tare ${tare.name}` : 'no tare'} · ${method}${factors ? ` (${factors})` : ''}`,
    );
  }
  if (p.runs.length > maxRuns) lines.push(`… and ${p.runs.length - maxRuns} more runs (their provenance is in the CSV and workbook exports)`);
  lines.push(CAUTION);
  return lines;
}
