import { InputError } from '../core/errors.js';
import { WarningLog } from '../core/warnings.js';
import { readFirstBreaks } from '../io/firstBreaksCsv.js';
import { depthsCsv } from '../io/depthsCsv.js';
import { INTERPRETATION_SCHEMA, interpretationJson } from '../io/interpretationJson.js';
import { pickTableCsv, unpickedSummary } from '../io/pickTable.js';
import { interpret, receiverGround, type InterpretationResult, type InterpretOptions } from '../interpret.js';
import type { FirstBreakTable, Wave } from '../core/types.js';
import type { LengthUnit } from '../core/units.js';
import type { PickRow } from '../picking/recordPicks.js';
import { summary } from '../report/summary.js';
import { compareWithPLine } from '../site/pLineCheck.js';
import { keyValue, lengthUnitOption, listOption, numberOption, parse, readInput, SITE_OPTIONS, siteOptions, waveOption } from './args.js';
import { commandHelp } from './help.js';
import { checkOutputPaths, type CliIo } from './io.js';
import { GEOMETRY_OPTIONS, isSeg2, pickAll, traceLabeller } from './records.js';
import type { RecordGroup } from '../picking/pickRecords.js';
import { round } from '../io/numbers.js';
import { toMetres } from '../core/units.js';
import { pushAll } from '../core/extent.js';
import { DEFAULT_SMOOTHING } from '../model/layeredInversion.js';
import { interpretProject, isProjectFile, pickEditsJson } from './project.js';

/** Options of interpret that choose how a line is interpreted; report accepts the same. */
export const INTERPRET_OPTIONS = {
  units: { type: 'string' },
  wave: { type: 'string' },
  segments: { type: 'string', multiple: true },
  breakpoint: { type: 'string', multiple: true },
  'max-segments': { type: 'string' },
  'through-origin': { type: 'boolean' },
  'allow-short-branches': { type: 'boolean' },
  'no-inversion': { type: 'boolean' },
  'inversion-smoothing': { type: 'string' },
  'inversion-nodes': { type: 'string' },
  'lateral-gradient': { type: 'boolean' },
  quiet: { type: 'boolean', short: 'q' },
  help: { type: 'boolean', short: 'h' },
  'accept-velocities': { type: 'boolean' },
  ...SITE_OPTIONS,
  poisson: { type: 'string' },
  'vp-vs': { type: 'string' },
  'layer-poisson': { type: 'string', multiple: true },
  'layer-vs': { type: 'string', multiple: true },
  'p-line': { type: 'string' },
  ...GEOMETRY_OPTIONS,
} as const;

/** What the options of INTERPRET_OPTIONS ask for: the unit of the input, the wave, interpret's options and the P line to check an S line against. */
export interface InterpretChoices {
  unit: LengthUnit;
  wave: Wave | undefined;
  options: InterpretOptions;
  pLine?: InterpretationResult;
  /** Read times and lengths as given where their apparent velocities look like a unit mistake (a warning instead). */
  acceptVelocities: boolean;
}

/** Parses LAYER:VALUE[:VALUE] of the per-layer options. */
function layerValue(option: string, text: string, expected: string): [number, number[]] {
  const parts = text.split(':');
  if (parts.length < 2 || parts.length > 3) throw new InputError({}, `--${option} ${text}: expected ${expected}`);
  const layer = numberOption(option, parts[0], expected);
  if (!Number.isInteger(layer) || layer < 1) throw new InputError({}, `--${option} ${text}: the layer must be a whole number from 1 (the top layer); expected ${expected}`);
  return [layer, parts.slice(1).map((p) => numberOption(option, p, expected))];
}

/** Reads the options of INTERPRET_OPTIONS, with a message naming the option that is wrong. */
export function interpretChoices(values: Record<string, unknown>, io: CliIo): InterpretChoices {
  const unit = lengthUnitOption(values.units as string | undefined);
  const wave = waveOption(values.wave as string | undefined);
  const acceptVelocities = Boolean(values['accept-velocities']);
  const options: InterpretOptions = {
    wave,
    directThroughOrigin: Boolean(values['through-origin']),
    allowShortBranches: Boolean(values['allow-short-branches']),
    site: siteOptions(values),
  };
  options.inversion = inversionOptions(values, unit);
  if (values.poisson !== undefined && values['vp-vs'] !== undefined) throw new InputError({}, 'give --poisson or --vp-vs, not both');
  if (values.poisson !== undefined) options.vsFromVp = { poisson: listOption('poisson', values.poisson as string, "a Poisson's ratio from 0 to below 0.5") };
  if (values['vp-vs'] !== undefined) options.vsFromVp = { vpVs: listOption('vp-vs', values['vp-vs'] as string, 'a Vp/Vs ratio above 1.414') };
  for (const text of (values['layer-poisson'] as string[] | undefined) ?? []) {
    const [layer, nu] = layerValue('layer-poisson', text, 'LAYER:RATIO, for example 2:0.45 (layer 1 = top)');
    options.vsFromVp = { ...options.vsFromVp, layerPoisson: { ...options.vsFromVp?.layerPoisson, [layer]: nu[0] } };
  }
  for (const text of (values['layer-vs'] as string[] | undefined) ?? []) {
    const [layer, vs] = layerValue('layer-vs', text, `LAYER:VS[:SE] in ${unit === 'ft' ? 'ft/s' : 'm/s'}, for example 2:250 (layer 1 = top)`);
    options.vsFromVp = { ...options.vsFromVp, layerVs: { ...options.vsFromVp?.layerVs, [layer]: { velocity: toMetres(vs[0], unit), se: toMetres(vs[1] ?? 0, unit) } } };
  }
  let pLine: InterpretationResult | undefined;
  if (values['p-line'] !== undefined) {
    const file = values['p-line'] as string;
    if (isSeg2(io, file)) throw new InputError({ file }, '--p-line takes the first-break table of the P line (one file for the whole line), not a SEG-2 record; pick the P records first: hammerline pick P*.seg2 -o P.csv, then --p-line P.csv');
    const log = new WarningLog();
    pLine = interpret(readFirstBreaks(readInput(io, file), file, log, { lengthUnit: unit, wave: 'P', acceptVelocities }), { ...options, wave: 'P', vsFromVp: undefined }, log);
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
  return { unit, wave, options, pLine, acceptVelocities };
}

/**
 * The SEG-2 records of one line, picked and then interpreted together. A record that cannot be
 * read or picked is reported on stderr, left out (a `record-skipped` warning) and listed in
 * `skipped`; the caller exits non-zero.
 */
export function interpretRecords(records: string[], values: Record<string, unknown>, choices: InterpretChoices, io: CliIo): { result: InterpretationResult; table: FirstBreakTable; rows: PickRow[]; groups: RecordGroup[]; skipped: { file: string; message: string }[] } {
  const { rows, skipped, groups, notes } = pickAll(records, values, choices.unit, io, choices.wave ?? 'P');
  const name = records.length === 1 ? records[0] : `${records[0]} and ${records.length - 1} more record${records.length > 2 ? 's' : ''}`;
  const log = new WarningLog();
  for (const s of skipped) log.add('record-skipped', `${s.message}; the record was left out of the interpretation`);
  for (const note of notes ?? []) log.add(note.code, note.message);
  for (const sentence of unpickedSummary(rows)) {
    log.add('unpicked-traces', sentence);
    io.stderr(`hammerline: ${sentence}\n`);
  }
  // The picks reach the interpretation as a table; its rows are traces of records to the user.
  const relabel = traceLabeller(rows);
  let table: FirstBreakTable;
  let result: InterpretationResult;
  try {
    table = readFirstBreaks(pickTableCsv(rows, 'm', false), name, log, { wave: choices.wave, acceptVelocities: choices.acceptVelocities });
    result = interpret(table, { ...choices.options, records: records.filter((r) => !skipped.some((s) => s.file === r)) }, log);
  } catch (error) {
    if (error instanceof InputError) throw new InputError({}, relabel(error.message));
    throw error;
  }
  for (const w of result.warnings) {
    w.message = relabel(w.message);
    if (w.parts) w.parts = w.parts.map((p) => (typeof p === 'string' ? relabel(p) : p));
  }
  checkAgainstPLine(result, name, choices);
  return { result, table, rows, groups: groups ?? [], skipped };
}

/** One first-break table, read and interpreted (an S line checked against the P line when one is given). */
export function interpretTable(file: string, choices: InterpretChoices, io: CliIo): { result: InterpretationResult; table: FirstBreakTable } {
  const log = new WarningLog();
  const table = readFirstBreaks(readInput(io, file), file, log, { lengthUnit: choices.unit, wave: choices.wave, acceptVelocities: choices.acceptVelocities });
  const result = interpret(table, choices.options, log);
  checkAgainstPLine(result, file, choices);
  return { result, table };
}

/** With --p-line: the S line compared with the P line at the same depths, kept in the result (summary and JSON show it). */
export function checkAgainstPLine(result: InterpretationResult, file: string, choices: InterpretChoices): void {
  if (choices.pLine === undefined) return;
  if (result.wave !== 'S') throw new InputError({ file }, '--p-line compares an S-wave line with a P-wave line; this line is not an S-wave line (use --wave S or a wave column)');
  const log = new WarningLog();
  result.pLineCheck = compareWithPLine(result, choices.pLine, log);
  pushAll(result.warnings, log.items);
}

/** hammerline interpret: first-break tables (one line each) or the SEG-2 records of one line. */
export function interpretCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parse(args, {
    json: { type: 'boolean' },
    output: { type: 'string', short: 'o' },
    depths: { type: 'string' },
    ...INTERPRET_OPTIONS,
  });
  if (values.help) {
    io.stdout(commandHelp('interpret'));
    return 0;
  }
  if (positionals.length === 0) throw new InputError({}, 'interpret needs at least one first-break table (FILE.csv), the SEG-2 records of one line, or a project file of the field app (PROJECT.json)');
  checkOutputPaths([...positionals, ...[values['p-line'], values.stations].filter((f): f is string => typeof f === 'string')],
    [{ option: '-o', path: values.output as string | undefined }, { option: '--depths', path: values.depths as string | undefined }]);
  const choices = interpretChoices(values, io);
  const { unit } = choices;

  // A project file of the field app: its line with the picks set by hand, in the project's unit unless --units is given.
  const projectFile = positionals.find((file) => isProjectFile(io, file));
  if (projectFile !== undefined) {
    if (positionals.length > 1) throw new InputError({ file: projectFile }, 'is a project file given with other files; interpret a project file alone (it holds the records or table of its line)');
    const { result, table, rows, line, unit: shown } = interpretProject(projectFile, values, choices, io);
    if (values.depths) io.writeText(values.depths as string, depthsCsv(result, receiverGround(table), shown));
    const document = interpretationJson(result, {
      ...(rows ? { picking: { records: line.records.map((r) => r.name), wave: result.wave, picked: rows.filter((r) => r.time !== undefined).length, traces: rows.length } } : {}),
      pick_edits: pickEditsJson(line.applied),
    });
    if (rows && document.site !== undefined) (document.site as Record<string, unknown>).records = result.records ?? line.records.map((r) => r.name);
    const output = values.json ? JSON.stringify(document, null, 2) + '\n' : summary(result, shown);
    if (values.output) io.writeText(values.output as string, output);
    else io.stdout(output);
    return 0;
  }

  const documents: Record<string, unknown>[] = [];
  const texts: string[] = [];
  let failed = 0;
  let internalErrors = 0;
  const records = positionals.filter((file) => isSeg2(io, file));
  if (records.length > 0) {
    if (records.length !== positionals.length) {
      throw new InputError({ file: positionals.find((f) => !records.includes(f)) }, 'is a first-break table given with SEG-2 records; interpret either tables (one line each) or the records of one line, not both');
    }
    const { result, table, rows, skipped, groups } = interpretRecords(records, values, choices, io);
    if (values.depths) io.writeText(values.depths as string, depthsCsv(result, receiverGround(table), unit));
    const document = interpretationJson(result, {
      picking: {
        records, wave: result.wave, picked: rows.filter((r) => r.time !== undefined).length, traces: rows.length,
        ...(result.wave === 'S' ? { polarity_pairs: groups.map((g) => ({ records: g.files, reversed: g.reversed, source_x_m: g.sourceX, combined: g.check.combined === 'pair' ? 'difference' : 'stack', difference_to_sum_energy: round(g.check.differenceToSum, 3), p_residual: round(g.check.pResidual, 3) })) } : {}),
      },
    });
    // The records a site class rests on.
    if (document.site !== undefined) (document.site as Record<string, unknown>).records = result.records ?? records;
    const output = values.json ? JSON.stringify(document, null, 2) + '\n' : summary(result, unit);
    if (values.output) io.writeText(values.output as string, output);
    else io.stdout(output);
    return skipped.length > 0 ? 2 : 0;
  }
  if (values.depths && positionals.length > 1) throw new InputError({}, '--depths writes the depth table of one line; give one first-break table (or the records of one line)');
  positionals.forEach((file, i) => {
    if (positionals.length > 1 && !values.quiet) io.stderr(`[${i + 1}/${positionals.length}] ${file}\n`);
    try {
      const { result, table } = interpretTable(file, choices, io);
      if (values.depths) io.writeText(values.depths as string, depthsCsv(result, receiverGround(table), unit));
      if (values.json) documents.push(interpretationJson(result));
      else texts.push(summary(result, unit));
    } catch (error) {
      if (positionals.length === 1) throw error;
      // In a batch every file is tried: bad input is reported and skipped (status 2), and so is an
      // internal error, reported as one (status 1), so that one file never loses the others.
      const internal = !(error instanceof InputError);
      if (internal) internalErrors++;
      else failed++;
      const message = internal ? `${file}: internal error (please report it with this file): ${error instanceof Error ? error.message : String(error)}` : error.message;
      io.stderr(`hammerline: ${message}\n`);
      if (values.json) documents.push({ schema: INTERPRETATION_SCHEMA, file, error: { message } });
      else texts.push(`hammerline: ${file}: not interpreted (see the message on stderr)\n`);
    }
  });
  const output = values.json
    ? JSON.stringify(positionals.length === 1 ? documents[0] : documents, null, 2) + '\n'
    : texts.join('\n');
  if (values.output) io.writeText(values.output as string, output);
  else io.stdout(output);
  if (failed + internalErrors > 0 && positionals.length > 1) io.stderr(`hammerline: ${failed + internalErrors} of ${positionals.length} files not interpreted\n`);
  return internalErrors > 0 ? 1 : failed > 0 ? 2 : 0;
}

/** The layered inversion's options from --no-inversion, --inversion-smoothing, --inversion-nodes and --lateral-gradient. */
function inversionOptions(values: Record<string, unknown>, unit: LengthUnit): InterpretOptions['inversion'] {
  const tuning = ['inversion-smoothing', 'inversion-nodes', 'lateral-gradient'].filter((name) => values[name] !== undefined);
  if (values['no-inversion']) {
    if (tuning.length > 0) throw new InputError({}, `--no-inversion switches the layered inversion off; --${tuning[0]} cannot be given with it`);
    return false;
  }
  const options: NonNullable<Exclude<InterpretOptions['inversion'], false>> = {};
  if (values['inversion-smoothing'] !== undefined) {
    options.smoothing = numberOption('inversion-smoothing', values['inversion-smoothing'] as string, `a smoothing weight of 0 or more (default ${DEFAULT_SMOOTHING})`);
    if (options.smoothing < 0) throw new InputError({}, `--inversion-smoothing ${values['inversion-smoothing'] as string}: expected a smoothing weight of 0 or more (default ${DEFAULT_SMOOTHING})`);
  }
  if (values['inversion-nodes'] !== undefined) {
    const expected = `a node spacing in ${unit === 'ft' ? 'feet' : 'metres'}, above 0 (default the geophone spacing)`;
    const spacing = numberOption('inversion-nodes', values['inversion-nodes'] as string, expected);
    if (!(spacing > 0)) throw new InputError({}, `--inversion-nodes ${values['inversion-nodes'] as string}: expected ${expected}`);
    options.nodeSpacing = toMetres(spacing, unit);
  }
  if (values['lateral-gradient']) options.lateralGradient = true;
  return options;
}
