/** SVG figures: round ticks, runs in their styles, a legible provenance block, text escaped. */
import { describe, expect, it } from 'vitest';
import { niceStep, niceTicks, svgFigure, wrapLines } from '../../renderer/src/charts/svgFigure.ts';
import { styleFor } from '../../renderer/src/logic/palette.ts';

describe('svg figure', () => {
  it('puts ticks on round values (1, 2, 2.5, 5 × 10ⁿ)', () => {
    expect(niceStep(10)).toBe(2);
    expect(niceStep(0.9)).toBe(0.2);
    expect(niceTicks(-7.3, 17.2)).toEqual([-5, 0, 5, 10, 15]);
    expect(niceTicks(0.013, 0.087)).toEqual([0.02, 0.04, 0.06, 0.08]);
    expect(niceStep(0)).toBe(1);
  });

  it('wraps long provenance lines at a separator, never losing text', () => {
    const line = 'run-101-clean.csv (sha256 abc…) · setup "KM-7 wing" · tare windoff-tare.csv · 3D wall corrections, classic wake blockage';
    const wrapped = wrapLines([line], 60);
    for (const l of wrapped) expect(l.length).toBeLessThanOrEqual(64);
    expect(wrapped.join(' ').replace(/\s+/g, ' ')).toBe(line.replace(/\s+/g, ' '));
    expect(wrapLines(['short'], 60)).toEqual(['short']);
  });

  it('draws each run in its colour, the repeat with open markers and a dash, and writes the provenance at 12 px', () => {
    const svg = svgFigure({
      title: 'Lift curve <test> & more',
      xTitle: 'α [deg]',
      yTitle: 'CL [–]',
      series: [
        {
          label: '101 · clean',
          style: styleFor(0, 0, 0),
          points: [
            { x: 0, y: 0.2 },
            { x: 5, y: 0.6 },
          ],
        },
        {
          label: '104 · clean',
          style: styleFor(1, 0, 1),
          points: [
            { x: 0, y: 0.2 },
            { x: 5, y: 0.6 },
          ],
        },
      ],
      width: 1100,
      height: 780,
      provenance: ['Sweepbook 0.1.0 · exported 2026-12-02', '101: run-101-clean.csv (sha256 abc…) · δ = 0.125, τ1 = 0.84'],
    });
    expect(svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg" width="1100" height="780"')).toBe(true);
    expect(svg).toContain('Lift curve &lt;test&gt; &amp; more');
    expect(svg).toContain('stroke="#0072B2"');
    expect(svg).toContain('stroke="#D55E00"');
    expect(svg).toMatch(/stroke="#D55E00" stroke-width="1.8" stroke-dasharray="8 4"/);
    expect(svg).toMatch(/<circle [^>]*fill="none" stroke="#D55E00"/);
    expect(svg).toContain('<g class="provenance" font-size="12"');
    expect(svg).toContain('δ = 0.125, τ1 = 0.84');
    expect(svg.trim().endsWith('</svg>')).toBe(true);
  });

  describe('sweep branches and fitted marks, as on screen', () => {
    // an invented loop: up 0 → 10° in 2° steps, back down to 0°, CL lower on the way down
    const up = [0, 2, 4, 6, 8, 10].map((a) => ({ x: a, y: 0.1 * a }));
    const down = [8, 6, 4, 2, 0].map((a) => ({ x: a, y: 0.1 * a - (a > 3 ? 0.15 : 0) }));
    const loop = {
      label: '107 · clean',
      style: styleFor(2, 0, 0),
      points: [...up, ...down],
      plot: 'cl-alpha',
      sweep: { branchOf: [...up.map(() => 0), ...down.map(() => 1)], directions: ['up', 'down'] as ('up' | 'down')[] },
    };
    const base = { title: 'Lift curve', xTitle: 'α [deg]', yTitle: 'CL [–]', width: 1100, height: 780, provenance: ['Sweepbook 0.1.0'] };

    it("draws the return sweep thin in the run's colour, with one arrowhead per branch and a key entry", () => {
      const svg = svgFigure({ ...base, series: [loop] });
      const falling = /<path class="branch-falling" d="([^"]+)" fill="none" stroke="#009E73" stroke-width="0.9"\/>/.exec(svg);
      expect(falling).not.toBeNull();
      // five segments down: from the top (10°) to each of the five falling points
      expect(falling![1]!.match(/L/g)).toHaveLength(5);
      expect(svg).toMatch(/<path d="[^"]+" fill="none" stroke="#009E73" stroke-width="1.8"\/>/);
      expect(svg.match(/class="sweep-arrow"/g)).toHaveLength(2);
      expect(svg).toContain('<g class="key" data-key="return">');
      expect(svg).toContain('return sweep (α falling)');
      expect(svg).not.toContain('clmax-mark');
      expect(svg).not.toContain('fit-line');
    });

    it('draws the fitted line under the points and the CLmax mark with its uncertainty, and writes the notes above the provenance', () => {
      const withMarks = {
        ...loop,
        marks: {
          clMax: { x: 10, y: 1.0, xu: 0.2, yu: 0.02, text: 'CLmax 1.0000 ± 0.0200 at α 10.00 ± 0.20 deg' },
          fitLine: {
            points: [
              { x: 0, y: 0 },
              { x: 8, y: 0.8 },
            ],
            text: 'fitted lift line',
          },
          notes: [],
        },
      };
      const none = {
        label: '201 · section (2D)',
        style: styleFor(3, 1, 0),
        points: [
          { x: 0, y: 0.2 },
          { x: 5, y: 0.7 },
        ],
        plot: 'cl-alpha',
        marks: { notes: ['no CLmax: no stall is seen'] },
      };
      const svg = svgFigure({ ...base, series: [withMarks, none] });
      expect(svg.match(/class="fit-line"/g)).toHaveLength(1);
      expect(svg.indexOf('class="fit-line"')).toBeLessThan(svg.indexOf('<circle'));
      expect(svg).toMatch(/<path class="fit-line" d="M[\d.]+ [\d.]+L[\d.]+ [\d.]+" fill="none" stroke="#009E73" stroke-opacity="0.3" stroke-width="6"/);
      expect(svg).toContain('<title>107 · clean: fitted lift line</title>');
      const mark = /<g class="clmax-mark" data-cl-max="1" data-alpha="10">(.*?)<\/g>/.exec(svg);
      expect(mark).not.toBeNull();
      expect(mark![1]).toContain('<title>107 · clean: CLmax 1.0000 ± 0.0200 at α 10.00 ± 0.20 deg</title>');
      // the uncertainty bars: vertical and horizontal, each with two end caps
      expect(mark![1]!.match(/M/g)!.length).toBeGreaterThanOrEqual(6);
      expect(svg.match(/class="clmax-mark"/g)).toHaveLength(1);
      expect(['return', 'clmax', 'fit'].map((k) => svg.includes(`data-key="${k}"`))).toEqual([true, true, true]);
      expect(svg).toContain('<g class="mark-notes" font-size="12" fill="#333">');
      expect(svg).toContain('201 · section (2D): no CLmax: no stall is seen');
      expect(svg.indexOf('class="mark-notes"')).toBeLessThan(svg.indexOf('class="provenance"'));
    });

    it('leaves room above a CLmax at the top of the data for its caret', () => {
      const top = { x: 10, y: 1.0, xu: null, yu: null, text: 'CLmax 1.0000 at α 10.00 deg' };
      const plain = svgFigure({ ...base, series: [loop] });
      const marked = svgFigure({ ...base, series: [{ ...loop, marks: { clMax: top, notes: [] } }] });
      const ticks = (svg: string) => [...svg.matchAll(/text-anchor="end" font-size="13">([^<]+)</g)].map((m) => Number(m[1]));
      expect(Math.max(...ticks(plain))).toBe(1);
      expect(Math.max(...ticks(marked))).toBeGreaterThan(1);
      // a range the user typed is kept as typed
      const typed = svgFigure({ ...base, series: [{ ...loop, marks: { clMax: top, notes: [] } }], limits: { y: { min: 0, max: 1 } } });
      expect(Math.max(...ticks(typed))).toBe(1);
    });
  });
});
