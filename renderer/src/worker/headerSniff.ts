/**
 * Finds a run file's header line in the first text of the file, following the reader's own rules
 * (byte-order mark, blank lines and `#` metadata lines before it; DESIGN §3.1), so the worker can pick
 * a remembered column mapping by header signature before the reader sees the header.
 */
import Papa from 'papaparse';
import { headerSignature } from '../../../core/index.ts';
import { detectDelimiter, splitHeaderCell } from '../../../core/index.ts';
import type { HeaderInfo } from './protocol.ts';

const PREVIEW_ROWS = 5;

/** Header and preview from text that starts at the beginning of the file; null until the header line is complete. */
export function sniffHeader(text: string): HeaderInfo | null {
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
  const lines = text.split(/\r\n|\n|\r/);
  // the last piece may be an incomplete line
  const complete = lines.length - 1;
  for (let i = 0; i < complete; i++) {
    const trimmed = lines[i]!.trim();
    if (trimmed === '' || trimmed.startsWith('#')) continue;
    const raw = lines[i]!;
    const delimiter = detectDelimiter(raw);
    const parsed = Papa.parse<string[]>(raw, { delimiter, newline: '\n' });
    const cells = (parsed.data[0] ?? []).map((c) => {
      const { name, unit } = splitHeaderCell(c.trim());
      return { name, unit: unit ?? null };
    });
    const preview: string[][] = [];
    for (let j = i + 1; j < complete && preview.length < PREVIEW_ROWS; j++) {
      const t = lines[j]!.trim();
      if (t === '' || t.startsWith('#')) continue;
      preview.push((Papa.parse<string[]>(lines[j]!, { delimiter, newline: '\n' }).data[0] ?? []).map((c) => c.trim()));
    }
    return { line: i + 1, text: raw, signature: headerSignature(raw), delimiter, cells, preview };
  }
  return null;
}
