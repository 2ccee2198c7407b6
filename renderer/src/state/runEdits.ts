/**
 * Changes to the campaign's runs: adding files (import, drop, locating a missing one), removing,
 * ticking, labels, setup and tare assignment, column mappings and setups. Each change that affects a
 * result reduces the runs concerned again.
 */
import type { Campaign } from '../../../core/index.ts';
import type { ChosenFile } from '../../../core/index.ts';
import type { ColumnMapping } from '../../../core/index.ts';
import type { EngineClient } from '../engine/engineClient.ts';
import type { Host } from '../host/hostAccess.ts';
import { baseName } from '../host/browserHost.ts';
import { newEntry, type CampaignState } from './campaignState.ts';
import type { RunLoader } from './runLoader.ts';

export function createRunEdits(base: CampaignState, host: Host, engine: EngineClient, loader: RunLoader, ask: (question: string) => Promise<boolean>) {
  const { state, say, problem, runOf } = base;
  const { hashOf, checkHash, reReduce } = loader;

  function defaultSetup(): string {
    const current = state.currentRun ? runOf(state.currentRun)?.setup : undefined;
    return current ?? Object.keys(state.campaign.setups)[0] ?? state.editingSetup ?? 'setup 1';
  }

  /** Add chosen files as runs; a file named like a missing run locates that run instead. */
  async function addFiles(chosen: readonly ChosenFile[]): Promise<void> {
    const toLoad: string[] = [];
    for (const c of chosen) {
      if (/\.json$/i.test(c.name)) {
        // a balance file a setup names and the campaign could not find: taken in, its runs read again
        if (await loader.offerNamedFile(c)) continue;
        say('info', `${c.name} is not a run file: open campaigns with Open…, read setups in the Setup view.`);
        continue;
      }
      const existing = state.campaign.runs.find((r) => baseName(r.file) === c.name);
      if (existing) {
        const e = state.entries[existing.file]!;
        if (e.fileId) {
          say('info', `${c.name} is already in the campaign (as ${existing.file}); not added again.`);
          continue;
        }
        e.fileId = c.id;
        e.size = c.size;
        e.errors = [];
        e.status = 'queued';
        toLoad.push(existing.file);
        continue;
      }
      // read provisionally with the current run's setup and no tare; the import strip (ImportChoice.vue)
      // proposes a setup and tare from the file's metadata and the run stays marked until the user confirms
      const setup = defaultSetup();
      state.campaign.runs.push({ file: c.name, sha256: null, configuration: null, setup, tare: null, visible: true });
      if (!state.unconfirmed.includes(c.name)) state.unconfirmed.push(c.name);
      state.entries[c.name] = { ...newEntry(c.name, c.id, c.size), imported: true };
      if (!state.campaign.setups[setup]) state.editingSetup = setup;
      toLoad.push(c.name);
    }
    if (toLoad.length > 0 && !state.currentRun) state.currentRun = toLoad[0]!;
    await loader.loadAll(toLoad);
  }

  async function importRuns(): Promise<void> {
    try {
      await addFiles(await host.chooseRunFiles());
    } catch (err) {
      say('error', problem(err));
    }
  }

  async function dropFiles(files: File[]): Promise<void> {
    try {
      if (host.acceptDroppedFiles) await addFiles(await host.acceptDroppedFiles(files));
      else if (host.adoptDroppedFile) await addFiles(await Promise.all(files.map((f) => host.adoptDroppedFile!(f))));
      else say('info', 'This window cannot take dropped files; use Import runs…');
    } catch (err) {
      say('error', `Dropped files could not be taken: ${problem(err)}`);
    }
  }

  async function removeRun(file: string): Promise<void> {
    if (!(await ask(`Remove ${file} from the campaign? The file itself is not touched.`))) return;
    const i = state.campaign.runs.findIndex((r) => r.file === file);
    if (i >= 0) state.campaign.runs.splice(i, 1);
    delete state.entries[file];
    state.unconfirmed = state.unconfirmed.filter((f) => f !== file);
    loader.forgetRun(file);
    if (state.campaign.baseline === file) state.campaign.baseline = null;
    if (state.currentRun === file) state.currentRun = state.campaign.runs[0]?.file ?? null;
  }

  function acceptChangedFile(file: string): void {
    const e = state.entries[file];
    const run = runOf(file);
    if (e && run && e.sha256) {
      run.sha256 = e.sha256;
      e.hashNote = null;
    }
  }

  function setVisible(file: string, visible: boolean): void {
    const run = runOf(file);
    if (run) run.visible = visible;
  }

  function setConfiguration(file: string, configuration: string): void {
    const run = runOf(file);
    if (run) run.configuration = configuration.trim() === '' ? null : configuration.trim();
  }

  function setBaseline(file: string | null): void {
    state.campaign.baseline = file;
  }

  function setRunSetup(file: string, setup: string): void {
    const run = runOf(file);
    if (!run || run.setup === setup) return;
    run.setup = setup;
    void reReduce((r) => r.file === file);
  }

  /** The user's choice of setup and tare for an imported run; the run is reduced again when either changed. */
  function confirmImport(file: string, setup: string, tare: string | null): void {
    const run = runOf(file);
    state.unconfirmed = state.unconfirmed.filter((f) => f !== file);
    if (!run) return;
    const changed = run.setup !== setup || (run.tare ?? null) !== tare;
    run.setup = setup;
    run.tare = tare;
    if (changed) void reReduce((r) => r.file === file);
  }

  function setRunTare(file: string, tare: string | null): void {
    const run = runOf(file);
    if (!run) return;
    run.tare = tare;
    void reReduce((r) => r.file === file);
  }

  /** Choose a wind-off file as the tare of a run. */
  async function chooseTare(file: string): Promise<void> {
    const [c] = await host.chooseRunFiles();
    if (!c) return;
    const existing = state.tares[c.name];
    if (!existing || !existing.fileId) {
      const sha = await hashOf(c.id);
      state.tares[c.name] = { file: c.name, fileId: c.id, sha256: sha, hashNote: null, status: 'reading', errors: [] };
      loader.forgetTare(c.name);
      const tares = (state.campaign.tares ??= []);
      const recorded = tares.find((t) => t.file === c.name);
      if (recorded) state.tares[c.name]!.hashNote = checkHash(c.name, recorded.sha256, sha);
      else tares.push({ file: c.name, sha256: sha });
    }
    setRunTare(file, c.name);
  }

  /** Point a missing run at a file the user chooses (the same name, so the campaign stays right). */
  async function locate(file: string): Promise<void> {
    const chosen = await host.chooseRunFiles();
    const c = chosen.find((x) => x.name === baseName(file));
    if (!c) {
      if (chosen.length > 0) say('warning', `Choose the file named ${baseName(file)} to locate ${file}.`);
      return;
    }
    await addFiles([c]);
  }

  /** Apply a column mapping to a run, remember it for its header, and read again every run it fits. */
  async function applyMapping(file: string, mapping: ColumnMapping): Promise<void> {
    const run = runOf(file);
    const e = state.entries[file];
    if (!run || !e) return;
    run.mapping = mapping;
    const signature = e.header?.signature;
    if (signature) (state.campaign.mappings ??= {})[signature] = mapping;
    state.mappingFor = null;
    const again = state.campaign.runs
      .filter((r) => r.file === file || (state.entries[r.file]?.status === 'needs-mapping' && state.entries[r.file]?.header?.signature === signature))
      .map((r) => r.file);
    await loader.loadAll(again);
  }

  /** Store a valid setup under a name and reduce its runs again. */
  async function applySetup(name: string, setup: unknown): Promise<void> {
    state.campaign.setups[name] = JSON.parse(JSON.stringify(setup)) as Campaign['setups'][string];
    await reReduce((r) => r.setup === name);
  }

  function renameSetup(from: string, to: string): boolean {
    const name = to.trim();
    if (!name || name === from || state.campaign.setups[name]) return false;
    const setups = state.campaign.setups;
    if (setups[from]) {
      setups[name] = setups[from]!;
      delete setups[from];
    }
    for (const r of state.campaign.runs) if (r.setup === from) r.setup = name;
    if (state.editingSetup === from) state.editingSetup = name;
    return true;
  }

  function removeSetup(name: string): boolean {
    if (state.campaign.runs.some((r) => r.setup === name)) return false;
    delete state.campaign.setups[name];
    if (state.editingSetup === name) state.editingSetup = Object.keys(state.campaign.setups)[0] ?? null;
    return true;
  }

  return {
    confirmImport,
    addFiles,
    importRuns,
    dropFiles,
    removeRun,
    acceptChangedFile,
    setVisible,
    setConfiguration,
    setBaseline,
    setRunSetup,
    setRunTare,
    chooseTare,
    locate,
    applyMapping,
    applySetup,
    renameSetup,
    removeSetup,
  };
}
