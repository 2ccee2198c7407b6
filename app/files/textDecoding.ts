/**
 * Bytes of a text file to characters, chunk by chunk. UTF-8 unless the file starts with a UTF-16
 * byte-order mark (FF FE little-endian, FE FF big-endian; Unicode Standard §23.8), which spreadsheet
 * programs write for "Unicode text"; the mark itself is dropped. Characters split across chunks are
 * held until complete.
 */
export interface ChunkDecoder {
  write(bytes: Uint8Array): string;
  end(): string;
}

/** The encoding named by the file's first bytes: 'utf-16le', 'utf-16be' or 'utf-8'. */
export function encodingOf(first: Uint8Array): 'utf-8' | 'utf-16le' | 'utf-16be' {
  if (first.length >= 2 && first[0] === 0xff && first[1] === 0xfe) return 'utf-16le';
  if (first.length >= 2 && first[0] === 0xfe && first[1] === 0xff) return 'utf-16be';
  return 'utf-8';
}

/** A decoder that picks its encoding from the first bytes it is given (at least two, unless the file is shorter). */
export function chunkDecoder(): ChunkDecoder {
  let decoder: TextDecoder | undefined;
  let head = new Uint8Array(0);
  const pick = (bytes: Uint8Array) => {
    // keep the UTF-8 BOM (the run reader drops it); TextDecoder drops the UTF-16 marks
    const encoding = encodingOf(bytes);
    decoder = new TextDecoder(encoding, { ignoreBOM: encoding === 'utf-8' });
  };
  return {
    write(bytes) {
      if (!decoder) {
        const joined = new Uint8Array(head.length + bytes.length);
        joined.set(head);
        joined.set(bytes, head.length);
        if (joined.length < 2) {
          head = joined;
          return '';
        }
        pick(joined);
        return decoder!.decode(joined, { stream: true });
      }
      return decoder.decode(bytes, { stream: true });
    },
    end() {
      if (!decoder) {
        if (head.length === 0) return '';
        pick(head);
        return decoder!.decode(head);
      }
      return decoder.decode();
    },
  };
}
