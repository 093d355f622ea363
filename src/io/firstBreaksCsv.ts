import { InputError, InputErrors } from '../core/errors.js';
import { linearAt } from '../core/interpolate.js';
import type { FirstBreak, FirstBreakTable, Wave } from '../core/types.js';
import { toMetres, type LengthUnit } from '../core/units.js';
import type { WarningLog } from '../core/warnings.js';
import { apparentVelocityProblem, medianApparentVelocity, type UnitSuspect } from './apparentVelocity.js';
import { csvRecords, isBlankRecord, type CsvRecord } from './csvRecords.js';
import { notANumberHint, parseDecimal } from './strictNumber.js';

/** Options for reading a first-break table. */
export interface ReadFirstBreaksOptions {
  /** Unit of every length column (positions and elevations); defaults to metres. */
  lengthUnit?: LengthUnit;
  /** Wave type for the whole file, overriding or filling a `wave` column. */
  wave?: Wave;
  /**
   * Apparent velocities outside what any ground gives (apparentVelocity.ts) are a warning instead
   * of an error: for the user who has checked the units (`--accept-velocities`).
   */
  acceptVelocities?: boolean;
  /** Further likely unit mistakes to name when the velocities are implausible (the SEG-2 headers of picked records). */
  unitSuspects?: UnitSuspect[];
}

const KNOWN_COLUMNS = new Set([
  'source_id', 'source_x', 'source_elev', 'receiver_x', 'receiver_elev', 'time_ms', 'time_s', 'wave',
]);
/** Columns written by `hammerline pick`: kept with each pick like unknown columns, but expected, so not warned about. */
const PICK_COLUMNS = new Set(['confidence', 'source_file', 'trace']);

/** Largest number of cell errors listed before the reader stops collecting more. */
const MAX_ERRORS = 25;

/**
 * Largest position, in metres, from the line's origin: 10 000 km, beyond any projected survey
 * coordinate (UTM northings stay below it). Larger values lose the precision depths need.
 */
export const MAX_POSITION_M = 1e7;
/** Largest elevation magnitude, in metres, of any ground or local datum. */
export const MAX_ELEVATION_M = 1e5;
/**
 * Largest time, in seconds, taken as a number at all (about a day): only a guard against values
 * like 1e300; whether the times are plausible is judged from the apparent velocities.
 */
export const MAX_TIME_S = 1e5;

/**
 * Reads a first-break table (CSV, RFC 4180, header required) into picks in SI units.
 *
 * Comment rule: lines above the header whose first cell begins with `#` are comments (and blank
 * lines anywhere are skipped); below the header every line is a row, so a source_id beginning
 * with `#` is data. The delimiter is a comma, or a semicolon or tab when the header line has no
 * comma. Numbers are plain decimals (no hexadecimal, NaN, Infinity or decimal comma). Blanks
 * around a cell are not part of it; an id is otherwise kept as written, and one holding a control
 * character or a replacement character (U+FFFD, a byte that was not UTF-8) is refused.
 *
 * Required columns: source_x, receiver_x and one of time_ms or time_s. Optional: source_id
 * (default: one id per distinct source_x), source_elev and receiver_elev (default: flat ground at
 * elevation 0), wave (P or S). Unknown columns are kept and reported.
 *
 * Units are judged from the data: a median apparent velocity (offset / time) outside what the
 * ground gives (apparentVelocity.ts), over the file or for one source, is an error naming the
 * likely unit (seconds or microseconds in time_ms, feet as metres) unless `acceptVelocities`.
 *
 * @param text - file contents
 * @param file - file name, used in every message
 * @param warnings - collects probable mistakes (zero offsets, unknown columns, accepted velocities)
 * @throws InputError naming the file, row and column for a missing column, an empty or
 *   non-numeric value, a negative time, a duplicate pick, an inconsistent source, constant times
 *   or implausible apparent velocities
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
  const body = text.replace(/^\uFEFF/, '');
  const records = csvRecords(body, file, delimiterOf(body));
  const errors: InputError[] = [];

  const headerAt = records.findIndex((r) => !isBlankRecord(r) && !r.cells[0].startsWith('#'));
  if (headerAt < 0) throw new InputError({ file }, 'the file is empty; expected a header row such as source_x,receiver_x,time_ms');
  const headerLine = records[headerAt].line;
  const header = records[headerAt].cells.map((h) => h.trim().toLowerCase());
  const col = (name: string) => header.indexOf(name);

  const missing: string[] = [];
  if (col('source_x') < 0) missing.push('source_x');
  if (col('receiver_x') < 0) missing.push('receiver_x');
  const msCol = col('time_ms');
  const sCol = col('time_s');
  if (msCol < 0 && sCol < 0) missing.push('time_ms (or time_s)');
  if (missing.length > 0) {
    throw new InputError({ file, row: headerLine },
      `missing required column ${missing.join(', ')}; the header has ${header.join(',')}${header.length === 1 && /[;\t]/.test(header[0]) ? ' (a single column: expected commas between the columns)' : ''}`);
  }
  if (msCol >= 0 && sCol >= 0) {
    throw new InputError({ file, row: headerLine }, 'both time_ms and time_s are present; expected exactly one time column');
  }
  const seen = new Map<string, number>();
  header.forEach((h, i) => {
    if (seen.has(h)) errors.push(new InputError({ file, row: headerLine, column: h }, `column appears twice (columns ${seen.get(h)! + 1} and ${i + 1}); expected each column once`));
    seen.set(h, i);
  });

  const timeCol = msCol >= 0 ? msCol : sCol;
  const timeName = msCol >= 0 ? 'time_ms' : 'time_s';
  const timeScale = msCol >= 0 ? 1e-3 : 1;
  const extraColumns = header.filter((h) => !KNOWN_COLUMNS.has(h) && h !== '');
  const hasSourceElev = col('source_elev') >= 0;
  const hasReceiverElev = col('receiver_elev') >= 0;
  const lengthWords = lengthUnit === 'ft' ? 'feet' : 'metres';
  const perMetre = lengthUnit === 'ft' ? 1 / 0.3048 : 1;

  const picks: FirstBreak[] = [];
  const extraValues: Record<string, string>[] = [];
  const waves = new Set<Wave>();
  const rawSourceElev: (number | undefined)[] = [];

  for (let i = headerAt + 1; i < records.length && errors.length < MAX_ERRORS; i++) {
    const record: CsvRecord = records[i];
    const cells = record.cells;
    if (isBlankRecord(record)) continue;
    const row = record.line;
    const where = (column: string) => ({ file, row, column });
    if (cells.length !== header.length) {
      const hint = cells[0].startsWith('#') ? ' (lines starting with # are comments only above the header; below it they are rows)' : '';
      errors.push(new InputError({ file, row }, `has ${cells.length} fields; expected ${header.length} as in the header${hint}`));
      continue;
    }
    const number = (index: number, name: string, required: boolean, limit: number): number | undefined => {
      const raw = cells[index].trim();
      const unitWords = name.startsWith('time') ? (name === 'time_ms' ? 'milliseconds' : 'seconds') : lengthWords;
      if (raw === '') {
        if (required) errors.push(new InputError(where(name), `is empty; expected a number in ${unitWords}`));
        return undefined;
      }
      const value = parseDecimal(raw);
      if (value === undefined) {
        errors.push(new InputError(where(name), `"${raw}" is not a number${notANumberHint(raw)}; expected a number in ${unitWords}${cells[0].startsWith('#') && index !== 0 ? ' (lines starting with # are comments only above the header)' : ''}`));
        return undefined;
      }
      if (Math.abs(value) > limit) {
        errors.push(new InputError(where(name), `${raw} is beyond ${limit.toExponential(0).replace('e+', 'e')} ${unitWords}; expected ${name.startsWith('time') ? 'a first-break time' : name.endsWith('_x') ? 'a position along the line (distance from its start)' : 'a ground elevation'}`));
        return undefined;
      }
      return value;
    };
    const positionLimit = MAX_POSITION_M * perMetre;
    const elevationLimit = MAX_ELEVATION_M * perMetre;
    const sourceX = number(col('source_x'), 'source_x', true, positionLimit);
    const receiverX = number(col('receiver_x'), 'receiver_x', true, positionLimit);
    const time = number(timeCol, timeName, true, MAX_TIME_S / timeScale);
    const sourceElev = hasSourceElev ? number(col('source_elev'), 'source_elev', false, elevationLimit) : undefined;
    const receiverElev = hasReceiverElev ? number(col('receiver_elev'), 'receiver_elev', true, elevationLimit) : undefined;
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
    const idRaw = col('source_id') >= 0 ? cells[col('source_id')].trim() : '';
    const badCharacter = /[\u0000-\u001f\u007f\ufffd]/.exec(idRaw);
    if (badCharacter !== null) {
      const code = badCharacter[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, '0');
      errors.push(new InputError(where('source_id'), badCharacter[0] === '\ufffd'
        ? 'holds U+FFFD, the mark of a byte that was not UTF-8; expected the id as written, in UTF-8 (save the table as UTF-8)'
        : `holds the control character U+${code}; expected printable text`));
      continue;
    }
    if (sourceX === undefined || receiverX === undefined || time === undefined) continue;
    if (hasReceiverElev && receiverElev === undefined) continue;
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
  checkTimesVary(picks, file, timeName);

  const unknown = extraColumns.filter((c) => !PICK_COLUMNS.has(c));
  if (unknown.length > 0) {
    const extraColumns = unknown;
    warnings.add('unknown-columns', `column${extraColumns.length > 1 ? 's' : ''} ${extraColumns.join(', ')} ${extraColumns.length > 1 ? 'are' : 'is'} not used by the interpretation; kept with each pick and carried to exports`, { where: { file } });
  }
  const zeroOffset = picks.filter((p) => p.receiverX === p.sourceX);
  if (zeroOffset.length > 0) {
    warnings.add('zero-offset', `${zeroOffset.length} pick${zeroOffset.length > 1 ? 's' : ''} at zero offset (rows ${zeroOffset.slice(0, 8).map((p) => p.row).join(', ')}${zeroOffset.length > 8 ? ', ...' : ''}); a geophone at the source is kept but carries no slope information`, { where: { file } });
  }
  checkApparentVelocities(picks, file, timeName, lengthUnit, wave ?? 'P', warnings, options);

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

/** A comma, or a semicolon or tab when the header line (the first line not blank and not a comment) has no comma. */
function delimiterOf(text: string): string {
  for (const line of text.split(/\r\n|\n|\r/, 200)) {
    if (line.trim() === '' || line.startsWith('#') || line.startsWith('"#')) continue;
    if (line.includes(',')) return ',';
    if (line.includes(';')) return ';';
    if (line.includes('\t')) return '\t';
    return ',';
  }
  return ',';
}

/**
 * Every side of every source must have times that change with offset: constant (or all-zero)
 * times are a fill value or an export fault, not first breaks.
 */
function checkTimesVary(picks: FirstBreak[], file: string, timeName: string): void {
  const bySide = new Map<string, FirstBreak[]>();
  for (const p of picks) {
    if (p.receiverX === p.sourceX) continue;
    const key = `${p.sourceId}\u0000${p.receiverX > p.sourceX ? '+x' : '-x'}`;
    let list = bySide.get(key);
    if (list === undefined) bySide.set(key, (list = []));
    list.push(p);
  }
  for (const [key, list] of bySide) {
    if (list.length < 3) continue;
    const first = list[0].time;
    if (list.every((p) => p.time === first)) {
      const [id, side] = key.split('\u0000');
      const shown = timeName === 'time_ms' ? `${Number((first * 1e3).toFixed(6))} ms` : `${first} s`;
      throw new InputError({ file, row: list[0].row, column: timeName, source: id },
        `every one of the ${list.length} times on the ${side} side is ${shown}; first breaks grow with offset, so expected times that change from geophone to geophone (a fill value or an export fault?)`);
    }
  }
}

/**
 * Judges the units from the data: the median apparent velocity of the file and of each source
 * must lie within what the ground gives (apparentVelocity.ts).
 */
function checkApparentVelocities(picks: FirstBreak[], file: string, timeName: string, lengthUnit: LengthUnit, wave: Wave, warnings: WarningLog, options: ReadFirstBreaksOptions): void {
  const suspects: UnitSuspect[] = [
    ...(timeName === 'time_ms'
      ? [{ factor: 1e-3, advice: 'the times look like seconds: put them in a time_s column (or multiply them by 1000)' },
        { factor: 1e3, advice: 'the times look like microseconds: divide them by 1000' }]
      : [{ factor: 1e3, advice: 'the times look like milliseconds: put them in a time_ms column' }]),
    lengthUnit === 'm'
      ? { factor: 0.3048, advice: 'the lengths look like feet: give --units ft' }
      : { factor: 1 / 0.3048, advice: 'the lengths look like metres: leave out --units ft' },
    ...(options.unitSuspects ?? []),
  ];
  const report = (where: { file: string; source?: string; column?: string }, message: string) => {
    if (options.acceptVelocities) warnings.add('apparent-velocity', `${message.replace(/\. If the values are right, give --accept-velocities$/, '')}; accepted as given (--accept-velocities)`, { where });
    else throw new InputError(where, message);
  };
  const all = medianApparentVelocity(picks.map((p) => p.receiverX - p.sourceX), picks.map((p) => p.time));
  const overall = all === undefined ? undefined : apparentVelocityProblem(all, wave, suspects);
  if (overall !== undefined) {
    report({ file, column: timeName }, overall);
    return;
  }
  const bySource = new Map<string, FirstBreak[]>();
  for (const p of picks) {
    let list = bySource.get(p.sourceId);
    if (list === undefined) bySource.set(p.sourceId, (list = []));
    list.push(p);
  }
  let first = Infinity;
  let last = -Infinity;
  for (const p of picks) { first = Math.min(first, p.receiverX); last = Math.max(last, p.receiverX); }
  for (const [id, list] of bySource) {
    if (list.length < 3) continue;
    const v = medianApparentVelocity(list.map((p) => p.receiverX - p.sourceX), list.map((p) => p.time));
    if (v === undefined) continue;
    const problem = apparentVelocityProblem(v, wave, []);
    if (problem !== undefined) {
      const unit = lengthUnit === 'ft' ? 'ft' : 'm';
      const show = (m: number) => Number((lengthUnit === 'ft' ? m / 0.3048 : m).toFixed(3));
      report({ file, source: id, column: 'source_x' },
        problem.replace('check the time unit, the length unit and the source positions',
          `the other sources are plausible, so check this source's source_x (${show(list[0].sourceX)} ${unit}; the receivers span ${show(first)} to ${show(last)} ${unit}) and its times`));
    }
  }
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

function trimNumber(value: number): string {
  return Number(value.toFixed(4)).toString();
}
