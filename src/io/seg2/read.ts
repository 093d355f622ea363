import { notANumberHint, parseDecimal, parseInteger } from '../strictNumber.js';
import { Seg2Error } from './errors.js';
import type { Seg2Record, Seg2Trace } from './types.js';

const FILE_BLOCK_ID = 0x3a55;
const TRACE_BLOCK_ID = 0x4422;
const BYTES_PER_SAMPLE: Record<number, number> = { 1: 2, 2: 4, 3: 2.5, 4: 4, 5: 8 };
const UNITS_TO_METRES: Record<string, number> = { METERS: 1, METRES: 1, FEET: 0.3048, INCHES: 0.0254, CENTIMETERS: 0.01, CENTIMETRES: 0.01, NONE: 1 };

/**
 * Reads a SEG-2 file (Pullan 1990, Geophysics 55, 1260-1271; revision 1): both byte orders, data
 * format codes 1 to 5 (16- and 32-bit integers, 20-bit floating point, 32- and 64-bit IEEE), string
 * lists with one- or two-byte terminators, all keywords kept. DELAY gives the time of the first
 * sample; DESCALING_FACTOR scales the samples; STACK is kept and not divided; DEAD traces marked;
 * SOURCE_LOCATION and RECEIVER_LOCATION converted to metres by UNITS.
 *
 * Corrupt input never reads outside the buffer: every pointer, block size and sample count is
 * checked against the file length before use.
 *
 * @param bytes - the whole file
 * @param file - file name, used in every message
 * @throws Seg2Error naming the file, trace and field that broke, and what was expected
 */
export function readSeg2(bytes: Uint8Array, file: string): Seg2Record {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (bytes.byteLength < 32) throw new Seg2Error(file, undefined, 'file descriptor', `is ${bytes.byteLength} bytes long; a SEG-2 file starts with a 32-byte descriptor`);
  let little: boolean;
  if (view.getUint16(0, true) === FILE_BLOCK_ID) little = true;
  else if (view.getUint16(0, false) === FILE_BLOCK_ID) little = false;
  else throw new Seg2Error(file, undefined, 'block ID', `starts with bytes ${hex(bytes[0])} ${hex(bytes[1])}; expected the SEG-2 file block ID 3A55 (55 3A little-endian or 3A 55 big-endian)`);
  const u16 = (at: number) => view.getUint16(at, little);
  const u32 = (at: number) => view.getUint32(at, little);
  const remarks: string[] = [];
  const revision = u16(2);
  if (revision !== 1) remarks.push(`revision ${revision}; revision 1 is the only one in use, read as revision 1`);
  const pointerBytes = u16(4);
  const traceCount = u16(6);
  if (traceCount === 0) throw new Seg2Error(file, undefined, 'number of traces', 'is 0: the record holds no traces; expected at least one trace');
  if (traceCount * 4 > pointerBytes) {
    throw new Seg2Error(file, undefined, 'number of traces', `${traceCount} traces need ${traceCount * 4} bytes of trace pointers but the pointer block is ${pointerBytes} bytes; expected N × 4 ≤ M`);
  }
  if (32 + pointerBytes > bytes.byteLength) {
    throw new Seg2Error(file, undefined, 'trace pointer block', `ends at byte ${32 + pointerBytes}, past the end of the ${bytes.byteLength}-byte file; the file is truncated`);
  }
  const stringTerminator = terminator(bytes[8], bytes[9], bytes[10]);
  const lineTerminator = terminator(bytes[11], bytes[12], bytes[13]);
  if (stringTerminator === undefined) throw new Seg2Error(file, undefined, 'string terminator length', `is ${bytes[8]}; expected 1 or 2`);
  const pointers: number[] = [];
  for (let i = 0; i < traceCount; i++) pointers.push(u32(32 + 4 * i));
  let firstTrace = bytes.byteLength;
  for (const pointer of pointers) firstTrace = Math.min(firstTrace, pointer);
  const fileStringsEnd = Math.min(firstTrace, bytes.byteLength);
  const fileStrings = readStrings(bytes, u16, 32 + pointerBytes, fileStringsEnd, stringTerminator, lineTerminator, remarks, 'file descriptor');
  const units = (fileStrings.keywords.UNITS ?? 'METERS').toUpperCase();
  const metresPerUnit: number | undefined = UNITS_TO_METRES[units];
  if (metresPerUnit === undefined) remarks.push(`UNITS ${units} is not one of METERS, FEET, INCHES, CENTIMETERS or NONE; coordinates in the headers cannot be used`);

  const traces: Seg2Trace[] = pointers.map((pointer, i) => {
    const index = i + 1;
    if (pointer + 32 > bytes.byteLength) {
      throw new Seg2Error(file, index, 'trace pointer', `points at byte ${pointer}, past the end of the ${bytes.byteLength}-byte file; expected a trace descriptor there`);
    }
    if (u16(pointer) !== TRACE_BLOCK_ID) {
      throw new Seg2Error(file, index, 'block ID', `the trace descriptor at byte ${pointer} starts with ${hex(bytes[pointer])} ${hex(bytes[pointer + 1])}; expected the trace block ID 4422`);
    }
    const descriptorBytes = u16(pointer + 2);
    const dataBytes = u32(pointer + 4);
    const sampleCount = u32(pointer + 8);
    const formatCode = bytes[pointer + 12];
    if (descriptorBytes < 32) throw new Seg2Error(file, index, 'descriptor block size', `is ${descriptorBytes} bytes; expected at least 32`);
    const dataStart = pointer + descriptorBytes;
    if (dataStart > bytes.byteLength) {
      throw new Seg2Error(file, index, 'descriptor block size', `${descriptorBytes} bytes from byte ${pointer} runs past the end of the ${bytes.byteLength}-byte file; the file is truncated`);
    }
    const perSample = BYTES_PER_SAMPLE[formatCode];
    if (perSample === undefined) throw new Seg2Error(file, index, 'data format code', `is ${formatCode}; expected 1 to 5`);
    if (formatCode === 3 && sampleCount % 4 !== 0) {
      throw new Seg2Error(file, index, 'number of samples', `is ${sampleCount}, not a multiple of 4; the 20-bit format (code 3) packs samples in groups of four`);
    }
    if (sampleCount * perSample !== dataBytes) {
      throw new Seg2Error(file, index, 'data block size', `is ${dataBytes} bytes but ${sampleCount} samples of format code ${formatCode} take ${sampleCount * perSample}; expected the two to agree`);
    }
    if (dataStart + dataBytes > bytes.byteLength) {
      throw new Seg2Error(file, index, 'data block', `needs bytes ${dataStart} to ${dataStart + dataBytes} but the file ends at ${bytes.byteLength}; the file is truncated`);
    }
    const strings = readStrings(bytes, u16, pointer + 32, dataStart, stringTerminator, lineTerminator, remarks, `trace ${index}`);
    const keywords = strings.keywords;
    const sampleInterval = decimalKeyword(file, index, keywords, 'SAMPLE_INTERVAL', 'the sample interval in seconds');
    if (sampleInterval === undefined) throw new Seg2Error(file, index, 'SAMPLE_INTERVAL', 'is missing; expected the sample interval in seconds');
    if (!(sampleInterval > 0) || sampleInterval > MAX_SAMPLE_INTERVAL_S) {
      throw new Seg2Error(file, index, 'SAMPLE_INTERVAL', `${keywords.SAMPLE_INTERVAL} is not a sample interval in seconds (above 0, at most ${MAX_SAMPLE_INTERVAL_S} s)${sampleInterval > MAX_SAMPLE_INTERVAL_S ? '; it looks like milliseconds or microseconds, but SEG-2 gives seconds' : ''}`);
    }
    const delay = decimalKeyword(file, index, keywords, 'DELAY', 'the time of the first sample in seconds') ?? 0;
    const recordLength = sampleCount * sampleInterval;
    if (Math.abs(delay) > Math.max(recordLength, MAX_DELAY_S)) {
      throw new Seg2Error(file, index, 'DELAY', `${keywords.DELAY} s puts the first sample ${delay < 0 ? 'before' : 'after'} the shot by more than ${MAX_DELAY_S} s and more than the record's length (${Number(recordLength.toPrecision(6))} s); expected the time of the first sample in seconds (a value in milliseconds does not follow SEG-2)`);
    }
    const raw = decode(view, dataStart, sampleCount, formatCode, little);
    const descalingFactor = decimalKeyword(file, index, keywords, 'DESCALING_FACTOR', 'a non-zero scale factor') ?? 1;
    if (descalingFactor === 0) throw new Seg2Error(file, index, 'DESCALING_FACTOR', 'is 0; expected a non-zero scale factor');
    const data = new Float32Array(sampleCount);
    for (let k = 0; k < sampleCount; k++) data[k] = raw[k] * descalingFactor;
    const location = (name: string) => {
      const value = keywords[name];
      if (value === undefined) return undefined;
      if (metresPerUnit === undefined) {
        throw new Seg2Error(file, index, 'UNITS', `${units} is not one of METERS, FEET, INCHES, CENTIMETERS or NONE, and ${name} needs it; expected one of those in the file descriptor`);
      }
      const parts = value.split(/\s+/).filter(Boolean);
      const numbers = parts.map(parseDecimal);
      if (numbers.length === 0 || numbers.length > 3 || numbers.some((n) => n === undefined)) {
        const bad = parts.find((p) => parseDecimal(p) === undefined);
        throw new Seg2Error(file, index, name, `"${value}" is not one to three numbers (x [y [z]])${bad === undefined ? '' : notANumberHint(bad)}; expected plain decimal numbers in ${units}`);
      }
      const metres = (numbers as number[]).map((n) => n * metresPerUnit!);
      if (metres.some((m) => Math.abs(m) > MAX_COORDINATE_M)) {
        throw new Seg2Error(file, index, name, `"${value}" is beyond ${MAX_COORDINATE_M} m; expected a position along the line (distance from its start)`);
      }
      return metres;
    };
    const integer = (name: string) => integerKeyword(file, index, keywords, name);
    const stackText = keywords.STACK === undefined ? undefined : keywords.STACK.split(/\s+/)[0];
    const stack = stackText === undefined ? undefined : parseInteger(stackText);
    if (stackText !== undefined && stack === undefined) remarks.push(`trace ${index}: STACK "${keywords.STACK}" is not a whole number; not kept`);
    return {
      index,
      keywords,
      notes: strings.notes,
      formatCode,
      raw,
      descalingFactor,
      data,
      sampleInterval,
      delay,
      stack,
      dead: (keywords.TRACE_TYPE ?? '').toUpperCase() === 'DEAD',
      sourceLocation: location('SOURCE_LOCATION'),
      receiverLocation: location('RECEIVER_LOCATION'),
      sourceStation: integer('SOURCE_STATION_NUMBER'),
      receiverStation: integer('RECEIVER_STATION_NUMBER'),
      channel: integer('CHANNEL_NUMBER'),
    };
  });
  return { file, byteOrder: little ? 'little' : 'big', revision, keywords: fileStrings.keywords, notes: fileStrings.notes, units, metresPerUnit: metresPerUnit ?? 1, traces, remarks };
}

function hex(byte: number | undefined): string {
  return byte === undefined ? '--' : byte.toString(16).toUpperCase().padStart(2, '0');
}

/** A terminator of the declared length (1 or 2 bytes); undefined for any other length. */
function terminator(length: number, first: number, second: number): number[] | undefined {
  if (length === 1) return [first];
  if (length === 2) return [first, second];
  return undefined;
}

/** Largest SAMPLE_INTERVAL, in seconds, of any seismic record (1 s is 1 Hz sampling). */
const MAX_SAMPLE_INTERVAL_S = 1;
/** Largest DELAY magnitude, in seconds, accepted in a record shorter than it (refraction records last under a second or two). */
const MAX_DELAY_S = 1;
/** Largest coordinate, in metres: 10 000 km, beyond any projected survey coordinate. */
const MAX_COORDINATE_M = 1e7;

/**
 * A keyword holding a number, parsed strictly (first blank-separated token; plain decimals only,
 * no hexadecimal, NaN or decimal comma): undefined when absent, an error naming file, trace and
 * keyword when present and not a number, since such a value would change the numbers.
 */
function decimalKeyword(file: string, trace: number, keywords: Record<string, string>, name: string, expected: string): number | undefined {
  const value = keywords[name];
  if (value === undefined) return undefined;
  const first = value.split(/\s+/).filter(Boolean)[0] ?? '';
  const number = parseDecimal(first);
  if (number === undefined) throw new Seg2Error(file, trace, name, `"${value}" is not a number${notANumberHint(first)}; expected ${expected}`);
  return number;
}

/** A keyword holding a whole number (channel and station numbers), parsed strictly. */
function integerKeyword(file: string, trace: number, keywords: Record<string, string>, name: string): number | undefined {
  const value = keywords[name];
  if (value === undefined) return undefined;
  const first = value.split(/\s+/).filter(Boolean)[0] ?? '';
  const number = parseInteger(first);
  if (number === undefined) throw new Seg2Error(file, trace, name, `"${value}" is not a whole number${notANumberHint(first)}; expected a whole number`);
  return number;
}

/**
 * The string list of a descriptor block: entries of a two-byte length (counting itself), text,
 * and the string terminator; a zero length ends the list. An entry with no terminator inside its
 * length is taken whole (real files do this); a length running past the area ends the list.
 */
function readStrings(
  bytes: Uint8Array, u16: (at: number) => number, start: number, end: number,
  stringTerminator: number[], lineTerminator: number[] | undefined, remarks: string[], where: string,
): { keywords: Record<string, string>; notes: string[] } {
  const keywords: Record<string, string> = {};
  const notes: string[] = [];
  let at = start;
  while (at + 2 <= end) {
    const length = u16(at);
    if (length === 0) break;
    if (length < 2 || at + length > end) {
      remarks.push(`${where}: a string entry at byte ${at} declares ${length} bytes, past its block; the rest of the list was skipped`);
      break;
    }
    let stop = at + length;
    for (let k = at + 2; k + stringTerminator.length <= at + length; k++) {
      if (stringTerminator.every((b, j) => bytes[k + j] === b)) { stop = k; break; }
    }
    const text = printable(bytes.subarray(at + 2, stop), lineTerminator);
    at += length;
    const match = /^\s*([A-Za-z0-9_]+)\s*(.*)$/s.exec(text);
    if (match === null) continue;
    const keyword = match[1].toUpperCase();
    const value = match[2];
    if (keyword === 'NOTE') {
      const lines = lineTerminator === undefined ? [value] : value.split(lineTerminator.map((b) => String.fromCharCode(b)).join('')).flatMap((l) => l.split('\n'));
      for (const line of lines) if (line.trim() !== '') notes.push(line.trim());
      keywords.NOTE = notes.join('\n');
    } else {
      keywords[keyword] = value.trim();
    }
  }
  return { keywords, notes };
}

/** Text of an entry: printable ASCII kept, line terminators kept, anything else dropped. */
function printable(slice: Uint8Array, lineTerminator: number[] | undefined): string {
  let text = '';
  for (const b of slice) {
    if ((b >= 0x20 && b < 0x7f) || (lineTerminator !== undefined && lineTerminator.includes(b)) || b === 0x0a) text += String.fromCharCode(b);
  }
  return text;
}

function decode(view: DataView, start: number, count: number, code: number, little: boolean): Float64Array {
  const out = new Float64Array(count);
  switch (code) {
    case 1:
      for (let k = 0; k < count; k++) out[k] = view.getInt16(start + 2 * k, little);
      break;
    case 2:
      for (let k = 0; k < count; k++) out[k] = view.getInt32(start + 4 * k, little);
      break;
    case 3:
      // Groups of 10 bytes: five 16-bit words; W0 holds four 4-bit exponents (sample 1 in the
      // lowest bits), W1..W4 the mantissas, 15-bit magnitude in one's complement with a sign bit.
      for (let g = 0; g < count / 4; g++) {
        const base = start + 10 * g;
        const exponents = view.getUint16(base, little);
        for (let j = 0; j < 4; j++) {
          const word = view.getUint16(base + 2 + 2 * j, little);
          const mantissa = word & 0x8000 ? -(~word & 0x7fff) : word;
          out[4 * g + j] = mantissa * 2 ** ((exponents >> (4 * j)) & 0xf);
        }
      }
      break;
    case 4:
      for (let k = 0; k < count; k++) out[k] = view.getFloat32(start + 4 * k, little);
      break;
    case 5:
      for (let k = 0; k < count; k++) out[k] = view.getFloat64(start + 8 * k, little);
      break;
  }
  return out;
}
