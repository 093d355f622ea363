import { InputError } from '../core/errors.js';

/** A position in WGS 84 (EPSG:4326), in decimal degrees. */
export interface LonLat {
  lon: number;
  lat: number;
}

/**
 * The job a line belongs to, as shown at the top of the report. Every field is optional: what a
 * reviewer expects and is missing is listed by missingJobDetails.
 */
export interface JobDetails {
  client?: string;
  /** The firm's project or job number. */
  project?: string;
  site?: string;
  /** Line name or number. */
  line?: string;
  /** Date of the survey, YYYY-MM-DD. */
  date?: string;
  operator?: string;
  /** Seismograph and geophones. */
  equipment?: string;
  /** For example "sledgehammer on a steel plate, 8 blows stacked". */
  sourceType?: string;
  /** Nominal geophone spacing of the layout, in metres (checked against the data). */
  geophoneSpacing?: number;
  /** WGS 84 position of the first geophone (smallest x) and of the last. */
  lineStart?: LonLat;
  lineEnd?: LonLat;
  /** Datum of the ground elevations, for example "site datum, benchmark BM1 = 100.00 m". */
  elevationDatum?: string;
}

interface FieldSpec {
  /** Name in a sidecar file. */
  key: string;
  /** Command-line option. */
  flag: string;
  property: keyof JobDetails;
  label: string;
  kind: 'text' | 'date' | 'length' | 'position';
  /** A reviewer expects it in the report. */
  expected: boolean;
}

/** The fields of the job details, in the order the report shows them. */
export const JOB_FIELDS: FieldSpec[] = [
  { key: 'client', flag: 'client', property: 'client', label: 'Client', kind: 'text', expected: true },
  { key: 'project', flag: 'project', property: 'project', label: 'Project number', kind: 'text', expected: false },
  { key: 'site', flag: 'site', property: 'site', label: 'Site', kind: 'text', expected: true },
  { key: 'line', flag: 'line', property: 'line', label: 'Line', kind: 'text', expected: true },
  { key: 'date', flag: 'date', property: 'date', label: 'Date of survey', kind: 'date', expected: true },
  { key: 'operator', flag: 'operator', property: 'operator', label: 'Field operator', kind: 'text', expected: true },
  { key: 'equipment', flag: 'equipment', property: 'equipment', label: 'Equipment', kind: 'text', expected: true },
  { key: 'source_type', flag: 'source-type', property: 'sourceType', label: 'Seismic source', kind: 'text', expected: true },
  { key: 'geophone_spacing_m', flag: 'geophone-spacing', property: 'geophoneSpacing', label: 'Geophone spacing (nominal)', kind: 'length', expected: false },
  { key: 'line_start', flag: 'line-start', property: 'lineStart', label: 'First geophone (WGS 84)', kind: 'position', expected: true },
  { key: 'line_end', flag: 'line-end', property: 'lineEnd', label: 'Last geophone (WGS 84)', kind: 'position', expected: true },
  { key: 'elevation_datum', flag: 'elevation-datum', property: 'elevationDatum', label: 'Elevation datum', kind: 'text', expected: false },
];

/** Options of the job details on the command line. */
export const JOB_OPTIONS = Object.fromEntries(JOB_FIELDS.map((f) => [f.flag, { type: 'string' as const }])) as Record<string, { type: 'string' }>;

const MAX_TEXT = 300;

function parseValue(field: FieldSpec, raw: unknown, where: string): JobDetails[keyof JobDetails] {
  const fail = (expected: string): never => {
    throw new InputError({}, `${where}: field "${field.key}" is ${JSON.stringify(raw)}; expected ${expected}`);
  };
  if (field.kind === 'position') {
    let parts: unknown[];
    if (Array.isArray(raw)) parts = raw;
    else if (typeof raw === 'string') parts = raw.split(',').map((p) => (p.trim() === '' ? NaN : Number(p)));
    else return fail('LONGITUDE,LATITUDE in decimal degrees (WGS 84), for example 7.4312,46.9487');
    if (parts.length !== 2 || !parts.every((p) => typeof p === 'number' && Number.isFinite(p))) return fail('LONGITUDE,LATITUDE in decimal degrees (WGS 84), longitude first, for example 7.4312,46.9487');
    const [lon, lat] = parts as number[];
    if (lon < -180 || lon > 180) return fail(`a longitude from -180 to 180 degrees first (got ${lon})`);
    if (lat < -90 || lat > 90) return fail(`a latitude from -90 to 90 degrees second (got ${lat}); longitude comes first`);
    return { lon, lat };
  }
  if (field.kind === 'length') {
    const value = typeof raw === 'number' ? raw : typeof raw === 'string' && raw.trim() !== '' ? Number(raw) : NaN;
    if (!(Number.isFinite(value) && value > 0)) return fail('a spacing in metres above 0');
    return value;
  }
  if (typeof raw !== 'string') return fail('text');
  const text = raw.trim();
  if (text === '') return fail('some text (leave the field out when it is not known)');
  // Control characters would reach the report and the CSV; line breaks belong in separate fields.
  if (/[\u0000-\u001f\u007f]/.test(text)) return fail('one line of text without control characters');
  if (text.length > MAX_TEXT) return fail(`at most ${MAX_TEXT} characters (got ${text.length})`);
  if (field.kind === 'date') {
    const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
    const date = match ? new Date(Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3]))) : undefined;
    if (!match || !date || date.getUTCMonth() !== Number(match[2]) - 1 || date.getUTCDate() !== Number(match[3])) return fail('a date written YYYY-MM-DD, for example 2026-05-14');
  }
  return text;
}

function fieldByKey(name: string): FieldSpec | undefined {
  const key = name.trim().toLowerCase().replace(/[\s-]+/g, '_');
  return JOB_FIELDS.find((f) => f.key === key || f.key === `${key}_m` && f.kind === 'length');
}

function unknownField(where: string, name: string): InputError {
  return new InputError({}, `${where}: unknown field "${name}"; expected one of ${JOB_FIELDS.map((f) => f.key).join(', ')}`);
}

/**
 * Reads a job-details sidecar file: a JSON object, or lines of `key: value` (blank lines and lines
 * starting with # ignored), with the keys of JOB_FIELDS (case and spaces ignored: "Source type"
 * is source_type). Positions are LONGITUDE,LATITUDE in decimal degrees (WGS 84); in JSON also
 * [longitude, latitude].
 *
 * @throws InputError naming the file, the line and the field, for an unknown or repeated field or
 *   a value that is not what the field takes
 */
export function readJobDetails(text: string, file: string): JobDetails {
  const job: JobDetails = {};
  const set = (field: FieldSpec, raw: unknown, where: string) => {
    if (job[field.property] !== undefined) throw new InputError({}, `${where}: field "${field.key}" is given twice`);
    (job as Record<string, unknown>)[field.property] = parseValue(field, raw, where);
  };
  const trimmed = text.replace(/^\uFEFF/, '').trim();
  if (trimmed.startsWith('{')) {
    let parsed: unknown;
    try {
      parsed = JSON.parse(trimmed);
    } catch (error) {
      throw new InputError({ file }, `is not valid JSON (${(error as Error).message}); expected an object of job details, or lines of "key: value"`);
    }
    if (parsed === null || typeof parsed !== 'object' || Array.isArray(parsed)) throw new InputError({ file }, 'expected a JSON object of job details');
    for (const [name, raw] of Object.entries(parsed as Record<string, unknown>)) {
      if (name === 'schema') {
        if (raw !== JOB_SCHEMA) throw new InputError({}, `${file}: field "schema" is ${JSON.stringify(raw)}; expected "${JOB_SCHEMA}" or no schema field`);
        continue;
      }
      const field = fieldByKey(name);
      if (field === undefined) throw unknownField(file, name);
      if (raw === null) continue;
      set(field, raw, file);
    }
    return job;
  }
  text.replace(/^\uFEFF/, '').split(/\r?\n/).forEach((line, i) => {
    const where = `${file}, line ${i + 1}`;
    if (line.trim() === '' || line.trim().startsWith('#')) return;
    const colon = line.indexOf(':');
    if (colon <= 0) throw new InputError({}, `${where}: "${line.trim()}" is not "key: value"; expected for example "client: Example Holdings"`);
    const name = line.slice(0, colon);
    const field = fieldByKey(name);
    if (field === undefined) throw unknownField(where, name.trim());
    set(field, line.slice(colon + 1).trim(), where);
  });
  return job;
}

/** Schema name a JSON sidecar may carry. */
export const JOB_SCHEMA = 'hammerline/job@1';

/**
 * The job details given as command-line options (values as typed; a spacing in `lengthToMetres`'s
 * unit), over those of a sidecar file: an option replaces the file's field.
 */
export function jobFromOptions(values: Record<string, unknown>, base: JobDetails = {}, lengthToMetres: (v: number) => number = (v) => v): JobDetails {
  const job: JobDetails = { ...base };
  for (const field of JOB_FIELDS) {
    const raw = values[field.flag];
    if (raw === undefined) continue;
    const value = parseValue(field, raw, `--${field.flag}`);
    (job as Record<string, unknown>)[field.property] = field.kind === 'length' ? lengthToMetres(value as number) : value;
  }
  return job;
}

/** Labels of the fields a reviewer expects that were not given, in report order. */
export function missingJobDetails(job: JobDetails): string[] {
  return JOB_FIELDS.filter((f) => f.expected && job[f.property] === undefined).map((f) => f.label.replace(/ \(WGS 84\)$/, ' coordinates'));
}
