import { InputError } from '../core/errors.js';
import type { FirstBreakTable } from '../core/types.js';
import type { LengthUnit } from '../core/units.js';
import { round } from '../io/numbers.js';
import { projectInterpretOptions, projectLine, type AppliedEdit, type ProjectLine } from '../io/projectLine.js';
import { PROJECT_SCHEMA, readProjectFile, type Project } from '../io/projectFile.js';
import { interpret, type InterpretationResult, type InterpretOptions } from '../interpret.js';
import type { PickRow } from '../picking/recordPicks.js';
import { readInput } from './args.js';
import { checkAgainstPLine, type InterpretChoices } from './interpret.js';
import type { CliIo } from './io.js';

/** Whether a file given to interpret or report is a field-app project document (JSON) rather than a table or record. */
export function isProjectFile(io: CliIo, file: string): boolean {
  let bytes: Uint8Array;
  try {
    bytes = io.readBytes(file);
  } catch (error) {
    throw new InputError({ file }, `cannot be read (${(error as NodeJS.ErrnoException).code ?? (error as Error).message}); expected a first-break table, a SEG-2 record or a project file`);
  }
  if (/\.json$/i.test(file)) return true;
  let i = 0;
  if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) i = 3;
  while (i < bytes.length && (bytes[i] === 0x20 || bytes[i] === 0x0a || bytes[i] === 0x0d || bytes[i] === 0x09)) i++;
  return bytes[i] === 0x7b; // "{": no first-break table or SEG-2 record starts so
}

/** A project file read and its line interpreted as the field app interprets it. */
export interface InterpretedProject {
  project: Project;
  line: ProjectLine;
  result: InterpretationResult;
  table: FirstBreakTable;
  rows?: PickRow[];
  /** Unit the project was shown in; `--units` replaces it. */
  unit: LengthUnit;
}

/**
 * Interprets the line of a project file (schema hammerline/project@1) with the picks set by hand
 * in the field app in place of the automatic ones (io/projectLine.ts, the code the app runs) and
 * the project's choices (wave, segments, breakpoints, direct wave through the origin, Poisson's
 * ratio), each replaced by the same option given on the command line.
 */
export function interpretProject(file: string, values: Record<string, unknown>, choices: InterpretChoices, io: CliIo): InterpretedProject {
  const project = readProjectFile(readInput(io, file), file);
  const fromProject = projectInterpretOptions(project.choices);
  const given = choices.options;
  const options: InterpretOptions = {
    ...given,
    wave: values.wave !== undefined ? given.wave : fromProject.wave,
    directThroughOrigin: Boolean(given.directThroughOrigin) || Boolean(fromProject.directThroughOrigin),
    ...(fromProject.segments || given.segments ? { segments: { ...fromProject.segments, ...given.segments } } : {}),
    ...(fromProject.breakpoints || given.breakpoints ? { breakpoints: { ...fromProject.breakpoints, ...given.breakpoints } } : {}),
    ...(given.vsFromVp ?? fromProject.vsFromVp ? { vsFromVp: given.vsFromVp ?? fromProject.vsFromVp } : {}),
  };
  const wave = options.wave;
  let line: ProjectLine | undefined;
  try {
    line = projectLine(project.inputs, project.picks, { ...project.choices, wave });
  } catch (error) {
    if (error instanceof InputError) throw new InputError({ file }, error.message);
    throw error;
  }
  if (line === undefined) throw new InputError({ file }, `holds no line: expected the SEG-2 records of one line or one first-break table in its inputs (schema ${PROJECT_SCHEMA})`);
  let result: InterpretationResult;
  try {
    result = interpret(line.table, { ...options, ...(line.kind === 'records' ? { records: line.records.map((r) => r.name) } : {}) }, line.log);
  } catch (error) {
    if (error instanceof InputError) throw new InputError({ file }, line.relabel(error.message));
    throw error;
  }
  for (const w of result.warnings) {
    w.message = line.relabel(w.message);
    if (w.parts) w.parts = w.parts.map((p) => (typeof p === 'string' ? line!.relabel(p) : p));
  }
  checkAgainstPLine(result, line.name, choices);
  return { project, line, result, table: line.table, rows: line.rows, unit: values.units !== undefined ? choices.unit : project.units };
}

/** The picks set by hand for the JSON document (`pick_edits`): times in ms, positions in metres. */
export function pickEditsJson(applied: AppliedEdit[]): Record<string, unknown>[] {
  return applied.map((e) => ({
    file: e.file,
    ...(e.trace !== undefined ? { trace: e.trace } : { row: e.row }),
    source_id: e.sourceId,
    receiver_x_m: round(e.receiverX, 3),
    before_ms: e.before === undefined ? null : round(e.before * 1e3, 3),
    time_ms: e.after === null ? null : round(e.after * 1e3, 3),
  }));
}
