/**
 * Fixed timestamps in a ZIP archive (an XLSX workbook is one), so that the same content gives the
 * same bytes: every local file header and central-directory entry gets the same MS-DOS date and time
 * (PKWARE APPNOTE 6.3.x, §4.3.7 and §4.3.12: last-mod time at offsets 10/12, date at 12/14). The
 * writer library stamps entries with the current time; this rewrites them, nothing else.
 */

const LOCAL = 0x04034b50;
const CENTRAL = 0x02014b50;
const END = 0x06054b50;

/** MS-DOS time and date words of a moment, in UTC (APPNOTE §4.4.6; years 1980–2107). */
export function dosDateTime(d: Date): { time: number; date: number } {
  const year = Math.min(2107, Math.max(1980, d.getUTCFullYear()));
  return {
    time: (d.getUTCHours() << 11) | (d.getUTCMinutes() << 5) | Math.floor(d.getUTCSeconds() / 2),
    date: ((year - 1980) << 9) | ((d.getUTCMonth() + 1) << 5) | d.getUTCDate(),
  };
}

/** A copy of the archive with every entry's timestamp set to `when`. Throws on bytes that are not a ZIP archive. */
export function withZipTimestamps(zip: Uint8Array, when: Date): Uint8Array {
  const out = zip.slice();
  const view = new DataView(out.buffer, out.byteOffset, out.byteLength);
  const { time, date } = dosDateTime(when);
  // the end-of-central-directory record, searched from the end (a comment may follow it)
  let end = -1;
  for (let i = out.length - 22; i >= Math.max(0, out.length - 22 - 0xffff); i--) {
    if (view.getUint32(i, true) === END) {
      end = i;
      break;
    }
  }
  if (end < 0) throw new Error('not a ZIP archive (no end-of-central-directory record)');
  const entries = view.getUint16(end + 10, true);
  let at = view.getUint32(end + 16, true);
  for (let n = 0; n < entries; n++) {
    if (view.getUint32(at, true) !== CENTRAL) throw new Error('not a ZIP archive (bad central directory)');
    view.setUint16(at + 12, time, true);
    view.setUint16(at + 14, date, true);
    const local = view.getUint32(at + 42, true);
    if (view.getUint32(local, true) !== LOCAL) throw new Error('not a ZIP archive (bad local header)');
    view.setUint16(local + 10, time, true);
    view.setUint16(local + 12, date, true);
    at += 46 + view.getUint16(at + 28, true) + view.getUint16(at + 30, true) + view.getUint16(at + 32, true);
  }
  return out;
}
