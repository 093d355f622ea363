import { InputError } from '../core/errors.js';
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
 * x = first receiver + (channel − 1) × spacing). Elevations: the third location number, else the
 * station table, else none.
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
    const elevation = (location: number[] | undefined, x: number) => location?.[2] ?? (options.stations ? stationElevation(options.stations, x) : undefined);
    return { sourceX, receiverX, sourceElev: elevation(options.sourceX === undefined ? t.sourceLocation : undefined, sourceX), receiverElev: elevation(fromLayout === undefined ? t.receiverLocation : undefined, receiverX) };
  });
  const traces = record.traces.map((t, i) => ({
    data: options.bandPass ? bandPass(t.data, t.sampleInterval, options.bandPass[0], options.bandPass[1]) : t.data,
    sampleInterval: t.sampleInterval,
    delay: t.delay,
    offset: geometry[i].receiverX - geometry[i].sourceX,
    dead: t.dead,
  }));
  return { record, sourceId, geometry, traces };
}
