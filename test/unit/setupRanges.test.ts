import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseSetup, SETUP_RANGES } from '../../core/setup/schema.ts';
import { readSetup } from '../../core/reduction/engine.ts';
import { SETUP_MAX_BYTES } from '../../core/formats/limits.ts';

const ROOT = resolve(__dirname, '../..');
const base = () => JSON.parse(readFileSync(join(ROOT, 'sample-runs', 'setup-3d.json'), 'utf8'));

/** The setup with `path` set to `value`, parsed; the error's field and message, or 'ok'. */
function tryValue(path: string[], value: unknown): string {
  const s = base();
  let o = s;
  for (const k of path.slice(0, -1)) o = o[k] ??= {};
  o[path.at(-1)!] = value;
  try {
    parseSetup('setup.json', JSON.stringify(s));
    return 'ok';
  } catch (err) {
    const n = (err as { notice: { field?: string; message: string } }).notice;
    return `${n.field}: ${n.message}`;
  }
}

describe('sane ranges for the numeric setup fields', () => {
  it('refuses δ = 11.5 (a slipped decimal point for 0.115), naming the field and the range', () => {
    expect(tryValue(['corrections', 'delta'], 11.5)).toMatch(/^corrections\.delta: expected -0\.5 to 0\.5/);
    expect(tryValue(['corrections', 'delta'], 0.115)).toBe('ok');
  });

  it.each([
    [['corrections', 'delta'], -0.51, 0.125],
    [['corrections', 'tau1'], 2.5, 0.86],
    [['corrections', 'tau1'], -0.1, 0.86],
    [['corrections', 'tau2'], 1.5, 0.2],
    [['corrections', 'tau2'], -0.01, 0],
    [['corrections', 'solid_blockage_k'], 9.6, 0.96],
    [['corrections', 'solid_blockage_k'], 0, 0.74],
    [['ambient', 'p_pa'], 99.25, 99250], // kPa typed for Pa
    [['ambient', 'p_pa'], 1e8, 2e6],
    [['uncertainty', 'alpha_deg'], 45, 0.02],
    [['uncertainty', 'area_rel'], 2, 0.002],
    [['uncertainty', 'dp_pitot_pa'], 1e6, 0.5],
  ])('%j = %d is refused naming the field; %d is accepted', (path, bad, good) => {
    expect(tryValue(path as string[], bad)).toMatch(new RegExp(`^${(path as string[]).join('\\.')}: expected`));
    expect(tryValue(path as string[], good)).toBe('ok');
  });

  it('keeps null (computed) for δ, τ1, τ2 and K', () => {
    for (const k of ['delta', 'tau1', 'tau2', 'solid_blockage_k']) expect(tryValue(['corrections', k], null)).toBe('ok');
  });

  it('refuses a moment-reference offset more than 10 reference chords from the balance centre', () => {
    const chord = base().model.chord_m as number;
    expect(tryValue(['model', 'moment_ref_offset_m'], { x: 11.5, z: 0 })).toMatch(/^model\.moment_ref_offset_m\.x: expected within ±/);
    expect(tryValue(['model', 'moment_ref_offset_m'], { x: 0, z: -10.5 * chord })).toMatch(/^model\.moment_ref_offset_m\.z:/);
    expect(tryValue(['model', 'moment_ref_offset_m'], { x: 0.25 * chord, z: -0.05 })).toBe('ok');
    expect(SETUP_RANGES.moment_ref_offset_chords).toBe(10);
  });

  it('refuses a setup text larger than the limit, naming the file', () => {
    const r = readSetup('big.json', `{"note":"${'x'.repeat(SETUP_MAX_BYTES)}"}`);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]).toMatchObject({ file: 'big.json', message: expect.stringMatching(/at most 1\.0 MiB/) });
  });
});
