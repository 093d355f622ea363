import { fromMetres, type LengthUnit } from '../core/units.js';
import { csvNumber as decimal, csvText } from './csvCell.js';
import type { PickRow } from '../picking/recordPicks.js';

/**
 * The first-break table (CSV, the DESIGN.md contract) of automatic picks, with the confidence,
 * the source file and the trace number of each pick. Unpicked traces are not rows (the caller
 * reports them). Elevation columns are written when every row has them, the wave column when the
 * rows say which wave was picked. Text cells are made safe for
 * spreadsheets (csvText) unless `neutralise` is false, which only the in-memory hand-over from
 * picking to interpretation uses, so that ids stay as the records name them.
 */
export function pickTableCsv(rows: PickRow[], unit: LengthUnit = 'm', neutralise = true): string {
  const picked = rows.filter((r) => r.time !== undefined);
  const withElevations = picked.length > 0 && picked.every((r) => r.sourceElev !== undefined && r.receiverElev !== undefined);
  // The wave column (P or S) when the picking was told which wave it picked (--wave).
  const withWave = picked.some((r) => r.wave !== undefined);
  const header = ['source_id', 'source_x', ...(withElevations ? ['source_elev'] : []), 'receiver_x', ...(withElevations ? ['receiver_elev'] : []), 'time_ms', 'confidence', 'source_file', 'trace', ...(withWave ? ['wave'] : [])];
  const lines = picked.map((r) => [
    csvText(r.sourceId, neutralise),
    decimal(fromMetres(r.sourceX, unit), 4),
    ...(withElevations ? [decimal(fromMetres(r.sourceElev!, unit), 4)] : []),
    decimal(fromMetres(r.receiverX, unit), 4),
    ...(withElevations ? [decimal(fromMetres(r.receiverElev!, unit), 4)] : []),
    decimal(r.time! * 1e3, 4),
    decimal(r.confidence, 3),
    csvText(r.file, neutralise),
    String(r.trace),
    ...(withWave ? [r.wave ?? 'P'] : []),
  ].join(','));
  return [header.join(','), ...lines].join('\n') + '\n';
}

/** A sentence per record on the traces left unpicked, for stderr and the report. */
export function unpickedSummary(rows: PickRow[]): string[] {
  const byFile = new Map<string, PickRow[]>();
  for (const r of rows) if (r.time === undefined) {
    if (!byFile.has(r.file)) byFile.set(r.file, []);
    byFile.get(r.file)!.push(r);
  }
  return [...byFile.entries()].map(([file, missing]) => {
    const byStatus = new Map<string, number[]>();
    for (const r of missing) {
      if (!byStatus.has(r.status)) byStatus.set(r.status, []);
      byStatus.get(r.status)!.push(r.trace);
    }
    return `${file}: ${missing.length} trace${missing.length > 1 ? 's' : ''} not picked (${[...byStatus.entries()].map(([status, traces]) => `${status}: ${traces.join(', ')}`).join('; ')})`;
  });
}
