import { InputError } from '../core/errors.js';

/** One record of a CSV text: its cells and the file line on which it starts (1-based). */
export interface CsvRecord {
  cells: string[];
  line: number;
}

/**
 * Splits a CSV text into records (RFC 4180): fields separated by the delimiter, a field may be
 * quoted with `"` (inner quotes doubled) and then hold delimiters and line breaks; lines end in
 * CRLF, LF or CR. Written out rather than taken from a library so that every record knows the
 * file line it starts on and every fault names the line where it is.
 *
 * @param text - the file contents (a byte-order mark already removed)
 * @param file - file name, for messages
 * @param delimiter - one character; defaults to a comma
 * @throws InputError naming the file and line of a stray quote inside an unquoted field, of text
 *   after a closing quote, or of a quote that is never closed (the line where it opened)
 * @example
 * csvRecords('a,b\n"x, y",2\n', 'f.csv') // [{ cells: ['a', 'b'], line: 1 }, { cells: ['x, y', '2'], line: 2 }]
 */
export function csvRecords(text: string, file: string, delimiter = ','): CsvRecord[] {
  const records: CsvRecord[] = [];
  let cells: string[] = [];
  let cell = '';
  let line = 1;
  let recordLine = 1;
  let i = 0;
  const n = text.length;
  const endRecord = () => {
    cells.push(cell);
    records.push({ cells, line: recordLine });
    cells = [];
    cell = '';
  };
  while (i < n) {
    const ch = text[i];
    if (ch === '"' && cell.trim() === '') {
      // A quoted field (blanks before the opening quote are allowed and dropped).
      const openedOn = line;
      cell = '';
      i++;
      for (;;) {
        if (i >= n) throw new InputError({ file, row: openedOn }, 'CSV: a quoted field opened on this line is never closed; expected a closing " (a quote inside a field is written "")');
        const c = text[i];
        if (c === '"') {
          if (text[i + 1] === '"') { cell += '"'; i += 2; continue; }
          i++;
          break;
        }
        if (c === '\r' || c === '\n') {
          if (c === '\r' && text[i + 1] === '\n') { cell += '\r'; i++; }
          line++;
        }
        cell += c;
        i++;
      }
      // After the closing quote: blanks, then a delimiter or the end of the line.
      while (i < n && (text[i] === ' ' || text[i] === '\t') && delimiter !== text[i]) i++;
      if (i < n && text[i] !== delimiter && text[i] !== '\n' && text[i] !== '\r') {
        throw new InputError({ file, row: line }, `CSV: text after the closing quote of field ${cells.length + 1}; expected a delimiter or the end of the line after a quoted field`);
      }
      continue;
    }
    if (ch === delimiter) { cells.push(cell); cell = ''; i++; continue; }
    if (ch === '\n' || ch === '\r') {
      endRecord();
      i += ch === '\r' && text[i + 1] === '\n' ? 2 : 1;
      line++;
      recordLine = line;
      continue;
    }
    if (ch === '"') throw new InputError({ file, row: line }, `CSV: a stray quote inside unquoted field ${cells.length + 1}; expected a field quoted from its first character ("a ""b"" c") or no quote`);
    cell += ch;
    i++;
  }
  if (cell !== '' || cells.length > 0) endRecord();
  return records;
}

/** True when every cell of a record is blank. */
export function isBlankRecord(record: CsvRecord): boolean {
  return record.cells.every((c) => c.trim() === '');
}
