// @vitest-environment happy-dom
/**
 * Runs that log raw bridge outputs reduce in the window as on the command line: the setup's balance
 * calibration (a file beside the campaign, named by path) turns every sample into loads in the worker,
 * the raw-output tare goes through the same calibration, and the numbers are the command line's. A
 * balance file that cannot be found or read is named in the run's message, and importing it reads the
 * runs again.
 */
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { campaignFiles, parseCampaign, serializeCampaign, type Campaign } from '../../core/formats/campaign.ts';
import type { OpenedCampaign } from '../../core/contract/host.ts';
import { filesNamedBy } from '../../renderer/src/host/browserHost.ts';
import type { KeptSession } from '../../renderer/src/host/hostAccess.ts';
import { EngineClient, type TextFeeder } from '../../renderer/src/engine/engineClient.ts';
import { runCli } from '../support/cli.ts';
import { appContext, fakeHost, inProcessTransport, sample, SAMPLES, sha256Hex, type FakeHost } from './support.ts';

const RAW_SETUP = JSON.parse(sample('setup-3d-raw.json')) as Record<string, unknown>;
const RUN = 'run-301-raw-outputs.csv';
const TARE = 'windoff-tare-raw.csv';
const BALANCE = 'balance-b3.json';

function whole(text: string): TextFeeder {
  return async (push) => push(text);
}

/** A campaign of the raw-output run, its tare and setup (calibration by path, as in setup-3d-raw.json). */
function rawCampaign(setup: Record<string, unknown> = RAW_SETUP): Campaign {
  return {
    format: 'sweepbook-campaign',
    version: 1,
    name: 'raw outputs',
    setups: { 'KM-7 raw': setup as Campaign['setups'][string] },
    runs: [{ file: RUN, sha256: null, configuration: 'clean (B3)', setup: 'KM-7 raw', tare: TARE, visible: true }],
    tares: [{ file: TARE, sha256: null }],
    mappings: {},
    baseline: null,
  };
}

/** The campaign as a host opens it; files left out come back as missing. */
function opened(host: FakeHost, c: Campaign, files: Record<string, string>): OpenedCampaign {
  const text = serializeCampaign(c);
  const runs = filesNamedBy(text).map((file) =>
    file in files ? { file, id: host.add(file, files[file]!).id, sha256: null } : { file, id: null, sha256: null },
  );
  return { id: 'c1', name: 'raw.json', text, runs };
}

const ALL = { [RUN]: sample(RUN), [TARE]: sample(TARE), [BALANCE]: sample(BALANCE) };

/** The command line's reduction of the raw-output run with its raw-output tare. */
async function cliResult() {
  const r = await runCli('reduce', join(SAMPLES, RUN), '--setup', join(SAMPLES, 'setup-3d-raw.json'), '--tare', join(SAMPLES, TARE));
  expect(r.code).toBe(0);
  return JSON.parse(r.stdout) as { points: Record<string, number | null>[]; fit: Record<string, unknown> };
}

/** Every number of two results agrees within 1e-12 relative (1e-12 absolute near zero); other values equal. */
function expectSameNumbers(a: unknown, b: unknown, path = ''): void {
  if (typeof a === 'number' && typeof b === 'number') {
    const scale = Math.max(1, Math.abs(a), Math.abs(b));
    if (!(Math.abs(a - b) <= 1e-12 * scale)) throw new Error(`${path}: ${a} ≠ ${b}`);
    return;
  }
  if (Array.isArray(a) && Array.isArray(b)) {
    expect(a.length, path).toBe(b.length);
    a.forEach((x, i) => expectSameNumbers(x, b[i], `${path}[${i}]`));
    return;
  }
  if (a !== null && b !== null && typeof a === 'object' && typeof b === 'object') {
    expect(Object.keys(a as object).sort(), path).toEqual(Object.keys(b as object).sort());
    for (const k of Object.keys(a as object)) expectSameNumbers((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`);
    return;
  }
  expect(a, path).toEqual(b);
}

describe('raw balance outputs in the window', () => {
  it('names balance files among the files a campaign refers to, for both hosts', () => {
    const text = serializeCampaign(rawCampaign());
    expect(filesNamedBy(text)).toEqual([RUN, TARE, BALANCE]);
    expect(campaignFiles(parseCampaign('raw.json', text))).toEqual([RUN, TARE, BALANCE]);
    // an inline calibration names no file
    const inline = rawCampaign({ ...RAW_SETUP, balance: { axes: 'body', calibration: JSON.parse(sample(BALANCE)) } });
    expect(filesNamedBy(serializeCampaign(inline))).toEqual([RUN, TARE]);
  });

  it("the worker's reduction of run 301 equals the command line's within 1e-12", async () => {
    const client = new EngineClient(inProcessTransport());
    const profile = { setupName: 'KM-7 raw', setup: RAW_SETUP, balance: { name: BALANCE, text: sample(BALANCE) } };
    const tare = await client.read('tare:raw', TARE, whole(sample(TARE)), { mapping: null, mappings: {}, profile });
    expect(tare.ok).toBe(true);
    const read = await client.read('run:301', RUN, whole(sample(RUN)), { mapping: null, mappings: {}, profile });
    if (!read.ok) throw new Error(JSON.stringify(read.errors));
    const reduced = await client.reduce('run:301', 'KM-7 raw', RAW_SETUP, 'tare:raw');
    if (!reduced.ok) throw new Error(JSON.stringify(reduced.errors));
    const cli = await cliResult();
    expect(reduced.result.points).toHaveLength(15);
    expect(reduced.result.points[0]!.samples).toBe(20);
    expectSameNumbers(reduced.result.points, cli.points);
    expectSameNumbers(reduced.result.fit, cli.fit);
    // the loads came through the calibration: the same wing logged as loads gives nearly the same slope
    expect(reduced.result.fit.cl_alpha_per_deg).toBeGreaterThan(0.05);
  });

  it('without the calibration the same file is refused for its missing loads, naming the file and line', async () => {
    const client = new EngineClient(inProcessTransport());
    const read = await client.read('run:301', RUN, whole(sample(RUN)), { mapping: null, mappings: {}, profile: null });
    expect(read.ok).toBe(true);
    const plainSetup = { ...RAW_SETUP, balance: { axes: 'body' } };
    const reduced = await client.reduce('run:301', 'plain', plainSetup, null);
    if (reduced.ok) throw new Error('reduced without its calibration');
    expect(reduced.errors[0]).toMatchObject({ file: RUN, line: 8 });
    expect(reduced.errors[0]!.message).toMatch(/^missing required column "normal"/);
  });

  it("opens a campaign whose setup names a balance file beside it, and shows the command line's CL", async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = opened(ctx.host, rawCampaign(), ALL);
    await ctx.wb.openCampaign();
    const e = ctx.wb.state.entries[RUN]!;
    expect(e.errors).toEqual([]);
    expect(e.status).toBe('ready');
    const cli = await cliResult();
    expect(Math.abs(e.result!.points[7]!.cl! - (cli.points[7]!['cl'] as number))).toBeLessThanOrEqual(1e-12);
    expect(e.result!.run.tare_file).toBe(TARE);
  });

  it("records the balance file in the run's provenance as the command line does: its matrices and its file's SHA-256", async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = opened(ctx.host, rawCampaign(), ALL);
    await ctx.wb.openCampaign();
    const record = (await ctx.wb.provenance([RUN])).runs[0]!.record as unknown as { inputs: object[]; setup: { balance: { calibration: unknown } } };
    const cli = JSON.parse(
      (await runCli('reduce', join(SAMPLES, RUN), '--setup', join(SAMPLES, 'setup-3d-raw.json'), '--tare', join(SAMPLES, TARE))).stdout,
    ) as {
      provenance: { inputs: object[]; setup: { balance: { calibration: unknown } } };
    };
    const balanceInput = cli.provenance.inputs.find((i) => (i as { role: string }).role === 'balance');
    expect(balanceInput).toMatchObject({ name: BALANCE, sha256: await sha256Hex(ALL[BALANCE]!) });
    expect(record.inputs).toContainEqual(balanceInput);
    expect(record.setup.balance.calibration).toEqual(cli.provenance.setup.balance.calibration);
  });

  it('keeps the balance file with the session, so a reload of the browser host finds it again', async () => {
    const ctx = appContext();
    const kept: KeptSession[] = [];
    ctx.host.keepSession = async (session) => {
      kept.push(session);
    };
    await ctx.wb.resumeSession();
    ctx.host.nextCampaign = opened(ctx.host, rawCampaign(), ALL);
    await ctx.wb.openCampaign();
    await ctx.wb.sessionKept();
    expect(
      kept
        .at(-1)!
        .files.map((f) => f.file)
        .sort(),
    ).toEqual([BALANCE, RUN, TARE].sort());
  });

  it('names the balance file it cannot find, and reads the runs again once the file is imported', async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = opened(ctx.host, rawCampaign(), { [RUN]: ALL[RUN]!, [TARE]: ALL[TARE]! });
    await ctx.wb.openCampaign();
    const e = ctx.wb.state.entries[RUN]!;
    expect(e.status).toBe('failed');
    expect(e.errors[0]).toMatch(/^setup "KM-7 raw": balance\.calibration: the balance file "balance-b3\.json" is not found beside the campaign; import it/);
    expect(ctx.wb.state.banners.map((b) => b.text).join('\n')).toMatch(/balance-b3\.json \(balance file\)/);
    ctx.host.add(BALANCE, ALL[BALANCE]!);
    ctx.host.nextChoice = [BALANCE];
    await ctx.wb.importRuns();
    expect(ctx.wb.state.entries[RUN]!.status).toBe('ready');
    // taken as the balance file, not added as a run
    expect(ctx.wb.state.campaign.runs.map((r) => r.file)).toEqual([RUN]);
  });

  it('reports a balance file that is not JSON at its line and column', async () => {
    const ctx = appContext();
    const broken = ALL[BALANCE]!.replace('"format"', '"format" :: ');
    ctx.host.nextCampaign = opened(ctx.host, rawCampaign(), { ...ALL, [BALANCE]: broken });
    await ctx.wb.openCampaign();
    const e = ctx.wb.state.entries[RUN]!;
    expect(e.status).toBe('failed');
    expect(e.errors[0]).toMatch(/^balance-b3\.json:\d+:\d+: not valid JSON/);
  });

  it('refuses a balance path that leaves the campaign folder, saying so', async () => {
    const host = fakeHost();
    const ctx = appContext(host);
    const c = rawCampaign({ ...RAW_SETUP, balance: { axes: 'body', calibration: '../balance-b3.json' } });
    const o = opened(host, c, ALL);
    // what both hosts do with such a path: refused, never opened
    o.runs = o.runs.map((r) => (r.file === '../balance-b3.json' ? { ...r, id: null, refused: 'leaves the campaign folder ("..")' } : r));
    host.nextCampaign = o;
    await ctx.wb.openCampaign();
    expect(ctx.wb.state.entries[RUN]!.errors[0]).toMatch(/the balance file "\.\.\/balance-b3\.json" is refused \(leaves the campaign folder/);
  });

  it('reads the run again when its setup changes how it is read, and reduces only when it does not', async () => {
    const { ctx, reads } = countingContext();
    ctx.host.nextCampaign = opened(ctx.host, rawCampaign(), ALL);
    await ctx.wb.openCampaign();
    const before = ctx.wb.state.entries[RUN]!.result!;
    const n0 = reads();
    // a change that leaves reading alone: the run is reduced again, not read again
    await ctx.wb.applySetup('KM-7 raw', { ...RAW_SETUP, note: 'edited' });
    expect(reads()).toBe(n0);
    expect(ctx.wb.state.entries[RUN]!.result).not.toBe(before);
    // the calibration inline instead of by path: the same balance, so the same numbers, after reading again
    await ctx.wb.applySetup('KM-7 raw', { ...RAW_SETUP, balance: { axes: 'body', calibration: JSON.parse(ALL[BALANCE]!) } });
    expect(reads()).toBeGreaterThan(n0);
    const after = ctx.wb.state.entries[RUN]!;
    expect(after.status).toBe('ready');
    expect(after.result!.points[7]!.cl).toBe(before.points[7]!.cl);
  });
});

/** An app context whose host counts the files it is asked to read. */
function countingContext() {
  const host = fakeHost();
  let reads = 0;
  const readChunks = host.readChunks.bind(host);
  host.readChunks = (id, onChunk, chunkBytes) => {
    reads++;
    return readChunks(id, onChunk, chunkBytes);
  };
  return { ctx: appContext(host), reads: () => reads };
}
