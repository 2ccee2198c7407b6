/**
 * Provenance of reduced runs in core's form (core/provenance.ts), as the command line writes it. The
 * setup lives in the campaign rather than in a file of its own: it is named by campaign and key and
 * hashed as canonical JSON.
 */
import { attempt, canonical, parseBalance, provenanceOf, type InputFile } from '../../../core/index.ts';
import { validateSetup } from '../../../core/index.ts';
import { baseName } from '../host/browserHost.ts';
import { sha256Text } from '../logic/hashText.ts';
import { TOOL_VERSION, type ExportProvenance, type RunProvenance } from '../logic/provenance.ts';
import type { Basis, CampaignState } from './campaignState.ts';

/** The balance file a setup names by path, as the runs were read through it (runLoader.ts). */
export type BalanceRead = (path: string) => { name: string; text: string; sha256: string | null } | undefined;

export function createProvenance(base: CampaignState, balanceRead: BalanceRead = () => undefined) {
  const { state, runOf, resultOf, configurationOf } = base;

  /**
   * Provenance of reduced runs, in core's form (as the command line writes it). The setup lives in the
   * campaign rather than in a file of its own: it is named by campaign and key, hashed as canonical JSON.
   */
  async function provenance(files: readonly string[], basis: Basis = state.basis): Promise<ExportProvenance> {
    const runs: RunProvenance[] = [];
    for (const file of files) {
      const run = runOf(file);
      const e = state.entries[file];
      const result = resultOf(file, basis);
      const setupInput = run ? state.campaign.setups[run.setup] : undefined;
      if (!run || !e || !result || !setupInput) continue;
      const setup = validateSetup(run.setup, setupInput).setup;
      const inputs: InputFile[] = [
        { role: 'setup', name: `${state.campaignFile ?? state.campaign.name}: setups["${run.setup}"]`, sha256: (await sha256Text(JSON.stringify(canonical(setupInput)))) ?? 'unavailable' },
        { role: 'run', name: baseName(file), sha256: e.sha256 ?? 'unavailable' },
      ];
      if (run.tare) inputs.push({ role: 'tare', name: baseName(run.tare), sha256: state.tares[run.tare]?.sha256 ?? 'unavailable' });
      // a balance file named by path: recorded as the command line records it (its matrices, its file's hash)
      const cal = setup.balance.calibration;
      const read = cal !== null && 'path' in cal ? balanceRead(cal.path) : undefined;
      if (read) {
        const parsed = attempt(() => parseBalance(read.name, read.text));
        if (parsed.ok) setup.balance.calibration = parsed.value;
        inputs.push({ role: 'balance', name: read.name, sha256: read.sha256 ?? 'unavailable' });
      }
      runs.push({
        name: result.run.name,
        configuration: configurationOf(file),
        file,
        record: provenanceOf(result, setup, { version: TOOL_VERSION, reducedAt: e.reducedAt ?? 'unknown', inputs }),
      });
    }
    return { exportedAt: new Date().toISOString(), campaign: state.campaign.name, runs };
  }

  return provenance;
}
