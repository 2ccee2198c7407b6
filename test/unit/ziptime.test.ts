import { describe, expect, it } from 'vitest';
import writeXlsxFile from 'write-excel-file/node';
import readXlsxFile from 'read-excel-file/node';
import { dosDateTime, withZipTimestamps } from '../../renderer/src/logic/zipTimestamps.ts';

async function workbook(): Promise<Uint8Array> {
  const buffer = (await writeXlsxFile([[{ value: 'cl' }], [{ value: 0.5 }]]).toBuffer()) as Buffer;
  return new Uint8Array(buffer);
}

describe('reproducible ZIP timestamps', () => {
  it('encodes MS-DOS date and time as the APPNOTE describes (2-second resolution, years from 1980)', () => {
    // 2025-12-01 13:45:58 UTC → time 13<<11 | 45<<5 | 29, date 45<<9 | 12<<5 | 1
    expect(dosDateTime(new Date('2025-12-01T13:45:58Z'))).toEqual({ time: (13 << 11) | (45 << 5) | 29, date: (45 << 9) | (12 << 5) | 1 });
    expect(dosDateTime(new Date('1970-01-01T00:00:00Z')).date).toBe((0 << 9) | (1 << 5) | 1);
  });

  it('refuses bytes that are not an archive', () => {
    expect(() => withZipTimestamps(new TextEncoder().encode('alpha,cl\n1,2\n'), new Date())).toThrow(/not a ZIP archive/);
  });

  it('makes two workbooks written at different moments byte-identical, and leaves them readable', async () => {
    const a = await workbook();
    await new Promise((r) => setTimeout(r, 2100)); // the writer stamps entries with the clock (2 s resolution)
    const b = await workbook();
    expect(Buffer.from(a).equals(Buffer.from(b))).toBe(false);
    const when = new Date('2025-12-01T00:00:00Z');
    const fa = withZipTimestamps(a, when);
    const fb = withZipTimestamps(b, when);
    expect(Buffer.from(fa).equals(Buffer.from(fb))).toBe(true);
    const sheets = (await readXlsxFile(Buffer.from(fa))) as unknown as { sheet: string; data: unknown[][] }[];
    expect(sheets[0]!.data).toEqual([['cl'], [0.5]]);
  });
});
