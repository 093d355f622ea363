import type { LengthUnit } from './units.js';
import type { Warning } from './warnings.js';

/** Wave type of a line: compressional (P) or horizontally polarised shear (S, SH). */
export type Wave = 'P' | 'S';

/** One first-break pick. Lengths in metres, time in seconds, elevation up. */
export interface FirstBreak {
  sourceId: string;
  /** Source position along the line, in metres. */
  sourceX: number;
  /** Source ground elevation, in metres. */
  sourceElev: number;
  /** Receiver (geophone) position along the line, in metres. */
  receiverX: number;
  /** Receiver ground elevation, in metres. */
  receiverElev: number;
  /** First-break time after the shot, in seconds. */
  time: number;
  /** 1-based row of the input file (header = row 1), so messages can point back at it. */
  row: number;
}

/** A first-break table as read from one file. */
export interface FirstBreakTable {
  /** File name as given, used in every message. */
  file: string;
  picks: FirstBreak[];
  /** Wave type, when the file or a flag says it. */
  wave?: Wave;
  /** Unit the file's lengths were written in (already converted to metres in `picks`). */
  lengthUnit: LengthUnit;
  /** Columns the reader does not use, kept with their values per row. */
  extraColumns: string[];
  extraValues: Record<string, string>[];
  /** True when the file gave ground elevations. */
  hasElevations: boolean;
}

/** Side of a source a branch lies on: forward = receivers at larger x than the source. */
export type Side = 'forward' | 'reverse';

/** The picks of one source on one side, sorted by increasing offset. */
export interface Branch {
  sourceId: string;
  sourceX: number;
  sourceElev: number;
  side: Side;
  picks: FirstBreak[];
  /** Horizontal source-receiver distance of each pick, in metres (same order as picks). */
  offsets: number[];
  /** Straight-line (slope) source-receiver distance of each pick, in metres. */
  distances: number[];
  /** First-break times, in seconds. */
  times: number[];
}

/** One straight-line segment of a branch's time-offset graph. */
export interface Segment {
  /** 1-based order within the branch (1 = nearest the source). */
  order: number;
  /** Layer this segment is assigned to (1 = top layer, the direct wave). */
  layer: number;
  /** Index range [start, end) into the branch's picks. */
  start: number;
  end: number;
  /** Offsets of the first and last pick of the segment, in metres. */
  firstOffset: number;
  lastOffset: number;
  /** Slope of time against offset, in seconds per metre, and its standard error. */
  slowness: number;
  slownessSe: number;
  /** Intercept time at zero offset, in seconds, and its standard error. */
  intercept: number;
  interceptSe: number;
  /** Apparent velocity 1 / slowness, in metres per second. */
  apparentVelocity: number;
  /** Number of picks used in the fit (outliers excluded). */
  used: number;
  /** True when the fit was forced through the origin (direct wave, common practice). */
  throughOrigin: boolean;
  /**
   * Crossover distance: the offset, in metres, where this segment's line meets the previous
   * segment's line (undefined for the first segment).
   */
  crossoverOffset?: number;
}

/** Result of fitting one branch. */
export interface BranchFit {
  branch: Branch;
  segments: Segment[];
  /** Rows of picks flagged as outliers and left out of the line fits. */
  outlierRows: number[];
  /** Residual standard deviation of the chosen fit, in seconds. */
  residualSd: number;
  /** Bayesian information criterion of each segment count tried (index 0 = one segment). */
  criterionBySegments: (number | undefined)[];
  /** How the segment count was chosen: by criterion or fixed by the user. */
  chosenBy: 'criterion' | 'user';
}

/** A layer of the section, 1 = top. Layer k+1 lies under refractor k. */
export interface Layer {
  index: number;
  /** True (dip-corrected) velocity, in metres per second, and its standard error. */
  velocity: number;
  velocitySe: number;
  /** Refractor dip at the top of this layer, in degrees, positive when it deepens towards +x. */
  dipDeg?: number;
  dipSeDeg?: number;
  /** Apparent velocities seen by forward and reverse branches, in m/s (harmonic mean of fits). */
  forwardApparent?: number;
  reverseApparent?: number;
  /** Number of branch segments assigned to this layer. */
  segmentCount: number;
  /** True when both forward and reverse branches see the layer, so its true velocity is known. */
  reversed: boolean;
  /** Layer 1 only: true when its velocity was fitted through the origin (the direct-wave lines pass through it). */
  throughOrigin?: boolean;
}

/** A point on a refractor. Depth is vertical, positive down, below the ground at x. */
export interface RefractorPoint {
  x: number;
  depth: number;
  elev: number;
  depthSe: number;
  /** Source the depth was computed under, for intercept-time points. */
  sourceId?: string;
}

export interface RefractorProfile {
  method: string;
  points: RefractorPoint[];
}

/** Refractor k is the top of layer k+1. */
export interface Refractor {
  index: number;
  /** Method of the recommended profile. */
  method: string;
  points: RefractorPoint[];
  byMethod: Record<string, RefractorPoint[]>;
}

/** One step of the processing history, recorded after it succeeded. */
export interface HistoryStep {
  step: string;
  parameters: Record<string, unknown>;
}

export interface Interpretation {
  file: string;
  wave: Wave;
  layers: Layer[];
  refractors: Refractor[];
  fits: BranchFit[];
  warnings: Warning[];
  history: HistoryStep[];
  /** Residual standard deviation of all line fits together, in seconds. */
  fitRmsSeconds: number;
  picksUsed: number;
  picksTotal: number;
}
