/**
 * `sweepbook columns FILE [--out MAP.json]`: the columns of a run file as found (header, unit from
 * brackets, parentheses or a units row, an example value) with the channel and unit guessed for
 * each, and, with --out, a ready column map to check and edit.
 */
import { parseArgs } from 'node:util';
import {
  CHANNELS,
  columnMapFromGuesses,
  guessColumns,
  inspectHeader,
  InputError,
  serializeColumnMap,
  WHITESPACE,
  formatNotice,
  type Channel,
} from '../../core/index.ts';
import { writeFileAtomic } from '../files/atomic.ts';
import { runHead } from './runSource.ts';

export async function columnsCommand(
  args: string[],
  io: { stdout: NodeJS.WritableStream },
  say: (l: string) => void,
  usage: (m: string) => never,
): Promise<number> {
  const { values, positionals } = parseArgs({ args, allowPositionals: true, options: { out: { type: 'string' } } });
  if (positionals.length !== 1) usage('columns needs one run file');
  const file = positionals[0]!;
  if (values.out !== undefined && values.out === file) usage(`--out ${values.out} is the run file; raw files are never overwritten`);
  let sketch;
  try {
    sketch = inspectHeader(file, await runHead(file));
  } catch (err) {
    if (err instanceof InputError) {
      say(`error: ${formatNotice(err.notice)}`);
      return 1;
    }
    throw err;
  }
  const guesses = guessColumns(sketch.cells);
  const layout =
    sketch.delimiter === WHITESPACE
      ? 'columns aligned with spaces'
      : sketch.delimiter === '\t'
        ? 'tab-separated'
        : sketch.delimiter === ';'
          ? 'semicolon-separated, decimal comma'
          : 'comma-separated';
  const out: string[] = [];
  out.push(
    `${file}: header on line ${sketch.headerLine}${sketch.unitsLine ? `, units row on line ${sketch.unitsLine}` : ''}; ${layout}; ${sketch.cells.length} columns`,
  );
  const rows = guesses.map((g) => {
    const ch = g.channel;
    const unit = g.unknownUnit ? `${g.cell.unit} (unknown)` : (g.cell.unit ?? (ch && ch !== 'point' ? `(${CHANNELS[ch as Channel].defaultUnit})` : ''));
    return [String(g.cell.column), g.cell.text, unit, ch ?? '—', ch ? (g.score >= 0.85 ? 'sure' : 'likely') : '', sketch.example[g.cell.column - 1] ?? ''];
  });
  const head = ['col', 'header as written', 'unit', 'channel', 'guess', 'first value'];
  const widths = head.map((h, i) =>
    Math.min(
      40,
      rows.reduce((w, r) => Math.max(w, r[i]!.length), h.length),
    ),
  );
  const line = (cells: string[]) =>
    cells
      .map((c, i) => (i === 0 ? c.padStart(widths[i]!) : c.padEnd(widths[i]!)))
      .join('  ')
      .trimEnd();
  out.push(line(head), line(widths.map((w) => '-'.repeat(w))));
  for (const r of rows) out.push(line(r));
  const missing = (['alpha'] as Channel[]).filter((c) => !guesses.some((g) => g.channel === c));
  if (!guesses.some((g) => g.channel === 'q' || g.channel === 'dp_pitot' || g.channel === 'dp_contraction')) missing.push('dp_pitot');
  if (missing.length > 0) out.push(`not found: ${missing.join(', ')} (assign them in the map)`);
  out.push('(unit in parentheses: none written, the channel default applies; "—": ignored unless assigned)');
  io.stdout.write(out.join('\n') + '\n');
  if (values.out !== undefined) {
    await writeFileAtomic(values.out, serializeColumnMap(columnMapFromGuesses(guesses)));
    say(
      `wrote ${values.out}: a column map from these guesses; check every entry (channel, unit, and "scale": -1 where a sign convention differs) before using it with --columns`,
    );
  }
  return 0;
}
