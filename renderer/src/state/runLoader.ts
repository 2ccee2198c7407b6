/**
 * Reading and reducing: each run file is streamed into the worker once, its hash checked against the
 * campaign, then reduced with its setup and tare; reductions are redone (without reading again) when
 * a setup or tare changes. One read at a time, in order, so a large file never competes with another.
 */
import { markRaw } from 'vue';
import type { CampaignRun } from '../../../core/index.ts';
import { formatNotice } from '../../../core/index.ts';
import type { ColumnMapping } from '../../../core/index.ts';
import type { EngineClient } from '../engine/engineClient.ts';
import type { Host } from '../host/hostAccess.ts';
import { baseName } from '../host/browserHost.ts';
import { needsMapping } from '../logic/columnMapping.ts';
import { RUN_KEY, TARE_KEY, type CampaignState } from './campaignState.ts';

export function createRunLoader(base: CampaignState, host: Host, engine: EngineClient) {
  const { state, say, problem, runOf } = base;
  let queue: Promise<void> = Promise.resolve();
  const tareReads = new Map<string, Promise<boolean>>();

  function enqueue(step: () => Promise<void>): Promise<void> {
    queue = queue.then(step, step);
    return queue;
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

  async function loadRun(file: string): Promise<void> {
    const e = state.entries[file];
    const run = runOf(file);
    if (!e || !run) return;
    if (!e.fileId) {
      e.status = 'missing';
      return;
    }
    e.status = 'reading';
    e.errors = [];
    e.progress = e.size ? 0 : null;
    e.charsRead = 0;
    e.result = null;
    e.asMeasured = null;
    const id = e.fileId;
    if (!e.sha256) {
      e.sha256 = await hashOf(id);
      e.hashNote = checkHash(file, run.sha256, e.sha256);
    }
    let reply;
    try {
      reply = await engine.read(RUN_KEY(file), baseName(file), (push) => host.readChunks(id, push), {
        mapping: (run.mapping as ColumnMapping | null | undefined) ?? null,
        mappings: (state.campaign.mappings ?? {}) as Record<string, ColumnMapping>,
        onProgress: (chars) => {
          e.charsRead = chars;
          if (e.size) e.progress = Math.min(1, chars / e.size);
        },
      });
    } catch (err) {
      e.status = 'failed';
      e.errors = [problem(err)];
      return;
    }
    e.progress = null;
    if (!reply.ok) {
      e.header = reply.header;
      e.errors = reply.errors.map(formatNotice);
      e.status = reply.header && needsMapping(reply.errors) ? 'needs-mapping' : 'failed';
      return;
    }
    e.header = reply.header;
    e.stats = markRaw(reply.stats);
    await reduceEntry(file);
  }

  async function readTare(file: string): Promise<boolean> {
    const t = state.tares[file];
    if (!t || !t.fileId) return false;
    t.status = 'reading';
    const id = t.fileId;
    if (!t.sha256) {
      t.sha256 = await hashOf(id);
      const recorded = state.campaign.tares?.find((x) => x.file === file)?.sha256;
      t.hashNote = checkHash(file, recorded, t.sha256);
    }
    try {
      const reply = await engine.read(TARE_KEY(file), baseName(file), (push) => host.readChunks(id, push), {
        mapping: null,
        mappings: (state.campaign.mappings ?? {}) as Record<string, ColumnMapping>,
      });
      t.status = reply.ok ? 'ready' : 'failed';
      t.errors = reply.ok ? [] : reply.errors.map(formatNotice);
    } catch (err) {
      t.status = 'failed';
      t.errors = [problem(err)];
    }
    return t.status === 'ready';
  }

  function ensureTare(file: string): Promise<boolean> {
    let p = tareReads.get(file);
    if (!p) {
      p = readTare(file);
      tareReads.set(file, p);
    }
    return p;
  }

  async function reduceEntry(file: string): Promise<void> {
    const e = state.entries[file];
    const run = runOf(file);
    if (!e || !run || !e.header) return;
    const generation = ++e.generation;
    const setup = state.campaign.setups[run.setup];
    if (!setup) {
      e.status = 'needs-setup';
      e.errors = [`no setup "${run.setup}" yet: fill it in under Setup and apply it`];
      return;
    }
    let tareKey: string | null = null;
    if (run.tare) {
      const t = state.tares[run.tare];
      if (!t || !t.fileId) {
        e.status = 'failed';
        e.errors = [`tare file ${run.tare} not found beside the campaign; locate it, or choose another tare in the run's details`];
        return;
      }
      if (!(await ensureTare(run.tare))) {
        e.status = 'failed';
        e.errors = [`tare file ${run.tare} could not be read:`, ...(state.tares[run.tare]?.errors ?? [])];
        return;
      }
      tareKey = TARE_KEY(run.tare);
    }
    e.status = 'reducing';
    let reply;
    try {
      reply = await engine.reduce(RUN_KEY(file), run.setup, setup, tareKey);
    } catch (err) {
      if (generation !== e.generation) return;
      e.status = 'failed';
      e.errors = [problem(err)];
      return;
    }
    // a newer request (setup edit, tare change) has overtaken this one
    if (generation !== e.generation) return;
    if (!reply.ok) {
      e.result = null;
      e.asMeasured = null;
      e.errors = reply.errors.map(formatNotice);
      e.status = needsMapping(reply.errors) ? 'needs-mapping' : 'failed';
      return;
    }
    // results are never changed once made: kept raw, so reading a thousand runs' points costs no proxies
    e.result = markRaw(reply.result);
    e.asMeasured = markRaw(reply.asMeasured);
    e.reducedAt = reply.reducedAt;
    e.errors = [];
    e.status = 'ready';
    if (e.imported) {
      // a new run records its file's hash, and takes the configuration its file names, once
      if (!run.sha256 && e.sha256) run.sha256 = e.sha256;
      if ((run.configuration === null || run.configuration === undefined) && reply.result.run.configuration) run.configuration = reply.result.run.configuration;
      e.imported = false;
    }
  }

  /** Reduce again every read run that uses this setup (or all runs). */
  function reReduce(filter: (r: CampaignRun) => boolean): Promise<void> {
    const files = state.campaign.runs.filter((r) => filter(r) && state.entries[r.file]?.header).map((r) => r.file);
    return enqueue(async () => {
      await Promise.all(files.map((f) => reduceEntry(f)));
    });
  }

  /** Forget every read file (a new campaign). */
  function reset(): void {
    for (const file of Object.keys(state.entries)) engine.forget(RUN_KEY(file));
    for (const file of Object.keys(state.tares)) engine.forget(TARE_KEY(file));
    tareReads.clear();
  }

  /** A tare chosen anew is read again on next use. */
  function forgetTare(file: string): void {
    tareReads.delete(file);
  }

  return { enqueue, hashOf, checkHash, loadRun, reduceEntry, reReduce, reset, forgetTare, settled: () => queue };
}

export type RunLoader = ReturnType<typeof createRunLoader>;
