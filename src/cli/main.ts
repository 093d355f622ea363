import { parseArgs, type ParseArgsConfig } from 'node:util';
import { InputError } from '../core/errors.js';
import type { Wave } from '../core/types.js';
import type { LengthUnit } from '../core/units.js';
import { WarningLog } from '../core/warnings.js';
import { readFirstBreaks } from '../io/firstBreaksCsv.js';
import { interpretationJson } from '../io/interpretationJson.js';
import { interpret, VERSION, type InterpretationResult, type InterpretOptions } from '../interpret.js';
import { siteJson } from '../io/siteJson.js';
import { siteSummary } from '../report/siteSummary.js';
import { summary } from '../report/summary.js';
import { pickTableCsv, unpickedSummary } from '../io/pickTable.js';
import { readSeg2 } from '../io/seg2/read.js';
import type { Seg2Record } from '../io/seg2/types.js';
import { readStations } from '../io/stationsCsv.js';
import { pickSeg2, type PickRow, type RecordPickOptions } from '../picking/recordPicks.js';
import { checkShearSlowerThanP } from '../site/fromInterpretation.js';
import { assessSite, type SiteInput, type SiteOptions } from '../site/siteAssessment.js';
import { fromMetres, toMetres } from '../core/units.js';
import { keyValue, numberOption } from './args.js';
import { processIo, type CliIo } from './io.js';

const HELP = `hammerline ${VERSION}: seismic-refraction interpretation for shallow site investigation

Usage:
  hammerline interpret FILE.csv [FILE.csv ...] [options]
  hammerline interpret SHOT.seg2 [SHOT.seg2 ...] [geometry and picking options] [options]
  hammerline pick SHOT.seg2 [SHOT.seg2 ...] [-o FILE.csv] [geometry and picking options]
  hammerline records SHOT.seg2 [...] [--json]
  hammerline site --layer THICKNESS:VELOCITY[:SE] [--layer ...] [--halfspace VELOCITY[:SE]] [options]
  hammerline --help | --version

interpret: reads first-break tables (CSV: source_id, source_x, source_elev, receiver_x,
receiver_elev, time_ms or time_s, optional wave) and prints layer velocities with their standard
errors, depths to each refractor under every source, warnings and cautions.

Options for interpret:
  --json                   print the JSON document (schema hammerline/interpretation@1; one
                           document for one file, an array for several); always in metres and m/s
  -o, --output FILE        write the summary or JSON to FILE instead of stdout (whole or not at all)
  --units m|ft             unit of lengths in the input and of the summary (default m; velocities
                           then in ft/s)
  --wave P|S               wave type of the picks, when the table has no wave column (default P)
  --segments N | BRANCH=N  fix the number of segments (1 to 4) for every branch or for one branch;
                           a branch is SOURCE:forward (+x side) or SOURCE:reverse (-x side)
  --breakpoint BRANCH=OFFSET[,OFFSET...]
                           fix where new segments start on a branch, as offsets in the input unit
  --max-segments N         most segments the criterion may choose (1 to 4, default 4)
  --through-origin         force the direct-wave segment through the origin (common practice
                           where the trigger is sound)
  --allow-short-branches   leave out sides of a source with fewer than 3 picks instead of stopping
  -q, --quiet              no progress messages on stderr

Site class (Vs30; ASCE 7-16, ASCE 7-22, EN 1998-1:2004), printed for S-wave lines, or for P-wave
lines given a Poisson's ratio:
  --poisson NU[,NU...]     Poisson's ratio, one for every layer or one per layer top down, to
                           ESTIMATE Vs from Vp (the classes are then labelled estimated)
  --vp-vs R[,R...]         the same as a Vp/Vs ratio
  --p-line FILE.csv        the P-wave line over the same ground, to check that Vs < Vp
  --draws N                Monte Carlo draws (at least 2000, default 4000)
  --seed N                 Monte Carlo seed (default 1)

Shot records (SEG-2; recognised by their first bytes, whatever the name). Several records given
to interpret are the shots of one line: they are picked, then interpreted together.
  --source-x X             source position along the line (for records whose headers lack it)
  --first-receiver X --spacing D
                           receiver positions X + (channel - 1) × D (for headers without them)
  --stations FILE.csv      station table (x, elev, optional station): ground elevations, and
                           positions of records that give only station numbers
  --bandpass LOW,HIGH      4th-order Butterworth band-pass before picking, zero phase, in Hz
  pick writes the first-break table (with confidence, source_file and trace columns); traces
  left unpicked (dead, no clear onset, inconsistent with their neighbours) are listed on stderr.

site: classes a hand-entered shear-wave profile (for example from a downhole test):
  --layer T:V[:SE]         a layer T thick (m, or ft with --units ft) at shear-wave velocity V
                           (m/s or ft/s), with an optional standard error of V; top down, repeatable
  --halfspace V[:SE]       velocity below the last layer (default: the last layer continues)
  --estimated              the velocities are estimates, not measurements
  --json, --units, --draws, --seed as above

Exit status: 0 success, 2 bad input (message on stderr), 1 internal error.
`;

/**
 * The command line as a function of its arguments, so tests can call it.
 * @returns the exit status: 0 success, 2 bad input, 1 internal error
 */
export function main(argv: string[], io: CliIo = processIo): number {
  try {
    return run(argv, io);
  } catch (error) {
    if (error instanceof InputError) {
      io.stderr(`hammerline: ${error.message}\n`);
      return 2;
    }
    const text = error instanceof Error ? `${error.message}\n${error.stack ?? ''}` : String(error);
    io.stderr(`hammerline: internal error (please report it with the input that caused it): ${text}\n`);
    return 1;
  }
}

function run(argv: string[], io: CliIo): number {
  const [command, ...rest] = argv;
  if (command === undefined || command === '--help' || command === '-h' || command === 'help') {
    io.stdout(HELP);
    return command === undefined ? 2 : 0;
  }
  if (command === '--version' || command === '-v') {
    io.stdout(`hammerline ${VERSION}\n`);
    return 0;
  }
  if (command === 'interpret') return interpretCommand(rest, io);
  if (command === 'site') return siteCommand(rest, io);
  if (command === 'pick') return pickCommand(rest, io);
  if (command === 'records') return recordsCommand(rest, io);
  throw new InputError({}, `unknown command "${command}"; expected interpret, pick, records or site (see hammerline --help)`);
}

function parse(args: string[], options: NonNullable<ParseArgsConfig['options']>) {
  try {
    return parseArgs({ args, options, allowPositionals: true, strict: true });
  } catch (error) {
    const message = (error as Error).message;
    const ambiguous = /Option '(--[\w-]+)' argument is ambiguous/.exec(message);
    if (ambiguous) throw new InputError({}, `${ambiguous[1]}: a value starting with "-" must be joined with "=", for example ${ambiguous[1]}=-6`);
    throw new InputError({}, `${message.split('\n')[0].replace(/\. To specify.*$/s, '')}; see hammerline --help`);
  }
}

function interpretCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parse(args, {
    json: { type: 'boolean' },
    output: { type: 'string', short: 'o' },
    units: { type: 'string' },
    wave: { type: 'string' },
    segments: { type: 'string', multiple: true },
    breakpoint: { type: 'string', multiple: true },
    'max-segments': { type: 'string' },
    'through-origin': { type: 'boolean' },
    'allow-short-branches': { type: 'boolean' },
    quiet: { type: 'boolean', short: 'q' },
    help: { type: 'boolean', short: 'h' },
    ...SITE_OPTIONS,
    poisson: { type: 'string' },
    'vp-vs': { type: 'string' },
    'p-line': { type: 'string' },
    ...GEOMETRY_OPTIONS,
  });
  if (values.help) {
    io.stdout(HELP);
    return 0;
  }
  if (positionals.length === 0) throw new InputError({}, 'interpret needs at least one first-break table (FILE.csv)');
  const unit = lengthUnitOption(values.units as string | undefined);
  const wave = waveOption(values.wave as string | undefined);
  const options: InterpretOptions = {
    wave,
    directThroughOrigin: Boolean(values['through-origin']),
    allowShortBranches: Boolean(values['allow-short-branches']),
    site: siteOptions(values),
  };
  if (values.poisson !== undefined && values['vp-vs'] !== undefined) throw new InputError({}, 'give --poisson or --vp-vs, not both');
  if (values.poisson !== undefined) options.vsFromVp = { poisson: listOption('poisson', values.poisson as string, "a Poisson's ratio from 0 to below 0.5") };
  if (values['vp-vs'] !== undefined) options.vsFromVp = { vpVs: listOption('vp-vs', values['vp-vs'] as string, 'a Vp/Vs ratio above 1.414') };
  let pLine: InterpretationResult | undefined;
  if (values['p-line'] !== undefined) {
    const file = values['p-line'] as string;
    const log = new WarningLog();
    pLine = interpret(readFirstBreaks(readInput(io, file), file, log, { lengthUnit: unit, wave: 'P' }), { ...options, wave: 'P', vsFromVp: undefined }, log);
  }
  for (const text of (values.segments as string[] | undefined) ?? []) {
    options.segments ??= {};
    if (!text.includes('=')) options.segments['*'] = numberOption('segments', text, 'a segment count from 1 to 4');
    else {
      const [name, count] = keyValue('segments', text);
      options.segments[name] = numberOption('segments', count, 'a segment count from 1 to 4');
    }
  }
  for (const text of (values.breakpoint as string[] | undefined) ?? []) {
    options.breakpoints ??= {};
    const [name, list] = keyValue('breakpoint', text);
    options.breakpoints[name] = list.split(',').map((v) => toMetres(numberOption('breakpoint', v, `an offset in ${unit === 'ft' ? 'feet' : 'metres'}`), unit));
  }
  if (values['max-segments'] !== undefined) options.maxSegments = numberOption('max-segments', values['max-segments'] as string, 'a count from 1 to 4');

  const documents: Record<string, unknown>[] = [];
  const texts: string[] = [];
  let failed = 0;
  const records = positionals.filter((file) => isSeg2(io, file));
  if (records.length > 0) {
    if (records.length !== positionals.length) {
      throw new InputError({ file: positionals.find((f) => !records.includes(f)) }, 'is a first-break table given with SEG-2 records; interpret either tables (one line each) or the records of one line, not both');
    }
    const rows = pickAll(records, values, unit, io);
    const name = records.length === 1 ? records[0] : `${records[0]} and ${records.length - 1} more record${records.length > 2 ? 's' : ''}`;
    const log = new WarningLog();
    for (const sentence of unpickedSummary(rows)) log.add('unpicked-traces', sentence);
    const table = readFirstBreaks(pickTableCsv(rows), name, log, { wave });
    const result = interpret(table, options, log);
    const output = values.json ? JSON.stringify(interpretationJson(result, { picking: { records, picked: rows.filter((r) => r.time !== undefined).length, traces: rows.length } }), null, 2) + '\n' : summary(result, unit);
    if (values.output) io.writeText(values.output as string, output);
    else io.stdout(output);
    return 0;
  }
  positionals.forEach((file, i) => {
    if (positionals.length > 1 && !values.quiet) io.stderr(`[${i + 1}/${positionals.length}] ${file}\n`);
    try {
      const log = new WarningLog();
      const table = readFirstBreaks(readInput(io, file), file, log, { lengthUnit: unit, wave });
      const result = interpret(table, options, log);
      if (pLine !== undefined) {
        if (result.wave !== 'S') throw new InputError({ file }, '--p-line compares an S-wave line with a P-wave line; this line is not an S-wave line (use --wave S or a wave column)');
        checkShearSlowerThanP(result, pLine);
      }
      if (values.json) documents.push(interpretationJson(result));
      else texts.push(summary(result, unit));
    } catch (error) {
      if (!(error instanceof InputError) || positionals.length === 1) throw error;
      failed++;
      io.stderr(`hammerline: ${error.message}\n`);
      if (values.json) documents.push({ schema: 'hammerline/interpretation@1', file, error: { message: error.message } });
      else texts.push(`hammerline: ${file}: not interpreted (see the message on stderr)\n`);
    }
  });
  const output = values.json
    ? JSON.stringify(positionals.length === 1 ? documents[0] : documents, null, 2) + '\n'
    : texts.join('\n');
  if (values.output) io.writeText(values.output as string, output);
  else io.stdout(output);
  return failed > 0 ? 2 : 0;
}

const GEOMETRY_OPTIONS = {
  'source-x': { type: 'string' },
  'first-receiver': { type: 'string' },
  spacing: { type: 'string' },
  stations: { type: 'string' },
  bandpass: { type: 'string' },
} as const;

/** True when the file starts with the SEG-2 file block ID in either byte order. */
function isSeg2(io: CliIo, file: string): boolean {
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

function pickAll(files: string[], values: Record<string, unknown>, unit: LengthUnit, io: CliIo): PickRow[] {
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

function pickCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parse(args, { ...GEOMETRY_OPTIONS, output: { type: 'string', short: 'o' }, units: { type: 'string' }, quiet: { type: 'boolean', short: 'q' }, help: { type: 'boolean', short: 'h' } });
  if (values.help) { io.stdout(HELP); return 0; }
  if (positionals.length === 0) throw new InputError({}, 'pick needs at least one SEG-2 record (SHOT.seg2)');
  const unit = lengthUnitOption(values.units as string | undefined);
  const rows = pickAll(positionals, values, unit, io);
  for (const sentence of unpickedSummary(rows)) io.stderr(`hammerline: ${sentence}\n`);
  const csv = pickTableCsv(rows, unit);
  if (values.output) io.writeText(values.output as string, csv);
  else io.stdout(csv);
  return 0;
}

function recordsCommand(args: string[], io: CliIo): number {
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

const SITE_OPTIONS = {
  draws: { type: 'string' },
  seed: { type: 'string' },
} as const;

function siteOptions(values: Record<string, unknown>): SiteOptions {
  const options: SiteOptions = {};
  if (values.draws !== undefined) {
    options.draws = numberOption('draws', values.draws as string, 'a whole number of at least 2000');
    if (!(Number.isInteger(options.draws) && options.draws >= 2000)) throw new InputError({}, `--draws ${values.draws as string}: expected a whole number of at least 2000`);
  }
  if (values.seed !== undefined) options.seed = numberOption('seed', values.seed as string, 'a whole number');
  return options;
}

function listOption(option: string, text: string, expected: string): number[] {
  return text.split(',').map((v) => numberOption(option, v, expected));
}

function readInput(io: CliIo, file: string): string {
  try {
    return io.readText(file);
  } catch (error) {
    throw new InputError({ file }, `cannot be read (${(error as NodeJS.ErrnoException).code ?? (error as Error).message}); expected a readable first-break table`);
  }
}

function siteCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parse(args, {
    layer: { type: 'string', multiple: true },
    halfspace: { type: 'string' },
    estimated: { type: 'boolean' },
    json: { type: 'boolean' },
    output: { type: 'string', short: 'o' },
    units: { type: 'string' },
    help: { type: 'boolean', short: 'h' },
    ...SITE_OPTIONS,
  });
  if (values.help) {
    io.stdout(HELP);
    return 0;
  }
  if (positionals.length > 0) throw new InputError({}, `site takes a hand-entered profile (--layer, --halfspace), not files; for a line use: hammerline interpret ${positionals[0]}`);
  const unit = lengthUnitOption(values.units as string | undefined);
  const toSi = (v: number) => toMetres(v, unit);
  const layers = ((values.layer as string[] | undefined) ?? []).map((text) => {
    const parts = text.split(':');
    if (parts.length < 2 || parts.length > 3) throw new InputError({}, `--layer ${text}: expected THICKNESS:VELOCITY or THICKNESS:VELOCITY:SE, for example 4:185`);
    const thickness = numberOption('layer', parts[0], `a thickness in ${unit === 'ft' ? 'feet' : 'metres'}`);
    const velocity = numberOption('layer', parts[1], `a velocity in ${unit === 'ft' ? 'ft/s' : 'm/s'}`);
    const se = parts[2] === undefined ? 0 : numberOption('layer', parts[2], 'a standard error of the velocity');
    if (!(thickness > 0) || !(velocity > 0) || se < 0) throw new InputError({}, `--layer ${text}: expected a thickness and a velocity above 0 and a standard error of 0 or more`);
    return { thickness: toSi(thickness), velocity: toSi(velocity), se: toSi(se) };
  });
  if (layers.length === 0) throw new InputError({}, 'site needs at least one --layer THICKNESS:VELOCITY');
  let halfspace: { velocity: number; se: number } | undefined;
  if (values.halfspace !== undefined) {
    const [v, se] = (values.halfspace as string).split(':');
    halfspace = { velocity: toSi(numberOption('halfspace', v, 'a velocity')), se: se === undefined ? 0 : toSi(numberOption('halfspace', se, 'a standard error')) };
    if (!(halfspace.velocity > 0)) throw new InputError({}, `--halfspace ${values.halfspace as string}: expected a velocity above 0`);
  }
  const all = halfspace ? [...layers, { thickness: 0, ...halfspace }] : layers;
  const depths: number[] = [];
  for (let i = 0; i < all.length - 1; i++) depths.push((depths[i - 1] ?? 0) + all[i].thickness);
  const input: SiteInput = {
    velocities: all.map((l) => l.velocity),
    velocitySes: all.map((l) => l.se),
    stations: [{ x: 0, depths, depthSes: depths.map(() => 0) }],
    estimatedFromVp: false,
    estimatedByUser: Boolean(values.estimated),
    profileBase: halfspace ? depths[depths.length - 1] : layers.reduce((a, l) => a + l.thickness, 0),
  };
  const site = assessSite(input, siteOptions(values));
  const output = values.json
    ? JSON.stringify({ schema: 'hammerline/site@1', program: { name: 'hammerline', version: VERSION }, units: { length: 'm', velocity: 'm/s' },
      profile: all.map((l, i) => ({ layer: i + 1, thickness_m: i < layers.length ? Number(l.thickness.toFixed(3)) : null, velocity_mps: Number(l.velocity.toFixed(1)), velocity_se_mps: Number(l.se.toFixed(1)) })),
      site: siteJson(site) }, null, 2) + '\n'
    : [`hammerline ${VERSION}: hand-entered shear-wave profile`, ...all.map((l, i) => `  layer ${i + 1}: ${i < layers.length ? `${fromMetres(l.thickness, unit).toFixed(2)} ${unit}` : 'half-space'} at ${Math.round(fromMetres(l.velocity, unit))} ${unit === 'ft' ? 'ft/s' : 'm/s'}${l.se > 0 ? ` ± ${Math.round(fromMetres(l.se, unit))}` : ''}`), '', ...siteSummary(site, unit)].join('\n') + '\n';
  if (values.output) io.writeText(values.output as string, output);
  else io.stdout(output);
  return 0;
}

function lengthUnitOption(text: string | undefined): LengthUnit {
  if (text === undefined || text === 'm') return 'm';
  if (text === 'ft') return 'ft';
  throw new InputError({}, `--units ${text}: expected m or ft`);
}

function waveOption(text: string | undefined): Wave | undefined {
  if (text === undefined) return undefined;
  const upper = text.toUpperCase();
  if (upper === 'P' || upper === 'S') return upper;
  throw new InputError({}, `--wave ${text}: expected P or S`);
}
