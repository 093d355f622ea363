import { WarningLog } from '../src/core/warnings.js';
import { readFirstBreaks, type ReadFirstBreaksOptions } from '../src/io/firstBreaksCsv.js';
import { interpret, type InterpretOptions } from '../src/interpret.js';

/** Reads a CSV text and interprets it, returning the result and the warning log. */
export function interpretCsv(csv: string, options: InterpretOptions = {}, read: ReadFirstBreaksOptions = {}) {
  const log = new WarningLog();
  const table = readFirstBreaks(csv, 'test.csv', log, read);
  return { result: interpret(table, options, log), log, table };
}

/** A CSV of picks from a travel-time function, one row per source and receiver (zero offset skipped). */
export function csvFrom(sources: number[], receivers: number[], time: (sourceX: number, receiverX: number) => number): string {
  const rows = ['source_id,source_x,receiver_x,time_ms'];
  sources.forEach((sx, s) => {
    for (const rx of receivers) if (rx !== sx) rows.push(`S${s + 1},${sx},${rx},${(time(sx, rx) * 1e3).toFixed(4)}`);
  });
  return rows.join('\n') + '\n';
}

export const range = (count: number, step: number, start = 0) => Array.from({ length: count }, (_, i) => start + i * step);
