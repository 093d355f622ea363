import { createHash } from 'node:crypto';
import { InputError } from '../core/errors.js';
import type { FirstBreakTable } from '../core/types.js';
import { formatLength, toMetres } from '../core/units.js';
import { depthProfileCsv } from '../io/depthProfileCsv.js';
import { greatCircleDistance, lineGeoJson } from '../io/geojson.js';
import { interpretationJson } from '../io/interpretationJson.js';
import { JOB_OPTIONS, jobFromOptions, missingJobDetails, readJobDetails, type JobDetails } from '../io/jobDetails.js';
import { round } from '../io/numbers.js';
import { tomogramJson } from '../io/tomogramJson.js';
import { tomography } from '../tomography/tomography.js';
import { WarningLog } from '../core/warnings.js';
import { readStations } from '../io/stationsCsv.js';
import { receiverGround, receiverSpacing, VERSION, type InterpretationResult } from '../interpret.js';
import type { PickRow } from '../picking/recordPicks.js';
import { renderPdf, requireChromium } from './pdf.js';
import { reportHtml } from '../report/html/reportHtml.js';
import type { ReportInputFile } from '../report/html/types.js';
import { parse, readInput } from './args.js';
import { commandHelp } from './help.js';
import { INTERPRET_OPTIONS, interpretChoices, interpretRecords, interpretTable } from './interpret.js';
import { checkOutputPaths, type CliIo } from './io.js';
import { isSeg2 } from './records.js';
import { interpretProject, isProjectFile, pickEditsJson, type InterpretedProject } from './project.js';

/** Options of report beyond those of interpret. */
const REPORT_OPTIONS = {
  output: { type: 'string', short: 'o' },
  pdf: { type: 'string' },
  'depths-csv': { type: 'string' },
  geojson: { type: 'string' },
  json: { type: 'string' },
  job: { type: 'string' },
  paper: { type: 'string' },
  issued: { type: 'string' },
  tomography: { type: 'boolean' },
  ...JOB_OPTIONS,
} as const;

function sha256(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

function todayUtc(): string {
  return new Date().toISOString().slice(0, 10);
}

/**
 * hammerline report: the permit-packet report of one line (HTML, and PDF through Chromium), with
 * the depth profile CSV, the line as GeoJSON and the JSON interpretation beside it.
 */
export function reportCommand(args: string[], io: CliIo, context: { now?: () => string; version?: string } = {}): number {
  const { values, positionals } = parse(args, { ...INTERPRET_OPTIONS, ...REPORT_OPTIONS });
  if (values.help) {
    io.stdout(commandHelp('report'));
    return 0;
  }
  if (positionals.length === 0) throw new InputError({}, 'report needs the first breaks of one line: a first-break table (FILE.csv), the SEG-2 records of the line, or a project file of the field app (PROJECT.json)');
  const outputs: [string, string][] = (['output', 'pdf', 'depths-csv', 'geojson', 'json'] as const)
    .filter((name) => values[name] !== undefined).map((name) => [name === 'output' ? '-o' : `--${name}`, values[name] as string]);
  if (values.output === undefined && values.pdf === undefined) throw new InputError({}, 'report needs -o FILE.html or --pdf FILE.pdf (or both) to say where the report goes');
  const paperText = ((values.paper as string | undefined) ?? 'A4').toLowerCase();
  if (paperText !== 'a4' && paperText !== 'letter') throw new InputError({}, `--paper ${values.paper as string}: expected A4 or Letter`);
  const paper = paperText === 'a4' ? 'A4' : 'Letter';
  const issued = (values.issued as string | undefined) ?? (context.now ?? todayUtc)();
  if (!/^\d{4}-\d{2}-\d{2}$/.test(issued) || Number.isNaN(Date.parse(`${issued}T00:00:00Z`)) || new Date(`${issued}T00:00:00Z`).toISOString().slice(0, 10) !== issued) {
    throw new InputError({}, `--issued ${issued}: expected a date written YYYY-MM-DD`);
  }

  // An output never overwrites an input, nor another output.
  checkOutputPaths([...positionals, values.stations, values['p-line'], values.job].filter((f): f is string => typeof f === 'string'), outputs.map(([option, path]) => ({ option, path })));
  if (values.pdf !== undefined) requireChromium();

  const choices = interpretChoices(values, io);
  const projectFile = positionals.find((file) => isProjectFile(io, file));
  if (projectFile !== undefined && positionals.length > 1) throw new InputError({ file: projectFile }, 'is a project file given with other files; a report is of one line: give its project file alone (it holds the records or table of the line)');
  let records = projectFile === undefined ? positionals.filter((file) => isSeg2(io, file)) : [];
  let result: InterpretationResult;
  let table: FirstBreakTable;
  let rows: PickRow[] | undefined;
  let project: InterpretedProject | undefined;
  if (projectFile !== undefined) {
    project = interpretProject(projectFile, values, choices, io);
    ({ result, table, rows } = project);
    records = project.line.records.map((r) => r.name);
  } else if (records.length > 0) {
    if (records.length !== positionals.length) throw new InputError({ file: positionals.find((f) => !records.includes(f)) }, 'is a first-break table given with SEG-2 records; a report is of one line: give its first-break table or its records, not both');
    ({ result, table, rows } = interpretRecords(records, values, choices, io));
  } else {
    if (positionals.length > 1) throw new InputError({}, `report is of one line; got ${positionals.length} first-break tables (make one report per line, or give the SEG-2 records of one line)`);
    ({ result, table } = interpretTable(positionals[0], choices, io));
  }

  let job: JobDetails = {};
  if (values.job !== undefined) job = readJobDetails(readInput(io, values.job as string), values.job as string);
  job = jobFromOptions(values, job, (v) => toMetres(v, choices.unit));
  const receivers = receiverGround(table);
  const spacing = receiverSpacing(table);
  const missing = missingJobDetails(job);
  const projectStations = project?.project.inputs.find((i) => i.kind === 'stations');
  if (!table.hasElevations && values.stations === undefined && projectStations === undefined) missing.push('ground elevations (none were supplied; flat ground was assumed)');
  else if (job.elevationDatum === undefined) missing.push('Elevation datum (of the ground elevations supplied)');
  const notices: string[] = [];
  // The unit the report is shown in: --units, or the project's own.
  const unit = project?.unit ?? choices.unit;
  // Computed in SI; with --units ft the report shows feet and ft/s (the SI value in brackets in
  // the text), and says so at the top, since its exports keep SI.
  if (unit === 'ft') notices.push('Lengths are given in feet and velocities in feet per second (1 ft = 0.3048 m exactly), the metric values following in brackets in the text; the JSON, depth-profile CSV and GeoJSON files that accompany this report give metres and m/s, as their field names say.');
  if (job.geophoneSpacing !== undefined && Math.abs(job.geophoneSpacing - spacing) > 0.02 * spacing) {
    notices.push(`The nominal geophone spacing given (${formatLength(job.geophoneSpacing, unit, 2)}) differs from the median spacing of the data (${formatLength(spacing, unit, 2)}); the data are used.`);
  }
  if ((job.lineStart === undefined) !== (job.lineEnd === undefined)) throw new InputError({}, 'give the coordinates of both line ends (--line-start and --line-end, or line_start and line_end in the job file), or neither');
  const span = receivers[receivers.length - 1].x - receivers[0].x;
  if (job.lineStart && job.lineEnd) {
    const distance = greatCircleDistance(job.lineStart, job.lineEnd);
    if (Math.abs(distance - span) > Math.max(2, 0.05 * span)) {
      notices.push(`The coordinates given for the line ends are ${formatLength(distance, unit, 1)} apart, but the geophones span ${formatLength(span, unit, 1)}: check the coordinates (longitude first, then latitude, in decimal degrees WGS 84) before using the GeoJSON.`);
    }
  }
  if (values.geojson !== undefined && (job.lineStart === undefined || job.lineEnd === undefined)) {
    throw new InputError({}, '--geojson needs the coordinates of the line ends: give --line-start LON,LAT and --line-end LON,LAT (decimal degrees, WGS 84; the first and the last geophone), or line_start and line_end in the --job file');
  }

  const stationLabels = values.stations !== undefined ? readStations(readInput(io, values.stations as string), values.stations as string, choices.unit).rows
    : projectStations !== undefined ? readStations(new TextDecoder().decode(projectStations.bytes), projectStations.name, projectStations.lengthUnit).rows : [];
  const stationAt = (x: number, i: number) => stationLabels.find((s) => Math.abs(s.x - x) < 1e-6 && s.station !== undefined)?.station ?? i + 1;
  const sources = [...new Map(result.fits.map((f) => [f.branch.sourceId, f.branch])).values()].sort((a, b) => a.sourceX - b.sourceX);
  const layout = {
    geophones: receivers.length,
    first_x_m: round(receivers[0].x, 3),
    last_x_m: round(receivers[receivers.length - 1].x, 3),
    spacing_m: round(spacing, 3),
    elevations_given: table.hasElevations || values.stations !== undefined || projectStations !== undefined,
    source_count: sources.length,
    sources: sources.map((s) => ({ id: s.sourceId, x_m: round(s.sourceX, 3), elev_m: round(s.sourceElev, 3) })),
    receivers: receivers.map((r, i) => ({ station: stationAt(r.x, i), x_m: round(r.x, 3), elev_m: round(r.elev, 3) })),
  };
  const statusCounts: Record<string, number> = {};
  for (const row of rows ?? []) statusCounts[row.status] = (statusCounts[row.status] ?? 0) + 1;
  const extra: Record<string, unknown> = {
    layout,
    job: jobJson(job),
    ...(rows ? { picking: { records, picked: rows.filter((r) => r.time !== undefined).length, traces: rows.length, status_counts: statusCounts } } : {}),
  };
  if (project !== undefined) extra.pick_edits = pickEditsJson(project.line.applied);
  if (values.tomography) extra.tomogram = tomogramOf(table, result);
  const document = interpretationJson(result, extra);

  const roles: [string | undefined, string][] = [
    ...positionals.map((f): [string, string] => [f, project !== undefined ? 'project file of the field app' : records.length > 0 ? 'SEG-2 shot record' : 'first-break table']),
    [values.stations as string | undefined, 'station table'],
    [values['p-line'] as string | undefined, 'P-wave line (check of Vs < Vp)'],
    [values.job as string | undefined, 'job details'],
  ];
  const files: ReportInputFile[] = roles.filter((r): r is [string, string] => r[0] !== undefined).map(([file, role]) => {
    const bytes = io.readBytes(file);
    return { file, role, bytes: bytes.length, sha256: sha256(bytes) };
  });
  // The files inside a project file, each with its own digest.
  const INPUT_ROLES = { seg2: 'SEG-2 shot record, in the project file', 'first-breaks': 'first-break table, in the project file', stations: 'station table, in the project file' } as const;
  for (const input of project?.project.inputs ?? []) files.push({ file: input.name, role: INPUT_ROLES[input.kind], bytes: input.bytes.length, sha256: sha256(input.bytes) });
  const html = reportHtml({
    result, document, receivers, hasElevations: layout.elevations_given, job, missing, notices, inputs: files,
    command: ['report', ...args], version: context.version ?? VERSION, issued, paper, unit,
  });

  const title = [job.line ? `line ${job.line}` : result.file, job.site].filter(Boolean).join(', ');
  // The PDF first: it is the step that can fail, and then nothing else has been written.
  if (values.pdf !== undefined) renderPdf(html, values.pdf as string);
  if (values.output !== undefined) io.writeText(values.output as string, html);
  if (values['depths-csv'] !== undefined) io.writeText(values['depths-csv'] as string, depthProfileCsv(result, receivers, title, unit));
  if (values.geojson !== undefined) io.writeText(values.geojson as string, JSON.stringify(lineGeoJson(result, receivers, job as JobDetails & Required<Pick<JobDetails, 'lineStart' | 'lineEnd'>>, unit), null, 2) + '\n');
  if (values.json !== undefined) io.writeText(values.json as string, JSON.stringify(document, null, 2) + '\n');

  if (missing.length > 0) io.stderr(`hammerline: the report lists as not supplied: ${missing.join('; ')}\n`);
  for (const notice of notices) io.stderr(`hammerline: ${notice}\n`);
  if (!values.quiet) io.stderr(`hammerline: report of ${result.file} written to ${outputs.filter(([o]) => o === '-o' || o === '--pdf').map(([, p]) => p).join(' and ')} (${result.warnings.length} warning${result.warnings.length === 1 ? '' : 's'} in it)\n`);
  return 0;
}

/** The job details in the JSON document (snake_case keys, as in a sidecar file). */
function jobJson(job: JobDetails): Record<string, unknown> {
  return {
    client: job.client ?? null,
    project: job.project ?? null,
    site: job.site ?? null,
    line: job.line ?? null,
    date: job.date ?? null,
    operator: job.operator ?? null,
    equipment: job.equipment ?? null,
    source_type: job.sourceType ?? null,
    geophone_spacing_m: job.geophoneSpacing ?? null,
    line_start: job.lineStart ? [job.lineStart.lon, job.lineStart.lat] : null,
    line_end: job.lineEnd ? [job.lineEnd.lon, job.lineEnd.lat] : null,
    elevation_datum: job.elevationDatum ?? null,
  };
}

/**
 * The tomogram of the line (hammerline/tomogram@1), with default settings and contours at the
 * geometric mean of each pair of consecutive layer velocities, where a refractor would show.
 */
function tomogramOf(table: FirstBreakTable, result: InterpretationResult): Record<string, unknown> {
  const log = new WarningLog();
  const layers = result.layers.slice(0, result.refractors.length + 1);
  const contours = layers.slice(1).map((l, i) => Math.round(Math.sqrt(l.velocity * layers[i].velocity)));
  try {
    return tomogramJson(tomography(table, { contours }, log, result), log.items);
  } catch (error) {
    if (error instanceof RangeError) throw new InputError({ file: table.file }, `--tomography: ${error.message}`);
    throw error;
  }
}
