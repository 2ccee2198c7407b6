// @vitest-environment happy-dom
/// <reference path="../../renderer/src/env.d.ts" />
/**
 * A campaign of many runs: every run is listed as soon as the campaign is read (before any file is),
 * changes land in batches rather than one page update per run, a few files are read at a time, the
 * run list draws only the rows in sight, the worker reads and hashes a Blob itself, and a campaign
 * or a path the hosts refuse says why, where.
 */
import { mount } from '@vue/test-utils';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { nextTick, watch } from 'vue';
import { serializeCampaign, type Campaign } from '../../core/formats/campaign.ts';
import type { OpenedCampaign } from '../../core/contract/host.ts';
import { readRunText } from '../../core/formats/runFile.ts';
import RunsPanel from '../../renderer/src/components/RunsPanel.vue';
import { createBrowserHost } from '../../renderer/src/host/browserHost.ts';
import { APP } from '../../renderer/src/state/context.ts';
import { createCommitBatch, createStepPool } from '../../renderer/src/state/commitBatch.ts';
import { COMMIT_INTERVAL_MS, READS_IN_FLIGHT } from '../../renderer/src/state/runLoader.ts';
import { WorkerEngine } from '../../renderer/src/worker/workerEngine.ts';
import type { FromWorker } from '../../renderer/src/worker/protocol.ts';
import { appContext, sample, sha256Hex, type FakeHost } from './support.ts';

afterEach(() => {
  vi.useRealTimers();
});

/** A campaign of `n` copies of the sample's clean run under their own names; files given for the first `present`. */
function bigCampaign(host: FakeHost, n: number, present = n): OpenedCampaign {
  const base = JSON.parse(sample('sweepbook-campaign.json')) as Campaign;
  const text101 = sample('run-101-clean.csv');
  const runs: Campaign['runs'] = [];
  const opened: OpenedCampaign['runs'] = [];
  for (let i = 0; i < n; i++) {
    const file = `run-${1000 + i}.csv`;
    runs.push({ file, sha256: null, configuration: i % 2 ? 'clean' : 'flap 10', setup: 'KM-7 wing', tare: null, visible: true });
    opened.push(
      i < present ? { file, id: host.add(file, text101.replace(/# run: \d+/, `# run: ${1000 + i}`)).id, sha256: null } : { file, id: null, sha256: null },
    );
  }
  const c: Campaign = { ...base, name: `${n} runs`, runs, tares: [], baseline: null };
  return { id: 'big', name: 'big.json', text: serializeCampaign(c), runs: opened };
}

describe('changes in batches, reads a few at a time', () => {
  it('applies the changes of one interval together, in order, and at once on flush', () => {
    vi.useFakeTimers();
    const batch = createCommitBatch(100);
    const seen: number[] = [];
    batch.later(() => seen.push(1));
    batch.later(() => seen.push(2));
    expect(seen).toEqual([]);
    expect(batch.waiting).toBe(2);
    vi.advanceTimersByTime(99);
    expect(seen).toEqual([]);
    vi.advanceTimersByTime(1);
    expect(seen).toEqual([1, 2]);
    batch.later(() => seen.push(3));
    batch.flush();
    expect(seen).toEqual([1, 2, 3]);
    expect(batch.waiting).toBe(0);
    // nothing left for the timer to do
    vi.advanceTimersByTime(200);
    expect(seen).toEqual([1, 2, 3]);
  });

  it('runs at most the limit of steps at once, in order, carries on after a failing one, and says when idle', async () => {
    const errors: unknown[] = [];
    const pool = createStepPool(3, (e) => errors.push(e));
    let running = 0;
    let most = 0;
    const started: number[] = [];
    const step = (i: number) => async () => {
      started.push(i);
      running++;
      most = Math.max(most, running);
      await new Promise((r) => setTimeout(r, 2));
      running--;
      if (i === 4) throw new Error('step 4');
    };
    const all = Array.from({ length: 10 }, (_, i) => pool.run(step(i)));
    expect(pool.busy).toBe(true);
    await pool.idle();
    await Promise.all(all);
    expect(most).toBe(3);
    expect(started).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
    expect(errors.map((e) => (e as Error).message)).toEqual(['step 4']);
    expect(pool.busy).toBe(false);
    await pool.idle(); // resolves at once when nothing runs
  });
});

describe('a campaign of many runs in the workbench', () => {
  it('lists every run with its name, configuration and status before any file is read, then reduces them all', async () => {
    const ctx = appContext();
    const n = 240;
    ctx.host.nextCampaign = bigCampaign(ctx.host, n);
    // the host counts reads at once, to see they are bounded
    let reading = 0;
    let mostReading = 0;
    const readChunks = ctx.host.readChunks.bind(ctx.host);
    ctx.host.readChunks = async (id, onChunk, chunkBytes) => {
      reading++;
      mostReading = Math.max(mostReading, reading);
      try {
        await readChunks(id, onChunk, chunkBytes);
      } finally {
        reading--;
      }
    };
    // how often the page would redraw the list of reduced runs
    let updates = 0;
    const stop = watch(
      () => ctx.wb.readyRuns.value.length,
      () => updates++,
    );
    const t0 = Date.now();
    const opening = ctx.wb.openCampaign();
    // listed: the campaign is read, no run file is yet
    await vi.waitFor(() => expect(Object.keys(ctx.wb.state.entries)).toHaveLength(n));
    const runs = ctx.wb.state.campaign.runs;
    expect(runs).toHaveLength(n);
    expect(ctx.wb.displayName('run-1239.csv')).toBe('run-1239');
    expect(ctx.wb.configurationOf('run-1239.csv')).toBe('clean');
    expect(ctx.wb.state.entries['run-1239.csv']!.status).toBe('queued');
    await opening;
    const elapsed = Date.now() - t0;
    stop();
    expect(runs.every((r) => ctx.wb.state.entries[r.file]!.status === 'ready')).toBe(true);
    expect(ctx.wb.state.entries['run-1239.csv']!.result!.run.name).toBe('1239');
    expect(mostReading).toBeLessThanOrEqual(READS_IN_FLIGHT);
    expect(mostReading).toBeGreaterThan(1);
    // at most one update per interval (and one at the end), however many runs finished in it: one per run would be 240
    expect(updates).toBeLessThanOrEqual(Math.floor(elapsed / COMMIT_INTERVAL_MS) + 2);
    expect(updates).toBeLessThan(n / 4);
  });

  it('drops the reads still waiting for a campaign that another one has replaced', async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = bigCampaign(ctx.host, 200);
    let reads = 0;
    const readChunks = ctx.host.readChunks.bind(ctx.host);
    ctx.host.readChunks = (id, onChunk, chunkBytes) => {
      reads++;
      return readChunks(id, onChunk, chunkBytes);
    };
    const first = ctx.wb.openCampaign();
    await vi.waitFor(() => expect(reads).toBeGreaterThan(0));
    // the same run names again (a campaign opened anew): the old queue would otherwise read them all a second time
    const before = reads;
    ctx.host.nextCampaign = bigCampaign(ctx.host, 200);
    await ctx.wb.openCampaign();
    await first;
    await ctx.wb.settled();
    expect(ctx.wb.state.campaign.runs).toHaveLength(200);
    expect(Object.values(ctx.wb.state.entries).every((e) => e.status === 'ready')).toBe(true);
    // the first campaign's reads in flight finish; the rest of its 200 are never made
    expect(before).toBeLessThan(100);
    expect(reads).toBeLessThan(200 + before + 2 * READS_IN_FLIGHT);
  });

  it('draws only the rows in sight of a long list; scrolling brings the last run into the page', async () => {
    const ctx = appContext();
    const n = 1000;
    // no files: every run listed as not found, nothing to read
    ctx.host.nextCampaign = bigCampaign(ctx.host, n, 0);
    await ctx.wb.openCampaign();
    const w = mount(RunsPanel as never, { global: { provide: { [APP as symbol]: ctx } }, attachTo: document.body } as never);
    await nextTick();
    const drawn = () => w.findAll('tbody[data-run]').map((b) => b.attributes('data-run'));
    expect(w.text()).toContain(`${n} in campaign`);
    expect(w.find('table').attributes('aria-rowcount')).toBe(String(n));
    const first = drawn();
    expect(first[0]).toBe('run-1000.csv');
    expect(first.length).toBeGreaterThan(10);
    expect(first.length).toBeLessThan(100);
    // the spacer below stands for the rows not drawn, so the scroll bar is the whole list's
    const spacer = w.find('tbody.spacer-bottom tr').attributes('style') ?? '';
    expect(Number(/height:\s*([\d.]+)px/.exec(spacer)?.[1])).toBeGreaterThan((n - first.length) * 20);
    const panel = w.find('section.runs-panel').element as HTMLElement;
    // the test page has no layout to scroll: the panel is told it has been scrolled to the end
    Object.defineProperty(panel, 'scrollTop', { value: 1e7, configurable: true });
    panel.dispatchEvent(new Event('scroll'));
    await nextTick();
    const last = drawn();
    expect(last).toContain(`run-${1000 + n - 1}.csv`);
    expect(last).not.toContain('run-1000.csv');
    expect(last.length).toBeLessThan(100);
    expect(w.find('tbody.spacer-top').exists()).toBe(true);
    w.unmount();
  });
});

describe('the worker reads a Blob itself', () => {
  it('reads, parses and hashes a file handed over as a Blob like the streamed text', async () => {
    const replies: FromWorker[] = [];
    const engine = new WorkerEngine((m) => replies.push(m));
    const text = sample('run-104-clean-timehistory.csv');
    engine.handle({
      type: 'readBlob',
      id: 1,
      key: 'run:104',
      file: 'run-104.csv',
      blob: new Blob([text]),
      mapping: null,
      mappings: {},
      profile: null,
      hash: true,
    });
    await vi.waitFor(() => expect(replies.some((r) => r.type === 'read')).toBe(true));
    const reply = replies.find((r) => r.type === 'read')!;
    if (reply.type !== 'read' || !reply.reply.ok) throw new Error(JSON.stringify(reply));
    const whole = readRunText('run-104.csv', text);
    expect(reply.reply.rows).toBe(3000);
    expect(reply.reply.stats.points[3]!.mean).toEqual(Array.from(whole.points[3]!.mean));
    expect(reply.reply.sha256).toBe(await sha256Hex(text));
  });
});

describe('a campaign or a file the hosts refuse says why', () => {
  it('a campaign that is not JSON: the file, line and column', async () => {
    const ctx = appContext();
    ctx.host.nextCampaign = { id: 'c', name: 'c.json', text: '{\n  "format": "sweepbook-campaign",\n  "version": 1\n  "name": "x"\n}', runs: [] };
    await ctx.wb.openCampaign();
    expect(ctx.wb.state.banners.at(-1)!.text).toMatch(/^c\.json:4:3: not valid JSON .* Nothing was changed\.$/);
    expect(ctx.wb.state.campaign.runs).toEqual([]);
  });

  it('a campaign of another version or with a bad field: the file and field', async () => {
    const ctx = appContext();
    const c = JSON.parse(sample('sweepbook-campaign.json')) as Record<string, unknown>;
    ctx.host.nextCampaign = { id: 'c', name: 'c.json', text: JSON.stringify({ ...c, version: 2 }), runs: [] };
    await ctx.wb.openCampaign();
    expect(ctx.wb.state.banners.at(-1)!.text).toMatch(/^c\.json: version: .* Nothing was changed\.$/);
    ctx.host.nextCampaign = { id: 'c', name: 'c.json', text: JSON.stringify({ ...c, runs: [{ file: 'a.csv', sha256: 'xyz', setup: 'KM-7 wing' }] }), runs: [] };
    await ctx.wb.openCampaign();
    expect(ctx.wb.state.banners.at(-1)!.text).toMatch(/^c\.json: runs\.0\.sha256: expected 64 lower-case hex digits/);
  });

  it('a run path leaving the campaign folder: refused with the reason, in the list and the message', async () => {
    const ctx = appContext();
    const c = JSON.parse(sample('sweepbook-campaign.json')) as Campaign;
    const runs = [{ ...c.runs[0]!, file: '../elsewhere/run-101-clean.csv', tare: null }];
    // as the desktop host reports it; the browser host's own check is below
    ctx.host.nextCampaign = {
      id: 'c',
      name: 'c.json',
      text: JSON.stringify({ ...c, runs, tares: [] }),
      runs: [{ file: runs[0]!.file, id: null, sha256: null, refused: 'leaves the campaign folder ("..")' }],
    };
    await ctx.wb.openCampaign();
    const e = ctx.wb.state.entries['../elsewhere/run-101-clean.csv']!;
    expect(e.status).toBe('missing');
    expect(e.errors[0]).toBe(
      '../elsewhere/run-101-clean.csv (refused: leaves the campaign folder ("..")): the run stays in the campaign; Locate… points it to a file',
    );
    expect(ctx.wb.state.banners.at(-1)!.text).toMatch(
      /^Not found beside the campaign: \.\.\/elsewhere\/run-101-clean\.csv \(refused: leaves the campaign folder/,
    );
  });

  it('the browser host refuses such a path itself instead of matching the file by its name', async () => {
    const host = createBrowserHost(window);
    const c = JSON.parse(sample('sweepbook-campaign.json')) as Campaign;
    const text = JSON.stringify({ ...c, runs: [{ ...c.runs[0]!, file: '../run-101-clean.csv', tare: null }], tares: [] });
    vi.spyOn(document.body, 'appendChild').mockImplementation((n) => n); // no download link in the test page
    const saved = await host.saveCampaign(text, { saveAs: true, suggestedName: 'c.json' });
    const opened = await host.openRecentCampaign!(saved!.name);
    expect(opened!.runs).toEqual([{ file: '../run-101-clean.csv', id: null, sha256: null, refused: 'leaves the campaign folder ("..")' }]);
    vi.restoreAllMocks();
  });
});
