/**
 * Hands the working campaign and its files to the host whenever they change (a short moment after the
 * last change), so the browser host can bring them back after a reload or a restart. Hosts without
 * keepSession (the desktop window, which works on files on disk) are left alone.
 */
import { watch } from 'vue';
import { serializeCampaign } from '../../../core/index.ts';
import type { Host, KeptSession } from '../host/hostAccess.ts';
import type { CampaignState } from './campaignState.ts';

export const KEEP_DELAY_MS = 150;

/** Files the campaign names besides its runs and tares (balance files), with the host's id of each. */
export type OtherFiles = () => { file: string; id: string }[];

export function sessionOf(base: CampaignState, others: OtherFiles = () => []): KeptSession {
  const { state } = base;
  const files: KeptSession['files'] = [];
  for (const e of Object.values(state.entries)) if (e.fileId) files.push({ file: e.file, id: e.fileId });
  for (const t of Object.values(state.tares)) if (t.fileId) files.push({ file: t.file, id: t.fileId });
  for (const f of others()) files.push(f);
  return { campaignText: serializeCampaign(state.campaign), savedText: state.savedText, campaignFile: state.campaignFile, files };
}

/**
 * Start keeping; returns `flushed()`, resolving once what is shown now has been handed over. The
 * document's `data-kept` attribute says "pending" or "kept" (tests and the curious can wait on it).
 */
export function startSessionKeeper(
  base: CampaignState,
  host: Host,
  doc: Document | null = typeof document === 'undefined' ? null : document,
  /** Resolves when no run is being read: keeping copies every file into storage, which waits until then. */
  idle: () => Promise<void> = () => Promise.resolve(),
  others: OtherFiles = () => [],
) {
  let timer: ReturnType<typeof setTimeout> | undefined;
  let last = Promise.resolve();
  const mark = (v: string) => doc?.documentElement.setAttribute('data-kept', v);
  if (!host.keepSession) return { flushed: () => last, stop: () => undefined };

  const keep = () => {
    timer = undefined;
    const session = sessionOf(base, others);
    last = host.keepSession!(session).then(
      () => (timer === undefined && !waiting ? mark('kept') : undefined),
      () => mark('failed'),
    );
  };
  // copying a thousand files into storage while they are being read would slow the opening down: the
  // keep waits until the runs have been read, then takes the campaign as it is by then
  let waiting = false;
  const keepWhenIdle = () => {
    timer = undefined;
    if (waiting) return;
    waiting = true;
    void idle().then(() => {
      waiting = false;
      if (timer === undefined) keep();
    });
  };
  const stop = watch(
    () => {
      const s = sessionOf(base);
      return `${s.campaignText}\n${s.savedText}\n${s.campaignFile}\n${s.files.map((f) => `${f.file}=${f.id}`).join('|')}`;
    },
    () => {
      mark('pending');
      if (timer !== undefined) clearTimeout(timer);
      timer = setTimeout(keepWhenIdle, KEEP_DELAY_MS);
    },
    { immediate: true },
  );
  return {
    flushed: async () => {
      if (timer !== undefined || waiting) {
        if (timer !== undefined) clearTimeout(timer);
        keep();
      }
      await last;
    },
    stop,
  };
}
