import { InputError } from '../../src/core/errors.js';
import type { Wave } from '../../src/core/types.js';
import type { LengthUnit } from '../../src/core/units.js';
import { WarningLog } from '../../src/core/warnings.js';
import { depthsCsv } from '../../src/io/depthsCsv.js';
import { readFirstBreaks } from '../../src/io/firstBreaksCsv.js';
import { interpretationJson } from '../../src/io/interpretationJson.js';
import { pickTableCsv } from '../../src/io/pickTable.js';
import type { PickEdit, ProjectChoices, ProjectInput } from '../../src/io/projectFile.js';
import { pickKey, pickProjectRecord, projectInterpretOptions, projectLine } from '../../src/io/projectLine.js';
import { readStations } from '../../src/io/stationsCsv.js';
import { interpret, receiverGround, type InterpretationResult } from '../../src/interpret.js';
import type { PickRow, Stations } from '../../src/picking/recordPicks.js';
import { firstBreakTableCsv } from './tableCsv.js';

export { pickKey };

/** One pick (or unpicked trace) as the views show it. Lengths in metres, times in seconds. */
export interface PickView {
  key: string;
  file: string;
  trace?: number;
  row?: number;
  sourceId: string;
  sourceX: number;
  receiverX: number;
  /** The time used, undefined when the trace is unpicked or the pick cleared. */
  time?: number;
  /** The automatic pick of a record's trace. */
  autoTime?: number;
  confidence?: number;
  status?: string;
  edited: boolean;
  /** Layer each fitted branch gave the pick (1 = direct wave), and whether a fit left it out. */
  layer?: number;
  outlier: boolean;
}

export interface Residual {
  key: string;
  sourceId: string;
  receiverX: number;
  /** Pick minus the first arrival computed through the section, in seconds. */
  difference: number;
}

export interface LineView {
  ok: true;
  name: string;
  kind: 'records' | 'table';
  /** The interpretation document, as `hammerline interpret --json` writes it. */
  document: Record<string, unknown>;
  result: InterpretationResult;
  picks: PickView[];
  receivers: { x: number; elev: number }[];
  sources: { id: string; x: number; elev: number }[];
  residuals: Residual[];
  exports: { picksCsv: string; picksName: string; interpretationJson: string; depthsCsv: string };
  milliseconds: { picking: number; interpretation: number };
}

export interface LineFailure {
  ok: false;
  message: string;
}

/** The worker's cache: records read and picked once per set of inputs. */
export class LineCache {
  private inputs: ProjectInput[] = [];
  private picked = new Map<string, PickRow[]>();

  setInputs(inputs: ProjectInput[]): void {
    this.inputs = inputs;
    this.picked.clear();
  }

  getInputs(): ProjectInput[] {
    return this.inputs;
  }

  /** Automatic picks of a record, with the station table when there is one (same as `hammerline pick`). */
  rows(input: ProjectInput, stations: Stations | undefined, wave: Wave | 'any'): PickRow[] {
    let rows = this.picked.get(input.name);
    if (rows === undefined) {
      rows = pickProjectRecord(input, stations, wave);
      this.picked.set(input.name, rows);
    }
    return rows;
  }
}

/** Checks that one file can be read as the kind it claims, without touching the session. */
export function checkInput(input: ProjectInput): void {
  const text = () => new TextDecoder().decode(input.bytes);
  // A record's positions may need the station table, which may come later: it is read, and picked when it can be.
  if (input.kind === 'seg2') {
    try {
      pickProjectRecord(input, undefined, 'any');
    } catch (error) {
      if (!(error instanceof InputError && /SOURCE_LOCATION|RECEIVER_LOCATION/.test(error.message))) throw error;
    }
  }
  else if (input.kind === 'stations') readStations(text(), input.name, input.lengthUnit);
  else readFirstBreaks(text(), input.name, new WarningLog(), { lengthUnit: input.lengthUnit });
}

/**
 * Interprets the line of a project with the same src/ code and in the same order as the command
 * line: SEG-2 records are read, picked (pickSeg2), written as the first-break table and read back
 * (readFirstBreaks), then interpret(); a first-break table is read and interpreted. Picks set by
 * hand replace the automatic ones (or the table's) before the interpretation.
 */
export function computeLine(cache: LineCache, picks: PickEdit[], choices: ProjectChoices, units: LengthUnit): LineView | LineFailure {
  try {
    return compute(cache, picks, choices, units);
  } catch (error) {
    if (error instanceof InputError || error instanceof RangeError) return { ok: false, message: error.message };
    throw error;
  }
}

function compute(cache: LineCache, edits: PickEdit[], choices: ProjectChoices, units: LengthUnit): LineView | LineFailure {
  const started = performance.now();
  // The hand edits are put in by src/io/projectLine.ts, as for `hammerline report PROJECT.json`.
  const line = projectLine(cache.getInputs(), edits, choices, (input, stations, wave) => cache.rows(input, stations, wave));
  if (line === undefined) return { ok: false, message: 'Load the SEG-2 records of a line, or one first-break table, to begin.' };
  const options = projectInterpretOptions(choices);
  const { table, log, name, relabel, records } = line;
  const edited = new Set(edits.map((e) => pickKey(e.file, e)));
  let picks: PickView[];
  let picksCsv: string;
  let extra: Record<string, unknown> = {};
  if (line.kind === 'records') {
    const rows = line.rows!;
    const automatic = line.automatic!;
    picksCsv = pickTableCsv(rows, units);
    const pickedRows = rows.filter((r) => r.time !== undefined);
    // pickTableCsv writes the header on file row 1 and the picked traces in order below it.
    const rowKey = new Map(pickedRows.map((r, i) => [i + 2, pickKey(r.file, r)]));
    picks = rows.map((r, i) => ({
      key: pickKey(r.file, r), file: r.file, trace: r.trace, sourceId: r.sourceId, sourceX: r.sourceX, receiverX: r.receiverX,
      time: r.time, autoTime: automatic[i].time, confidence: r.confidence, status: r.status, edited: edited.has(pickKey(r.file, r)), outlier: false,
    }));
    extra = { picking: { records: records.map((r) => r.name), wave: undefined, picked: pickedRows.length, traces: rows.length } };
    return finish(rowKey);
  }
  const all = line.tablePicks!;
  const extraByRow = new Map(all.map((p, i) => [p.row, table.extraValues[i]]));
  picksCsv = firstBreakTableCsv(table, units, extraByRow);
  const rowKey = new Map(table.picks.map((p) => [p.row, pickKey(name, { row: p.row })]));
  const byKey = new Map(edits.map((e) => [pickKey(e.file, e), e]));
  picks = all.map((p) => {
    const key = pickKey(name, { row: p.row });
    const edit = byKey.get(key);
    return { key, file: name, row: p.row, sourceId: p.sourceId, sourceX: p.sourceX, receiverX: p.receiverX, time: edit ? (edit.time ?? undefined) : p.time, autoTime: p.time, edited: edit !== undefined, outlier: false };
  });
  return finish(rowKey);

  function finish(rowKey: Map<number, string>): LineView {
    const picked = performance.now();
    let result: InterpretationResult;
    try {
      result = interpret(table, options, log);
    } catch (error) {
      if (error instanceof InputError) throw new InputError({}, relabel(error.message));
      throw error;
    }
    for (const w of result.warnings) w.message = relabel(w.message);
    const interpreted = performance.now();
    if (extra.picking) (extra.picking as Record<string, unknown>).wave = result.wave;
    const document = interpretationJson(result, extra);
    // The records a site class rests on (as interpret writes it).
    if (extra.picking && document.site !== undefined) (document.site as Record<string, unknown>).records = (result as { records?: string[] }).records ?? records.map((r) => r.name);
    const byPick = new Map(picks.map((p) => [p.key, p]));
    for (const fit of result.fits) {
      for (const segment of fit.segments) {
        for (let i = segment.start; i < segment.end; i++) {
          const view = byPick.get(rowKey.get(fit.branch.picks[i].row)!);
          if (view === undefined) continue;
          // A zero-offset pick belongs to every branch of its source; the direct wave wins.
          view.layer = view.layer === undefined ? segment.layer : Math.min(view.layer, segment.layer);
        }
      }
      for (const row of fit.outlierRows) {
        const view = byPick.get(rowKey.get(row)!);
        if (view) view.outlier = true;
      }
    }
    const receivers = receiverGround(table);
    const sources = [...new Map(table.picks.map((p) => [p.sourceId, { id: p.sourceId, x: p.sourceX, elev: p.sourceElev }])).values()];
    return {
      ok: true,
      name,
      kind: records.length > 0 ? 'records' : 'table',
      document,
      result,
      picks,
      receivers,
      sources,
      residuals: residuals(result, rowKey),
      exports: {
        picksCsv,
        picksName: `${name.replace(/ and \d+ more records?$/, '').replace(/\.[^.]*$/, '')}-first-breaks.csv`,
        interpretationJson: JSON.stringify(document, null, 2) + '\n',
        depthsCsv: depthsCsv(result, receivers, units),
      },
      milliseconds: { picking: picked - started, interpretation: interpreted - picked },
    };
  }
}

/** Pick minus computed first arrival for every pick the forward check (src/forward/forwardCheck.ts) uses, keyed for the checks view. */
function residuals(result: InterpretationResult, rowKey: Map<number, string>): Residual[] {
  return (result.forward?.residuals ?? []).map((r) => ({ key: rowKey.get(r.row) ?? '', sourceId: r.sourceId, receiverX: r.receiverX, difference: r.difference }));
}
