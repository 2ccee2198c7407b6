// The floor for a JavaScript reader of a run file: the same chunked read as the command line
// (utf8 stream, 1 MiB chunks), papaparse over each block of complete lines, nothing else (no
// number conversion, no grouping). Plain JavaScript run by node itself, so no TypeScript loader
// start-up is counted. Prints the rows and fields seen, so the work cannot be skipped.
// Usage: node test/bench/bare-parse.mjs RUN.csv
import { createReadStream } from 'node:fs';
import Papa from 'papaparse';

const file = process.argv[2];
let carry = '';
let rows = 0;
let fields = 0;

function parseBlock(text) {
  const parsed = Papa.parse(text, { delimiter: ',', newline: '\n', skipEmptyLines: false });
  for (const row of parsed.data) {
    rows++;
    fields += row.length;
  }
}

for await (const chunk of createReadStream(file, { encoding: 'utf8', highWaterMark: 1 << 20 })) {
  const text = carry + chunk;
  const nl = text.lastIndexOf('\n');
  if (nl < 0) {
    carry = text;
    continue;
  }
  carry = text.slice(nl + 1);
  parseBlock(text.slice(0, nl));
}
if (carry.length > 0) parseBlock(carry);
process.stdout.write(JSON.stringify({ rows, fields }) + '\n');
