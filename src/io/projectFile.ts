import { InputError } from '../core/errors.js';
import type { Wave } from '../core/types.js';
import type { LengthUnit } from '../core/units.js';
import { VERSION } from '../interpret.js';

/** Version tag of the project document; change it when a field changes meaning. */
export const PROJECT_SCHEMA = 'hammerline/project@1';

/** What an input file is: a SEG-2 shot record, a first-break table or a station table. */
export type InputKind = 'seg2' | 'first-breaks' | 'stations';

/** One file the user gave, kept whole so the project can be interpreted again from scratch. */
export interface ProjectInput {
  /** File name as the user gave it (no folders), used in every message. */
  name: string;
  kind: InputKind;
  /** The file's bytes, unchanged. */
  bytes: Uint8Array;
  /** Unit of the lengths in a table (first-break or station table); metres for records. */
  lengthUnit: LengthUnit;
}

/**
 * One pick set by hand: on a trace of a record (file and 1-based trace) or on a row of a
 * first-break table (file and 1-based file row, header = row 1). Time in seconds after the shot;
 * null when the pick was cleared (the trace or row is then left out).
 */
export interface PickEdit {
  file: string;
  trace?: number;
  row?: number;
  time: number | null;
}

/** The user's choices of the interpretation (see InterpretOptions). */
export interface ProjectChoices {
  /** Wave type of the line when the files do not say it. */
  wave?: Wave;
  /** Segment count by branch name ("S1:forward"). */
  segments: Record<string, number>;
  /** Offsets, in metres, at which a new segment starts, by branch name. */
  breakpoints: Record<string, number[]>;
  /** Direct-wave segments forced through the origin. */
  directThroughOrigin: boolean;
  /** Poisson's ratio from which a P line's Vs is estimated for the site class. */
  poisson?: number;
}

/**
 * A field-app session: the files of one line (the SEG-2 records with an optional station table,
 * or one first-break table), the picks set by hand and the interpretation choices, and the unit
 * lengths are shown in.
 */
export interface Project {
  units: LengthUnit;
  inputs: ProjectInput[];
  picks: PickEdit[];
  choices: ProjectChoices;
}

/** An empty project in metres. */
export function emptyProject(): Project {
  return { units: 'm', inputs: [], picks: [], choices: { segments: {}, breakpoints: {}, directThroughOrigin: false } };
}

const BASE64 = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';

const BASE64_VALUE = new Int16Array(128).fill(-1);
for (let i = 0; i < BASE64.length; i++) BASE64_VALUE[BASE64.charCodeAt(i)] = i;

/** Bytes as base64 (RFC 4648 §4, with padding). */
export function toBase64(bytes: Uint8Array): string {
  const chunks: string[] = [];
  let chunk = '';
  for (let i = 0; i < bytes.length; i += 3) {
    const rest = bytes.length - i;
    const triple = (bytes[i] << 16) | ((rest > 1 ? bytes[i + 1] : 0) << 8) | (rest > 2 ? bytes[i + 2] : 0);
    chunk += BASE64[(triple >> 18) & 63] + BASE64[(triple >> 12) & 63] + (rest > 1 ? BASE64[(triple >> 6) & 63] : '=') + (rest > 2 ? BASE64[triple & 63] : '=');
    if (chunk.length >= 4096) { chunks.push(chunk); chunk = ''; }
  }
  chunks.push(chunk);
  return chunks.join('');
}

/** Base64 (RFC 4648 §4) back to bytes; undefined when the text is not base64. */
export function fromBase64(text: string): Uint8Array | undefined {
  if (text.length % 4 !== 0 || !/^[A-Za-z0-9+/]*={0,2}$/.test(text)) return undefined;
  const padding = text.endsWith('==') ? 2 : text.endsWith('=') ? 1 : 0;
  const bytes = new Uint8Array((text.length / 4) * 3 - padding);
  const value = (at: number) => (at < text.length - padding ? BASE64_VALUE[text.charCodeAt(at)] : 0);
  let out = 0;
  for (let i = 0; i < text.length; i += 4) {
    const triple = (value(i) << 18) | (value(i + 1) << 12) | (value(i + 2) << 6) | value(i + 3);
    if (out < bytes.length) bytes[out++] = (triple >> 16) & 255;
    if (out < bytes.length) bytes[out++] = (triple >> 8) & 255;
    if (out < bytes.length) bytes[out++] = triple & 255;
  }
  return bytes;
}

/**
 * The project document (schema hammerline/project@1) as JSON text. Records are stored as base64,
 * tables as UTF-8 text; pick times in milliseconds, breakpoints in metres.
 */
export function projectFileJson(project: Project): string {
  const decoder = new TextDecoder();
  const document = {
    schema: PROJECT_SCHEMA,
    program: { name: 'hammerline', version: VERSION },
    units: project.units,
    inputs: project.inputs.map((input) => ({
      name: input.name,
      kind: input.kind,
      length_unit: input.lengthUnit,
      ...(input.kind === 'seg2' ? { encoding: 'base64', data: toBase64(input.bytes) } : { encoding: 'utf-8', data: decoder.decode(input.bytes) }),
    })),
    picks: project.picks.map((p) => ({ file: p.file, ...(p.trace !== undefined ? { trace: p.trace } : { row: p.row }), time_ms: p.time === null ? null : Number((p.time * 1e3).toFixed(6)) })),
    choices: {
      wave: project.choices.wave ?? null,
      segments: project.choices.segments,
      breakpoints_m: project.choices.breakpoints,
      through_origin: project.choices.directThroughOrigin,
      poisson: project.choices.poisson ?? null,
    },
  };
  return JSON.stringify(document, null, 1) + '\n';
}

type Json = unknown;

/**
 * Reads and validates a project document (schema hammerline/project@1).
 *
 * @param text - the file's text
 * @param file - file name, used in every message
 * @throws InputError naming the file and the field that is wrong ("inputs[2].kind"), what was
 *   found and what was expected
 */
export function readProjectFile(text: string, file: string): Project {
  let document: Json;
  try {
    document = JSON.parse(text.replace(/^\uFEFF/, ''));
  } catch (error) {
    throw new InputError({ file }, `is not JSON (${(error as Error).message}); expected a hammerline project file (schema ${PROJECT_SCHEMA})`);
  }
  const fail = (field: string, message: string): never => { throw new InputError({ file }, `field ${field}: ${message}`); };
  const describe = (value: Json) => (value === undefined ? 'missing' : `${JSON.stringify(value)?.slice(0, 60)}`);
  const object = (value: Json, field: string): Record<string, Json> => {
    if (typeof value !== 'object' || value === null || Array.isArray(value)) fail(field, `is ${describe(value)}; expected an object`);
    return value as Record<string, Json>;
  };
  const array = (value: Json, field: string): Json[] => {
    if (!Array.isArray(value)) fail(field, `is ${describe(value)}; expected a list`);
    return value as Json[];
  };
  const string = (value: Json, field: string): string => {
    if (typeof value !== 'string' || value === '') fail(field, `is ${describe(value)}; expected a text`);
    return value as string;
  };
  const oneOf = <T extends string>(value: Json, field: string, allowed: readonly T[]): T => {
    if (!allowed.includes(value as T)) fail(field, `is ${describe(value)}; expected one of ${allowed.map((a) => JSON.stringify(a)).join(', ')}`);
    return value as T;
  };
  const number = (value: Json, field: string, expected: string, ok: (v: number) => boolean): number => {
    if (typeof value !== 'number' || !Number.isFinite(value) || !ok(value)) fail(field, `is ${describe(value)}; expected ${expected}`);
    return value as number;
  };

  const root = object(document, 'the document');
  if (root.schema !== PROJECT_SCHEMA) {
    fail('schema', `is ${describe(root.schema)}; expected "${PROJECT_SCHEMA}"${typeof root.schema === 'string' && root.schema.startsWith('hammerline/project@') ? ' (a project written by another version of hammerline)' : ''}`);
  }
  const units = oneOf(root.units, 'units', ['m', 'ft'] as const);
  const encoder = new TextEncoder();
  const names = new Set<string>();
  const inputs: ProjectInput[] = array(root.inputs, 'inputs').map((raw, i) => {
    const field = `inputs[${i}]`;
    const input = object(raw, field);
    const name = string(input.name, `${field}.name`);
    if (names.has(name)) fail(`${field}.name`, `"${name}" is given twice; expected each file once`);
    names.add(name);
    const kind = oneOf(input.kind, `${field}.kind`, ['seg2', 'first-breaks', 'stations'] as const);
    const lengthUnit = oneOf(input.length_unit, `${field}.length_unit`, ['m', 'ft'] as const);
    const encoding = oneOf(input.encoding, `${field}.encoding`, kind === 'seg2' ? ['base64'] as const : ['utf-8'] as const);
    if (typeof input.data !== 'string') fail(`${field}.data`, `is ${describe(input.data)}; expected the file's contents as ${encoding} text`);
    const bytes = encoding === 'base64' ? fromBase64(input.data as string) : encoder.encode(input.data as string);
    if (bytes === undefined) fail(`${field}.data`, 'is not base64 text; expected the SEG-2 record encoded as base64 (RFC 4648)');
    return { name, kind, lengthUnit, bytes: bytes! };
  });
  const kinds = inputs.map((input) => input.kind);
  if (kinds.includes('first-breaks') && (kinds.includes('seg2') || kinds.filter((k) => k === 'first-breaks').length > 1)) {
    fail('inputs', 'holds more than one line; expected the SEG-2 records of one line (and a station table) or one first-break table');
  }
  if (kinds.filter((k) => k === 'stations').length > 1) fail('inputs', 'holds more than one station table; expected at most one');
  const picks: PickEdit[] = array(root.picks, 'picks').map((raw, i) => {
    const field = `picks[${i}]`;
    const pick = object(raw, field);
    const name = string(pick.file, `${field}.file`);
    const input = inputs.find((f) => f.name === name);
    if (input === undefined || input.kind === 'stations') fail(`${field}.file`, `is "${name}"; expected the name of one of the project's records or first-break tables`);
    const time = pick.time_ms === null ? null : number(pick.time_ms, `${field}.time_ms`, 'a time in ms, 0 or more, or null for a cleared pick', (v) => v >= 0) / 1e3;
    if (input!.kind === 'seg2') return { file: name, trace: number(pick.trace, `${field}.trace`, 'a trace number, 1 or more', (v) => Number.isInteger(v) && v >= 1), time };
    return { file: name, row: number(pick.row, `${field}.row`, 'a file row, 2 or more (the header is row 1)', (v) => Number.isInteger(v) && v >= 2), time };
  });
  const choices = object(root.choices, 'choices');
  const wave = choices.wave === null || choices.wave === undefined ? undefined : oneOf(choices.wave, 'choices.wave', ['P', 'S'] as const);
  const segments: Record<string, number> = {};
  for (const [branch, count] of Object.entries(object(choices.segments, 'choices.segments'))) {
    segments[branch] = number(count, `choices.segments["${branch}"]`, 'a segment count from 1 to 4', (v) => Number.isInteger(v) && v >= 1 && v <= 4);
  }
  const breakpoints: Record<string, number[]> = {};
  for (const [branch, list] of Object.entries(object(choices.breakpoints_m, 'choices.breakpoints_m'))) {
    breakpoints[branch] = array(list, `choices.breakpoints_m["${branch}"]`).map((v, k) => number(v, `choices.breakpoints_m["${branch}"][${k}]`, 'an offset in metres, above 0', (x) => x > 0));
  }
  if (typeof choices.through_origin !== 'boolean') fail('choices.through_origin', `is ${describe(choices.through_origin)}; expected true or false`);
  const poisson = choices.poisson === null || choices.poisson === undefined ? undefined : number(choices.poisson, 'choices.poisson', "a Poisson's ratio from 0 to below 0.5", (v) => v >= 0 && v < 0.5);
  return { units, inputs, picks, choices: { wave, segments, breakpoints, directThroughOrigin: choices.through_origin as boolean, poisson } };
}
