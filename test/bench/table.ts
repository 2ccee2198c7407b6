/** Plain-text tables for the benchmark report (also pasted into docs/performance.md as Markdown). */

export type Align = 'l' | 'r';

export function textTable(head: string[], rows: string[][], align: Align[]): string {
  const width = head.map((h, i) => Math.max(h.length, ...rows.map((r) => (r[i] ?? '').length)));
  const pad = (s: string, i: number) => (align[i] === 'r' ? s.padStart(width[i]!) : s.padEnd(width[i]!));
  const line = (cells: string[]) => '| ' + cells.map(pad).join(' | ') + ' |';
  const rule = '|' + width.map((w, i) => (align[i] === 'r' ? '-'.repeat(w + 1) + ':' : ':' + '-'.repeat(w + 1))).join('|') + '|';
  return [line(head), rule, ...rows.map(line)].join('\n');
}
