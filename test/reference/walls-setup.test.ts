import { describe, expect, it } from 'vitest';
import { validateSetup, tunnelSectionOf } from '../../core/setup/schema.ts';
import { InputError } from '../../core/contract/messages.ts';

const base = () => ({
  model: { kind: '3d', area_m2: 0.2, chord_m: 0.22, span_m: 0.9, volume_m3: 0.002 } as Record<string, unknown>,
  tunnel: { section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 } as Record<string, unknown>,
  balance: { axes: 'wind' },
});

/** The field an invalid setup is refused for. */
function refusedField(setup: unknown): string {
  try {
    validateSetup('setup.json', setup);
  } catch (e) {
    if (e instanceof InputError) return `${e.notice.field}: ${e.notice.message}`;
    throw e;
  }
  throw new Error('accepted');
}

describe('setup: tunnels and mountings', () => {
  it('accepts every section kind, and the section it describes has the boundaries its name implies', () => {
    const s = base();
    s.tunnel = { section: 'open-rectangular', width_m: 1.2, height_m: 0.9 };
    expect(tunnelSectionOf(validateSetup('f', s).setup.tunnel)).toEqual({
      shape: 'rectangular',
      width: 1.2,
      height: 0.9,
      boundaries: { floor: 'free', ceiling: 'free', left: 'free', right: 'free' },
      fillet: 0,
    });
    s.tunnel = { section: 'closed-circular', diameter_m: 1.5 };
    const c = validateSetup('f', s).setup.tunnel;
    expect([c.width_m, c.height_m, c.diameter_m]).toEqual([1.5, 1.5, 1.5]);
    expect(tunnelSectionOf(c)).toEqual({ shape: 'circular', diameter: 1.5, boundary: 'solid' });
    s.tunnel = {
      section: 'rectangular',
      width_m: 1.2,
      height_m: 0.9,
      boundaries: { floor: 'solid', ceiling: 'free', left: 'free', right: 'free' },
      fillet_m: 0.1,
    };
    expect(tunnelSectionOf(validateSetup('f', s).setup.tunnel)).toMatchObject({ fillet: 0.1, boundaries: { floor: 'solid', ceiling: 'free' } });
  });

  it('reads a classic setup back without any of the new keys (so its canonical form and provenance do not change)', () => {
    const s = base();
    const t = validateSetup('f', s).setup;
    expect(Object.keys(t.tunnel).sort()).toEqual(['height_m', 'section', 'width_m']);
    expect(['mounting', 'reflection_wall', 'moment_ref_xc', 'fineness_ratio', 'tail_arm_m', 'tail_cm_per_deg'].filter((k) => k in t.model)).toEqual([]);
  });

  it('refuses a circular section without a diameter, naming tunnel.diameter_m', () => {
    const s = base();
    s.tunnel = { section: 'open-circular' };
    expect(refusedField(s)).toMatch(/^tunnel\.diameter_m: required for an open-circular section/);
  });

  it('refuses a span that does not fit, naming model.span_m', () => {
    const s = base();
    s.model.span_m = 1.3;
    expect(refusedField(s)).toMatch(/^model\.span_m: the span 1\.3 m does not fit/);
  });

  it('refuses a half model on a free boundary, and one without its wall, naming model.reflection_wall', () => {
    const s = base();
    s.tunnel = { section: 'rectangular', width_m: 1.2, height_m: 0.9, boundaries: { floor: 'free', ceiling: 'solid', left: 'solid', right: 'solid' } };
    s.model = { ...s.model, span_m: 0.5, mounting: 'half', reflection_wall: 'floor' };
    expect(refusedField(s)).toMatch(/^model\.reflection_wall: the floor is a free boundary/);
    delete s.model.reflection_wall;
    expect(refusedField(s)).toMatch(/^model\.reflection_wall: required for a half model/);
  });

  it('refuses fillets larger than the section, naming tunnel.fillet_m, and cautions for large ones', () => {
    const s = base();
    s.tunnel = { ...s.tunnel, fillet_m: 0.5 };
    expect(refusedField(s)).toMatch(/^tunnel\.fillet_m:/);
    s.tunnel = { ...s.tunnel, fillet_m: 0.25 };
    expect(validateSetup('f', s).warnings.map((w) => w.field)).toContain('tunnel.fillet_m');
  });

  it('refuses boundaries outside section "rectangular" and a diameter on a rectangle', () => {
    const s = base();
    s.tunnel = { ...s.tunnel, boundaries: { floor: 'solid', ceiling: 'solid', left: 'solid', right: 'solid' } };
    expect(refusedField(s)).toMatch(/^tunnel\.boundaries:/);
    s.tunnel = { section: 'closed-rectangular', width_m: 1.2, height_m: 0.9, diameter_m: 1 };
    expect(refusedField(s)).toMatch(/^tunnel\.diameter_m:/);
  });

  it('refuses a 2D wing in an open rectangular jet (no side walls to hold it), naming tunnel.section, and accepts free floor and ceiling between solid sides', () => {
    const s = base();
    s.model = { kind: '2d', chord_m: 0.3, volume_m3: 0.004 };
    s.tunnel = { section: 'open-rectangular', width_m: 1.2, height_m: 0.9 };
    expect(refusedField(s)).toMatch(/^tunnel\.section: a 2d model spans the width between solid side walls/);
    s.tunnel = { section: 'rectangular', width_m: 1.2, height_m: 0.9, boundaries: { floor: 'free', ceiling: 'free', left: 'solid', right: 'solid' } };
    expect(validateSetup('f', s).setup.model.kind).toBe('2d');
  });

  it('cautions, without refusing, a span above 0.8 of the width', () => {
    const s = base();
    s.model.span_m = 1.0;
    const w = validateSetup('f', s).warnings;
    expect(w.find((x) => x.field === 'model.span_m')?.message).toMatch(/0\.83 of the tunnel width/);
  });

  it('takes K from the body fineness ratio on the point-doublet normalisation, 1.045 by default (fineness 6), and an explicit K as given', () => {
    const s = base();
    expect(validateSetup('f', s).setup.corrections.solid_blockage_k).toBeCloseTo(1.0452, 4);
    s.model.fineness_ratio = 1;
    expect(validateSetup('f', s).setup.corrections.solid_blockage_k).toBe(1.5);
    (s as Record<string, unknown>).corrections = { solid_blockage_k: 0.96 };
    expect(validateSetup('f', s).setup.corrections.solid_blockage_k).toBe(0.96);
  });
});
