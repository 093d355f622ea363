import { InputError } from '../../src/core/errors.js';
import type { LengthUnit } from '../../src/core/units.js';
import type { InputKind, ProjectInput } from '../../src/io/projectFile.js';

export type Classified = { kind: InputKind; input: ProjectInput } | { kind: 'project'; text: string; name: string };

/**
 * What a file is, from its contents: a SEG-2 record (the file block ID 3A55 in either byte
 * order), a hammerline project (JSON naming its schema), a first-break table (a header with
 * source_x and receiver_x) or a station table (a header with x and elev).
 *
 * @throws InputError naming the file when it is none of these
 */
export function classify(name: string, bytes: Uint8Array, lengthUnit: LengthUnit): Classified {
  if (bytes.length >= 2 && ((bytes[0] === 0x55 && bytes[1] === 0x3a) || (bytes[0] === 0x3a && bytes[1] === 0x55))) {
    return { kind: 'seg2', input: { name, kind: 'seg2', bytes, lengthUnit: 'm' } };
  }
  const text = new TextDecoder().decode(bytes.subarray(0, 65536)).replace(/^\uFEFF/, '');
  if (/^\s*\{/.test(text)) {
    if (/"schema"\s*:\s*"hammerline\/project@/.test(text)) return { kind: 'project', text: new TextDecoder().decode(bytes), name };
    throw new InputError({ file: name }, 'is JSON but not a hammerline project (no "schema": "hammerline/project@1"); expected SEG-2 records, a first-break table, a station table or a project file');
  }
  const header = text.split(/\r?\n/).find((line) => line.trim() !== '' && !line.startsWith('#'));
  const columns = (header ?? '').split(',').map((c) => c.trim().replace(/^"|"$/g, '').toLowerCase());
  if (columns.includes('source_x') && columns.includes('receiver_x')) return { kind: 'first-breaks', input: { name, kind: 'first-breaks', bytes, lengthUnit } };
  if (columns.includes('x') && columns.includes('elev')) return { kind: 'stations', input: { name, kind: 'stations', bytes, lengthUnit } };
  throw new InputError({ file: name }, `is not a SEG-2 record (it does not start with the block ID bytes 55 3A or 3A 55), nor a first-break table (a header with source_x, receiver_x and time_ms), nor a station table (a header with x and elev)${header ? `; its first line is "${header.slice(0, 60)}"` : '; it is empty'}`);
}
