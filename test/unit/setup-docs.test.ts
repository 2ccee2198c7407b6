import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { setupJsonSchemaText, setupMarkdown } from '../../core/setup/docs.ts';
import { setupFields } from '../../core/setup/fields.ts';
import { validateSetup } from '../../core/setup/schema.ts';
import type { InputError } from '../../core/contract/messages.ts';
import { parseCampaign, serializeCampaign } from '../../core/formats/campaign.ts';
import { SETUP_FIELDS } from '../../renderer/src/logic/setupForm.ts';

/**
 * The setup is described once (core/setup/schema.ts); the form, docs/setup.md and
 * docs/setup.schema.json are derived from it. These tests fail when a derived file is stale or a
 * field lacks what the derived views need.
 */
const ROOT = resolve(__dirname, '../..');
const read = (p: string) => readFileSync(resolve(ROOT, p), 'utf8');

describe('documents derived from the setup schema', () => {
  it('docs/setup.md is what `npm run docs:setup` writes (stale otherwise: run it)', () => {
    expect(read('docs/setup.md'), 'docs/setup.md is stale: run npm run docs:setup').toBe(setupMarkdown());
  });

  it('docs/setup.schema.json is what `npm run docs:setup` writes (stale otherwise: run it)', () => {
    expect(read('docs/setup.schema.json'), 'docs/setup.schema.json is stale: run npm run docs:setup').toBe(setupJsonSchemaText());
  });

  it('lists every field of the sample setups in the docs table', () => {
    const doc = setupMarkdown();
    const leaves = (o: unknown, path: string[] = []): string[] =>
      o !== null && typeof o === 'object' && !Array.isArray(o) ? Object.entries(o).flatMap(([k, v]) => leaves(v, [...path, k])) : [path.join('.')];
    for (const file of ['sample-runs/setup-3d.json', 'sample-runs/setup-2d.json']) {
      for (const path of leaves(JSON.parse(read(file)))) expect(doc, `${file}: ${path}`).toContain(`| \`${path}\` |`);
    }
  });
});

describe('setup field metadata', () => {
  it('gives every field a label of its own (not just its key), and every number a unit', () => {
    for (const f of setupFields()) {
      expect(f.label, f.path).not.toBe(f.path.split('.').pop());
      if (f.type === 'number') expect(f.unit, `${f.path} has no unit ('–' for a pure number)`).not.toBe('');
    }
  });

  it('derives defaults, ranges and choices from the schema itself', () => {
    const byPath = new Map(setupFields().map((f) => [f.path, f]));
    expect(byPath.get('flow.gamma')).toMatchObject({ default: 1.4, min: 1.0001, max: 2, required: false });
    expect(byPath.get('model.chord_m')).toMatchObject({ required: true, min: 1e-4, max: 1e3, unit: 'm' });
    expect(byPath.get('ambient.p_pa')).toMatchObject({ min: 0, minExclusive: true, required: false });
    expect(byPath.get('model.moment_ref_offset_m.z')).toMatchObject({ default: 0 });
    expect(byPath.get('corrections.delta')).toMatchObject({ nullable: true, default: null, form: 'auto-number' });
    expect(byPath.get('balance.axes')?.choices?.map((c) => c.value)).toEqual(['wind', 'body']);
  });

  it('resolves a minimal setup with the schema defaults the docs state', () => {
    const { setup } = validateSetup('s.json', {
      model: { kind: '3d', area_m2: 0.2, chord_m: 0.2, span_m: 1 },
      tunnel: { section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
      balance: { axes: 'wind' },
    });
    for (const f of setupFields()) {
      if (f.default === undefined) continue;
      const value = f.path.split('.').reduce<unknown>((o, k) => (o as Record<string, unknown>)[k], setup);
      expect(value, f.path).toEqual(f.default);
    }
    expect(setup.corrections.solid_blockage_k).toBeCloseTo(1.0452, 4); // 1 + k1 of a prolate spheroid of fineness 6 (Lamb §373)
    expect(setup.uncertainty).toBeNull();
  });

  it('gives the window the same form as before the derivation: fields, order, kinds and groups', () => {
    // the form as it was listed by hand, kept as the reference for the derived one (fields added later may sit between)
    const shown = SETUP_FIELDS.map((f) => `${f.group} | ${f.path} | ${f.kind} | ${f.unit}`);
    const before = [
      'Model | model.kind | choice | ',
      'Model | model.name | text | ',
      'Model | model.area_m2 | number | m²',
      'Model | model.chord_m | number | m',
      'Model | model.span_m | number | m',
      'Model | model.volume_m3 | number | m³',
      'Model | model.moment_ref_offset_m.x | number | m',
      'Model | model.moment_ref_offset_m.z | number | m',
      'Tunnel | tunnel.width_m | number | m',
      'Tunnel | tunnel.height_m | number | m',
      'Balance | balance.axes | choice | ',
      'Ambient (when the run has no column) | ambient.p_pa | number | Pa',
      'Ambient (when the run has no column) | ambient.t_c | number | °C',
      'Ambient (when the run has no column) | ambient.rh_pct | number | %',
      'Wall corrections | corrections.enabled | flag | ',
      'Wall corrections | corrections.wake | choice | ',
      'Wall corrections | corrections.solid_blockage_k | auto-number | –',
      'Wall corrections | corrections.delta | auto-number | –',
      'Wall corrections | corrections.tau1 | auto-number | –',
      'Wall corrections | corrections.tau2 | auto-number | –',
      'Instrument uncertainties (standard, k = 1; optional) | uncertainty.dp_pitot_pa | number | Pa',
      'Instrument uncertainties (standard, k = 1; optional) | uncertainty.p_static_pa | number | Pa',
      'Instrument uncertainties (standard, k = 1; optional) | uncertainty.t_total_c | number | K',
      'Instrument uncertainties (standard, k = 1; optional) | uncertainty.rh_pct | number | % RH',
      'Instrument uncertainties (standard, k = 1; optional) | uncertainty.force_n | number | N',
      'Instrument uncertainties (standard, k = 1; optional) | uncertainty.moment_nm | number | N m',
      'Instrument uncertainties (standard, k = 1; optional) | uncertainty.alpha_deg | number | deg',
      'Instrument uncertainties (standard, k = 1; optional) | uncertainty.area_rel | number | –',
      'Instrument uncertainties (standard, k = 1; optional) | uncertainty.chord_rel | number | –',
    ];
    expect(shown.filter((line) => before.includes(line))).toEqual(before);
  });
});

describe('schema defaults and saved files', () => {
  it('keeps the setups of a campaign as written: defaults fill in when reducing, never into the saved file', () => {
    const text = read('sample-runs/sweepbook-campaign.json');
    const campaign = parseCampaign('sweepbook-campaign.json', text);
    expect(campaign.setups).toEqual(JSON.parse(text).setups);
    expect(serializeCampaign(campaign)).toBe(serializeCampaign(JSON.parse(text)));
  });
});

describe('setup messages for a value out of its range', () => {
  const setup = (edit: (s: Record<string, Record<string, unknown>>) => void) => {
    const s: Record<string, Record<string, unknown>> = {
      model: { kind: '3d', area_m2: 0.2, chord_m: 0.2, span_m: 1 },
      tunnel: { section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
      balance: { axes: 'wind' },
    };
    edit(s);
    return s;
  };
  const message = (s: unknown) => {
    try {
      validateSetup('s.json', s);
      return 'accepted';
    } catch (e) {
      const { notice } = e as InputError;
      return `${notice.field}: ${notice.message}`;
    }
  };

  it('names the range, not just "expected a number", when the value is a number outside it', () => {
    expect(message(setup((s) => (s['flow'] = { gamma: 3 })))).toBe('flow.gamma: expected 1.0001 to 2 (ratio of specific heats)');
    expect(message(setup((s) => (s['ambient'] = { t_c: 500 })))).toBe('ambient.t_c: expected -100 to 200 °C');
    expect(message(setup((s) => (s['ambient'] = { rh_pct: 101 })))).toBe('ambient.rh_pct: expected 0 to 100 %');
    expect(message(setup((s) => (s['uncertainty'] = { force_n: -0.1 })))).toBe('uncertainty.force_n: expected zero or more (N)');
  });

  it('says a block must be an object of fields when it is null, a list or missing', () => {
    expect(message(setup((s) => (s['flow'] = null as never)))).toBe('flow: expected an object of fields, { ... }, not null');
    expect(message(setup((s) => (s['model'] = [] as never)))).toBe('model: expected an object of fields, { ... }, not a list');
    expect(message(setup((s) => delete s['tunnel']))).toBe('tunnel: missing; expected an object of fields, { ... }');
  });

  it('keeps the type message for a value that is not a number', () => {
    expect(message(setup((s) => (s['flow'] = { gamma: '1.4' })))).toBe('flow.gamma: expected a number (ratio of specific heats), not the text "1.4"');
  });
});
