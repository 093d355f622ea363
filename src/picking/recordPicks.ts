import { InputError } from '../core/errors.js';
import { maxOf, minOf } from '../core/extent.js';
import { linearAt } from '../core/interpolate.js';
import type { Wave } from '../core/types.js';
import type { Seg2Record } from '../io/seg2/types.js';
import { bandPass } from './filter.js';
import { pickRecord, type PickOptions, type PickStatus, type PickTrace, type TracePick } from './autoPick.js';
import { pickShearRecord } from './pickShearRecord.js';

/** A station table: positions along the line and ground elevations, in metres, by station number. */
export interface Stations {
  file: string;
  rows: { station?: number; x: number; elev: number }[];
}

/** Geometry to use where a record's headers lack it. Lengths in metres. */
export interface GeometryOptions {
  sourceX?: number;
  firstReceiverX?: number;
  spacing?: number;
  stations?: Stations;
}

export interface RecordPickOptions extends GeometryOptions, PickOptions {
  /** Band-pass corners in Hz before picking (0 = none). */
  bandPass?: [number, number];
  /** Wave to pick: P (the first break; default) or S (the shear onset after the P, `pickShearRecord`). */
  wave?: Wave;
}

/** One pick row of the first-break table made from a record. */
export interface PickRow {
  sourceId: string;
  sourceX: number;
  sourceElev?: number;
  receiverX: number;
  receiverElev?: number;
  /** Seconds after the shot; undefined for a trace left unpicked. */
  time?: number;
  confidence: number;
  status: PickStatus;
  file: string;
  trace: number;
  /** Wave picked, when the picking was told (--wave). */
  wave?: Wave;
}

/**
 * The file name without its folders and its last extension ("records/S1.seg2" -> "S1"), as
 * node:path's basename(file, extname(file)) gives it, written out so the browser app can use it.
 */
export function fileStem(file: string): string {
  const name = file.replace(/[\\/]+$/, '').split(/[\\/]/).pop() ?? file;
  const dot = name.lastIndexOf('.');
  return dot > 0 ? name.slice(0, dot) : name;
}

/** Tolerance, in metres, within which a header elevation agrees with the station table. */
export const ELEVATION_AGREEMENT_M = 0.01;

/**
 * What the placing of a record decided that the user should hear: where the station table
 * overrides different elevations in the headers (the table wins), which positions lie beyond
 * the table's ends (their elevation is the end value), and where a source given by --source-x
 * takes its elevation from the receivers. One sentence per record and kind, naming the record,
 * the traces and the table; SI units.
 */
export function geometryNotes(record: Seg2Record, options: GeometryOptions = {}): { code: string; message: string }[] {
  const notes: { code: string; message: string }[] = [];
  const file = record.file;
  const stations = options.stations;
  const fromLayout = options.firstReceiverX !== undefined && options.spacing !== undefined;
  const receiverXs = record.traces.map((t) => (fromLayout ? options.firstReceiverX! + ((t.channel ?? t.index) - 1) * options.spacing! : t.receiverLocation?.[0] ?? stationX(stations, t.receiverStation)));
  const sourceXs = record.traces.map((t) => options.sourceX ?? t.sourceLocation?.[0] ?? stationX(stations, t.sourceStation));
  const f = (v: number) => String(Number(v.toFixed(3)));
  if (stations !== undefined) {
    const differing: { trace: number; header: number; table: number }[] = [];
    record.traces.forEach((t, i) => {
      const x = receiverXs[i];
      const header = fromLayout ? undefined : t.receiverLocation?.[2];
      if (x === undefined || header === undefined) return;
      const table = stationElevation(stations, x);
      if (Math.abs(header - table) > ELEVATION_AGREEMENT_M) differing.push({ trace: t.index, header, table });
    });
    if (differing.length > 0) {
      const worst = differing.reduce((a, b) => (Math.abs(b.header - b.table) > Math.abs(a.header - a.table) ? b : a));
      notes.push({ code: 'elevation-precedence', message: `${file}: the receiver elevations in the headers (RECEIVER_LOCATION) of ${differing.length} trace${differing.length > 1 ? 's' : ''} (${differing.slice(0, 8).map((d) => d.trace).join(', ')}${differing.length > 8 ? ', ...' : ''}) differ from the station table ${stations.file} by up to ${f(Math.abs(worst.header - worst.table))} m (trace ${worst.trace}: ${f(worst.header)} m in the header, ${f(worst.table)} m in the table); the station table is used` });
    }
    const xs = stations.rows.map((r) => r.x);
    const lo = minOf(xs);
    const hi = maxOf(xs);
    const beyond = record.traces.map((t, i) => ({ trace: t.index, x: receiverXs[i] })).filter((b) => b.x !== undefined && (b.x < lo || b.x > hi));
    if (beyond.length > 0) {
      notes.push({ code: 'beyond-station-table', message: `${file}: the receiver${beyond.length > 1 ? 's' : ''} of trace${beyond.length > 1 ? 's' : ''} ${beyond.slice(0, 8).map((b) => `${b.trace} (x = ${f(b.x!)} m)`).join(', ')}${beyond.length > 8 ? ', ...' : ''} ${beyond.length > 1 ? 'lie' : 'lies'} beyond the station table ${stations.file} (x = ${f(lo)} to ${f(hi)} m); ${beyond.length > 1 ? 'their elevations are' : 'its elevation is'} the table's end value, not surveyed: extend the table to cover them` });
    }
    const sources = [...new Set(sourceXs.filter((x): x is number => x !== undefined && (x < lo || x > hi)))];
    if (sources.length > 0) {
      notes.push({ code: 'beyond-station-table', message: `${file}: the source at x = ${sources.map(f).join(', ')} m lies beyond the station table ${stations.file} (x = ${f(lo)} to ${f(hi)} m); its elevation is the table's end value, not surveyed: add the source position to the table` });
    }
  } else if (options.sourceX !== undefined && record.traces.some((t) => t.receiverLocation?.[2] !== undefined) && !fromLayout) {
    notes.push({ code: 'source-elevation-interpolated', message: `${file}: the source given by --source-x (x = ${f(options.sourceX)} m) has no elevation of its own; it is taken from the receiver elevations at that position (linear, the end value beyond the spread): give a --stations table with the source position to set it` });
  }
  return notes;
}

/** Ground elevation at x from a station table (linear interpolation, end values beyond). */
export function stationElevation(stations: Stations, x: number): number {
  const rows = [...stations.rows].sort((a, b) => a.x - b.x);
  return linearAt(rows.map((r) => r.x), rows.map((r) => r.elev), x);
}

function stationX(stations: Stations | undefined, number: number | undefined): number | undefined {
  if (stations === undefined || number === undefined) return undefined;
  return stations.rows.find((r) => r.station === number)?.x;
}

/**
 * Picks every trace of a record and places it on the line. Positions come from the headers
 * (SOURCE_LOCATION, RECEIVER_LOCATION; or SOURCE_STATION_NUMBER and RECEIVER_STATION_NUMBER
 * through the station table), or from the geometry options where the headers lack them (receiver
 * x = first receiver + (channel − 1) × spacing). Elevations: the station table when one is given
 * (it wins over the headers; geometryNotes says where they differ), else the third location
 * number, else none; a source without one takes the receivers' ground at its position.
 *
 * @throws InputError naming the file, trace and field when a position is missing and not given
 */
export function pickSeg2(record: Seg2Record, options: RecordPickOptions = {}): PickRow[] {
  const placed = placeRecord(record, options);
  const picks = options.wave === 'S' ? pickShearRecord(placed.traces, options).picks : pickRecord(placed.traces, options);
  return placedRows(placed, picks, options.wave);
}

/** A record placed on the line: its traces ready to pick, with their positions. */
export interface PlacedRecord {
  record: Seg2Record;
  sourceId: string;
  geometry: { sourceX: number; receiverX: number; sourceElev?: number; receiverElev?: number }[];
  traces: PickTrace[];
}

/** Pick rows of a placed record from one pick per trace. */
export function placedRows(placed: PlacedRecord, picks: TracePick[], wave?: Wave, sourceId = placed.sourceId, file = placed.record.file): PickRow[] {
  return placed.record.traces.map((t, i) => ({
    sourceId,
    ...placed.geometry[i],
    time: picks[i].time,
    confidence: picks[i].confidence,
    status: picks[i].status,
    file,
    trace: t.index,
    ...(wave ? { wave } : {}),
  }));
}

/**
 * Places a record on the line (positions as for `pickSeg2`) and prepares its traces for picking
 * (band-passed when asked), without picking them.
 *
 * @throws InputError naming the file, trace and field when a position is missing and not given
 */
export function placeRecord(record: Seg2Record, options: RecordPickOptions = {}): PlacedRecord {
  const sourceId = fileStem(record.file);
  const geometry = record.traces.map((t) => {
    const sourceX = options.sourceX ?? t.sourceLocation?.[0] ?? stationX(options.stations, t.sourceStation);
    if (sourceX === undefined) {
      throw new InputError({ file: record.file, trace: t.index, column: 'SOURCE_LOCATION' },
        'no SOURCE_LOCATION (or SOURCE_STATION_NUMBER in a station table) in the header; give the source position with --source-x, or a --stations table');
    }
    const channel = t.channel ?? t.index;
    const fromLayout = options.firstReceiverX !== undefined && options.spacing !== undefined ? options.firstReceiverX + (channel - 1) * options.spacing : undefined;
    const receiverX = fromLayout ?? t.receiverLocation?.[0] ?? stationX(options.stations, t.receiverStation);
    if (receiverX === undefined) {
      throw new InputError({ file: record.file, trace: t.index, column: 'RECEIVER_LOCATION' },
        'no RECEIVER_LOCATION (or RECEIVER_STATION_NUMBER in a station table) in the header; give --first-receiver and --spacing, or a --stations table');
    }
    // A station table given wins over the elevations in the headers (geometryNotes says where they differ).
    const elevation = (location: number[] | undefined, x: number) => (options.stations ? stationElevation(options.stations, x) : location?.[2]);
    return { sourceX, receiverX, sourceElev: elevation(options.sourceX === undefined ? t.sourceLocation : undefined, sourceX), receiverElev: elevation(fromLayout === undefined ? t.receiverLocation : undefined, receiverX) };
  });
  // --source-x without a station table: the source's ground from the receivers around it (linear,
  // the end value beyond the spread), as the first-break reader does; the pick table keeps its elevation columns.
  const withElev = geometry.filter((g) => g.receiverElev !== undefined).sort((a, b) => a.receiverX - b.receiverX);
  if (withElev.length > 0) {
    for (const g of geometry) {
      if (g.sourceElev === undefined) g.sourceElev = linearAt(withElev.map((w) => w.receiverX), withElev.map((w) => w.receiverElev!), g.sourceX);
    }
  }
  const traces = record.traces.map((t, i) => ({
    data: options.bandPass ? bandPass(t.data, t.sampleInterval, options.bandPass[0], options.bandPass[1]) : t.data,
    sampleInterval: t.sampleInterval,
    delay: t.delay,
    offset: geometry[i].receiverX - geometry[i].sourceX,
    dead: t.dead,
  }));
  return { record, sourceId, geometry, traces };
}
