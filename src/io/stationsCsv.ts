import Papa from 'papaparse';
import { InputError } from '../core/errors.js';
import { toMetres, type LengthUnit } from '../core/units.js';
import type { Stations } from '../picking/recordPicks.js';

/**
 * Reads a station table (CSV with a header: x and elev required, station optional), lengths in
 * the given unit, converted to metres.
 *
 * @throws InputError naming the file, row and column of a missing column or a bad value
 */
export function readStations(text: string, file: string, unit: LengthUnit = 'm'): Stations {
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: true, comments: '#', transformHeader: (h) => h.trim().toLowerCase() });
  const fields = parsed.meta.fields ?? [];
  for (const required of ['x', 'elev']) {
    if (!fields.includes(required)) throw new InputError({ file, row: 1 }, `missing required column ${required}; a station table needs x and elev (and optionally station); the header has ${fields.join(',')}`);
  }
  const rows = parsed.data.map((r, i) => {
    const number = (name: string, required: boolean) => {
      const raw = (r[name] ?? '').trim();
      if (raw === '' && !required) return undefined;
      const value = Number(raw);
      if (raw === '' || !Number.isFinite(value)) throw new InputError({ file, row: i + 2, column: name }, `"${raw}" is not a number; expected ${name === 'station' ? 'a station number' : `a length in ${unit === 'ft' ? 'feet' : 'metres'}`}`);
      return value;
    };
    const station = fields.includes('station') ? number('station', false) : undefined;
    return { station, x: toMetres(number('x', true)!, unit), elev: toMetres(number('elev', true)!, unit) };
  });
  if (rows.length === 0) throw new InputError({ file }, 'has no stations; expected one row per station');
  return { file, rows };
}
