import { InputError } from '../core/errors.js';
import { toMetres, type LengthUnit } from '../core/units.js';
import { pickTableCsv, unpickedSummary } from '../io/pickTable.js';
import { readSeg2 } from '../io/seg2/read.js';
import type { Seg2Record } from '../io/seg2/types.js';
import { readStations } from '../io/stationsCsv.js';
import { pickSeg2, type PickRow, type RecordPickOptions } from '../picking/recordPicks.js';
import { HELP } from './help.js';
import { lengthUnitOption, listOption, numberOption, parse, readInput } from './args.js';
import { checkOutputPaths, type CliIo } from './io.js';

/** Options that place and pick shot records, shared by pick and interpret. */
export const GEOMETRY_OPTIONS = {
  'source-x': { type: 'string' },
  'first-receiver': { type: 'string' },
  spacing: { type: 'string' },
  stations: { type: 'string' },
  bandpass: { type: 'string' },
} as const;

/** True when the file starts with the SEG-2 file block ID in either byte order. */
export function isSeg2(io: CliIo, file: string): boolean {
  let bytes: Uint8Array;
  try {
    bytes = io.readBytes(file);
  } catch (error) {
    throw new InputError({ file }, `cannot be read (${(error as NodeJS.ErrnoException).code ?? (error as Error).message}); expected a first-break table or a SEG-2 record`);
  }
  return bytes.length >= 2 && ((bytes[0] === 0x55 && bytes[1] === 0x3a) || (bytes[0] === 0x3a && bytes[1] === 0x55));
}

function recordOptions(values: Record<string, unknown>, unit: LengthUnit, io: CliIo): RecordPickOptions {
  const length = (name: string) => (values[name] === undefined ? undefined : toMetres(numberOption(name, values[name] as string, `a position in ${unit === 'ft' ? 'feet' : 'metres'}`), unit));
  const options: RecordPickOptions = { sourceX: length('source-x'), firstReceiverX: length('first-receiver'), spacing: length('spacing') };
  if ((options.firstReceiverX === undefined) !== (options.spacing === undefined)) throw new InputError({}, 'give --first-receiver and --spacing together');
  if (values.stations !== undefined) options.stations = readStations(readInput(io, values.stations as string), values.stations as string, unit);
  if (values.bandpass !== undefined) {
    const corners = listOption('bandpass', values.bandpass as string, 'a corner frequency in Hz');
    if (corners.length !== 2) throw new InputError({}, `--bandpass ${values.bandpass as string}: expected LOW,HIGH in Hz, for example 10,250`);
    options.bandPass = [corners[0], corners[1]];
  }
  return options;
}

function readRecord(io: CliIo, file: string): Seg2Record {
  if (!isSeg2(io, file)) throw new InputError({ file }, 'is not a SEG-2 record: it does not start with the SEG-2 block ID (bytes 55 3A or 3A 55)');
  return readSeg2(io.readBytes(file), file);
}

export function pickAll(files: string[], values: Record<string, unknown>, unit: LengthUnit, io: CliIo): PickRow[] {
  const options = recordOptions(values, unit, io);
  const rows: PickRow[] = [];
  files.forEach((file, i) => {
    if (files.length > 1 && !values.quiet) io.stderr(`[${i + 1}/${files.length}] picking ${file}\n`);
    const record = readRecord(io, file);
    try {
      rows.push(...pickSeg2(record, options));
    } catch (error) {
      if (error instanceof RangeError) throw new InputError({ file }, error.message);
      throw error;
    }
  });
  return rows;
}

export function pickCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parse(args, { ...GEOMETRY_OPTIONS, output: { type: 'string', short: 'o' }, units: { type: 'string' }, quiet: { type: 'boolean', short: 'q' }, help: { type: 'boolean', short: 'h' } });
  if (values.help) { io.stdout(HELP); return 0; }
  if (positionals.length === 0) throw new InputError({}, 'pick needs at least one SEG-2 record (SHOT.seg2)');
  checkOutputPaths([...positionals, ...(typeof values.stations === 'string' ? [values.stations] : [])], [{ option: '-o', path: values.output as string | undefined }]);
  const unit = lengthUnitOption(values.units as string | undefined);
  const rows = pickAll(positionals, values, unit, io);
  for (const sentence of unpickedSummary(rows)) io.stderr(`hammerline: ${sentence}\n`);
  const csv = pickTableCsv(rows, unit);
  if (values.output) io.writeText(values.output as string, csv);
  else io.stdout(csv);
  return 0;
}

export function recordsCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parse(args, { json: { type: 'boolean' }, help: { type: 'boolean', short: 'h' } });
  if (values.help) { io.stdout(HELP); return 0; }
  if (positionals.length === 0) throw new InputError({}, 'records needs at least one SEG-2 record (SHOT.seg2)');
  const summaries = positionals.map((file) => {
    const record = readRecord(io, file);
    const t = record.traces;
    const receivers = t.map((tr) => tr.receiverLocation?.[0]).filter((x): x is number => x !== undefined);
    const sources = [...new Set(t.map((tr) => tr.sourceLocation?.[0]).filter((x): x is number => x !== undefined))];
    return {
      file, byte_order: record.byteOrder, revision: record.revision, traces: t.length,
      format_codes: [...new Set(t.map((tr) => tr.formatCode))],
      samples: [...new Set(t.map((tr) => tr.raw.length))],
      sample_interval_s: [...new Set(t.map((tr) => tr.sampleInterval))],
      delay_s: [...new Set(t.map((tr) => tr.delay))],
      units: record.units,
      source_x_m: sources,
      receiver_x_m: receivers.length > 0 ? { first: Math.min(...receivers), last: Math.max(...receivers), count: receivers.length } : null,
      receivers_without_location: t.filter((tr) => tr.receiverLocation === undefined && tr.receiverStation === undefined).map((tr) => tr.index),
      dead_traces: t.filter((tr) => tr.dead).map((tr) => tr.index),
      stack: [...new Set(t.map((tr) => tr.stack).filter((v) => v !== undefined))],
      keywords: record.keywords,
      notes: record.notes,
      remarks: record.remarks,
    };
  });
  if (values.json) io.stdout(JSON.stringify(positionals.length === 1 ? summaries[0] : summaries, null, 2) + '\n');
  else {
    for (const s of summaries) {
      io.stdout([
        `${s.file}: SEG-2 revision ${s.revision}, ${s.byte_order}-endian, ${s.traces} traces, format code ${s.format_codes.join('/')}, ${s.samples.join('/')} samples at ${s.sample_interval_s.map((v) => v * 1e3).join('/')} ms, first sample at ${s.delay_s.map((v) => v * 1e3).join('/')} ms`,
        `  source x: ${s.source_x_m.length > 0 ? s.source_x_m.map((v) => v.toFixed(2)).join(', ') + ' m' : 'not in the headers (give --source-x)'}; receivers: ${s.receiver_x_m ? `${s.receiver_x_m.count} from ${s.receiver_x_m.first.toFixed(2)} to ${s.receiver_x_m.last.toFixed(2)} m` : 'no positions in the headers (give --first-receiver and --spacing, or --stations)'}; units ${s.units}`,
        `  dead traces: ${s.dead_traces.length > 0 ? s.dead_traces.join(', ') : 'none'}; stack: ${s.stack.length > 0 ? s.stack.join('/') : 'not given'}`,
        ...Object.entries(s.keywords).filter(([k]) => k !== 'NOTE').map(([k, v]) => `  ${k}: ${v}`),
        ...s.notes.map((n) => `  NOTE: ${n}`),
        ...s.remarks.map((r) => `  ! ${r}`),
        '',
      ].join('\n') + '\n');
    }
  }
  return 0;
}
