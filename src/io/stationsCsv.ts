import { InputError } from '../core/errors.js';
import { toMetres, type LengthUnit } from '../core/units.js';
import type { Stations } from '../picking/recordPicks.js';
import { csvRecords, isBlankRecord } from './csvRecords.js';
import { MAX_ELEVATION_M, MAX_POSITION_M } from './firstBreaksCsv.js';
import { notANumberHint, parseDecimal, parseInteger } from './strictNumber.js';

/**
 * Reads a station table (CSV with a header: x and elev required, station optional), lengths in
 * the given unit, converted to metres. Comment lines (`#`) only above the header, as in the
 * first-break table; numbers parsed strictly.
 *
 * @throws InputError naming the file, row and column of a missing column or a bad value
 */
export function readStations(text: string, file: string, unit: LengthUnit = 'm'): Stations {
  const records = csvRecords(text.replace(/^\uFEFF/, ''), file).filter((r) => !isBlankRecord(r));
  const headerAt = records.findIndex((r) => !r.cells[0].startsWith('#'));
  const fields = headerAt < 0 ? [] : records[headerAt].cells.map((h) => h.trim().toLowerCase());
  for (const required of ['x', 'elev']) {
    if (!fields.includes(required)) throw new InputError({ file, row: headerAt < 0 ? 1 : records[headerAt].line }, `missing required column ${required}; a station table needs x and elev (and optionally station); the header has ${fields.join(',')}`);
  }
  const rows = records.slice(headerAt + 1).map((record) => {
    if (record.cells.length !== fields.length) throw new InputError({ file, row: record.line }, `has ${record.cells.length} fields; expected ${fields.length} as in the header`);
    const number = (name: string, required: boolean) => {
      const raw = record.cells[fields.indexOf(name)].trim();
      if (raw === '' && !required) return undefined;
      const value = name === 'station' ? parseInteger(raw) : parseDecimal(raw);
      const limit = name === 'x' ? MAX_POSITION_M : MAX_ELEVATION_M;
      if (value === undefined || (name !== 'station' && Math.abs(toMetres(value, unit)) > limit)) {
        throw new InputError({ file, row: record.line, column: name }, `"${raw}" is not ${name === 'station' ? 'a whole number' : 'a number within range'}${notANumberHint(raw)}; expected ${name === 'station' ? 'a station number' : name === 'x' ? `a position along the line in ${unit === 'ft' ? 'feet' : 'metres'}` : `an elevation in ${unit === 'ft' ? 'feet' : 'metres'}`}`);
      }
      return value;
    };
    const station = fields.includes('station') ? number('station', false) : undefined;
    return { station, x: toMetres(number('x', true)!, unit), elev: toMetres(number('elev', true)!, unit) };
  });
  if (rows.length === 0) throw new InputError({ file }, 'has no stations; expected one row per station');
  return { file, rows };
}
