/**
 * The plots with a big campaign: redraws queued one chart per task, a legend that lists the first runs
 * and counts the rest, per-run series and datasets kept while the run is unchanged (so a batch of newly
 * reduced runs does not remake every other run's), and what an empty plot says while runs are reduced.
 */
import { describe, expect, it } from 'vitest';
import { readSetup, reduceRun } from '../../core/reduction/engine.ts';
import type { ReductionResult } from '../../core/reduction/pipeline.ts';
import { readRunText } from '../../core/formats/runFile.ts';
import { createDrawQueue } from '../../renderer/src/charts/drawQueue.ts';
import { datasetsOf, type DatasetCache } from '../../renderer/src/charts/plotConfig.ts';
import { legendEntries, LEGEND_MAX, namesText } from '../../renderer/src/logic/legendEntries.ts';
import { styleFor } from '../../renderer/src/logic/palette.ts';
import { plotSpec } from '../../renderer/src/logic/plotSpecs.ts';
import { tickedOnTheWay } from '../../renderer/src/state/pendingRuns.ts';
import { runSeries } from '../../renderer/src/state/plotSeries.ts';
import { sample } from './support.ts';

function reduced(file: string): ReductionResult {
  const s = readSetup('setup-3d.json', sample('setup-3d.json'));
  if (!s.ok) throw new Error(JSON.stringify(s.errors));
  const r = reduceRun({ run: readRunText(file, sample(file)), setup: s.value, tare: readRunText('windoff-tare.csv', sample('windoff-tare.csv')) });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

/** A queue whose tasks are run by hand, one per call, as the page's timer would. */
function manualQueue() {
  const tasks: (() => void)[] = [];
  let t = 0;
  const queue = createDrawQueue(
    (run) => tasks.push(run),
    () => t,
  );
  return { queue, tasks, advance: (ms: number) => (t += ms), runTask: () => tasks.shift()!() };
}

describe('draw queue', () => {
  it('does nothing until its task runs, then one draw per task, in the order queued', () => {
    const { queue, tasks, runTask } = manualQueue();
    const done: string[] = [];
    const [a, b, c] = [{}, {}, {}];
    queue.queue(a, () => done.push('a'));
    queue.queue(b, () => done.push('b'));
    queue.queue(c, () => done.push('c'));
    expect(done).toEqual([]);
    expect(tasks).toHaveLength(1);
    runTask();
    expect(done).toEqual(['a']);
    runTask();
    runTask();
    expect(done).toEqual(['a', 'b', 'c']);
    expect(tasks).toHaveLength(0);
    expect(queue.waiting).toBe(0);
  });

  it('draws a chart queued twice before its turn once, with the latest draw, keeping its place', () => {
    const { queue, runTask } = manualQueue();
    const done: string[] = [];
    const [a, b] = [{}, {}];
    queue.queue(a, () => done.push('a1'));
    queue.queue(b, () => done.push('b'));
    queue.queue(a, () => done.push('a2'));
    expect(queue.waiting).toBe(2);
    runTask();
    runTask();
    expect(done).toEqual(['a2', 'b']);
  });

  it('drops the draw of a chart that is removed, and keeps going after a draw that throws', () => {
    const { queue, tasks, runTask } = manualQueue();
    const done: string[] = [];
    const [a, b, c] = [{}, {}, {}];
    queue.queue(a, () => {
      throw new Error('broken chart');
    });
    queue.queue(b, () => done.push('b'));
    queue.queue(c, () => done.push('c'));
    queue.cancel(b);
    expect(() => runTask()).toThrow('broken chart');
    expect(tasks).toHaveLength(1);
    runTask();
    expect(done).toEqual(['c']);
  });

  it("adds up what each chart's last draw took, forgetting removed charts", () => {
    const { queue, advance, runTask } = manualQueue();
    const [a, b] = [{}, {}];
    expect(queue.cost).toBe(0);
    queue.queue(a, () => advance(120));
    queue.queue(b, () => advance(80));
    runTask();
    runTask();
    expect(queue.cost).toBe(200);
    queue.queue(a, () => advance(30));
    runTask();
    expect(queue.cost).toBe(110);
    queue.cancel(b);
    expect(queue.cost).toBe(30);
  });
});

describe('legend of a big campaign', () => {
  it('lists every run up to the limit, and one more rather than "+ 1 more runs"', () => {
    expect(legendEntries([], 3)).toEqual({ shown: [], more: 0, moreText: null });
    expect(legendEntries(['a', 'b', 'c'], 3)).toEqual({ shown: ['a', 'b', 'c'], more: 0, moreText: null });
    expect(legendEntries(['a', 'b', 'c', 'd'], 3)).toEqual({ shown: ['a', 'b', 'c', 'd'], more: 0, moreText: null });
  });

  it('lists the first runs in order and counts the others', () => {
    const runs = Array.from({ length: 1000 }, (_, i) => `run ${i}`);
    const l = legendEntries(runs);
    expect(l.shown).toEqual(runs.slice(0, LEGEND_MAX));
    expect(l.more).toBe(1000 - LEGEND_MAX);
    expect(l.moreText).toBe(`+ ${1000 - LEGEND_MAX} more runs`);
    expect(legendEntries(runs, 0).moreText).toBe('+ 1000 more runs');
  });
});

describe('per-run series and datasets kept while the run is unchanged', () => {
  const r101 = reduced('run-101-clean.csv');
  const r103 = reduced('run-103-flap20.csv');
  const lift = plotSpec('cl-alpha');
  const plain = { clMax: false, fitLines: false };

  it('gives the same series for the same result, plot, label, style and marks, whatever else changed', () => {
    const style = styleFor(0, 0);
    const a = runSeries(r101, lift, '101 · clean', style, plain);
    // another run becoming ready does not touch this run's series
    runSeries(r103, lift, '103 · flap 20', styleFor(1, 1), plain);
    expect(runSeries(r101, lift, '101 · clean', style, plain)).toBe(a);
    expect(a.points[0]).toEqual({ x: r101.points[0]!.alpha_deg, y: r101.points[0]!.cl });
  });

  it('makes the series again when the run is reduced again, restyled, renamed, or other marks are asked for', () => {
    const style = styleFor(0, 0);
    const a = runSeries(r101, lift, '101 · clean', style, plain);
    const again = reduced('run-101-clean.csv');
    expect(runSeries(again, lift, '101 · clean', style, plain)).not.toBe(a);
    const restyled = runSeries(r101, lift, '101 · clean', styleFor(2, 0), plain);
    expect(restyled).not.toBe(a);
    expect(restyled.style.colour).toBe(styleFor(2, 0).colour);
    expect(runSeries(r101, lift, '101 · clean (2D)', styleFor(2, 0), plain).label).toBe('101 · clean (2D)');
    const marked = runSeries(r101, lift, '101 · clean (2D)', styleFor(2, 0), { clMax: true, fitLines: true });
    expect(marked.marks?.clMax?.y).toBe(r101.fit.cl_max);
    expect(runSeries(r101, plotSpec('cd-cl'), '101 · clean (2D)', styleFor(2, 0), plain).points[0]).toEqual({ x: r101.points[0]!.cd, y: r101.points[0]!.cl });
  });

  it("reuses a chart's dataset objects for unchanged series and makes new ones only for the changed", () => {
    const cache: DatasetCache = new WeakMap();
    const marks = { clMax: true, fitLines: true };
    const s101 = runSeries(r101, lift, '101 · clean', styleFor(0, 0), marks);
    const s103 = runSeries(r103, lift, '103 · flap 20', styleFor(1, 1), marks);
    const first = datasetsOf([s101], cache);
    const second = datasetsOf([s101, s103], cache);
    expect(second.datasets[0]).toBe(first.datasets[0]);
    expect(second.roles).toEqual(['run', 'run', 'fit', 'fit', 'clmax', 'clmax']);
    // the fit and CLmax datasets of the unchanged run are kept too
    expect(second.datasets[2]).toBe(first.datasets[1]);
    expect(second.datasets[4]).toBe(first.datasets[2]);
    // the same datasets as made without a cache
    expect(JSON.stringify(second.datasets)).toBe(JSON.stringify(datasetsOf([s101, s103]).datasets));
    // without a cache every call makes its own (exported figures)
    expect(datasetsOf([s101]).datasets[0]).not.toBe(first.datasets[0]);
  });
});

describe('what an empty plot says while a campaign opens', () => {
  it('counts the ticked runs still waiting, being read or reduced, not the unticked, reduced or failed', () => {
    const runs = ['a', 'b', 'c', 'd', 'e', 'f'].map((file) => ({ file, visible: file !== 'b' }));
    const entries = { a: { status: 'queued' }, b: { status: 'reading' }, c: { status: 'reducing' }, d: { status: 'ready' }, e: { status: 'failed' } } as const;
    expect(tickedOnTheWay(runs, entries)).toBe(2);
    expect(tickedOnTheWay([], {})).toBe(0);
  });
});

describe('"Used by" of a setup in a big campaign', () => {
  it('names every run up to the limit, and counts the rest, asking only for the names shown', () => {
    const asked: string[] = [];
    const nameOf = (f: string) => {
      asked.push(f);
      return f.toUpperCase();
    };
    expect(namesText([], nameOf)).toBe('no run');
    expect(namesText(['a', 'b', 'c'], nameOf, 2)).toBe('A, B, C');
    asked.length = 0;
    const files = Array.from({ length: 1000 }, (_, i) => `r${i}`);
    expect(namesText(files, nameOf, 3)).toBe('R0, R1, R2 and 997 more');
    expect(asked).toEqual(['r0', 'r1', 'r2']);
  });
});
