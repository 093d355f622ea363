import { parseArgs, type ParseArgsConfig } from 'node:util';
import { InputError } from '../core/errors.js';
import type { Wave } from '../core/types.js';
import type { LengthUnit } from '../core/units.js';
import { WarningLog } from '../core/warnings.js';
import { readFirstBreaks } from '../io/firstBreaksCsv.js';
import { interpretationJson } from '../io/interpretationJson.js';
import { interpret, VERSION, type InterpretOptions } from '../interpret.js';
import { summary } from '../report/summary.js';
import { keyValue, numberOption } from './args.js';
import { processIo, type CliIo } from './io.js';

const HELP = `hammerline ${VERSION}: seismic-refraction interpretation for shallow site investigation

Usage:
  hammerline interpret FILE.csv [FILE.csv ...] [options]
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
  throw new InputError({}, `unknown command "${command}"; expected interpret (see hammerline --help)`);
}

function parse(args: string[], options: NonNullable<ParseArgsConfig['options']>) {
  try {
    return parseArgs({ args, options, allowPositionals: true, strict: true });
  } catch (error) {
    throw new InputError({}, `${(error as Error).message.replace(/\. To specify.*$/s, '')}; see hammerline --help`);
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
  };
  const toMetres = (v: number) => (unit === 'ft' ? v * 0.3048 : v);
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
    options.breakpoints[name] = list.split(',').map((v) => toMetres(numberOption('breakpoint', v, `an offset in ${unit === 'ft' ? 'feet' : 'metres'}`)));
  }
  if (values['max-segments'] !== undefined) options.maxSegments = numberOption('max-segments', values['max-segments'] as string, 'a count from 1 to 4');

  const documents: Record<string, unknown>[] = [];
  const texts: string[] = [];
  let failed = 0;
  positionals.forEach((file, i) => {
    if (positionals.length > 1 && !values.quiet) io.stderr(`[${i + 1}/${positionals.length}] ${file}\n`);
    try {
      const log = new WarningLog();
      let text: string;
      try {
        text = io.readText(file);
      } catch (error) {
        throw new InputError({ file }, `cannot be read (${(error as NodeJS.ErrnoException).code ?? (error as Error).message}); expected a readable first-break table`);
      }
      const table = readFirstBreaks(text, file, log, { lengthUnit: unit, wave });
      const result = interpret(table, options, log);
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
