/**
 * The command line's output written in pieces: a million-point result as one JSON or CSV string would
 * be near or past the longest string a JavaScript engine can hold (about 2^29 characters in V8), so
 * the documents are produced and written chunk by chunk, byte-identical to the whole-string form.
 */

/** Rows per JSON chunk. */
const POINTS_PER_CHUNK = 1024;

/**
 * `JSON.stringify(doc, null, 2) + '\n'` in pieces, with `doc.points` written a block of points at a
 * time (each point indented as JSON.stringify would indent it at that depth).
 */
export function* jsonChunks(doc: { points: readonly unknown[] } & Record<string, unknown>): Generator<string> {
  const mark = '\u0000points\u0000';
  const whole = JSON.stringify({ ...doc, points: mark }, null, 2);
  const slot = `"points": ${JSON.stringify(mark)}`;
  const at = whole.indexOf(slot);
  yield whole.slice(0, at + '"points": '.length);
  const points = doc.points;
  if (points.length === 0) yield '[]';
  else {
    yield '[\n';
    for (let start = 0; start < points.length; start += POINTS_PER_CHUNK) {
      let block = '';
      const end = Math.min(points.length, start + POINTS_PER_CHUNK);
      for (let i = start; i < end; i++) {
        block += '    ' + JSON.stringify(points[i], null, 2).replace(/\n/g, '\n    ') + (i + 1 < points.length ? ',\n' : '\n');
      }
      yield block;
    }
    yield '  ]';
  }
  yield whole.slice(at + slot.length) + '\n';
}

/** Write chunks to a stream, waiting for it to drain when it asks to (a pipe to a slow reader). */
export async function writeChunks(out: NodeJS.WritableStream, chunks: Iterable<string>): Promise<void> {
  for (const chunk of chunks) {
    if (!out.write(chunk)) await new Promise<void>((resolve) => out.once('drain', () => resolve()));
  }
}
