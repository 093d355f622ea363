import { InputError } from '../core/errors.js';
import type { Branch, BranchFit, Segment } from '../core/types.js';
import type { WarningLog } from '../core/warnings.js';
import { segmentedRegression, type SegmentedFit } from './segmentedRegression.js';

/** Per-branch choices the user can impose, keyed by branch name "SOURCE:forward" or "SOURCE:reverse". */
export interface BranchChoices {
  /** Number of segments (1 to 4) for a branch, or for every branch under the key "*". */
  segments?: Record<string, number>;
  /** Offsets, in metres, at which a new segment starts, for a branch. */
  breakpoints?: Record<string, number[]>;
  /** Force the direct-wave segment through the origin (common practice where the trigger is sound). */
  directThroughOrigin?: boolean;
  /** Largest number of segments the criterion may choose; default 4. */
  maxSegments?: number;
  /**
   * Largest number of segments for particular branches, set by the pipeline when a branch's extra
   * segment was found to be no layer (the criterion still chooses up to this many).
   */
  segmentCaps?: Record<string, number>;
}

/** The most segments the criterion may give a branch. */
export function segmentLimit(choices: BranchChoices, name: string): number {
  return Math.min(choices.maxSegments ?? 4, choices.segmentCaps?.[name] ?? 4);
}

/** Whether the user fixed the segments of this branch (by its name or for every branch) or its breakpoints. */
export function isUserFixed(choices: BranchChoices, branch: Branch): boolean {
  const name = branchName(branch);
  return choices.segments?.[name] !== undefined || choices.breakpoints?.[name] !== undefined || choices.segments?.['*'] !== undefined;
}

/** The name by which the user refers to a branch: source id, a colon, and the side. */
export function branchName(branch: Branch): string {
  return `${branch.sourceId}:${branch.side}`;
}

/**
 * Fits a segmented regression of time on offset to every branch. Segment k is provisionally
 * assigned to layer k; assignLayers() revises that across branches.
 *
 * @throws InputError when a choice names a branch that does not exist or cannot be honoured
 */
export function fitBranches(branches: Branch[], choices: BranchChoices, file: string, warnings: WarningLog): BranchFit[] {
  const names = new Set(branches.map(branchName));
  for (const key of [...Object.keys(choices.segments ?? {}), ...Object.keys(choices.breakpoints ?? {})]) {
    if (key !== '*' && !names.has(key)) {
      throw new InputError({ file }, `no branch named ${key}; expected one of ${[...names].join(', ')}`);
    }
  }
  return branches.map((branch) => {
    const name = branchName(branch);
    let fit;
    try {
      fit = segmentedRegression(branch.offsets, branch.times, {
        segments: choices.segments?.[name] ?? choices.segments?.['*'],
        breakpoints: choices.breakpoints?.[name],
        firstThroughOrigin: choices.directThroughOrigin,
        maxSegments: segmentLimit(choices, name),
      });
    } catch (error) {
      if (error instanceof RangeError) throw new InputError({ file, source: branch.sourceId }, `${branch.side} branch: ${error.message}`);
      throw error;
    }
    if (fit === undefined) throw new Error(`branch ${name} has too few picks to fit, after the branch split checked it`);
    return branchFit(branch, fit, file, warnings);
  });
}

/**
 * A branch's fit as the rest of the pipeline sees it: segments with apparent velocities,
 * intercepts and crossover distances, and warnings for its outliers and any slowing down kept.
 *
 * @throws InputError when a segment's times decrease with offset
 */
export function branchFit(branch: Branch, fit: SegmentedFit, file: string, warnings: WarningLog): BranchFit {
  const name = branchName(branch);
  const segments: Segment[] = fit.segments.map((line, k) => ({
    order: k + 1,
    layer: k + 1,
    start: line.start,
    end: line.end,
    firstOffset: branch.offsets[line.start],
    lastOffset: branch.offsets[line.end - 1],
    slowness: line.slope,
    slownessSe: line.slopeSe,
    intercept: line.intercept,
    interceptSe: line.interceptSe,
    apparentVelocity: 1 / line.slope,
    used: countUsed(line.start, line.end, fit.outliers),
    throughOrigin: line.throughOrigin,
  }));
  for (let k = 1; k < segments.length; k++) {
    segments[k].crossoverOffset = fit.segments[k].knot ?? crossoverDistance(segments[k - 1], segments[k]);
  }
  const outlierRows = fit.outliers.map((i) => branch.picks[i].row);
  if (outlierRows.length > 0) {
    warnings.add('outlier-pick',
      `${name} branch: pick${outlierRows.length > 1 ? 's' : ''} on row${outlierRows.length > 1 ? 's' : ''} ${outlierRows.join(', ')} ${outlierRows.length > 1 ? 'lie' : 'lies'} far off the fitted lines (modified z-score above 5) and ${outlierRows.length > 1 ? 'were' : 'was'} left out of the fit; check ${outlierRows.length > 1 ? 'them' : 'it'}`,
      { where: { file, source: branch.sourceId } });
  }
  if (fit.slopeIncreaseKept) {
    warnings.add('apparent-velocity-decrease',
      `${name} branch: the best fit has a segment slower than the one before it (apparent velocities ${segments.map((s) => Math.round(s.apparentVelocity)).join(', ')} m/s); kept because the data insist on it. It may be a mispick, a lateral change, or a fault; refraction assumes velocity increases with depth`,
      { where: { file, source: branch.sourceId } });
  }
  for (const s of segments) {
    if (!(s.slowness > 0)) {
      throw new InputError({ file, source: branch.sourceId },
        `${branch.side} branch, segment ${s.order} (offsets ${s.firstOffset.toFixed(1)} to ${s.lastOffset.toFixed(1)} m): times decrease with offset; expected first-break times that grow with distance from the source`);
    }
  }
  return {
    branch,
    segments,
    outlierRows,
    residualSd: fit.residualSd,
    criterionBySegments: fit.bic,
    chosenBy: fit.chosenBy,
  };
}

function countUsed(start: number, end: number, outliers: number[]): number {
  return end - start - outliers.filter((i) => i >= start && i < end).length;
}

/**
 * Crossover distance of two straight segments of a time-offset graph: the offset where
 * t = a₁ + s₁x meets t = a₂ + s₂x, x = (a₂ − a₁) / (s₁ − s₂) (Telford, Geldart & Sheriff 1990, §4.2).
 *
 * @returns the offset in metres, or undefined for parallel lines
 * @example
 * crossoverDistance({ intercept: 0, slowness: 1 / 500 }, { intercept: 0.02, slowness: 1 / 2000 }) // 13.33
 */
export function crossoverDistance(first: Pick<Segment, 'intercept' | 'slowness'>, second: Pick<Segment, 'intercept' | 'slowness'>): number | undefined {
  const slownessDifference = first.slowness - second.slowness;
  if (slownessDifference === 0) return undefined;
  return (second.intercept - first.intercept) / slownessDifference;
}
