/**
 * The campaign being worked on and everything known about its runs, put together from its parts
 * (campaignState, runLoader, campaignFiles, runEdits, runProvenance). Components read the state and
 * call these actions; files go through the host, parsing and reduction through the worker.
 */
import type { MenuCommand } from '../../../core/index.ts';
import type { EngineClient } from '../engine/engineClient.ts';
import type { Host } from '../host/hostAccess.ts';
import { createCampaignFiles } from './campaignFiles.ts';
import { createCampaignState } from './campaignState.ts';
import { createRunEdits } from './runEdits.ts';
import { createRunLoader } from './runLoader.ts';
import { createProvenance } from './runProvenance.ts';
import { startSessionKeeper } from './sessionKeeper.ts';

export type { Banner, Basis, RunEntry, RunStatus, TareEntry, ViewId, WorkbenchState } from './campaignState.ts';
export { RUN_KEY, TARE_KEY } from './campaignState.ts';

export interface WorkbenchOptions {
  /** Ask the user a yes/no question (window.confirm in the app). */
  ask?: (question: string) => Promise<boolean>;
}

export function createWorkbench(host: Host, engine: EngineClient, options: WorkbenchOptions = {}) {
  const ask = options.ask ?? (async () => true);
  const base = createCampaignState(host);
  const loader = createRunLoader(base, host, engine);
  const files = createCampaignFiles(base, host, loader, ask);
  const edits = createRunEdits(base, host, engine, loader, ask);
  const provenance = createProvenance(base, loader.balanceRead);

  let keeper: ReturnType<typeof startSessionKeeper> | null = null;
  /**
   * Bring back what the host kept from the last visit, then keep every change from here on. Returns
   * whether a campaign was brought back (the first start opens the sample instead).
   */
  async function resumeSession(): Promise<boolean> {
    const restored = await files.restoreSession();
    keeper ??= startSessionKeeper(base, host, undefined, loader.settled, loader.namedFiles);
    return restored;
  }

  function handleMenu(command: MenuCommand, exports: Partial<Record<MenuCommand, () => unknown>>): void {
    const actions: Partial<Record<MenuCommand, () => unknown>> = {
      'campaign:new': files.newCampaign,
      'campaign:open': files.openCampaign,
      'campaign:save': () => files.save(false),
      'campaign:save-as': () => files.save(true),
      'runs:import': edits.importRuns,
      ...exports,
    };
    void actions[command]?.();
  }

  return {
    state: base.state,
    dirty: base.dirty,
    shownRuns: base.shownRuns,
    readyRuns: base.readyRuns,
    configurations: base.configurations,
    runOf: base.runOf,
    displayName: base.displayName,
    configurationOf: base.configurationOf,
    resultOf: base.resultOf,
    styleOf: base.styleOf,
    say: base.say,
    dismiss: base.dismiss,
    ...files,
    ...edits,
    provenance,
    handleMenu,
    resumeSession,
    /** Resolves when the working campaign as shown has been handed to the host's keeping. */
    sessionKept: () => keeper?.flushed() ?? Promise.resolve(),
    /** Resolves when every queued read and reduction has finished (tests, exports). */
    settled: loader.settled,
  };
}

export type Workbench = ReturnType<typeof createWorkbench>;
