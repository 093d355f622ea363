import { InputError } from '../core/errors.js';
import { WarningLog } from '../core/warnings.js';
import { readFirstBreaks } from '../io/firstBreaksCsv.js';
import { pickTableCsv, unpickedSummary } from '../io/pickTable.js';
import { TOMOGRAM_CAUTIONS, tomogramCsv, tomogramJson } from '../io/tomogramJson.js';
import { interpret, type InterpretationResult } from '../interpret.js';
import { tomography, type Tomogram, type TomographyOptions } from '../tomography/tomography.js';
import { lengthUnitOption, listOption, numberOption, parse, readInput, waveOption } from './args.js';
import { TOMOGRAPHY_HELP } from './help.js';
import { checkOutputPaths, type CliIo } from './io.js';
import { GEOMETRY_OPTIONS, isSeg2, pickAll } from './records.js';
import type { FirstBreakTable } from '../core/types.js';

/** hammerline tomography: first-arrival traveltime tomography of one line, beside its layered interpretation. */
export function tomographyCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parse(args, {
    json: { type: 'boolean' },
    output: { type: 'string', short: 'o' },
    'grid-csv': { type: 'string' },
    contour: { type: 'string', multiple: true },
    cell: { type: 'string' },
    depth: { type: 'string' },
    'velocity-range': { type: 'string' },
    smoothing: { type: 'string' },
    'pick-noise': { type: 'string' },
    'max-iterations': { type: 'string' },
    units: { type: 'string' },
    wave: { type: 'string' },
    help: { type: 'boolean', short: 'h' },
    ...GEOMETRY_OPTIONS,
  });
  if (values.help) {
    io.stdout(TOMOGRAPHY_HELP);
    return 0;
  }
  if (positionals.length === 0) throw new InputError({}, 'tomography needs the first-break table of one line, or its SEG-2 records');
  checkOutputPaths([...positionals, ...[values.stations].filter((f): f is string => typeof f === 'string')],
    [{ option: '-o', path: values.output as string | undefined }, { option: '--grid-csv', path: values['grid-csv'] as string | undefined }]);
  const unit = lengthUnitOption(values.units as string | undefined);
  const wave = waveOption(values.wave as string | undefined);
  const feet = unit === 'ft' ? 0.3048 : 1;
  const options: TomographyOptions = {};
  if (values.contour !== undefined) {
    options.contours = (values.contour as string[]).flatMap((text) => listOption('contour', text, `a velocity in ${unit === 'ft' ? 'ft/s' : 'm/s'}`)).map((v) => v * feet);
    for (const v of options.contours) if (!(v > 0)) throw new InputError({}, `--contour ${v}: expected a positive velocity`);
  }
  if (values.cell !== undefined) options.cell = positive('cell', values.cell as string, unit) * feet;
  if (values.depth !== undefined) options.depth = positive('depth', values.depth as string, unit) * feet;
  if (values['pick-noise'] !== undefined) options.noise = positive('pick-noise', values['pick-noise'] as string, 'ms') * 1e-3;
  if (values['max-iterations'] !== undefined) options.maxIterations = Math.round(positive('max-iterations', values['max-iterations'] as string, 'iterations'));
  if (values['velocity-range'] !== undefined) {
    const [low, high] = listOption('velocity-range', values['velocity-range'] as string, 'LOW,HIGH velocities');
    if (!(low > 0 && high > low)) throw new InputError({}, `--velocity-range ${values['velocity-range'] as string}: expected LOW,HIGH with 0 < LOW < HIGH`);
    options.velocityRange = [low * feet, high * feet];
  }
  if (values.smoothing !== undefined) {
    const [horizontal, vertical] = listOption('smoothing', values.smoothing as string, 'HORIZONTAL,VERTICAL weights');
    if (!(horizontal >= 0 && vertical >= 0)) throw new InputError({}, `--smoothing ${values.smoothing as string}: expected two weights of 0 or more`);
    options.smoothing = { horizontal, vertical };
  }

  const log = new WarningLog();
  let table: FirstBreakTable;
  const records = positionals.filter((file) => isSeg2(io, file));
  if (records.length > 0) {
    if (records.length !== positionals.length) throw new InputError({ file: positionals.find((f) => !records.includes(f)) }, 'is a first-break table given with SEG-2 records; give either one table or the records of one line');
    const { rows, skipped } = pickAll(records, values, unit, io, wave ?? 'P');
    for (const s of skipped) log.add('record-skipped', `${s.message}; the record was left out`);
    for (const sentence of unpickedSummary(rows)) log.add('unpicked-traces', sentence);
    const name = records.length === 1 ? records[0] : `${records[0]} and ${records.length - 1} more record${records.length > 2 ? 's' : ''}`;
    table = readFirstBreaks(pickTableCsv(rows, 'm', false), name, log, { wave });
  } else {
    if (positionals.length > 1) throw new InputError({}, 'tomography images one line: give one first-break table (or the SEG-2 records of one line)');
    table = readFirstBreaks(readInput(io, positionals[0]), positionals[0], log, { lengthUnit: unit, wave });
  }
  let layered: InterpretationResult | undefined;
  try {
    layered = interpret(table, { wave }, new WarningLog());
  } catch (error) {
    if (!(error instanceof InputError)) throw error;
    log.add('tomography-layered-start', `the layered interpretation could not be made (${error.message}), so the tomogram was started from the velocity-depth gradient only`);
  }
  let result: Tomogram;
  try {
    result = tomography(table, options, log, layered);
  } catch (error) {
    if (error instanceof RangeError) throw new InputError({ file: table.file }, error.message);
    throw error;
  }
  if (values['grid-csv']) io.writeText(values['grid-csv'] as string, tomogramCsv(result, result.ground));
  const output = values.json ? JSON.stringify(tomogramJson(result, log.items), null, 2) + '\n' : tomogramSummary(result, log, unit);
  if (values.output) io.writeText(values.output as string, output);
  else io.stdout(output);
  return 0;
}

function positive(option: string, text: string, unit: string): number {
  const value = numberOption(option, text, `a positive number (${unit})`);
  if (!(value > 0)) throw new InputError({}, `--${option} ${text}: expected a positive number (${unit})`);
  return value;
}

/** The readable summary of a tomogram: the grid, the misfit, each contour beside the layered depth, warnings and cautions. */
export function tomogramSummary(t: Tomogram, log: WarningLog, unit: 'm' | 'ft'): string {
  const f = unit === 'ft' ? 1 / 0.3048 : 1;
  const L = unit === 'ft' ? 'ft' : 'm';
  const V = unit === 'ft' ? 'ft/s' : 'm/s';
  const len = (v: number | undefined, digits = 1) => (v === undefined ? '—' : (v * f).toFixed(digits));
  const out: string[] = [];
  out.push(`Traveltime tomogram of ${t.file}: ${t.picks} first breaks`);
  out.push(`Grid: ${t.grid.nx} × ${t.grid.nz} nodes at ${len(t.grid.h, 2)} ${L}, from x = ${len(t.grid.x0, 1)} ${L}, top at elevation ${len(t.grid.top, 1)} ${L}`);
  out.push(`Pick noise aimed at: ${(t.noise * 1e3).toFixed(2)} ms (${t.noiseSource})`);
  for (const r of t.results) {
    const first = r.iterations[0];
    const last = r.iterations[r.iterations.length - 1];
    out.push(`From ${r.startDescription}: RMS ${(first.rms * 1e3).toFixed(2)} ms at the start, ${(last.rms * 1e3).toFixed(2)} ms after ${last.iteration} iterations (${r.stopped === 'noise-reached' ? 'the pick noise was reached' : r.stopped === 'misfit-stalled' ? 'the misfit stopped falling' : 'iteration limit'})`);
  }
  const main = t.results[0];
  main.contours.forEach((contour, c) => {
    out.push('');
    out.push(`Depth to the ${Math.round(contour.velocity / f)} ${V} contour below the ground, in ${L} (— where not reached; * where no pick samples it):`);
    const header = ['x', ...t.results.map((r) => `${r.start} start`), 'layered'];
    out.push(header.map((h) => h.padStart(15)).join(''));
    contour.points.forEach((p, i) => {
      const cells = [len(p.x, 1), ...t.results.map((r) => {
        const q = r.contours[c].points[i];
        return `${len(q.depth)}${q.depth !== undefined && !q.covered ? '*' : ''}`;
      }), len(p.layeredDepth)];
      out.push(cells.map((cell) => cell.padStart(15)).join(''));
    });
  });
  if (main.contours.length === 0) out.push('', 'No contour asked for: give --contour V (for example a velocity between the soil and rock velocities) for its depth at every geophone.');
  out.push('', 'Warnings:');
  if (log.items.length === 0) out.push('  none');
  for (const w of log.items) out.push(`  [${w.code}] ${w.message}`);
  out.push('', 'Cautions:');
  for (const c of TOMOGRAM_CAUTIONS) out.push(`  - ${c}`);
  out.push('  - These results support, and do not replace, the judgement of the licensed professional responsible for the site; local codes govern.');
  return out.join('\n') + '\n';
}
