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
});
