import type { FirstBreakTable } from '../../src/core/types.js';
import { fromMetres, type LengthUnit } from '../../src/core/units.js';
import { decimal } from '../../src/io/numbers.js';

/**
 * A first-break table (the DESIGN.md contract: source_id, source_x, source_elev, receiver_x,
 * receiver_elev, time_ms, and wave when the table says it) from the picks in use, lengths in the
 * given unit. Columns the reader kept (unknown columns) follow, with each pick's values, found by
 * its file row in `extraByRow`.
 */
export function firstBreakTableCsv(table: FirstBreakTable, unit: LengthUnit, extraByRow: Map<number, Record<string, string>>): string {
  const quote = (text: string) => (/[",\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text);
  const extra = table.extraColumns;
  const header = ['source_id', 'source_x', 'source_elev', 'receiver_x', 'receiver_elev', 'time_ms', ...(table.wave ? ['wave'] : []), ...extra];
  const lines = table.picks.map((p) => [
    quote(p.sourceId),
    decimal(fromMetres(p.sourceX, unit), 4),
    decimal(fromMetres(p.sourceElev, unit), 4),
    decimal(fromMetres(p.receiverX, unit), 4),
    decimal(fromMetres(p.receiverElev, unit), 4),
    decimal(p.time * 1e3, 4),
    ...(table.wave ? [table.wave] : []),
    ...extra.map((c) => quote(extraByRow.get(p.row)?.[c] ?? '')),
  ].join(','));
  return [header.join(','), ...lines].join('\n') + '\n';
}
