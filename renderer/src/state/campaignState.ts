/**
 * The state of the campaign being worked on, and what every part of it needs to look things up: the
 * campaign itself, what is known about each run and tare file, messages for the user, the view choices.
 */
import { computed, reactive, shallowReactive, watch, type ComputedRef } from 'vue';
import { emptyCampaign, serializeCampaign, type Campaign, type CampaignRun } from '../../../core/index.ts';
import { formatNotice, InputError } from '../../../core/index.ts';
import type { ReductionResult } from '../../../core/index.ts';
import type { Host } from '../host/hostAccess.ts';
import { baseName } from '../host/browserHost.ts';
import { emptyDraft, type FullScaleDraft } from '../logic/fullScale.ts';
import { assignStyles, configurationOrder, styleFor, type SeriesStyle } from '../logic/palette.ts';
import type { ChannelStats, HeaderInfo } from '../worker/protocol.ts';

export type RunStatus = 'missing' | 'queued' | 'reading' | 'reducing' | 'ready' | 'failed' | 'needs-mapping' | 'needs-setup';
export type Basis = 'corrected' | 'measured';

export interface RunEntry {
  file: string;
  fileId: string | null;
  size: number | null;
  status: RunStatus;
  /** 0..1 while reading when the size is known. */
  progress: number | null;
  charsRead: number;
  /** SHA-256 of the file as found now. */
  sha256: string | null;
  /** Set when the file differs from the one the campaign recorded. */
  hashNote: string | null;
  errors: string[];
  header: HeaderInfo | null;
  stats: ChannelStats | null;
  result: ReductionResult | null;
  asMeasured: ReductionResult | null;
  reducedAt: string | null;
  generation: number;
  /** Added in this session: takes its hash and configuration from the file once reduced. */
  imported: boolean;
}

export interface TareEntry {
  file: string;
  fileId: string | null;
  sha256: string | null;
  hashNote: string | null;
  status: 'missing' | 'reading' | 'ready' | 'failed';
  errors: string[];
}

export interface Banner {
  id: number;
  kind: 'error' | 'warning' | 'info';
  text: string;
}

export interface WorkbenchState {
  campaign: Campaign;
  /** Host handle of the campaign file; null until saved (or for the bundled sample). */
  campaignId: string | null;
  campaignFile: string | null;
  savedText: string;
  entries: Record<string, RunEntry>;
  tares: Record<string, TareEntry>;
  banners: Banner[];
  basis: Basis;
  currentRun: string | null;
  mappingFor: string | null;
  recent: { id: string; name: string }[];
  /** Setup the editor shows; may name a setup not yet in the campaign (a new one being written). */
  editingSetup: string | null;
  /** The view shown beside the run list. */
  view: ViewId;
  /** Draw each point's standard uncertainty (k = 1) as error bars where the runs carry them. */
  errorBars: boolean;
  /** What was typed into the full-scale estimate, kept while other views are shown. */
  fullScale: FullScaleDraft;
  /** Imported runs whose setup and tare the user has not confirmed yet (ImportChoice.vue). */
  unconfirmed: string[];
}

export type ViewId = 'plots' | 'delta' | 'fits' | 'fullscale' | 'detail' | 'samples' | 'setup' | 'analysis'; // 'analysis': balance, upflow, repeatability

/** Runs that hold their place in the order of colours: reduced, or on their way to it. */
const PROSPECTIVE: ReadonlySet<RunStatus> = new Set<RunStatus>(['queued', 'reading', 'reducing', 'ready']);

/** Swatch colour of a run that is not reduced; it holds none of the run colours. */
export const UNREDUCED_GREY = '#A0A6AD';

export const RUN_KEY = (file: string) => `run:${file}`;
export const TARE_KEY = (file: string) => `tare:${file}`;

export function newEntry(file: string, fileId: string | null, size: number | null): RunEntry {
  return {
    file,
    fileId,
    size,
    status: fileId ? 'queued' : 'missing',
    progress: null,
    charsRead: 0,
    sha256: null,
    hashNote: null,
    errors: fileId ? [] : [`${file}: file not found beside the campaign; the run stays in the campaign (Locate… points to it)`],
    header: null,
    stats: null,
    result: null,
    asMeasured: null,
    reducedAt: null,
    generation: 0,
    imported: false,
  };
}

export function createCampaignState(host: Host) {
  const state = reactive<WorkbenchState>({
    campaign: emptyCampaign(),
    campaignId: null,
    campaignFile: null,
    savedText: serializeCampaign(emptyCampaign()),
    entries: {},
    tares: {},
    banners: [],
    basis: 'corrected',
    currentRun: null,
    mappingFor: null,
    recent: [],
    editingSetup: null,
    view: 'plots',
    errorBars: true,
    fullScale: emptyDraft(),
    unconfirmed: [],
  });
  let bannerId = 0;

  const dirty: ComputedRef<boolean> = computed(() => serializeCampaign(state.campaign) !== state.savedText);
  watch(dirty, (d) => host.setDirty(d), { immediate: true });

  // ---- messages -----------------------------------------------------------------------------------

  function say(kind: Banner['kind'], text: string): void {
    state.banners.push({ id: ++bannerId, kind, text });
  }
  function dismiss(id: number): void {
    const i = state.banners.findIndex((b) => b.id === id);
    if (i >= 0) state.banners.splice(i, 1);
  }
  function problem(err: unknown): string {
    if (err instanceof InputError) return formatNotice(err.notice);
    return err instanceof Error ? err.message : String(err);
  }

  // ---- lookups ------------------------------------------------------------------------------------

  // by file name: every row, style and plot looks runs up, and a search of a list of thousands each time adds up
  const runIndex = computed(() => new Map(state.campaign.runs.map((r) => [r.file, r])));
  function runOf(file: string): CampaignRun | undefined {
    return runIndex.value.get(file);
  }
  function displayName(file: string): string {
    const e = state.entries[file];
    return e?.result?.run.name ?? baseName(file).replace(/\.[^.]*$/, '');
  }
  function configurationOf(file: string): string | null {
    const r = runOf(file);
    return r?.configuration ?? state.entries[file]?.result?.run.configuration ?? null;
  }
  /** The result for the chosen basis: corrected, or the same run reduced with corrections off. */
  function resultOf(file: string, basis: Basis = state.basis): ReductionResult | null {
    const e = state.entries[file];
    if (!e || e.status !== 'ready') return null;
    return basis === 'corrected' ? e.result : e.asMeasured;
  }
  const configurations = computed(() => configurationOrder(state.campaign.runs.map((r) => configurationOf(r.file))));
  /** Colour, marker and dash of every reduced run (logic/palette.ts): unique colours, none spent on failed runs. */
  const styles = computed(() =>
    assignStyles(
      state.campaign.runs
        // runs still on their way (waiting, reading, reducing) keep their place, unseen, so the colours of
        // the runs before them do not shift each time one finishes out of order; a run that fails gives it up
        .filter((r) => PROSPECTIVE.has(state.entries[r.file]?.status ?? 'missing'))
        .map((r) => ({ file: r.file, configuration: configurationOf(r.file), chosen: r.style })),
      configurations.value,
    ),
  );
  // Each run's style kept in a reactive map, replaced only where it changed: a view that draws some runs
  // then depends on those runs' styles alone, not on every run that becomes ready while a campaign of
  // thousands is read (each batch would otherwise rebuild every plot, past their throttle). Synced
  // before the page redraws (the watcher's default timing).
  const styleCache = shallowReactive(new Map<string, SeriesStyle>());
  const styleKey = (s: SeriesStyle) => `${s.colour} ${s.marker} ${s.dash.join(',')} ${s.filled}`;
  watch(
    styles,
    (next) => {
      for (const [file, s] of next) {
        const old = styleCache.get(file);
        if (!old || styleKey(old) !== styleKey(s)) styleCache.set(file, s);
      }
      for (const file of [...styleCache.keys()]) if (!next.has(file)) styleCache.delete(file);
    },
    { immediate: true },
  );
  function styleOf(file: string): SeriesStyle {
    const s = state.entries[file]?.status === 'ready' ? styleCache.get(file) : undefined;
    if (s) return s;
    // not reduced (yet): the configuration's marker in grey, holding no colour
    return { ...styleFor(0, Math.max(0, configurations.value.indexOf(configurationOf(file) ?? ''))), colour: UNREDUCED_GREY };
  }
  /** Runs shown in plots: ticked and reduced, in campaign order. */
  const shownRuns = computed(() => state.campaign.runs.filter((r) => r.visible !== false && state.entries[r.file]?.status === 'ready').map((r) => r.file));
  const readyRuns = computed(() => state.campaign.runs.filter((r) => state.entries[r.file]?.status === 'ready').map((r) => r.file));

  return { state, dirty, say, dismiss, problem, runOf, displayName, configurationOf, resultOf, configurations, styleOf, shownRuns, readyRuns };
}

export type CampaignState = ReturnType<typeof createCampaignState>;
