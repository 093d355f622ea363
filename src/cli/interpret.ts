import { InputError } from '../core/errors.js';
import { WarningLog } from '../core/warnings.js';
import { readFirstBreaks } from '../io/firstBreaksCsv.js';
import { depthsCsv } from '../io/depthsCsv.js';
import { INTERPRETATION_SCHEMA, interpretationJson } from '../io/interpretationJson.js';
import { pickTableCsv, unpickedSummary } from '../io/pickTable.js';
import { interpret, receiverGround, type InterpretationResult, type InterpretOptions } from '../interpret.js';
import { summary } from '../report/summary.js';
import { checkShearSlowerThanP } from '../site/fromInterpretation.js';
import { keyValue, lengthUnitOption, listOption, numberOption, parse, readInput, SITE_OPTIONS, siteOptions, waveOption } from './args.js';
import { HELP } from './help.js';
import { checkOutputPaths, type CliIo } from './io.js';
import { GEOMETRY_OPTIONS, isSeg2, pickAll } from './records.js';
import { toMetres } from '../core/units.js';

/** hammerline interpret: first-break tables (one line each) or the SEG-2 records of one line. */
export function interpretCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parse(args, {
    json: { type: 'boolean' },
    output: { type: 'string', short: 'o' },
    depths: { type: 'string' },
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
  checkOutputPaths([...positionals, ...[values['p-line'], values.stations].filter((f): f is string => typeof f === 'string')],
    [{ option: '-o', path: values.output as string | undefined }, { option: '--depths', path: values.depths as string | undefined }]);
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
    const table = readFirstBreaks(pickTableCsv(rows, 'm', false), name, log, { wave });
    const result = interpret(table, options, log);
    if (values.depths) io.writeText(values.depths as string, depthsCsv(result, receiverGround(table), unit));
    const output = values.json ? JSON.stringify(interpretationJson(result, { picking: { records, picked: rows.filter((r) => r.time !== undefined).length, traces: rows.length } }), null, 2) + '\n' : summary(result, unit);
    if (values.output) io.writeText(values.output as string, output);
    else io.stdout(output);
    return 0;
  }
  if (values.depths && positionals.length > 1) throw new InputError({}, '--depths writes the depth table of one line; give one first-break table (or the records of one line)');
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
      if (values.depths) io.writeText(values.depths as string, depthsCsv(result, receiverGround(table), unit));
      if (values.json) documents.push(interpretationJson(result));
      else texts.push(summary(result, unit));
    } catch (error) {
      if (!(error instanceof InputError) || positionals.length === 1) throw error;
      failed++;
      io.stderr(`hammerline: ${error.message}\n`);
      if (values.json) documents.push({ schema: INTERPRETATION_SCHEMA, file, error: { message: error.message } });
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

