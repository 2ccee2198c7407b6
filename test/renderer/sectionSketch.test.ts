// @vitest-environment happy-dom
/// <reference path="../../renderer/src/env.d.ts" />
import { describe, expect, it } from 'vitest';
import { mount } from '@vue/test-utils';
import SectionSketch from '../../renderer/src/components/SectionSketch.vue';
import { sectionSketch, type SketchInput } from '../../renderer/src/logic/sectionSketch.ts';
import { draftFrom, setupFrom, checkSetup } from '../../renderer/src/logic/setupForm.ts';

const base: SketchInput = {
  section: 'closed-rectangular',
  width: 1.2,
  height: 0.9,
  diameter: null,
  boundaries: {},
  fillet: null,
  kind: '3d',
  span: 0.9,
  mounting: '',
  reflectionWall: '',
};

describe('cross-section sketch', () => {
  it('draws a closed rectangle with four solid sides and the span to scale (0.75 of the width)', () => {
    const s = sectionSketch(base);
    expect(s.walls.map((w) => w.kind)).toEqual(['solid', 'solid', 'solid', 'solid']);
    const m = s.model!;
    const wallTop = s.walls[0]!.d.match(/-?\d+(\.\d+)?/g)!.map(Number); // M x1 y L x2 y of the ceiling
    expect((m.x2 - m.x1) / (wallTop[2]! - wallTop[0]!)).toBeCloseTo(0.75, 10);
    expect(s.summary).toMatch(/all walls solid; span 0\.9 m = 0\.75 B/);
  });

  it('dashes the free sides of a jet over a ground board and draws a half model up from the floor', () => {
    const s = sectionSketch({
      ...base,
      section: 'rectangular',
      boundaries: { floor: 'solid', ceiling: 'free', left: 'free', right: 'free' },
      mounting: 'half',
      reflectionWall: 'floor',
      span: 0.45,
    });
    expect(Object.fromEntries(s.walls.map((w) => [w.label, w.kind]))).toEqual({ ceiling: 'free', right: 'free', floor: 'solid', left: 'free' });
    const m = s.model!;
    expect(m.x1).toBe(m.x2); // vertical
    expect(Math.abs(m.y1 - m.y2) / 200).toBeCloseTo(0.45 / 1.2, 10); // semi-span to the scale of the longer side
    expect(m.label).toBe('semi-span 0.45 m from the floor');
  });

  it('cuts the corners for fillets, draws circles open or closed, and asks for missing sizes instead of drawing', () => {
    expect(sectionSketch({ ...base, fillet: 0.1 }).walls.filter((w) => w.label === 'fillet')).toHaveLength(4);
    expect(sectionSketch({ ...base, section: 'open-circular', diameter: 1.5 }).walls[0]!.kind).toBe('free');
    expect(sectionSketch({ ...base, section: 'closed-circular' }).empty).toMatch(/diameter/);
    expect(sectionSketch({ ...base, width: null }).empty).toMatch(/width and height/);
  });

  it('renders solid and dashed strokes and a legend in the component', () => {
    const w = mount(SectionSketch, { props: { input: { ...base, section: 'open-rectangular' } } });
    expect(w.findAll('path.wall.free')).toHaveLength(4);
    expect(w.find('figure').attributes('aria-label')).toMatch(/free boundary: ceiling, right, floor, left/);
    expect(w.text()).toContain('free boundary');
  });
});

describe('setup form: sections and mountings', () => {
  it('sends only what the chosen section takes, so switching to a circular section does not leave a stale width', () => {
    const original = {
      model: { kind: '3d', area_m2: 0.2, chord_m: 0.2, span_m: 0.8 },
      tunnel: { section: 'closed-rectangular', width_m: 1.2, height_m: 0.9 },
      balance: { axes: 'wind' },
    };
    const d = draftFrom(original);
    d['tunnel.section'] = 'open-circular';
    d['tunnel.diameter_m'] = '1.2';
    const out = setupFrom(original, d);
    expect(out['tunnel']).toEqual({ section: 'open-circular', diameter_m: 1.2 });
    expect(checkSetup('s', out).ok).toBe(true);
  });

  it('places a half model on a free wall under the reflection-wall field', () => {
    const original = {
      model: { kind: '3d', area_m2: 0.1, chord_m: 0.2, span_m: 0.4, mounting: 'half', reflection_wall: 'floor' },
      tunnel: { section: 'open-rectangular', width_m: 1.2, height_m: 0.9 },
      balance: { axes: 'wind' },
    };
    const c = checkSetup('s', setupFrom(original, draftFrom(original)));
    expect(c.byField['model.reflection_wall']).toMatch(/free boundary/);
  });
});
