import Papa from 'papaparse';
import { InputError, InputErrors } from '../core/errors.js';
import { linearAt } from '../core/interpolate.js';
import type { FirstBreak, FirstBreakTable, Wave } from '../core/types.js';
import { toMetres, type LengthUnit } from '../core/units.js';
import type { WarningLog } from '../core/warnings.js';

/** Options for reading a first-break table. */
export interface ReadFirstBreaksOptions {
  /** Unit of every length column (positions and elevations); defaults to metres. */
  lengthUnit?: LengthUnit;
  /** Wave type for the whole file, overriding or filling a `wave` column. */
  wave?: Wave;
}

const KNOWN_COLUMNS = new Set([
  'source_id', 'source_x', 'source_elev', 'receiver_x', 'receiver_elev', 'time_ms', 'time_s', 'wave',
]);
/** Columns written by `hammerline pick`: kept with each pick like unknown columns, but expected, so not warned about. */
const PICK_COLUMNS = new Set(['confidence', 'source_file', 'trace']);

/** Above this median apparent velocity, in m/s, times in a millisecond column look like seconds. */
const FASTEST_PLAUSIBLE_MPS = 20_000;
/** Below this median apparent velocity, in m/s, times in a seconds column look like milliseconds. */
const SLOWEST_PLAUSIBLE_MPS = 30;

/** Largest number of cell errors listed before the reader stops collecting more. */
const MAX_ERRORS = 25;

/**
 * Reads a first-break table (CSV, RFC 4180, header required; lines starting with `#` are comments)
 * into picks in SI units.
 *
 * Required columns: source_x, receiver_x and one of time_ms or time_s. Optional: source_id
 * (default: one id per distinct source_x), source_elev and receiver_elev (default: flat ground at
 * elevation 0), wave (P or S). Unknown columns are kept and reported.
 *
 * @param text - file contents
 * @param file - file name, used in every message
 * @param warnings - collects probable mistakes (seconds in a millisecond column, zero offsets,
 *   unknown columns)
 * @throws InputError naming the file, row and column for a missing column, an empty or
 *   non-numeric value, a negative time, a duplicate pick or an inconsistent source
 * @example
 * readFirstBreaks('source_x,receiver_x,time_ms\n0,5,4.2\n', 'line.csv', log).picks[0].time // 0.0042
 */
export function readFirstBreaks(
  text: string,
  file: string,
  warnings: WarningLog,
  options: ReadFirstBreaksOptions = {},
): FirstBreakTable {
  const lengthUnit = options.lengthUnit ?? 'm';
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { header: false, comments: '#', skipEmptyLines: false });
  const errors: InputError[] = [];
  for (const e of parsed.errors) {
    if (e.code === 'UndetectableDelimiter') continue;
    errors.push(new InputError({ file, row: e.row === undefined ? undefined : e.row + 1 }, `CSV: ${e.message}`));
  }

  // Papaparse drops comment lines from `data`; recover file row numbers by walking the raw lines.
  const rowNumbers = fileRowNumbers(text);
  const rows = parsed.data;
  let headerAt = rows.findIndex((r) => !isBlank(r));
  if (headerAt < 0) throw new InputError({ file }, 'the file is empty; expected a header row such as source_x,receiver_x,time_ms');
  const header = rows[headerAt].map((h) => h.trim().toLowerCase());
  const col = (name: string) => header.indexOf(name);

  const missing: string[] = [];
  if (col('source_x') < 0) missing.push('source_x');
  if (col('receiver_x') < 0) missing.push('receiver_x');
  const msCol = col('time_ms');
  const sCol = col('time_s');
  if (msCol < 0 && sCol < 0) missing.push('time_ms (or time_s)');
  if (missing.length > 0) {
    throw new InputError({ file, row: rowNumbers[headerAt] },
      `missing required column ${missing.join(', ')}; the header has ${header.join(',')}`);
  }
  if (msCol >= 0 && sCol >= 0) {
    throw new InputError({ file, row: rowNumbers[headerAt] }, 'both time_ms and time_s are present; expected exactly one time column');
  }
  const seen = new Map<string, number>();
  header.forEach((h, i) => {
    if (seen.has(h)) errors.push(new InputError({ file, row: rowNumbers[headerAt], column: h }, `column appears twice (columns ${seen.get(h)! + 1} and ${i + 1}); expected each column once`));
    seen.set(h, i);
  });

  const timeCol = msCol >= 0 ? msCol : sCol;
  const timeName = msCol >= 0 ? 'time_ms' : 'time_s';
  const timeScale = msCol >= 0 ? 1e-3 : 1;
  const extraColumns = header.filter((h) => !KNOWN_COLUMNS.has(h) && h !== '');
  const hasSourceElev = col('source_elev') >= 0;
  const hasReceiverElev = col('receiver_elev') >= 0;

  const picks: FirstBreak[] = [];
  const extraValues: Record<string, string>[] = [];
  const waves = new Set<Wave>();
  const rawSourceElev: (number | undefined)[] = [];

  for (let i = headerAt + 1; i < rows.length && errors.length < MAX_ERRORS; i++) {
    const cells = rows[i];
    if (isBlank(cells)) continue;
    const row = rowNumbers[i];
    const where = (column: string) => ({ file, row, column });
    if (cells.length !== header.length) {
      errors.push(new InputError({ file, row }, `has ${cells.length} fields; expected ${header.length} as in the header`));
      continue;
    }
    const number = (index: number, name: string, required: boolean): number | undefined => {
      const raw = (cells[index] ?? '').trim();
      if (raw === '') {
        if (required) errors.push(new InputError(where(name), 'is empty; expected a number'));
        return undefined;
      }
      const value = Number(raw);
      if (!Number.isFinite(value)) {
        errors.push(new InputError(where(name), `"${raw}" is not a number; expected a number${name.startsWith('time') ? ` in ${name === 'time_ms' ? 'milliseconds' : 'seconds'}` : ` in ${lengthUnit === 'ft' ? 'feet' : 'metres'}`}`));
        return undefined;
      }
      return value;
    };
    const sourceX = number(col('source_x'), 'source_x', true);
    const receiverX = number(col('receiver_x'), 'receiver_x', true);
    const time = number(timeCol, timeName, true);
    const sourceElev = hasSourceElev ? number(col('source_elev'), 'source_elev', false) : undefined;
    const receiverElev = hasReceiverElev ? number(col('receiver_elev'), 'receiver_elev', true) : undefined;
    if (time !== undefined && time < 0) {
      errors.push(new InputError(where(timeName), `negative time ${time}; expected a first-break time after the shot, zero or more`));
      continue;
    }
    if (col('wave') >= 0) {
      const raw = cells[col('wave')].trim().toUpperCase();
      if (raw === 'P' || raw === 'S') {
        waves.add(raw);
      } else if (raw !== '') {
        errors.push(new InputError(where('wave'), `"${cells[col('wave')]}" is not a wave type; expected P or S`));
      }
    }
    if (sourceX === undefined || receiverX === undefined || time === undefined) continue;
    if (hasReceiverElev && receiverElev === undefined) continue;
    const idRaw = col('source_id') >= 0 ? cells[col('source_id')].trim() : '';
    picks.push({
      sourceId: idRaw,
      sourceX: toMetres(sourceX, lengthUnit),
      sourceElev: 0,
      receiverX: toMetres(receiverX, lengthUnit),
      receiverElev: receiverElev === undefined ? 0 : toMetres(receiverElev, lengthUnit),
      time: time * timeScale,
      row,
    });
    rawSourceElev.push(sourceElev === undefined ? undefined : toMetres(sourceElev, lengthUnit));
    const extra: Record<string, string> = {};
    for (const name of extraColumns) extra[name] = cells[header.indexOf(name)];
    extraValues.push(extra);
  }
  if (errors.length >= MAX_ERRORS) {
    errors.push(new InputError({ file }, `stopped after ${MAX_ERRORS} errors; fix these and read the file again`));
  }
  if (errors.length > 0) throw errors.length === 1 ? errors[0] : new InputErrors(errors);
  if (picks.length === 0) throw new InputError({ file }, 'has a header but no picks; expected one row per first break');

  if (waves.size > 1 && options.wave === undefined) {
    throw new InputError({ file, column: 'wave' }, 'mixes P and S picks; expected one wave type per file (split the file, one line per wave)');
  }
  const wave = options.wave ?? [...waves][0];

  assignSourceIds(picks, file);
  fillSourceElevations(picks, rawSourceElev, file, hasSourceElev, hasReceiverElev, warnings);
  checkDuplicates(picks, file);

  const unknown = extraColumns.filter((c) => !PICK_COLUMNS.has(c));
  if (unknown.length > 0) {
    const extraColumns = unknown;
    warnings.add('unknown-columns', `column${extraColumns.length > 1 ? 's' : ''} ${extraColumns.join(', ')} ${extraColumns.length > 1 ? 'are' : 'is'} not used by the interpretation; kept with each pick and carried to exports`, { where: { file } });
  }
  const zeroOffset = picks.filter((p) => p.receiverX === p.sourceX);
  if (zeroOffset.length > 0) {
    warnings.add('zero-offset', `${zeroOffset.length} pick${zeroOffset.length > 1 ? 's' : ''} at zero offset (rows ${zeroOffset.slice(0, 8).map((p) => p.row).join(', ')}${zeroOffset.length > 8 ? ', ...' : ''}); a geophone at the source is kept but carries no slope information`, { where: { file } });
  }
  checkTimeUnit(picks, file, timeName, warnings);

  return {
    file,
    picks,
    wave,
    lengthUnit,
    extraColumns,
    extraValues,
    hasElevations: hasSourceElev || hasReceiverElev,
  };
}

function isBlank(cells: string[]): boolean {
  return cells.every((c) => c.trim() === '');
}

/** 1-based file line of each record papaparse returns, skipping comment lines as it does. */
function fileRowNumbers(text: string): number[] {
  const numbers: number[] = [];
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  let inQuote = false;
  let recordStart = 1;
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    if (!inQuote && line.startsWith('#')) continue;
    if (!inQuote) recordStart = i + 1;
    for (const ch of line) if (ch === '"') inQuote = !inQuote;
    if (!inQuote) numbers.push(recordStart);
  }
  return numbers;
}

/** Rows without a source id get one per distinct source position; a named id keeps one position. */
function assignSourceIds(picks: FirstBreak[], file: string): void {
  const xById = new Map<string, { x: number; row: number }>();
  const idByX = new Map<number, string>();
  for (const p of picks) {
    if (p.sourceId === '') {
      if (!idByX.has(p.sourceX)) idByX.set(p.sourceX, `x=${trimNumber(p.sourceX)}`);
      p.sourceId = idByX.get(p.sourceX)!;
      continue;
    }
    const first = xById.get(p.sourceId);
    if (first === undefined) xById.set(p.sourceId, { x: p.sourceX, row: p.row });
    else if (Math.abs(first.x - p.sourceX) > 1e-6) {
      throw new InputError({ file, row: p.row, column: 'source_x' },
        `source ${p.sourceId} is at ${trimNumber(p.sourceX)} m here but at ${trimNumber(first.x)} m on row ${first.row}; expected one position per source id`);
    }
  }
}

function fillSourceElevations(
  picks: FirstBreak[], raw: (number | undefined)[], file: string,
  hasSourceElev: boolean, hasReceiverElev: boolean, warnings: WarningLog,
): void {
  const known = new Map<string, number>();
  picks.forEach((p, i) => {
    const elev = raw[i];
    if (elev === undefined) return;
    const previous = known.get(p.sourceId);
    if (previous !== undefined && Math.abs(previous - elev) > 1e-6) {
      throw new InputError({ file, row: p.row, column: 'source_elev' },
        `source ${p.sourceId} has elevation ${trimNumber(elev)} m here and ${trimNumber(previous)} m on an earlier row; expected one elevation per source`);
    }
    known.set(p.sourceId, elev);
  });
  const missing = [...new Set(picks.filter((p) => !known.has(p.sourceId)).map((p) => p.sourceId))];
  if (missing.length > 0 && hasReceiverElev) {
    const ground = groundFromReceivers(picks);
    for (const id of missing) {
      const x = picks.find((p) => p.sourceId === id)!.sourceX;
      known.set(id, ground(x));
    }
    warnings.add('source-elevation-interpolated',
      `no source_elev for source${missing.length > 1 ? 's' : ''} ${missing.join(', ')}; elevation taken from the receiver elevations at the source position (linear interpolation, nearest end value beyond the spread)`,
      { where: { file } });
  } else if (missing.length > 0 && hasSourceElev) {
    throw new InputError({ file, column: 'source_elev' }, `source${missing.length > 1 ? 's' : ''} ${missing.join(', ')} ha${missing.length > 1 ? 've' : 's'} no elevation and there are no receiver elevations to take it from; expected a source_elev on at least one row of each source`);
  }
  for (const p of picks) p.sourceElev = known.get(p.sourceId) ?? 0;
}

/** Ground elevation along the line from the receiver elevations, by linear interpolation. */
function groundFromReceivers(picks: FirstBreak[]): (x: number) => number {
  const byX = new Map<number, number>();
  for (const p of picks) byX.set(p.receiverX, p.receiverElev);
  const xs = [...byX.keys()].sort((a, b) => a - b);
  const elevations = xs.map((x) => byX.get(x)!);
  return (x: number) => linearAt(xs, elevations, x);
}

function checkDuplicates(picks: FirstBreak[], file: string): void {
  const seen = new Map<string, number>();
  const errors: InputError[] = [];
  for (const p of picks) {
    const key = `${p.sourceId}\u0000${p.receiverX}`;
    const first = seen.get(key);
    if (first !== undefined) {
      errors.push(new InputError({ file, row: p.row, column: 'receiver_x' },
        `duplicate pick for source ${p.sourceId} at receiver ${trimNumber(p.receiverX)} m (also on row ${first}); expected one first break per source and receiver`));
    } else seen.set(key, p.row);
  }
  if (errors.length > 0) throw errors.length === 1 ? errors[0] : new InputErrors(errors.slice(0, MAX_ERRORS));
}

/**
 * Judges the time unit from apparent velocities (offset / time): near-surface materials lie
 * between about 100 and 8000 m/s (common practice), so a median far outside that range suggests
 * the wrong unit.
 */
function checkTimeUnit(picks: FirstBreak[], file: string, timeName: string, warnings: WarningLog): void {
  const velocities = picks
    .filter((p) => p.time > 0 && p.receiverX !== p.sourceX)
    .map((p) => Math.abs(p.receiverX - p.sourceX) / p.time)
    .sort((a, b) => a - b);
  if (velocities.length === 0) return;
  const median = velocities[Math.floor(velocities.length / 2)];
  if (timeName === 'time_ms' && median > FASTEST_PLAUSIBLE_MPS) {
    warnings.add('time-unit', `the median apparent velocity is ${Math.round(median)} m/s if ${timeName} is in milliseconds, faster than any near-surface material; the times look like seconds (use a time_s column)`, { where: { file, column: timeName } });
  } else if (timeName === 'time_s' && median < SLOWEST_PLAUSIBLE_MPS) {
    warnings.add('time-unit', `the median apparent velocity is ${median.toFixed(2)} m/s if ${timeName} is in seconds, slower than any near-surface material; the times look like milliseconds (use a time_ms column)`, { where: { file, column: timeName } });
  }
}

function trimNumber(value: number): string {
  return Number(value.toFixed(4)).toString();
}
