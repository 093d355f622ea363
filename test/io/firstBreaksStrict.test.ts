import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { WarningLog } from '../../src/core/warnings.js';
import { decodeUtf8, firstInvalidUtf8 } from '../../src/io/decodeUtf8.js';
import { readFirstBreaks } from '../../src/io/firstBreaksCsv.js';
import { csvRecords } from '../../src/io/csvRecords.js';

const example = readFileSync('survey-examples/pump-station/first-breaks.csv', 'utf8');
const read = (text: string, options = {}) => readFirstBreaks(text, 'line.csv', new WarningLog(), options);
const error = (text: string, options = {}): string => {
  try {
    read(text, options);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as Error).message;
  }
  throw new Error('expected an InputError');
};
/** The pump-station table with one change per data row. */
const edited = (change: (cells: string[]) => void): string => {
  const lines = example.split('\n');
  const header = lines.findIndex((l) => l.startsWith('source_id'));
  return lines.map((l, i) => {
    if (i <= header || l.trim() === '') return l;
    const cells = l.split(',');
    change(cells);
    return cells.join(',');
  }).join('\n');
};
const dataRows = example.split('\n').filter((l) => /^S\d/.test(l)).length;

describe('readFirstBreaks comment rule and ids', () => {
  it('readFirstBreaks keeps rows whose source_id begins with # as picks: every row of the pump-station table is read', () => {
    // The file's own three # lines above the header are comments; rows of S3 renamed #S3 are data.
    const table = read(edited((c) => { if (c[0] === 'S3') c[0] = '#S3'; }));
    expect(table.picks).toHaveLength(dataRows);
    expect(table.picks.filter((p) => p.sourceId === '#S3').length).toBeGreaterThan(40);
  });

  it('readFirstBreaks reads # lines only above the header; below it a # line that is not a row names the rule', () => {
    expect(read('# a comment\n#, another, with commas\nsource_x,receiver_x,time_ms\n0,5,4\n0,10,8\n').picks).toHaveLength(2);
    expect(error('source_x,receiver_x,time_ms\n0,5,4\n# note\n')).toMatch(/line\.csv, row 3: has 1 fields; expected 3 .*comments only above the header/);
  });

  it('readFirstBreaks keeps ids as written (UTF-8, quotes, commas) and refuses U+FFFD and control characters', () => {
    const table = read('source_id,source_x,receiver_x,time_ms\n"Ö, ""a""",0,5,4\nÖ, "a",0,10,8\n'.replace('Ö, "a",0,10,8', '"Ö, ""a""",0,10,8'));
    expect(table.picks[0].sourceId).toBe('Ö, "a"');
    expect(error('source_id,source_x,receiver_x,time_ms\nS\uFFFD1,0,5,4\n')).toMatch(/row 2, column source_id: holds U\+FFFD/);
    expect(error('source_id,source_x,receiver_x,time_ms\nS\u00071,0,5,4\n')).toMatch(/row 2, column source_id: holds the control character U\+0007/);
  });

  it('decodeUtf8 refuses a byte that is not UTF-8, naming file, line and the header field', () => {
    const bytes = new TextEncoder().encode('# c\nsource_id,source_x,receiver_x,time_ms\nS1,0,5,4\nS?,0,10,8\n');
    bytes[bytes.indexOf(0x3f)] = 0xe9; // Latin-1 é
    expect(firstInvalidUtf8(bytes)).toBe(bytes.indexOf(0xe9));
    expect(() => decodeUtf8(bytes, 'line.csv')).toThrow(/line\.csv, row 4, column source_id: byte E9 .* is not UTF-8/);
    // Well-formed multi-byte text passes; an overlong form (C0 AF) and a lone surrogate (ED A0 80) do not (RFC 3629).
    expect(decodeUtf8(new TextEncoder().encode('Ö€𝄞'), 'f')).toBe('Ö€𝄞');
    expect(firstInvalidUtf8(new Uint8Array([0x41, 0xc0, 0xaf]))).toBe(1);
    expect(firstInvalidUtf8(new Uint8Array([0xed, 0xa0, 0x80]))).toBe(0);
    expect(firstInvalidUtf8(new Uint8Array([0xe2, 0x82]))).toBe(0);
  });

  it('csvRecords names the line of a stray quote and of a quote never closed, counting lines inside quoted fields', () => {
    // A quoted id spanning two lines, then a stray quote on file line 5 (the fourth record).
    const text = 'a,b\n"x\ny",1\nz,2\nw"q,3\n';
    expect(() => csvRecords(text, 'f.csv')).toThrow(/f\.csv, row 5: CSV: a stray quote inside unquoted field 1/);
    expect(csvRecords('a,b\n"x\ny",1\nz,2\n', 'f.csv').map((r) => r.line)).toEqual([1, 2, 4]);
    expect(() => csvRecords('a,b\nc,2\n"open,3\nd,4\n', 'f.csv')).toThrow(/row 3: CSV: a quoted field opened on this line is never closed/);
    expect(() => csvRecords('a,b\n"x"y,1\n', 'f.csv')).toThrow(/row 2: CSV: text after the closing quote/);
  });

  it('readFirstBreaks reports a stray quote on line 100 of a table as row 100', () => {
    const lines = example.split('\n');
    lines[99] = lines[99].replace(/^S(\d)/, 'S"$1');
    expect(error(lines.join('\n'))).toMatch(/^line\.csv, row 100: CSV: a stray quote/);
  });
});

describe('readFirstBreaks strict numbers', () => {
  it('readFirstBreaks refuses 0x10, NaN, Infinity, a decimal comma and 1e300, naming row and column', () => {
    const table = (time: string) => `source_x;receiver_x;time_ms\n0;5;4\n0;10;${time}\n`;
    expect(error(table('0x10'))).toMatch(/row 3, column time_ms: "0x10" is not a number \(hexadecimal, octal or binary notation is not read\); expected a number in milliseconds/);
    expect(error(table('NaN'))).toMatch(/"NaN" is not a number \(not a value\)/);
    expect(error(table('Infinity'))).toMatch(/"Infinity" is not a number/);
    expect(error(table('8,5'))).toMatch(/"8,5" is not a number \(a decimal comma; write a decimal point\)/);
    expect(error(table('1e300'))).toMatch(/row 3, column time_ms: 1e300 is beyond 1e8 milliseconds; expected a first-break time/);
    expect(read(table('8.5e0')).picks[1].time).toBeCloseTo(0.0085, 12);
  });

  it('readFirstBreaks refuses positions near 1e12 m instead of printing 0 ± NaN, and reads projected coordinates near 5e6 m', () => {
    expect(error(edited((c) => { c[1] = String(Number(c[1]) + 1e12); c[3] = String(Number(c[3]) + 1e12); }))).toMatch(/row 5, column source_x: 999999999994 is beyond 1e7 metres; expected a position along the line/);
    // 10 000 km: UTM northings stay below it (common practice).
    expect(read(edited((c) => { c[1] = String(Number(c[1]) + 5e6); c[3] = String(Number(c[3]) + 5e6); })).picks).toHaveLength(dataRows);
  });
});

describe('readFirstBreaks judges units from the data', () => {
  it('readFirstBreaks stops on seconds, microseconds or feet in the pump-station table, naming the likely unit', () => {
    // The line is 450 m/s over 2600 m/s (its README): its median apparent velocity lies inside 50-8000 m/s.
    const seconds = error(edited((c) => { c[5] = String(Number(c[5]) / 1000); }));
    expect(seconds).toMatch(/median apparent velocity .* is \d{6,} m\/s, outside the 50 to 8000 m\/s that P waves have .*the times look like seconds/);
    expect(error(edited((c) => { c[5] = String(Number(c[5]) * 1000); }))).toMatch(/is 0\.97 m\/s, outside .*the times look like microseconds: divide them by 1000 \(that would make it 971 m\/s\)/);
    // Lengths in feet read as metres: 2600 m/s rock becomes 8530 "m/s" (x 3.2808); with the
    // whole table in feet the median apparent velocity leaves the bounds only for fast ground.
    const fast = 'source_x,receiver_x,time_ms\n' + [10, 20, 30, 40, 50].map((x) => `0,${x / 0.3048},${(x / 6000) * 1000}`).join('\n') + '\n';
    expect(error(fast)).toMatch(/is 19685 m\/s.*the lengths look like feet: give --units ft \(that would make it 6000 m\/s\)/);
    expect(error(edited((c) => { c[5] = String(Number(c[5]) / 1000); }), { wave: 'S' })).toMatch(/outside the 30 to 5000 m\/s that S waves have/);
  });

  it('readFirstBreaks with acceptVelocities reads the table and warns instead', () => {
    const log = new WarningLog();
    const table = readFirstBreaks(edited((c) => { c[5] = String(Number(c[5]) * 1000); }), 'line.csv', log, { acceptVelocities: true });
    expect(table.picks).toHaveLength(dataRows);
    expect(log.withCode('apparent-velocity')[0].message).toMatch(/accepted as given \(--accept-velocities\)/);
  });

  it('readFirstBreaks stops on a source far from its receivers and on constant or all-zero times, naming the source', () => {
    expect(error(edited((c) => { if (c[0] === 'S1') c[1] = '1000'; }))).toMatch(/column source_x, source S1: .*check this source's source_x \(1000 m; the receivers span 0 to 94 m\)/);
    expect(error(edited((c) => { c[5] = '10'; }))).toMatch(/source S1: every one of the \d+ times on the \+x side is 10 ms; .*expected times that change/);
    expect(error(edited((c) => { c[5] = '0'; }))).toMatch(/every one of the \d+ times .* is 0 ms/);
  });
});
