import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/core/errors.js';
import { WarningLog } from '../../src/core/warnings.js';
import { readFirstBreaks } from '../../src/io/firstBreaksCsv.js';
import { Seg2Error } from '../../src/io/seg2/errors.js';
import { readSeg2 } from '../../src/io/seg2/read.js';
import { readStations } from '../../src/io/stationsCsv.js';

const table = readFileSync('survey-examples/pump-station/first-breaks.csv', 'utf8');
const tableLines = table.split('\n');
const record = readFileSync('survey-examples/pump-station/records/S3.seg2').toString('latin1');

/** Text pieces that break CSV readers: quotes, comment marks, delimiters, line ends, odd numbers. */
const nasty = fc.constantFrom('"', '""', '#', ',', ';', '\t', '\n', '\r', '\r\n', ' ', '0x10', 'NaN', '1e300', '-0', '1,5', '\uFFFD', '\u0000', '=1+1', 'Ö', '', '-', '.', 'e', 'Infinity');
const cellText = fc.array(fc.oneof(nasty, fc.string({ maxLength: 4 })), { maxLength: 4 }).map((parts) => parts.join(''));

describe('readFirstBreaks under fuzzing (fast-check)', () => {
  it('readFirstBreaks on the pump-station table with cells and lines mutated throws only InputError, and what it reads is finite', () => {
    fc.assert(fc.property(
      fc.array(fc.record({ line: fc.nat(tableLines.length - 1), cell: fc.nat(6), text: cellText, whole: fc.boolean() }), { minLength: 1, maxLength: 6 }),
      (edits) => {
        const lines = [...tableLines];
        for (const { line, cell, text, whole } of edits) {
          if (whole) lines[line] = text;
          else {
            const cells = lines[line].split(',');
            cells[Math.min(cell, cells.length - 1)] = text;
            lines[line] = cells.join(',');
          }
        }
        try {
          const result = readFirstBreaks(lines.join('\n'), 'fuzz.csv', new WarningLog());
          for (const p of result.picks) {
            expect(Number.isFinite(p.time) && p.time >= 0).toBe(true);
            expect(Number.isFinite(p.sourceX) && Number.isFinite(p.receiverX) && Number.isFinite(p.receiverElev) && Number.isFinite(p.sourceElev)).toBe(true);
          }
          // Nothing dropped: every non-blank line below the header is a pick.
          const header = lines.findIndex((l) => l.startsWith('source_id'));
          if (header >= 0 && lines.join('\n') === lines.join('\n').replace(/["\r]/g, '')) {
            expect(result.picks.length).toBe(lines.slice(header + 1).join('\n').split('\n').filter((l) => l.trim() !== '' && l.split(',').some((c) => c.trim() !== '')).length);
          }
        } catch (error) {
          expect(error).toBeInstanceOf(InputError);
        }
      },
    ), { numRuns: 300, seed: 7 });
  });

  it('readFirstBreaks and readStations on arbitrary short texts throw only InputError', () => {
    fc.assert(fc.property(fc.array(fc.oneof(nasty, fc.string({ maxLength: 6 }), fc.constantFrom('source_x', 'receiver_x', 'time_ms', 'x', 'elev', 'station')), { maxLength: 30 }), (parts) => {
      const text = parts.join('');
      for (const read of [() => readFirstBreaks(text, 'fuzz.csv', new WarningLog()), () => readStations(text, 'fuzz.csv')]) {
        try {
          read();
        } catch (error) {
          expect(error).toBeInstanceOf(InputError);
        }
      }
    }), { numRuns: 400, seed: 3 });
  });
});

describe('readSeg2 header values under fuzzing (fast-check)', () => {
  const keywords = ['SAMPLE_INTERVAL', 'DELAY', 'DESCALING_FACTOR', 'SOURCE_LOCATION', 'RECEIVER_LOCATION', 'CHANNEL_NUMBER', 'STACK', 'UNITS'];
  const valueChars = fc.constantFrom(...'0123456789.,-+eExX NaInfity#'.split(''));
  it('readSeg2 with keyword values replaced (same length, so the blocks stay valid) throws only Seg2Error, and what it reads is finite', () => {
    fc.assert(fc.property(
      fc.array(fc.record({ keyword: fc.constantFrom(...keywords), nth: fc.nat(47), chars: fc.array(valueChars, { minLength: 12, maxLength: 12 }) }), { minLength: 1, maxLength: 4 }),
      (edits) => {
        let text = record;
        for (const { keyword, nth, chars } of edits) {
          let at = -1;
          for (let k = 0; k <= nth; k++) {
            const next = text.indexOf(`${keyword} `, at + 1);
            if (next < 0) break;
            at = next;
          }
          if (at < 0) continue;
          const start = at + keyword.length + 1;
          let end = start;
          while (end < text.length && text.charCodeAt(end) >= 0x20 && text.charCodeAt(end) < 0x7f) end++;
          const value = chars.join('').slice(0, end - start).padEnd(end - start, ' ');
          text = text.slice(0, start) + value + text.slice(end);
        }
        try {
          const read = readSeg2(new Uint8Array(Buffer.from(text, 'latin1')), 'fuzz.seg2');
          for (const t of read.traces) {
            expect(t.sampleInterval > 0 && t.sampleInterval <= 1).toBe(true);
            expect(Number.isFinite(t.delay) && Number.isFinite(t.descalingFactor)).toBe(true);
            for (const v of [...(t.sourceLocation ?? []), ...(t.receiverLocation ?? [])]) expect(Math.abs(v)).toBeLessThanOrEqual(1e7);
          }
        } catch (error) {
          expect(error).toBeInstanceOf(Seg2Error);
        }
      },
    ), { numRuns: 300, seed: 5 });
  });
});
