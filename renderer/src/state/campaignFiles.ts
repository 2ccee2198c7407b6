/**
 * Campaign files: new, open (reporting every missing or changed file by name), the bundled sample,
 * recent campaigns, save and save-as through the host. Unsaved changes are asked about first.
 */
import { campaignPathProblem, emptyCampaign, parseCampaign, parseJsonText, serializeCampaign, type Campaign } from '../../../core/index.ts';
import type { OpenedCampaign } from '../../../core/index.ts';
import type { Host, OpenedRun } from '../host/hostAccess.ts';
import { newEntry, type CampaignState, type RunEntry, type TareEntry } from './campaignState.ts';
import { balancePathOf, type RunLoader } from './runLoader.ts';

/**
 * Read a campaign's text, or throw the reason it is refused: text that is not JSON is located by line
 * and column (the campaign parser names only the JSON engine's message), anything else by its field.
 */
export function readCampaignText(name: string, text: string): Campaign {
  parseJsonText(name, text);
  return parseCampaign(name, text);
}

export function createCampaignFiles(base: CampaignState, host: Host, loader: RunLoader, ask: (question: string) => Promise<boolean>) {
  const { state, dirty, say, problem } = base;
  const { checkHash } = loader;

  async function confirmDiscard(): Promise<boolean> {
    return !dirty.value || ask('The campaign has unsaved changes. Discard them?');
  }

  function reset(campaign: Campaign, savedText: string): void {
    loader.reset();
    state.campaign = campaign;
    state.savedText = savedText;
    state.entries = {};
    state.tares = {};
    state.banners = [];
    state.mappingFor = null;
    state.unconfirmed = [];
    state.currentRun = null;
    state.editingSetup = Object.keys(campaign.setups)[0] ?? null;
  }

  async function newCampaign(): Promise<void> {
    if (!(await confirmDiscard())) return;
    const c = emptyCampaign();
    reset(c, serializeCampaign(c));
    state.campaignId = null;
    state.campaignFile = null;
  }

  /**
   * A campaign that could not be read, with a backup beside it: offer the backup (where the host can open
   * it). The backup comes in unsaved, so nothing is overwritten until the user saves.
   */
  async function offerBackup(opened: OpenedCampaign, reason: string, options: { keepId: boolean }): Promise<boolean> {
    if (!opened.backupAvailable || !host.openCampaignBackup) return false;
    if (!(await ask(`${reason}\n\nThe previous version of the campaign is kept beside it as a backup. Open the backup instead? The campaign file is not changed until you save.`))) return false;
    let backup: OpenedCampaign | null;
    try {
      backup = await host.openCampaignBackup(opened.id);
    } catch (err) {
      say('error', `The backup of ${opened.name} could not be opened: ${problem(err)}`);
      return false;
    }
    if (!backup || !(await adopt(backup, options, false))) return false;
    // unsaved on purpose: the file on disk is still the unreadable one until the user saves
    state.savedText = '';
    say('warning', `${opened.name} could not be read (${reason}); its backup was opened instead. Save to make it the campaign again.`);
    return true;
  }

  /** Take over an opened campaign: report every missing or changed file by name, then read the rest. */
  async function adopt(opened: OpenedCampaign, options: { keepId: boolean }, mayOfferBackup = true): Promise<boolean> {
    let campaign: Campaign;
    try {
      campaign = readCampaignText(opened.name, opened.text);
    } catch (err) {
      if (mayOfferBackup && (await offerBackup(opened, problem(err), options))) return true;
      say('error', `${problem(err)}${opened.backupAvailable ? ' A backup of the campaign exists beside it.' : ''} Nothing was changed.`);
      return false;
    }
    reset(campaign, serializeCampaign(campaign));
    state.campaignId = options.keepId ? opened.id : null;
    state.campaignFile = opened.name;
    const found = new Map<string, OpenedRun>(opened.runs.map((r) => [r.file, r]));
    // why a named file is not there: refused by the host (outside the campaign folder…) or simply missing
    const whyMissing = (file: string): string => {
      const why = found.get(file)?.refused ?? campaignPathProblem(file);
      return why ? `${file} (refused: ${why})` : file;
    };
    const missing: string[] = [];
    // built whole and handed over at once: one change for the page however many runs there are
    const entries: Record<string, RunEntry> = {};
    for (const run of campaign.runs) {
      const f = found.get(run.file);
      const e = newEntry(run.file, f?.id ?? null, f?.size ?? null);
      if (f?.id && f.sha256) {
        e.sha256 = f.sha256;
        e.hashNote = checkHash(run.file, run.sha256, f.sha256);
      }
      if (!f?.id && (f?.refused || campaignPathProblem(run.file))) e.errors = [`${whyMissing(run.file)}: the run stays in the campaign; Locate… points it to a file`];
      entries[run.file] = e;
      if (!f?.id) missing.push(whyMissing(run.file));
    }
    state.entries = entries;
    const tareFiles = new Set<string>([...(campaign.tares ?? []).map((t) => t.file), ...campaign.runs.map((r) => r.tare).filter((t): t is string => !!t)]);
    const tares: Record<string, TareEntry> = {};
    for (const file of tareFiles) {
      const f = found.get(file);
      tares[file] = { file, fileId: f?.id ?? null, sha256: null, hashNote: null, status: f?.id ? 'reading' : 'missing', errors: f?.refused ? [`refused: ${f.refused}`] : [] };
      if (!f?.id) missing.push(`${whyMissing(file)} (tare)`);
    }
    state.tares = tares;
    // balance files named by the setups: found by the host beside the campaign like the runs
    const balances = new Set(Object.values(campaign.setups).map(balancePathOf).filter((p): p is string => p !== undefined));
    loader.rememberNamed([...balances].map((file) => ({ file, id: found.get(file)?.id ?? null, refused: found.get(file)?.refused ?? campaignPathProblem(file) })));
    for (const file of balances) if (!found.get(file)?.id) missing.push(`${whyMissing(file)} (balance file)`);
    if (missing.length > 0) {
      const shown = missing.length > 12 ? [...missing.slice(0, 12), `and ${missing.length - 12} more`] : missing;
      say('warning', `Not found beside the campaign: ${shown.join(', ')}. ${missing.length === 1 ? 'It stays' : 'They stay'} in the campaign; use Locate… or import the file with the same name.`);
    }
    state.currentRun = campaign.runs[0]?.file ?? null;
    await loader.loadAll(campaign.runs.filter((r) => entries[r.file]!.fileId).map((r) => r.file));
    return true;
  }

  async function openSample(): Promise<void> {
    if (!(await confirmDiscard())) return;
    try {
      // the bundled sample is never saved over: the first save asks where
      await adopt(await host.openSampleCampaign(), { keepId: false });
    } catch (err) {
      say('error', `The sample campaign could not be opened: ${problem(err)}`);
    }
  }

  async function openCampaign(): Promise<void> {
    if (!(await confirmDiscard())) return;
    try {
      const opened = await host.openCampaign();
      if (opened) await adopt(opened, { keepId: true });
    } catch (err) {
      say('error', problem(err));
    }
    await refreshRecent();
  }

  async function openRecent(id: string): Promise<void> {
    if (!host.openRecentCampaign || !(await confirmDiscard())) return;
    try {
      const opened = await host.openRecentCampaign(id);
      if (opened) await adopt(opened, { keepId: true });
    } catch (err) {
      say('error', problem(err));
    }
  }

  async function refreshRecent(): Promise<void> {
    try {
      state.recent = await host.recentCampaigns();
    } catch {
      state.recent = [];
    }
  }

  /** Problems that keep the campaign from being saved in a form it can be opened from again. */
  function saveProblems(): string[] {
    const out: string[] = [];
    for (const r of state.campaign.runs) {
      if (!state.campaign.setups[r.setup]) out.push(`${r.file} names setup "${r.setup}", which has not been applied yet`);
    }
    return out;
  }

  async function save(saveAs = false): Promise<boolean> {
    const problems = saveProblems();
    if (problems.length > 0) {
      say('error', `Not saved: ${problems.join('; ')}.`);
      return false;
    }
    const text = serializeCampaign(state.campaign);
    const suggestedName = state.campaignFile ?? `${state.campaign.name.replace(/[^A-Za-z0-9._ -]+/g, '-').trim() || 'campaign'}.json`;
    try {
      const saved = await host.saveCampaign(text, { id: state.campaignId ?? undefined, saveAs: saveAs || state.campaignId === null, suggestedName });
      if (!saved) return false;
      state.campaignId = saved.id;
      state.campaignFile = saved.name;
      state.savedText = text;
      await refreshRecent();
      return true;
    } catch (err) {
      say('error', `Not saved: ${problem(err)}`);
      return false;
    }
  }

  /**
   * Reopen the campaign the host kept from the last visit (the browser host after a reload or restart),
   * unsaved changes still marked unsaved. False when nothing was kept.
   */
  async function restoreSession(): Promise<boolean> {
    if (!host.restoreSession) return false;
    try {
      const kept = await host.restoreSession();
      if (!kept || !(await adopt(kept.opened, { keepId: false }))) return false;
      state.campaignFile = kept.campaignFile;
      state.savedText = kept.savedText;
      return true;
    } catch (err) {
      say('warning', `The campaign kept from the last visit could not be reopened: ${problem(err)}`);
      return false;
    }
  }

  return { newCampaign, openSample, openCampaign, openRecent, refreshRecent, save, restoreSession };
}
