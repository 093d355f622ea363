import { existsSync, readFileSync } from 'node:fs';
import { gunzipSync } from 'node:zlib';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { Seg2Error } from '../../../src/io/seg2/errors.js';
import { readSeg2 } from '../../../src/io/seg2/read.js';
import { writeSeg2, type WriterTrace } from './writeSeg2.js';

// Real files from a general-purpose seismology library's test suite, in ../shared/external/seg2
// (SOURCES.md there gives their provenance and the check values used below). Read from there,
// never copied into the project; skipped with a message when absent.
const external = new URL('../../../../shared/external/seg2/', import.meta.url);
const present = existsSync(new URL('20180307_031245000.0.seg2', external));
const file = (name: string) => {
  const bytes = readFileSync(new URL(name, external));
  return name.endsWith('.gz') ? gunzipSync(bytes) : bytes;
};
const datColumns = (name: string) => file(name).toString('latin1').trim().split(/\r?\n/).map((line) => line.trim().split(/\s+/).map(Number));

describe.skipIf(!present)('readSeg2 on the real reference files (../shared/external/seg2, see SOURCES.md)', () => {
  it('readSeg2(file 1, format code 2) recovers 3 traces of 2000 samples at 1 ms and the samples of the reference DAT', () => {
    const record = readSeg2(file('20130107_103041000.CET.3c.cont.0.seg2.gz'), 'file1.seg2');
    expect(record.traces.map((t) => [t.formatCode, t.raw.length, t.sampleInterval])).toEqual([[2, 2000, 0.001], [2, 2000, 0.001], [2, 2000, 0.001]]);
    // SOURCES.md: first raw samples, sums, descaling factors and header values.
    expect(Array.from(record.traces[0].raw.slice(0, 5))).toEqual([-11, -13, -22, -18, -11]);
    expect(record.traces.map((t) => t.raw.reduce((a, b) => a + b, 0))).toEqual([-867, -885, -856]);
    expect(record.traces.map((t) => t.descalingFactor)).toEqual([2.17378e-05, 2.19941e-05, 2.14815e-05]);
    expect(record.keywords.ACQUISITION_DATE).toBe('07/JAN/2013');
    expect(record.keywords.ACQUISITION_TIME).toBe('10:30:41');
    expect(record.notes).toEqual(['Comment']);
    expect(record.traces[0].keywords.LOW_CUT_FILTER).toBe('10.000000 12.000000');
    expect(record.traces[0].keywords.TRACE_TYPE).toBe('SEISMIC_DATA');
    // Raw × DESCALING_FACTOR × 1000 equals the DAT within 1e-7 + 1e-7·|value| (SOURCES.md tolerance).
    const dat = datColumns('20130107_103041000.CET.3c.cont.0.DAT.gz');
    for (let j = 0; j < 3; j++) {
      const t = record.traces[j];
      dat.forEach((row, k) => expect(Math.abs(t.raw[k] * t.descalingFactor * 1e3 - row[j])).toBeLessThanOrEqual(1e-7 + 1e-7 * Math.abs(row[j])));
    }
  });

  it('readSeg2(file 2, 20-bit format code 3) equals the reference DAT exactly and recovers DELAY, locations, STACK and the unterminated NOTE', () => {
    const record = readSeg2(file('20180307_031245000.0.seg2'), 'file2.seg2');
    const t = record.traces[0];
    expect([t.formatCode, t.raw.length, t.sampleInterval]).toEqual([3, 2048, 0.000125]);
    expect(t.delay).toBe(-0.01);
    expect(t.descalingFactor).toBe(0.001199);
    expect(t.sourceLocation).toEqual([1000]);
    expect(t.receiverLocation).toEqual([1004]);
    expect(t.stack).toBe(8);
    expect(Array.from(t.raw.slice(0, 5))).toEqual([-20, -22, -27, -32, -38]);
    expect(Array.from(t.raw.slice(-3))).toEqual([-1234, -1218, -1201]);
    expect(t.raw.reduce((a, b) => a + b, 0)).toBe(-7848);
    expect(Math.min(...t.raw)).toBe(-388384);
    expect(record.notes).toEqual(['BASE_INTERVAL 4.00', 'SHOT_INCREMENT 1.00', 'PHONE_INCREMENT 1.00', 'AGC_WINDOW 100', 'DISPLAY_FILTERS 0 0']);
    expect(t.notes).toEqual(['DISPLAY_SCALE 48']);
    expect(record.keywords.ACQUISITION_TIME).toBe('3:12:45');
    const dat = datColumns('20180307_031245000.0.DAT.gz');
    dat.forEach((row, k) => expect(t.raw[k] * t.descalingFactor).toBe(row[0]));
  });
});
if (!present) it.skip('the real SEG-2 reference files are absent from ../shared/external/seg2: their checks are skipped', () => {});

const trace = (code: WriterTrace['code'], samples: number[], extra: [string, string][] = []): WriterTrace => ({
  code, samples, keywords: [['CHANNEL_NUMBER', '1'], ['SAMPLE_INTERVAL', '0.00025'], ['DESCALING_FACTOR', '0.5'], ...extra],
});

describe('readSeg2 on files written by the test writer', () => {
  const samples = [0, 1, -1, 32767, -32768, 1234, -4321, 7];
  for (const little of [true, false]) {
    for (const code of [1, 2, 4, 5] as const) {
      it(`readSeg2 decodes format code ${code}, ${little ? 'little' : 'big'}-endian, and applies DESCALING_FACTOR`, () => {
        const values = code >= 4 ? samples.map((s) => s + 0.25) : samples;
        const record = readSeg2(writeSeg2([trace(code, values)], { littleEndian: little }), 'w.seg2');
        expect(record.byteOrder).toBe(little ? 'little' : 'big');
        expect(Array.from(record.traces[0].raw)).toEqual(values);
        expect(Array.from(record.traces[0].data)).toEqual(values.map((v) => Math.fround(v * 0.5)));
      });
    }
    it(`readSeg2 decodes the 20-bit format code 3 (one's-complement mantissas), ${little ? 'little' : 'big'}-endian`, () => {
      // FORMAT.md §5.3: values up to 32767 × 2^15; the writer normalises by halving, so use multiples of the step.
      const values = [26662, 29707, 32862, 36144, -385648, -387136, -388048, -388384];
      expect(Array.from(readSeg2(writeSeg2([trace(3, values)], { littleEndian: little }), 'w.seg2').traces[0].raw)).toEqual(values);
    });
  }

  it('readSeg2 reads two-byte string terminators, multi-line NOTEs, locations in feet and DELAY', () => {
    const bytes = writeSeg2([trace(2, [1, 2, 3, 4], [['SOURCE_LOCATION', '10'], ['RECEIVER_LOCATION', '20 0 101.5'], ['DELAY', '-0.005'], ['TRACE_TYPE', 'DEAD']])], {
      stringTerminator: [0, 0], lineTerminator: [0x0d, 0x0a], fileKeywords: [['UNITS', 'FEET'], ['NOTE', 'first line\r\nsecond line']],
    });
    const record = readSeg2(bytes, 'w.seg2');
    expect(record.notes).toEqual(['first line', 'second line']);
    const t = record.traces[0];
    expect(t.sourceLocation).toEqual([10 * 0.3048]);
    expect(t.receiverLocation![2]).toBeCloseTo(101.5 * 0.3048, 12);
    expect(t.delay).toBe(-0.005);
    expect(t.dead).toBe(true);
  });
});

describe('readSeg2 on corrupt files: a clear error naming file, trace and field', () => {
  const good = () => writeSeg2([trace(2, [1, 2, 3, 4]), trace(2, [5, 6, 7, 8])]);
  const expectError = (bytes: Uint8Array, pattern: RegExp) => {
    expect(() => readSeg2(bytes, 'bad.seg2')).toThrow(Seg2Error);
    expect(() => readSeg2(bytes, 'bad.seg2')).toThrow(pattern);
  };

  it('readSeg2 rejects a bad file block ID', () => {
    const bytes = good();
    bytes[0] = 0x12;
    expectError(bytes, /bad\.seg2, column block ID: starts with bytes 12 3A; expected the SEG-2 file block ID 3A55/);
  });

  it('readSeg2 rejects a trace count larger than the pointer block allows', () => {
    const bytes = good();
    bytes[6] = 9;
    expectError(bytes, /column number of traces: 9 traces need 36 bytes of trace pointers but the pointer block is 8 bytes/);
  });

  it('readSeg2 rejects a pointer past the end of the file, naming the trace', () => {
    const bytes = good();
    new DataView(bytes.buffer).setUint32(36, 999999, true);
    expectError(bytes, /bad\.seg2, trace 2, column trace pointer: points at byte 999999, past the end/);
  });

  it('readSeg2 rejects a bad trace block ID', () => {
    const bytes = good();
    const pointer = new DataView(bytes.buffer).getUint32(32, true);
    bytes[pointer] = 0;
    expectError(bytes, /trace 1, column block ID: the trace descriptor at byte \d+ starts with 00 44; expected the trace block ID 4422/);
  });

  it('readSeg2 rejects a data size that disagrees with the sample count', () => {
    const bytes = good();
    const view = new DataView(bytes.buffer);
    view.setUint32(view.getUint32(32, true) + 8, 5, true);
    expectError(bytes, /trace 1, column data block size: is 16 bytes but 5 samples of format code 2 take 20/);
  });

  it('readSeg2 rejects a 20-bit trace whose sample count is not a multiple of 4', () => {
    const bytes = writeSeg2([trace(3, [1, 2, 3, 4])]);
    const view = new DataView(bytes.buffer);
    const pointer = view.getUint32(32, true);
    view.setUint32(pointer + 8, 6, true);
    view.setUint32(pointer + 4, 15, true);
    expectError(bytes, /trace 1, column number of samples: is 6, not a multiple of 4/);
  });

  it('readSeg2 rejects a truncated file and a missing SAMPLE_INTERVAL', () => {
    const bytes = good();
    expectError(bytes.subarray(0, bytes.length - 3), /trace 2, column data block: needs bytes \d+ to \d+ but the file ends at \d+; the file is truncated/);
    expectError(writeSeg2([{ code: 2, samples: [1, 2], keywords: [['CHANNEL_NUMBER', '1']] }]), /trace 1, column SAMPLE_INTERVAL: is missing/);
  });

  it('readSeg2 under random corruption (fast-check) throws only Seg2Error and returns quickly', () => {
    const base = present ? new Uint8Array(file('20180307_031245000.0.seg2')) : good();
    fc.assert(fc.property(
      fc.array(fc.record({ at: fc.nat(base.length - 1), value: fc.integer({ min: 0, max: 255 }) }), { minLength: 1, maxLength: 8 }),
      fc.option(fc.nat(base.length), { nil: undefined }),
      (edits, cut) => {
        const bytes = Uint8Array.from(base);
        for (const { at, value } of edits) bytes[at] = value;
        const input = cut === undefined ? bytes : bytes.subarray(0, cut);
        const start = performance.now();
        try {
          readSeg2(input, 'fuzz.seg2');
        } catch (error) {
          expect(error).toBeInstanceOf(Seg2Error);
        }
        // Every check is against the file length before reading, so a call is bounded by the file size.
        expect(performance.now() - start).toBeLessThan(500);
      },
    ), { numRuns: 400, seed: 11 });
  });
});
