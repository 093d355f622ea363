import type { InterpretationResult } from '../../interpret.js';
import type { JobDetails } from '../../io/jobDetails.js';
import type { LengthUnit } from '../../core/units.js';

/** One input file of the report, for the processing history. */
export interface ReportInputFile {
  file: string;
  /** What it is: "first-break table", "SEG-2 record", "station table", "P-wave line", "job details". */
  role: string;
  bytes: number;
  sha256: string;
}

/** Everything the report is made from. */
export interface ReportInput {
  result: InterpretationResult;
  /**
   * The JSON interpretation document (interpretationJson, with the report's `layout` block):
   * every number the report shows is taken from it.
   */
  document: Record<string, unknown>;
  receivers: { x: number; elev: number }[];
  /** False when the first-break table gave no elevations (flat ground assumed). */
  hasElevations: boolean;
  job: JobDetails;
  /** Job details a reviewer expects that were not given (labels). */
  missing: string[];
  /** Remarks on the job details and the exports (for example coordinates that do not fit the line). */
  notices: string[];
  inputs: ReportInputFile[];
  /** The command line as given, so the report can be made again. */
  command: string[];
  /** Program version shown in the report (VERSION). */
  version: string;
  /** Date the report was made, YYYY-MM-DD. */
  issued: string;
  /** Paper the print layout is set for. */
  paper: 'A4' | 'Letter';
  /**
   * Unit lengths and velocities are shown in (figures, tables, axes, text); with 'ft' the text
   * gives the SI value in brackets. The document stays SI. Default metres.
   */
  unit?: LengthUnit;
}
