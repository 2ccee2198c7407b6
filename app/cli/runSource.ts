/**
 * A run file's text as the reader takes it: CSV and whitespace-aligned text streamed in chunks, or
 * the first sheet of an .xlsx workbook turned into CSV text (read-excel-file, a maintained reader of
 * the Office Open XML format; numbers are kept as the text the workbook stores, so no digit changes).
 */
import type { Hash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { StringDecoder } from 'node:string_decoder';
import { readSheet } from 'read-excel-file/node';
import { InputError, isWorkbookName, sheetRowsToCsv, type SheetCell } from '../../core/index.ts';

/** The file's text in chunks; the bytes also feed `hash` when given. Errors name the file. */
export async function* runText(path: string, hash?: Hash): AsyncGenerator<string> {
  if (isWorkbookName(path)) {
    yield await workbookText(path, hash);
    return;
  }
  yield* textStream(path, hash);
}

/** The first sheet of a workbook as CSV text. */
export async function workbookText(path: string, hash?: Hash): Promise<string> {
  let bytes: Buffer;
  try {
    bytes = await readFile(path);
  } catch (err) {
    throw new InputError({ file: path, message: describeFsError(err) });
  }
  hash?.update(bytes);
  try {
    const rows = await readSheet<string>(bytes, 1, { parseNumber: (s) => s });
    return sheetRowsToCsv(rows as unknown as SheetCell[][]);
  } catch (err) {
    throw new InputError({ file: path, message: `not a readable .xlsx workbook (${(err as Error).message})` });
  }
}

/** A text file's chunks, opened read-only and decoded as UTF-8 across chunk boundaries. */
export async function* textStream(path: string, hash?: Hash): AsyncGenerator<string> {
  const stream = createReadStream(path, { flags: 'r', highWaterMark: 1 << 20 });
  const decoder = new StringDecoder('utf8');
  try {
    for await (const chunk of stream) {
      hash?.update(chunk as Buffer);
      const text = decoder.write(chunk as Buffer);
      if (text.length > 0) yield text;
    }
    const rest = decoder.end();
    if (rest.length > 0) yield rest;
  } catch (err) {
    throw new InputError({ file: path, message: describeFsError(err) });
  }
}

/** The first `limit` characters of a run file (whole lines), enough to see its header. */
export async function runHead(path: string, limit = 65536): Promise<string> {
  let text = '';
  for await (const chunk of runText(path)) {
    text += chunk;
    if (text.length >= limit) break;
  }
  return text;
}

export function describeFsError(err: unknown): string {
  const code = (err as { code?: string }).code;
  if (code === 'ENOENT') return 'no such file';
  if (code === 'EISDIR') return 'is a folder, not a file';
  if (code === 'EACCES') return 'permission denied';
  return (err as Error).message;
}
