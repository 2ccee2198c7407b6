// @vitest-environment happy-dom
/**
 * The reduction worker's logic behind the engine client: streamed reads equal a whole-file read,
 * remembered mappings are applied by header signature, errors come back located with the header,
 * back-pressure holds the sender, and reductions come in both bases.
 */
import { describe, expect, it } from 'vitest';
import { headerSignature } from '../../core/formats/campaign.ts';
import { readSetup, reduceRun } from '../../core/reduction/engine.ts';
import { readRunText } from '../../core/formats/runFile.ts';
import { EngineClient, type TextFeeder } from '../../renderer/src/engine/engineClient.ts';
import type { FromWorker, ToWorker } from '../../renderer/src/worker/protocol.ts';
import { inProcessTransport, sample } from './support.ts';

function chunked(text: string, size: number): TextFeeder {
  return async (push) => {
    for (let i = 0; i < text.length; i += size) await push(text.slice(i, i + size));
  };
}

const SETUP = JSON.parse(sample('setup-3d.json')) as unknown;

describe('engine client and worker', () => {
  it('reads a run in small chunks to the same points as reading it whole, and reduces it like core', async () => {
    const client = new EngineClient(inProcessTransport());
    const text = sample('run-104-clean-timehistory.csv');
    const progress: number[] = [];
    const read = await client.read('run:104', 'run-104-clean-timehistory.csv', chunked(text, 997), { mapping: null, mappings: {}, onProgress: (c) => progress.push(c) });
    if (!read.ok) throw new Error(JSON.stringify(read.errors));
    const whole = readRunText('run-104-clean-timehistory.csv', text);
    expect(read.rows).toBe(3000);
    expect(read.stats.points.length).toBe(whole.points.length);
    expect(read.stats.points[3]!.mean).toEqual(Array.from(whole.points[3]!.mean));
    expect(read.stats.points[3]!.n).toBe(200);
    expect(read.header.line).toBe(7);
    expect(progress[progress.length - 1]).toBe(text.length);
    expect(progress).toEqual([...progress].sort((a, b) => a - b));

    const tare = await client.read('tare:t', 'windoff-tare.csv', chunked(sample('windoff-tare.csv'), 50), { mapping: null, mappings: {} });
    expect(tare.ok).toBe(true);
    const reduced = await client.reduce('run:104', 'KM-7 wing', SETUP, 'tare:t');
    if (!reduced.ok) throw new Error(JSON.stringify(reduced.errors));
    const setup = readSetup('s', JSON.stringify(SETUP));
    if (!setup.ok) throw new Error('setup');
    const ref = reduceRun({ run: whole, setup: setup.value, tare: readRunText('windoff-tare.csv', sample('windoff-tare.csv')) });
    if (!ref.ok) throw new Error('ref');
    expect(reduced.result.points).toEqual(ref.value.points);
    expect(reduced.result.fit).toEqual(ref.value.fit);
    // the as-measured reduction is the same run with corrections off
    expect(reduced.asMeasured.corrections.enabled).toBe(false);
    expect(reduced.asMeasured.points[0]!.cl).toBe(ref.value.points[0]!.cl_uncorrected);
    expect(Date.parse(reduced.reducedAt)).not.toBeNaN();
  });

  it('applies a mapping remembered for the file\'s header signature', async () => {
    const client = new EngineClient(inProcessTransport());
    const text = sample('run-101-clean.csv').replace('alpha [deg],dp_pitot [Pa]', 'incidence [deg],pitot [Pa]');
    const headerLine = text.split('\n').find((l) => l.startsWith('incidence'))!;
    const mapping = { names: { incidence: 'alpha', pitot: 'dp_pitot' } };
    const read = await client.read('run:x', 'x.csv', chunked(text, 40), { mapping: null, mappings: { [headerSignature(headerLine)]: mapping } });
    if (!read.ok) throw new Error(JSON.stringify(read.errors));
    expect(read.mappingUsed).toEqual(mapping);
    const reduced = await client.reduce('run:x', 's', SETUP, null);
    expect(reduced.ok).toBe(true);
  });

  it('returns a located error with the header for the mapping step', async () => {
    const client = new EngineClient(inProcessTransport());
    const text = '# run: 9\nalpha [deg],dp_pitot [cubits],lift,drag\n1,2,3,4\n';
    const read = await client.read('run:bad', 'bad.csv', chunked(text, 7), { mapping: null, mappings: {} });
    expect(read.ok).toBe(false);
    if (read.ok) return;
    expect(read.errors[0]).toMatchObject({ file: 'bad.csv', line: 2, column: 2 });
    expect(read.errors[0]!.message).toMatch(/unit "cubits", which is not a known unit/);
    expect(read.header?.cells.map((c) => c.name)).toEqual(['alpha', 'dp_pitot', 'lift', 'drag']);
  });

  it('reports an unread run or tare instead of guessing', async () => {
    const client = new EngineClient(inProcessTransport());
    const r = await client.reduce('run:never', 's', SETUP, null);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]!.message).toMatch(/has not been read/);
  });

  it('holds the sender back while the worker has chunks queued', async () => {
    // a worker that does not answer until told to
    const posted: ToWorker[] = [];
    let deliver: (msg: FromWorker) => void = () => undefined;
    const client = new EngineClient({ post: (m) => posted.push(m), listen: (h) => (deliver = h) });
    const states: string[] = [];
    const reading = client.read('run:bp', 'bp.csv', async (push) => {
      await push('a,');
      await push('b,');
      let third = false;
      const p = push('c\n').then(() => (third = true));
      await new Promise((r) => setTimeout(r, 5));
      states.push(`third sent, acknowledged none: ${third ? 'went on' : 'waits'}`);
      const id = posted[0]!.type === 'begin' ? posted[0]!.id : -1;
      deliver({ type: 'ack', id, chars: 2 });
      await p;
      states.push('after one acknowledgement: went on');
    }, { mapping: null, mappings: {} });
    await new Promise((r) => setTimeout(r, 20));
    const id = posted[0]!.type === 'begin' ? posted[0]!.id : -1;
    expect(posted.map((m) => m.type)).toEqual(['begin', 'chunk', 'chunk', 'chunk', 'end']);
    deliver({ type: 'read', id, reply: { ok: false, errors: [], header: null } });
    await reading;
    expect(states).toEqual(['third sent, acknowledged none: waits', 'after one acknowledgement: went on']);
  });

  it('gives a host read failure back as an error naming the file', async () => {
    const client = new EngineClient(inProcessTransport());
    const read = await client.read('run:gone', 'gone.csv', async () => {
      throw new Error('permission denied');
    }, { mapping: null, mappings: {} });
    expect(read).toEqual({ ok: false, errors: [{ file: 'gone.csv', message: 'could not be read: permission denied' }], header: null });
  });
});
