import { readFileSync } from 'node:fs';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { chunkDecoder, encodingOf } from '../../app/files/textDecoding.ts';
import { readRun } from '../../core/reduction/engine.ts';
import { runCli } from '../support/cli.ts';

const ROOT = resolve(__dirname, '../..');
const RUN = readFileSync(join(ROOT, 'sample-runs', 'run-201-section.csv'), 'utf8');
const SETUP = join(ROOT, 'sample-runs', 'setup-2d.json');

/** `text` as UTF-16 with its byte-order mark (what "Unicode text" exports of spreadsheets are). */
function utf16(text: string, order: 'le' | 'be'): Buffer {
  const le = Buffer.from('\ufeff' + text, 'utf16le');
  if (order === 'le') return le;
  const be = Buffer.alloc(le.length);
  for (let i = 0; i + 1 < le.length; i += 2) [be[i], be[i + 1]] = [le[i + 1]!, le[i]!];
  return be;
}

describe('UTF-16 run files', () => {
  it('a host that reads bytes as UTF-8 hands the reader a file it refuses as UTF-16, not as "binary data"', async () => {
    const asUtf8 = new TextDecoder('utf-8').decode(utf16(RUN, 'le'));
    const r = await readRun('run.csv', [asUtf8]);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]!.message).toMatch(/UTF-16 text.*save or export it as UTF-8/);
  });

  it.each(['le', 'be'] as const)('the command line reads UTF-16 %s with its byte-order mark exactly as the UTF-8 file', async (order) => {
    const dir = mkdtempSync(join(tmpdir(), 'sweepbook-utf16-'));
    writeFileSync(join(dir, 'run.csv'), RUN);
    writeFileSync(join(dir, 'run16.csv'), utf16(RUN, order));
    const a = await runCli('reduce', join(dir, 'run.csv'), '--setup', SETUP);
    const b = await runCli('reduce', join(dir, 'run16.csv'), '--setup', SETUP);
    expect(b.code, b.stderr).toBe(0);
    const strip = (s: string) => {
      const d = JSON.parse(s);
      delete d.provenance;
      delete d.run.source_file;
      return d;
    };
    expect(strip(b.stdout)).toEqual(strip(a.stdout));
  });

  it('decodes byte by byte: characters split across chunks are kept whole, in all three encodings', () => {
    const text = 'alpha,Δp [Pa],note\n1,2,µ°€😀\n';
    for (const bytes of [Buffer.from(text, 'utf8'), utf16(text, 'le'), utf16(text, 'be')]) {
      const d = chunkDecoder();
      let out = '';
      for (const b of bytes) out += d.write(Uint8Array.of(b));
      out += d.end();
      expect(out).toBe(text);
    }
    expect(encodingOf(Uint8Array.of(0xef, 0xbb, 0xbf))).toBe('utf-8');
    const one = chunkDecoder();
    expect(one.write(Uint8Array.of(0x41)) + one.end()).toBe('A');
  });
});
