/**
 * Fakes for the renderer's component tests: an in-memory host, the worker engine run in process behind
 * a transport that structured-clones every message (as a real worker does, so a reactive proxy sent by
 * mistake fails here too), and the app context wired as main.ts wires it.
 */
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { ChosenFile, MenuCommand, OpenedCampaign } from '../../core/contract/host.ts';
import { EngineClient, type Transport } from '../../renderer/src/engine/engineClient.ts';
import type { Host } from '../../renderer/src/host/hostAccess.ts';
import type { AppContext } from '../../renderer/src/state/context.ts';
import { createExports } from '../../renderer/src/state/exports.ts';
import { createPlotLimits } from '../../renderer/src/state/plotLimits.ts';
import { createWorkbench } from '../../renderer/src/state/workbench.ts';
import { WorkerEngine } from '../../renderer/src/worker/workerEngine.ts';
import type { FromWorker, ToWorker } from '../../renderer/src/worker/protocol.ts';

export const ROOT = resolve(__dirname, '../..');
export const SAMPLES = join(ROOT, 'sample-runs');

/** Instrument standard uncertainties (k = 1) for the tests: invented, of the order a small tunnel's instruments have. */
export const TEST_UNCERTAINTY = { dp_pitot_pa: 1.5, p_static_pa: 20, t_total_c: 0.2, rh_pct: 2, force_n: 0.3, moment_nm: 0.02, alpha_deg: 0.05, area_rel: 0.002, chord_rel: 0.002 };

export function sample(name: string): string {
  return readFileSync(join(SAMPLES, name), 'utf8');
}

export async function sha256Hex(text: string): Promise<string> {
  const d = await globalThis.crypto.subtle.digest('SHA-256', new TextEncoder().encode(text));
  return Array.from(new Uint8Array(d), (b) => b.toString(16).padStart(2, '0')).join('');
}

/** The worker engine in this process; messages are structured-cloned both ways and delivered asynchronously. */
export function inProcessTransport(): Transport & { sent: ToWorker[] } {
  let listener: (msg: FromWorker) => void = () => undefined;
  const engine = new WorkerEngine((msg) => {
    const copy = structuredClone(msg);
    queueMicrotask(() => listener(copy));
  });
  const sent: ToWorker[] = [];
  return {
    sent,
    post(msg) {
      const copy = structuredClone(msg);
      sent.push(copy);
      queueMicrotask(() => engine.handle(copy));
    },
    listen(handler) {
      listener = handler;
    },
  };
}

export interface FakeHost extends Host {
  files: Map<string, { name: string; text: string }>;
  /** Files the next chooseRunFiles() returns, by name. */
  nextChoice: string[];
  nextCampaign: OpenedCampaign | null;
  saved: { text: string; options: object }[];
  exported: { name: string; data: Uint8Array | string; mime: string }[];
  dirtyCalls: boolean[];
  menu: ((c: MenuCommand) => void) | null;
  /** Put a file in and return its chosen-file record. */
  add(name: string, text: string): ChosenFile;
}

export function fakeHost(): FakeHost {
  const files = new Map<string, { name: string; text: string }>();
  let n = 0;
  const add = (name: string, text: string): ChosenFile => {
    const id = `f${++n}`;
    files.set(id, { name, text });
    return { id, name, size: new TextEncoder().encode(text).length };
  };
  const host: FakeHost = {
    kind: 'browser',
    files,
    nextChoice: [],
    nextCampaign: null,
    saved: [],
    exported: [],
    dirtyCalls: [],
    menu: null,
    add,
    async chooseRunFiles() {
      const out: ChosenFile[] = [];
      for (const name of host.nextChoice) {
        const found = [...files.entries()].find(([, f]) => f.name === name);
        if (found) out.push({ id: found[0], name, size: found[1].text.length });
      }
      host.nextChoice = [];
      return out;
    },
    async readChunks(id, onChunk, chunkBytes = 64) {
      const f = files.get(id);
      if (!f) throw new Error(`no file ${id}`);
      // small chunks on purpose: lines and characters get split across chunk boundaries
      for (let i = 0; i < f.text.length; i += chunkBytes) await (onChunk(f.text.slice(i, i + chunkBytes)) as unknown);
    },
    async sha256(id) {
      return sha256Hex(files.get(id)!.text);
    },
    async openSampleCampaign() {
      throw new Error('no sample in the fake host');
    },
    async openCampaign() {
      return host.nextCampaign;
    },
    async saveCampaign(text, options) {
      host.saved.push({ text, options });
      return { id: options.id ?? 'saved-1', name: options.suggestedName ?? 'campaign.json' };
    },
    async saveExport(name, data, mime) {
      host.exported.push({ name, data, mime });
      return true;
    },
    async recentCampaigns() {
      return [];
    },
    onMenuCommand(listener) {
      host.menu = listener;
      return () => {
        host.menu = null;
      };
    },
    setDirty(d) {
      host.dirtyCalls.push(d);
    },
    async print() {},
    async acceptDroppedFiles(list) {
      return Promise.all(list.map(async (f) => add(f.name, await f.text())));
    },
  };
  return host;
}

export function appContext(host: FakeHost = fakeHost(), ask: (q: string) => Promise<boolean> = async () => true): AppContext & { host: FakeHost } {
  const wb = createWorkbench(host, new EngineClient(inProcessTransport()), { ask });
  const limits = createPlotLimits();
  return { host, wb, limits, exports: createExports(wb, host, limits) };
}

/** The sample campaign as a host would open it, every file present (names may be left out to make them missing). */
export async function openedSample(host: FakeHost, leaveOut: string[] = []): Promise<OpenedCampaign> {
  const text = sample('sweepbook-campaign.json');
  const names = ['run-101-clean.csv', 'run-102-flap10.csv', 'run-103-flap20.csv', 'run-104-clean-timehistory.csv', 'run-201-section.csv', 'windoff-tare.csv'];
  const runs = [];
  for (const name of names) {
    if (leaveOut.includes(name)) {
      runs.push({ file: name, id: null, sha256: null });
      continue;
    }
    const c = host.add(name, sample(name));
    runs.push({ file: name, id: c.id, sha256: await host.sha256(c.id) });
  }
  return { id: 'c1', name: 'sweepbook-campaign.json', text, runs };
}
