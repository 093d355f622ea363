import { InputError } from '../core/errors.js';

/**
 * Byte offset of the first byte that does not belong to a well-formed UTF-8 sequence (RFC 3629:
 * no overlong forms, no surrogates, nothing above U+10FFFF), or -1 when all of it is UTF-8.
 */
export function firstInvalidUtf8(bytes: Uint8Array): number {
  let i = 0;
  const n = bytes.length;
  while (i < n) {
    const b = bytes[i];
    if (b < 0x80) { i++; continue; }
    let need: number;
    let min: number;
    if (b >= 0xc2 && b <= 0xdf) { need = 1; min = 0x80; }
    else if (b >= 0xe0 && b <= 0xef) { need = 2; min = 0x800; }
    else if (b >= 0xf0 && b <= 0xf4) { need = 3; min = 0x10000; }
    else return i;
    if (i + need >= n) return i;
    let code = b & (need === 1 ? 0x1f : need === 2 ? 0x0f : 0x07);
    for (let k = 1; k <= need; k++) {
      const c = bytes[i + k];
      if (c === undefined || (c & 0xc0) !== 0x80) return i;
      code = (code << 6) | (c & 0x3f);
    }
    if (code < min || code > 0x10ffff || (code >= 0xd800 && code <= 0xdfff)) return i;
    i += need + 1;
  }
  return -1;
}

/**
 * Decodes a text file as UTF-8, strictly: a byte that is not UTF-8 is an error naming the file,
 * the line, the field (by the header's name where the file is a table) and the byte, never a
 * silent U+FFFD.
 *
 * @throws InputError naming file, row and column
 */
export function decodeUtf8(bytes: Uint8Array, file: string): string {
  const at = firstInvalidUtf8(bytes);
  if (at < 0) return new TextDecoder('utf-8').decode(bytes);
  let lineStart = 0;
  let line = 1;
  for (let i = 0; i < at; i++) if (bytes[i] === 0x0a) { line++; lineStart = i + 1; }
  // The field: delimiters before the byte on its line, read against the first line that is not a comment.
  const before = new TextDecoder('utf-8').decode(bytes.subarray(lineStart, at));
  const field = before.split(',').length - 1;
  const text = new TextDecoder('utf-8').decode(bytes.subarray(0, Math.min(bytes.length, 65536)));
  const header = text.split(/\r\n|\n|\r/).find((l) => l.trim() !== '' && !l.startsWith('#'));
  const name = header?.split(',')[field]?.trim().toLowerCase();
  const byte = bytes[at].toString(16).toUpperCase().padStart(2, '0');
  return throwAt(file, line, name !== undefined && name !== '' ? name : `field ${field + 1}`, byte, at);
}

function throwAt(file: string, row: number, column: string, byte: string, offset: number): never {
  throw new InputError({ file, row, column }, `byte ${byte} (at byte ${offset} of the file) is not UTF-8; expected UTF-8 text (save the table as UTF-8)`);
}
