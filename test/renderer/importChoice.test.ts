/** Setup and tare proposed for an imported run from the campaign's runs, by metadata. */
import { describe, expect, it } from 'vitest';
import { propose, type RunFacts } from '../../renderer/src/logic/importChoice.ts';

const run = (file: string, setup: string, tare: string | null, meta: RunFacts['meta']): RunFacts => ({ file, setup, tare, meta });
const name = (f: string) => f.replace(/\.csv$/, '');

describe('import proposal', () => {
  it('takes the first setup and no tare in an empty campaign, and says so', () => {
    expect(propose(run('a.csv', 'x', null, null), [], ['wing', 'section'], name)).toEqual({ setup: 'wing', tare: null, reason: 'first run of the campaign' });
  });

  it('prefers the latest run of the same model and configuration, ignoring case and spaces', () => {
    const others = [
      run('101.csv', 'wing', 'tare.csv', { model: 'KM-7 wing', configuration: 'clean' }),
      run('201.csv', 'section', null, { model: 'KM-7 section', configuration: 'clean' }),
      run('102.csv', 'wing flap', 'tare2.csv', { model: 'KM-7 wing', configuration: 'flap 10' }),
    ];
    const p = propose(run('105.csv', 'section', null, { model: 'km-7 wing ', configuration: 'Clean' }), others, ['wing', 'section'], name);
    expect(p).toEqual({ setup: 'wing', tare: 'tare.csv', reason: 'as 101: same model and configuration' });
  });

  it('falls back to the same model, then to the run added last', () => {
    const others = [
      run('101.csv', 'wing', 'tare.csv', { model: 'KM-7 wing', configuration: 'clean' }),
      run('201.csv', 'section', null, { model: 'KM-7 section' }),
    ];
    expect(propose(run('n.csv', '', null, { model: 'KM-7 wing', configuration: 'flap 30' }), others, [], name).reason).toBe('as 101: same model');
    expect(propose(run('n.csv', '', null, null), others, [], name)).toEqual({
      setup: 'section',
      tare: null,
      reason: 'as 201, the run added last (no metadata in common)',
    });
  });
});
