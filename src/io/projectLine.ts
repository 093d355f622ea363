import { InputError } from '../core/errors.js';
import type { FirstBreak, FirstBreakTable, Wave } from '../core/types.js';
import { WarningLog } from '../core/warnings.js';
import type { InterpretOptions } from '../interpret.js';
import { pickSeg2, type PickRow, type Stations } from '../picking/recordPicks.js';
import { recordVelocityProblem } from './apparentVelocity.js';
import { readFirstBreaks } from './firstBreaksCsv.js';
import { pickTableCsv, unpickedSummary } from './pickTable.js';
import type { PickEdit, ProjectChoices, ProjectInput } from './projectFile.js';
import { readSeg2 } from './seg2/read.js';
import type { Seg2Record } from './seg2/types.js';
import { readStations } from './stationsCsv.js';

// The one home of a project's hand edits: the field app (web/src/compute.ts) and the command line
// (cli/project.ts) both make the line they interpret here, so a project file gives the same
// first breaks, and so the same numbers, in both.

/** Key of a pick: a record's trace or a table's file row. */
export function pickKey(file: string, where: { trace?: number; row?: number }): string {
  return where.trace !== undefined ? `${file}#t${where.trace}` : `${file}#r${where.row}`;
}

/**
 * Rewrites "row N" and "rows N, M" of the table made from picked records (pickTableCsv: header on
 * line 1, one line per picked trace) as the record and trace they came from.
 */
export function traceLabeller(rows: PickRow[]): (text: string) => string {
  const picked = rows.filter((r) => r.time !== undefined);
  const label = (line: string) => {
    const row = picked[Number(line) - 2];
    return row === undefined ? `row ${line}` : `${row.file} trace ${row.trace}`;
  };
  return (text) => text
    .replace(/\brows (\d+(?:, \d+)*)/g, (_, list: string) => list.split(', ').map(label).join(', '))
    .replace(/\brow (\d+)/g, (_, line: string) => label(line));
}

/**
 * Judges a record's time and length units from its picks (io/apparentVelocity.ts): a median
 * apparent velocity no ground has stops with the likely header fault named.
 *
 * @throws InputError naming the record and the header value at fault
 */
export function checkRecordVelocities(record: Seg2Record, picked: PickRow[], wave: Wave | 'any'): void {
  const problem = recordVelocityProblem(record, picked, wave);
  if (problem !== undefined) throw new InputError({ file: record.file }, problem.replace(/\. If the values are right, give --accept-velocities$/, ''));
}

/** A record of a project read and picked as `hammerline pick` does it, its units judged from the picks. */
export function pickProjectRecord(input: ProjectInput, stations: Stations | undefined, wave: Wave | 'any'): PickRow[] {
  const record = readSeg2(input.bytes, input.name);
  let rows: PickRow[];
  try {
    rows = pickSeg2(record, { stations });
  } catch (error) {
    if (error instanceof RangeError) throw new InputError({ file: input.name }, error.message);
    throw error;
  }
  checkRecordVelocities(record, rows, wave);
  return rows;
}

/** The options `hammerline interpret` would be given for a project's choices. */
export function projectInterpretOptions(choices: ProjectChoices): InterpretOptions {
  return {
    wave: choices.wave,
    directThroughOrigin: choices.directThroughOrigin,
    allowShortBranches: false,
    site: {},
    ...(Object.keys(choices.segments).length > 0 ? { segments: { ...choices.segments } } : {}),
    ...(Object.keys(choices.breakpoints).length > 0 ? { breakpoints: { ...choices.breakpoints } } : {}),
    ...(choices.poisson !== undefined ? { vsFromVp: { poisson: [choices.poisson] } } : {}),
  };
}

/** The automatic picks of records with the hand edits put in: a time set by hand, or the trace cleared. */
export function applyRecordEdits(automatic: PickRow[], edits: PickEdit[]): PickRow[] {
  const byKey = new Map(edits.map((e) => [pickKey(e.file, e), e]));
  return automatic.map((row) => {
    const edit = byKey.get(pickKey(row.file, row));
    if (edit === undefined) return row;
    return edit.time === null
      ? { ...row, time: undefined, confidence: 0, status: 'cleared by hand' as PickRow['status'] }
      : { ...row, time: edit.time, confidence: 1, status: 'picked' };
  });
}

/** The picks of a first-break table with the hand edits put in: a row's time replaced, or the row left out. */
export function applyTableEdits(picks: FirstBreak[], file: string, edits: PickEdit[]): FirstBreak[] {
  const byKey = new Map(edits.map((e) => [pickKey(e.file, e), e]));
  return picks.flatMap((p) => {
    const edit = byKey.get(pickKey(file, { row: p.row }));
    if (edit === undefined) return [p];
    return edit.time === null ? [] : [{ ...p, time: edit.time }];
  });
}

/** One pick set or cleared by hand, beside the pick it replaced. Times in seconds. */
export interface AppliedEdit {
  file: string;
  trace?: number;
  row?: number;
  sourceId: string;
  receiverX: number;
  /** The automatic pick (records) or the table's time; undefined for a trace the picker left unpicked. */
  before?: number;
  /** The time used; null where the pick was cleared. */
  after: number | null;
}

/** The line of a project as the interpretation reads it: its first-break table, with the hand edits in. */
export interface ProjectLine {
  kind: 'records' | 'table';
  /** The line's name in messages: the record (and how many more) or the table. */
  name: string;
  table: FirstBreakTable;
  /** Warnings so far (unpicked traces, the edits, the table reader's). */
  log: WarningLog;
  records: ProjectInput[];
  /** Records: every trace with the edits in, and the automatic picks (same order). */
  rows?: PickRow[];
  automatic?: PickRow[];
  /** Table: its picks as read, before the edits. */
  tablePicks?: FirstBreak[];
  /** The edits that matched a trace or row of the line, with what they replaced. */
  applied: AppliedEdit[];
  /** Turns "row N" of the internal pick table into "RECORD trace T" (records; identity for a table). */
  relabel: (text: string) => string;
}

/**
 * The line of a project (the SEG-2 records with their station table, or one first-break table)
 * as the first-break table `interpret()` reads, with the picks set by hand in place of the
 * automatic ones (or the table's), in the order `hammerline interpret` takes: records are picked
 * (pickSeg2), edited, written as the first-break table and read back (readFirstBreaks); a table is
 * read and edited.
 *
 * @param rowsOf - the automatic picks of a record (the field app keeps them cached)
 * @returns undefined when the project holds no line yet (no record and no table)
 * @throws InputError for a file that cannot be read, or an edit that names no trace or row of the line
 *   (`picks[i]`, as in the project document)
 */
export function projectLine(
  inputs: ProjectInput[], edits: PickEdit[], choices: ProjectChoices,
  rowsOf: (input: ProjectInput, stations: Stations | undefined, wave: Wave | 'any') => PickRow[] = pickProjectRecord,
): ProjectLine | undefined {
  const records = inputs.filter((i) => i.kind === 'seg2');
  const tables = inputs.filter((i) => i.kind === 'first-breaks');
  const stationsInput = inputs.find((i) => i.kind === 'stations');
  if (records.length > 0) {
    const stations = stationsInput ? readStations(new TextDecoder().decode(stationsInput.bytes), stationsInput.name, stationsInput.lengthUnit) : undefined;
    const automatic = records.flatMap((r) => rowsOf(r, stations, choices.wave ?? 'P'));
    const rows = applyRecordEdits(automatic, edits);
    const name = records.length === 1 ? records[0].name : `${records[0].name} and ${records.length - 1} more record${records.length > 2 ? 's' : ''}`;
    const log = new WarningLog();
    for (const sentence of unpickedSummary(rows)) log.add('unpicked-traces', sentence);
    if (edits.length > 0) log.add('picks-edited', `${edits.filter((e) => e.time !== null).length} pick${edits.length === 1 ? '' : 's'} set by hand and ${edits.filter((e) => e.time === null).length} cleared; the automatic picks of the other traces are kept`);
    const relabel = traceLabeller(rows);
    let table: FirstBreakTable;
    try {
      table = readFirstBreaks(pickTableCsv(rows, 'm', false), name, log, { wave: choices.wave });
    } catch (error) {
      if (error instanceof InputError) throw new InputError({}, relabel(error.message));
      throw error;
    }
    const byKey = new Map(automatic.map((r) => [pickKey(r.file, r), r]));
    const applied = edits.map((e, i): AppliedEdit => {
      const row = byKey.get(pickKey(e.file, e));
      if (row === undefined) throw new InputError({}, `picks[${i}]: ${e.file} has no trace ${e.trace}; expected a trace of the project's records`);
      return { file: e.file, trace: e.trace, sourceId: row.sourceId, receiverX: row.receiverX, before: row.time, after: e.time };
    });
    return { kind: 'records', name, table, log, records, rows, automatic, applied, relabel };
  }
  if (tables.length !== 1) return undefined;
  const input = tables[0];
  const name = input.name;
  const log = new WarningLog();
  const table = readFirstBreaks(new TextDecoder().decode(input.bytes), name, log, { lengthUnit: input.lengthUnit, wave: choices.wave });
  const tablePicks = table.picks;
  table.picks = applyTableEdits(tablePicks, name, edits);
  const removed = edits.filter((e) => e.time === null).map((e) => e.row!);
  if (edits.length > 0) log.add('picks-edited', `${edits.length - removed.length} pick${edits.length - removed.length === 1 ? '' : 's'} of ${name} moved by hand and ${removed.length} left out (rows ${removed.length > 0 ? removed.join(', ') : 'none'})`);
  const byRow = new Map(tablePicks.map((p) => [p.row, p]));
  const applied = edits.map((e, i): AppliedEdit => {
    const pick = e.row === undefined ? undefined : byRow.get(e.row);
    if (pick === undefined) throw new InputError({}, `picks[${i}]: ${name} has no first break on file row ${e.row}; expected a row of the table`);
    return { file: e.file, row: e.row, sourceId: pick.sourceId, receiverX: pick.receiverX, before: pick.time, after: e.time };
  });
  return { kind: 'table', name, table, log, records, tablePicks, applied, relabel: (text) => text };
}
