/**
 * The browser host (docs/architecture.md §1): the same interface as the Electron preload, built from what a web page
 * has — file inputs, dropped files, downloads, fetch for the bundled sample and local storage for the
 * recent list. Files are held in memory as Blobs under opaque ids; nothing here ever sees a path.
 */
import { campaignPathProblem, type ChosenFile, type OpenedCampaign, type SweepbookHost } from '../../../core/index.ts';
import type { HostExtras, KeptSession, OpenedRun, RestoredSession } from './hostAccess.ts';
import { getJson, openKeptStore, putJson, type KeptStore } from './keptStore.ts';

const RECENT_KEY = 'sweepbook.recentCampaigns';
const SESSION_KEY = 'session';
const FILE_PREFIX = 'file:';
/** Run files larger than this are not kept between visits (they come back as "not found", to be located). */
const KEEP_FILE_LIMIT = 256 * 1024 * 1024;

interface KeptRecord {
  campaignText: string;
  savedText: string;
  campaignFile: string | null;
  files: { file: string; name: string; digest: string; size: number }[];
}
const RECENT_MAX = 8;
const SAMPLE_FOLDER = 'sample-runs/';
const SAMPLE_CAMPAIGN = 'sweepbook-campaign.json';
export const RUN_FILE_TYPES = '.csv,.tsv,.txt,.dat,.json,text/csv,text/plain,application/json';

interface RecentEntry {
  id: string;
  name: string;
  text: string;
  savedAt: string;
}

/**
 * Names of the files a campaign refers to (runs, tares, and balance files its setups name by path),
 * read without validating the campaign.
 */
export function filesNamedBy(campaignText: string): string[] {
  let json: unknown;
  try {
    json = JSON.parse(campaignText);
  } catch {
    return [];
  }
  const c = json as { runs?: { file?: unknown; tare?: unknown }[]; tares?: { file?: unknown }[]; setups?: Record<string, { balance?: { calibration?: unknown } }> };
  const names = new Set<string>();
  for (const r of Array.isArray(c.runs) ? c.runs : []) {
    if (typeof r?.file === 'string') names.add(r.file);
    if (typeof r?.tare === 'string') names.add(r.tare);
  }
  for (const t of Array.isArray(c.tares) ? c.tares : []) if (typeof t?.file === 'string') names.add(t.file);
  const setups = c.setups !== null && typeof c.setups === 'object' ? Object.values(c.setups) : [];
  for (const s of setups) if (typeof s?.balance?.calibration === 'string') names.add(s.balance.calibration);
  return [...names];
}

export function baseName(path: string): string {
  return path.replace(/^.*[\\/]/, '');
}

export function hex(bytes: ArrayBuffer): string {
  return Array.from(new Uint8Array(bytes), (b) => b.toString(16).padStart(2, '0')).join('');
}

export function createBrowserHost(win: Window): SweepbookHost & HostExtras {
  const doc = win.document;
  const files = new Map<string, { name: string; blob: Blob }>();
  let counter = 0;
  let dirty = false;

  const keepUnsized = (name: string, blob: Blob): string => {
    const id = `b${++counter}`;
    files.set(id, { name, blob });
    return id;
  };
  const keep = (name: string, blob: Blob): ChosenFile => ({ id: keepUnsized(name, blob), name, size: blob.size });
  const blobOf = (id: string): Blob => {
    const f = files.get(id);
    if (!f) throw new Error(`no file with id "${id}" was chosen in this window`);
    return f.blob;
  };

  // set once the working campaign has been kept: then a reload or closing the tab loses nothing, and
  // the browser's "leave the page?" question is only asked where it cannot be kept
  let keptOnce = false;
  win.addEventListener('beforeunload', (e) => {
    if (!dirty || keptOnce) return;
    e.preventDefault();
    // older engines need returnValue set to ask before closing
    e.returnValue = '';
  });

  /** Open the browser's file chooser; resolves with nothing when the user cancels. */
  function chooseFiles(accept: string, multiple: boolean): Promise<File[]> {
    return new Promise((resolve) => {
      const input = doc.createElement('input');
      input.type = 'file';
      input.accept = accept;
      input.multiple = multiple;
      input.hidden = true;
      const done = (list: File[]) => {
        input.remove();
        resolve(list);
      };
      input.addEventListener('change', () => done(Array.from(input.files ?? [])));
      input.addEventListener('cancel', () => done([]));
      doc.body.appendChild(input);
      input.click();
    });
  }

  function download(name: string, blob: Blob): void {
    const url = URL.createObjectURL(blob);
    const a = doc.createElement('a');
    a.href = url;
    a.download = name;
    a.hidden = true;
    doc.body.appendChild(a);
    a.click();
    a.remove();
    // give the download a moment to start before the URL goes away
    win.setTimeout(() => URL.revokeObjectURL(url), 60_000);
  }

  // opened once: encrypted, per-origin storage of the working campaign, its files and the recent list
  let storeOpened: Promise<KeptStore | null> | undefined;
  const store = () => (storeOpened ??= openKeptStore(win).catch(() => null));
  // keeps run one after another, so a slow write never lands after a newer one
  let keeping: Promise<void> = Promise.resolve();

  // without IndexedDB the recent list falls back to local storage (per origin, unencrypted)
  function readLocal(): RecentEntry[] | null {
    try {
      return JSON.parse(win.localStorage.getItem(RECENT_KEY) ?? '[]') as RecentEntry[];
    } catch {
      return null;
    }
  }

  async function readRecent(): Promise<RecentEntry[]> {
    const s = await store();
    const list = s ? await getJson<RecentEntry[]>(s, RECENT_KEY) : readLocal();
    return Array.isArray(list) ? list : [];
  }

  async function remember(entry: RecentEntry): Promise<void> {
    const list = [entry, ...(await readRecent()).filter((e) => e.id !== entry.id && e.name !== entry.name)].slice(0, RECENT_MAX);
    try {
      const s = await store();
      if (s) await putJson(s, RECENT_KEY, list);
      else win.localStorage.setItem(RECENT_KEY, JSON.stringify(list));
    } catch {
      // storage full or refused: the recent list is a convenience, the save itself has happened
    }
  }

  const digests = new Map<string, Promise<string>>();
  const digestOf = (id: string): Promise<string> => sha256(id);

  async function keepNow(session: KeptSession): Promise<void> {
    const s = await store();
    if (!s) return;
    const present = new Set(await s.keys());
    const record: KeptRecord = { campaignText: session.campaignText, savedText: session.savedText, campaignFile: session.campaignFile, files: [] };
    for (const { file, id } of session.files) {
      const f = files.get(id);
      if (!f || f.blob.size > KEEP_FILE_LIMIT) continue;
      const digest = await digestOf(id);
      if (!present.has(FILE_PREFIX + digest)) {
        await s.put(FILE_PREFIX + digest, new Uint8Array(await f.blob.arrayBuffer()));
        present.add(FILE_PREFIX + digest);
      }
      record.files.push({ file, name: f.name, digest, size: f.blob.size });
    }
    await putJson(s, SESSION_KEY, record);
    keptOnce = true;
    // files no longer named by the kept campaign go
    const wanted = new Set(record.files.map((f) => FILE_PREFIX + f.digest));
    for (const k of present) if (k.startsWith(FILE_PREFIX) && !wanted.has(k)) await s.delete(k);
  }

  function sha256(id: string): Promise<string> {
    // remembered: keeping the session needs the same digest, and a chosen file's bytes never change
    let d = digests.get(id);
    if (!d) {
      const subtle = win.crypto?.subtle;
      if (!subtle) return Promise.reject(new Error('SHA-256 needs a secure context: open the page as http://127.0.0.1 or http://localhost'));
      d = blobOf(id)
        .arrayBuffer()
        .then((bytes) => subtle.digest('SHA-256', bytes))
        .then(hex);
      digests.set(id, d);
      // a failure is not remembered: the next call tries again
      d.catch(() => digests.delete(id));
    }
    return d;
  }

  /**
   * Campaign text plus the run files chosen with it, matched by file name. Hashes are left to the loader,
   * which works them out as it reads each run, so a campaign of a thousand runs is listed at once.
   */
  async function resolveCampaign(id: string, name: string, text: string, available: Map<string, { id: string; size?: number }>): Promise<OpenedCampaign> {
    const runs: OpenedRun[] = [];
    for (const file of filesNamedBy(text)) {
      // the same rule as the desktop window: a campaign may not point outside its own folder
      const refused = campaignPathProblem(file);
      if (refused) {
        runs.push({ file, id: null, sha256: null, refused });
        continue;
      }
      const chosen = available.get(baseName(file));
      runs.push({ file, id: chosen?.id ?? null, sha256: null, size: chosen?.size });
    }
    return { id, name, text, runs };
  }

  const host: SweepbookHost & HostExtras = {
    kind: 'browser',

    async chooseRunFiles() {
      return (await chooseFiles(RUN_FILE_TYPES, true)).map((f) => keep(f.name, f));
    },

    async acceptDroppedFiles(list) {
      return list.map((f) => keep(f.name, f));
    },

    async readChunks(id, onChunk, chunkBytes = 1 << 20) {
      const blob = blobOf(id);
      if (blob.size <= chunkBytes) {
        // one read of a small file serves its text and its SHA-256 both (a campaign of thousands of
        // small runs would otherwise read every file twice)
        const bytes = await blob.arrayBuffer();
        const subtle = win.crypto?.subtle;
        if (subtle && !digests.has(id)) digests.set(id, subtle.digest('SHA-256', bytes).then(hex));
        const text = new TextDecoder('utf-8').decode(bytes);
        if (text.length > 0) await (onChunk(text) as unknown);
        return;
      }
      const decoder = new TextDecoder('utf-8');
      for (let at = 0; at < blob.size; at += chunkBytes) {
        const bytes = await blob.slice(at, Math.min(blob.size, at + chunkBytes)).arrayBuffer();
        // stream: true keeps a multi-byte character split across chunks for the next one
        const text = decoder.decode(bytes, { stream: true });
        // the callback may return a promise (the engine's back-pressure); waiting on it is harmless otherwise
        if (text.length > 0) await (onChunk(text) as unknown);
      }
      const rest = decoder.decode();
      if (rest.length > 0) await (onChunk(rest) as unknown);
    },

    sha256,

    blobOf,

    /** The worker worked out a file's SHA-256 while reading it: remembered, so keeping the session does not hash it again. */
    noteDigest(id: string, digest: string) {
      if (!digests.has(id)) digests.set(id, Promise.resolve(digest));
    },

    async openSampleCampaign() {
      const base = new URL(SAMPLE_FOLDER, doc.baseURI);
      const res = await win.fetch(new URL(SAMPLE_CAMPAIGN, base));
      if (!res.ok) throw new Error(`the sample campaign could not be loaded (${res.status} ${res.statusText})`);
      const text = await res.text();
      const available = new Map<string, ChosenFile>();
      for (const file of filesNamedBy(text)) {
        const r = await win.fetch(new URL(file, base));
        if (r.ok) available.set(baseName(file), keep(baseName(file), await r.blob()));
      }
      return resolveCampaign('sample', SAMPLE_CAMPAIGN, text, available);
    },

    async openCampaign() {
      const list = await chooseFiles(RUN_FILE_TYPES, true);
      if (list.length === 0) return null;
      const jsons = list.filter((f) => /\.json$/i.test(f.name));
      let campaignFile: File | undefined;
      let text = '';
      for (const f of jsons) {
        const t = await f.text();
        if (/"format"\s*:\s*"sweepbook-campaign"/.test(t)) {
          campaignFile = f;
          text = t;
          break;
        }
      }
      if (!campaignFile) {
        // let the campaign parser explain what is wrong with the one JSON file given
        if (jsons.length === 1) return { id: keep(jsons[0]!.name, jsons[0]!).id, name: jsons[0]!.name, text: await jsons[0]!.text(), runs: [] };
        throw new Error('choose the campaign file (.json) together with its run files; none of the chosen files is a Sweepbook campaign');
      }
      // the files' sizes are not asked for here: for files on disk each is a round trip to the browser,
      // seconds for thousands of runs before the list could show; the reader finds each size as it reads
      const available = new Map<string, { id: string; size?: number }>();
      for (const f of list) if (f !== campaignFile) available.set(f.name, { id: keepUnsized(f.name, f) });
      const id = keep(campaignFile.name, campaignFile).id;
      await remember({ id: campaignFile.name, name: campaignFile.name, text, savedAt: new Date().toISOString() });
      return resolveCampaign(id, campaignFile.name, text, available);
    },

    async saveCampaign(text, options) {
      const known = options.id ? files.get(options.id)?.name : undefined;
      const name = (options.saveAs ? options.suggestedName : known ?? options.suggestedName) ?? 'campaign.json';
      const blob = new Blob([text], { type: 'application/json' });
      // a page cannot write back to the file it opened: every save is a download under the campaign's name
      const id = options.id && !options.saveAs ? options.id : keep(name, blob).id;
      files.set(id, { name, blob });
      download(name, blob);
      await remember({ id: name, name, text, savedAt: new Date().toISOString() });
      return { id, name };
    },

    async saveExport(suggestedName, data, mime) {
      const part: BlobPart = typeof data === 'string' ? data : new Uint8Array(data);
      download(suggestedName, new Blob([part], { type: mime }));
      return true;
    },

    async recentCampaigns() {
      return (await readRecent()).map(({ id, name }) => ({ id, name }));
    },

    async openRecentCampaign(id) {
      const entry = (await readRecent()).find((e) => e.id === id);
      if (!entry) return null;
      // a web page keeps no access to files between visits: the runs have to be chosen again
      return resolveCampaign(keep(entry.name, new Blob([entry.text])).id, entry.name, entry.text, new Map());
    },

    keepSession(session) {
      keeping = keeping.then(() => keepNow(session)).catch(() => undefined);
      return keeping;
    },

    async restoreSession(): Promise<RestoredSession | null> {
      const s = await store();
      const record = s ? await getJson<KeptRecord>(s, SESSION_KEY) : null;
      if (!s || !record || typeof record.campaignText !== 'string') return null;
      const runs: OpenedRun[] = [];
      for (const f of record.files ?? []) {
        const bytes = await s.get(FILE_PREFIX + f.digest);
        if (!bytes) continue;
        const chosen = keep(f.name, new Blob([bytes as BlobPart]));
        digests.set(chosen.id, Promise.resolve(f.digest));
        runs.push({ file: f.file, id: chosen.id, sha256: f.digest, size: chosen.size });
      }
      // files the campaign names but the store lost come back as "not found", to be located
      for (const file of filesNamedBy(record.campaignText)) if (!runs.some((r) => r.file === file)) runs.push({ file, id: null, sha256: null });
      const name = record.campaignFile ?? 'campaign.json';
      return { opened: { id: keep(name, new Blob([record.campaignText])).id, name, text: record.campaignText, runs }, savedText: record.savedText, campaignFile: record.campaignFile };
    },

    onMenuCommand() {
      // a web page has no native menu; the toolbar and keyboard shortcuts issue the commands
      return () => undefined;
    },

    setDirty(value) {
      dirty = value;
    },

    async print() {
      win.print();
    },
  };
  return host;
}
