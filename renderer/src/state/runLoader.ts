/**
 * Reading and reducing: each run file is streamed into the worker once, its hash checked against the
 * campaign, then reduced with its setup and tare; reductions are redone (without reading again) when
 * a setup or tare changes, and the run is read again when its setup changes how it is read (balance
 * calibration, grouping tolerance). A few files are in flight at once, so the page reads one while the
 * worker parses another; what they change in the state lands in batches (commitBatch.ts), so a campaign
 * of thousands of runs is listed at once and fills in without the page redrawing per run.
 */
import { markRaw } from 'vue';
import type { CampaignRun, ChosenFile } from '../../../core/index.ts';
import { formatNotice } from '../../../core/index.ts';
import type { ColumnMapping } from '../../../core/index.ts';
import type { EngineClient } from '../engine/engineClient.ts';
import type { Host } from '../host/hostAccess.ts';
import { baseName } from '../host/browserHost.ts';
import { needsMapping } from '../logic/columnMapping.ts';
import type { HeaderInfo, ReadProfile } from '../worker/protocol.ts';
import { createCommitBatch, createStepPool } from './commitBatch.ts';
import { RUN_KEY, TARE_KEY, type CampaignState } from './campaignState.ts';

/** Runs read at once: enough to keep the page and the worker both busy, few enough to keep memory flat. */
export const READS_IN_FLIGHT = 4;
/** Wait before a finished run shows in the list, for campaigns of up to 1,000 runs. */
export const COMMIT_INTERVAL_MS = 100;

/**
 * The wait between batches grows with the campaign: each batch costs the page work in proportion to the
 * number of runs (the list's counts, the styles, the plots' run list), so batches that grow as rarely
 * keep that work a fixed share of the time: 100 ms up to 1,000 runs, 1 s from 10,000.
 */
export function commitInterval(runs: number): number {
  return Math.min(1000, Math.max(COMMIT_INTERVAL_MS, runs / 10));
}

/** A file the campaign names besides its runs and tares (a balance file), as the host found it. */
export interface NamedFile {
  id: string | null;
  /** Why the host would not open it (outside the campaign folder, not a regular file…). */
  refused?: string;
}

/** How a run was read: its header, and the read profile (setup's say in reading) it was read with. */
interface ReadRecord {
  header: HeaderInfo;
  profileId: string;
}

type Resolved = { ok: true; profile: ReadProfile | null; id: string } | { ok: false; message: string };

export function createRunLoader(base: CampaignState, host: Host, engine: EngineClient) {
  const { state, say, problem, runOf } = base;
  const pool = createStepPool(READS_IN_FLIGHT, (err) => say('error', `Internal error while reading runs: ${problem(err)}`));
  const batch = createCommitBatch(() => commitInterval(state.campaign.runs.length));
  const tareReads = new Map<string, Promise<boolean>>();
  const reads = new Map<string, ReadRecord>();
  const generations = new Map<string, number>();
  const workerKeys = new Set<string>();
  /** Balance files (and any other file the campaign names beside runs and tares), by the path written in the setup. */
  const named = new Map<string, NamedFile>();
  const balanceTexts = new Map<string, Promise<{ name: string; text: string } | string>>();
  /** Balance files read so far, by path: their text and SHA-256, for the provenance of the runs read through them. */
  const balancesRead = new Map<string, { name: string; text: string; sha256: string | null }>();

  function enqueue(step: () => Promise<void>): Promise<void> {
    return pool.run(step);
  }

  // counts campaigns: steps queued for a campaign that has since been replaced are dropped
  let epoch = 0;

  /** Read (and reduce) these runs; resolves with every change shown. */
  async function loadAll(files: readonly string[]): Promise<void> {
    const mine = epoch;
    await Promise.all(files.map((file) => enqueue(() => (mine === epoch ? loadRun(file) : Promise.resolve()))));
    batch.flush();
  }

  async function hashOf(id: string): Promise<string | null> {
    try {
      return await host.sha256(id);
    } catch (err) {
      say('warning', `SHA-256 could not be computed: ${problem(err)}`);
      return null;
    }
  }

  function checkHash(file: string, recorded: string | null | undefined, actual: string | null): string | null {
    if (!recorded || !actual || recorded === actual) return null;
    const note = `${file}: the file has changed since the campaign was saved (SHA-256 recorded ${recorded.slice(0, 12)}…, now ${actual.slice(0, 12)}…)`;
    say('warning', `${note}. Its results are shown from the file as it is now; "Accept" records the new file.`);
    return note;
  }

  // ---- the setup's say in reading a run --------------------------------------------------------------

  /** Files the host resolved with the campaign besides its runs and tares (balance files). */
  function rememberNamed(files: readonly { file: string; id: string | null; refused?: string }[]): void {
    for (const f of files) named.set(f.file, { id: f.id, refused: f.refused });
  }

  /** The text of a balance file named by path, read once through the host; a message when it cannot be. */
  function balanceText(path: string): Promise<{ name: string; text: string } | string> {
    let p = balanceTexts.get(path);
    if (!p) {
      p = (async () => {
        const f = named.get(path);
        if (!f?.id) {
          const why = f?.refused ? `refused (${f.refused})` : 'not found beside the campaign';
          return `the balance file "${path}" is ${why}; import it (Import runs… or drop it onto the window) to read the runs that need it`;
        }
        let text = '';
        try {
          await host.readChunks(f.id, (t) => {
            text += t;
          });
        } catch (err) {
          return `the balance file "${path}" could not be read: ${problem(err)}`;
        }
        const found = { name: baseName(path), text };
        balancesRead.set(path, { ...found, sha256: await hashOf(f.id) });
        return found;
      })();
      balanceTexts.set(path, p);
    }
    return p;
  }

  /**
   * What the run's setup decides about reading it: nothing (id "") when it names no balance calibration
   * and no grouping tolerance; else the setup and the balance file's text. A message when the balance
   * file cannot be had.
   */
  async function profileOf(run: CampaignRun): Promise<Resolved> {
    const setup = state.campaign.setups[run.setup] as { balance?: { calibration?: unknown }; grouping?: { alpha_tol_deg?: unknown } } | undefined;
    const calibration = setup?.balance?.calibration;
    const tol = setup?.grouping?.alpha_tol_deg;
    if (!setup || (calibration === undefined && tol === undefined)) return { ok: true, profile: null, id: '' };
    const id = shortHash(JSON.stringify([calibration ?? null, tol ?? null]));
    let balance: ReadProfile['balance'] = null;
    if (typeof calibration === 'string') {
      const found = await balanceText(calibration);
      if (typeof found === 'string') return { ok: false, message: `setup "${run.setup}": balance.calibration: ${found}` };
      balance = found;
    }
    return { ok: true, profile: { setupName: run.setup, setup, balance }, id };
  }

  // ---- reading -------------------------------------------------------------------------------------

  async function loadRun(file: string): Promise<void> {
    const e = state.entries[file];
    const run = runOf(file);
    if (!e || !run) return;
    if (!e.fileId) {
      batch.later(() => (e.status = 'missing'));
      return;
    }
    reads.delete(file);
    const generation = bump(file);
    const size = e.size;
    batch.later(() => {
      e.status = 'reading';
      e.errors = [];
      e.progress = size ? 0 : null;
      e.charsRead = 0;
      e.result = null;
      e.asMeasured = null;
    });
    const id = e.fileId;
    const resolved = await profileOf(run);
    if (!resolved.ok) {
      batch.later(() => {
        e.progress = null;
        e.status = 'failed';
        e.errors = [resolved.message];
      });
      return;
    }
    let reply;
    try {
      workerKeys.add(RUN_KEY(file));
      const options = {
        mapping: (run.mapping as ColumnMapping | null | undefined) ?? null,
        mappings: (state.campaign.mappings ?? {}) as Record<string, ColumnMapping>,
        profile: resolved.profile,
        onProgress: (chars: number) =>
          batch.later(() => {
            e.charsRead = chars;
            if (size) e.progress = Math.min(1, chars / size);
          }),
      };
      // a host holding the file as a Blob hands it to the worker, which reads and hashes it off the page's thread
      reply = host.blobOf
        ? await engine.readBlob(RUN_KEY(file), baseName(file), host.blobOf(id), { ...options, hash: !e.sha256 })
        : await engine.read(RUN_KEY(file), baseName(file), (push) => host.readChunks(id, push), options);
      if (reply.sha256) host.noteDigest?.(id, reply.sha256);
    } catch (err) {
      batch.later(() => {
        e.status = 'failed';
        e.errors = [problem(err)];
      });
      return;
    }
    // hashed after reading: a host that reads a small file whole has its digest from that one read
    if (!e.sha256) {
      const sha = reply.sha256 ?? (await hashOf(id));
      const note = checkHash(file, run.sha256, sha);
      batch.later(() => {
        e.sha256 = sha;
        e.hashNote = note;
      });
    }
    // a newer read of this file (a mapping applied, a setup changed) has overtaken this one
    if (generation !== generations.get(file)) return;
    if (!reply.ok) {
      const r = reply;
      batch.later(() => {
        e.progress = null;
        e.header = r.header;
        e.errors = r.errors.map(formatNotice);
        e.status = r.header && needsMapping(r.errors) ? 'needs-mapping' : 'failed';
      });
      return;
    }
    const r = reply;
    reads.set(file, { header: r.header, profileId: resolved.id });
    batch.later(() => {
      e.progress = null;
      e.header = r.header;
      e.stats = markRaw(r.stats);
    });
    await reduceEntry(file);
  }

  async function readTare(file: string, resolved: { profile: ReadProfile | null; id: string }, key: string): Promise<boolean> {
    const t = state.tares[file];
    if (!t || !t.fileId) return false;
    batch.later(() => (t.status = 'reading'));
    const id = t.fileId;
    if (!t.sha256) {
      const sha = await hashOf(id);
      const recorded = state.campaign.tares?.find((x) => x.file === file)?.sha256;
      const note = checkHash(file, recorded, sha);
      batch.later(() => {
        t.sha256 = sha;
        t.hashNote = note;
      });
    }
    let ok = false;
    let errors: string[] = [];
    try {
      workerKeys.add(key);
      const reply = await engine.read(key, baseName(file), (push) => host.readChunks(id, push), {
        mapping: null,
        mappings: (state.campaign.mappings ?? {}) as Record<string, ColumnMapping>,
        profile: resolved.profile,
      });
      ok = reply.ok;
      errors = reply.ok ? [] : reply.errors.map(formatNotice);
    } catch (err) {
      errors = [problem(err)];
    }
    batch.later(() => {
      t.status = ok ? 'ready' : 'failed';
      t.errors = errors;
    });
    return ok;
  }

  /** The tare read once per way of reading it (a raw-output tare goes through its run's balance calibration). */
  function ensureTare(file: string, resolved: { profile: ReadProfile | null; id: string }): { key: string; ready: Promise<boolean> } {
    const key = resolved.id ? `${TARE_KEY(file)}|${resolved.id}` : TARE_KEY(file);
    let p = tareReads.get(key);
    if (!p) {
      p = readTare(file, resolved, key);
      tareReads.set(key, p);
    }
    return { key, ready: p };
  }

  function bump(file: string): number {
    const g = (generations.get(file) ?? 0) + 1;
    generations.set(file, g);
    return g;
  }

  function fail(file: string, generation: number, status: 'failed' | 'needs-setup' | 'needs-mapping', errors: string[]): void {
    const e = state.entries[file];
    if (!e || generation !== generations.get(file)) return;
    batch.later(() => {
      if (generation !== generations.get(file)) return;
      e.result = null;
      e.asMeasured = null;
      e.status = status;
      e.errors = errors;
    });
  }

  async function reduceEntry(file: string): Promise<void> {
    const e = state.entries[file];
    const run = runOf(file);
    const read = reads.get(file);
    if (!e || !run || !read) return;
    const generation = bump(file);
    const setup = state.campaign.setups[run.setup];
    if (!setup) {
      fail(file, generation, 'needs-setup', [`no setup "${run.setup}" yet: fill it in under Setup and apply it`]);
      return;
    }
    const resolved = await profileOf(run);
    if (!resolved.ok) {
      fail(file, generation, 'failed', [resolved.message]);
      return;
    }
    // the setup now reads the run differently (a balance calibration or grouping tolerance changed): read it again
    if (resolved.id !== read.profileId) {
      await loadRun(file);
      return;
    }
    let tareKey: string | null = null;
    if (run.tare) {
      const t = state.tares[run.tare];
      if (!t || !t.fileId) {
        fail(file, generation, 'failed', [`tare file ${run.tare} not found beside the campaign; locate it, or choose another tare in the run's details`]);
        return;
      }
      const tare = ensureTare(run.tare, resolved);
      if (!(await tare.ready)) {
        batch.flush();
        fail(file, generation, 'failed', [`tare file ${run.tare} could not be read:`, ...(state.tares[run.tare]?.errors ?? [])]);
        return;
      }
      tareKey = tare.key;
    }
    if (generation !== generations.get(file)) return;
    batch.later(() => {
      if (generation === generations.get(file)) e.status = 'reducing';
    });
    let reply;
    try {
      reply = await engine.reduce(RUN_KEY(file), run.setup, setup, tareKey);
    } catch (err) {
      fail(file, generation, 'failed', [problem(err)]);
      return;
    }
    // a newer request (setup edit, tare change) has overtaken this one
    if (generation !== generations.get(file)) return;
    if (!reply.ok) {
      fail(file, generation, needsMapping(reply.errors) ? 'needs-mapping' : 'failed', reply.errors.map(formatNotice));
      return;
    }
    // results are never changed once made: kept raw, so reading a thousand runs' points costs no proxies
    const result = markRaw(reply.result);
    const asMeasured = markRaw(reply.asMeasured);
    const reducedAt = reply.reducedAt;
    batch.later(() => {
      if (generation !== generations.get(file)) return;
      e.result = result;
      e.asMeasured = asMeasured;
      e.reducedAt = reducedAt;
      e.errors = [];
      e.status = 'ready';
      if (e.imported) {
        // a new run records its file's hash, and takes the configuration its file names, once
        if (!run.sha256 && e.sha256) run.sha256 = e.sha256;
        if ((run.configuration === null || run.configuration === undefined) && result.run.configuration) run.configuration = result.run.configuration;
        e.imported = false;
      }
    });
  }

  /** Reduce again every read run that uses this setup (or all runs); resolves with the results shown. */
  async function reReduce(filter: (r: CampaignRun) => boolean): Promise<void> {
    const files = state.campaign.runs.filter((r) => filter(r) && reads.has(r.file)).map((r) => r.file);
    const mine = epoch;
    await Promise.all(files.map((f) => enqueue(() => (mine === epoch ? reduceEntry(f) : Promise.resolve()))));
    batch.flush();
  }

  /**
   * A chosen file that the campaign names besides its runs and tares (a balance file it could not find):
   * taken in, and the runs that need it read again. False when no setup names it.
   */
  async function offerNamedFile(chosen: ChosenFile): Promise<boolean> {
    const paths = [...named.keys(), ...setupBalancePaths()].filter((p) => baseName(p) === chosen.name);
    if (paths.length === 0) return false;
    for (const p of paths) {
      named.set(p, { id: chosen.id });
      balanceTexts.delete(p);
      balancesRead.delete(p);
    }
    tareReads.clear();
    const setups = new Set(
      Object.entries(state.campaign.setups)
        .filter(([, s]) => paths.includes(balancePathOf(s) ?? ''))
        .map(([n]) => n),
    );
    const again = state.campaign.runs.filter((r) => setups.has(r.setup) && state.entries[r.file]?.fileId).map((r) => r.file);
    await loadAll(again);
    return true;
  }

  function setupBalancePaths(): string[] {
    return Object.values(state.campaign.setups)
      .map(balancePathOf)
      .filter((p): p is string => p !== undefined);
  }

  /** Forget every read file (a new campaign). */
  function reset(): void {
    epoch++;
    batch.flush();
    for (const key of workerKeys) engine.forget(key);
    workerKeys.clear();
    tareReads.clear();
    reads.clear();
    named.clear();
    balanceTexts.clear();
    balancesRead.clear();
  }

  /** A tare chosen anew is read again on next use. */
  function forgetTare(file: string): void {
    for (const key of [...tareReads.keys()]) if (key === TARE_KEY(file) || key.startsWith(`${TARE_KEY(file)}|`)) tareReads.delete(key);
  }

  /** Forget one run (removed from the campaign). */
  function forgetRun(file: string): void {
    reads.delete(file);
    bump(file);
    workerKeys.delete(RUN_KEY(file));
    engine.forget(RUN_KEY(file));
  }

  return {
    enqueue,
    loadAll,
    hashOf,
    checkHash,
    loadRun,
    reduceEntry,
    reReduce,
    reset,
    forgetTare,
    forgetRun,
    rememberNamed,
    offerNamedFile,
    /** Balance files found for the setups, by the path the setups give, with the host's id of each (kept with the session). */
    namedFiles: () => [...named].filter(([, f]) => f.id).map(([file, f]) => ({ file, id: f.id! })),
    /** The balance file a setup names by path, as read for its runs (text and SHA-256), if it has been. */
    balanceRead: (path: string) => balancesRead.get(path),
    /** Apply every change waiting for the next batch now. */
    flush: () => batch.flush(),
    /** Whether runs are being read or reduced. */
    busy: () => pool.busy,
    /** Resolves when every queued read and reduction has finished and its changes are shown. */
    settled: async () => {
      await pool.idle();
      batch.flush();
    },
  };
}

/** A balance calibration named by path in a setup as written in the campaign, if any. */
export function balancePathOf(setup: unknown): string | undefined {
  const c = (setup as { balance?: { calibration?: unknown } } | undefined)?.balance?.calibration;
  return typeof c === 'string' ? c : undefined;
}

/** FNV-1a, 32 bits, hex: a short name for a read profile within one session (common practice). */
function shortHash(text: string): string {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return (h >>> 0).toString(16).padStart(8, '0');
}

export type RunLoader = ReturnType<typeof createRunLoader>;
