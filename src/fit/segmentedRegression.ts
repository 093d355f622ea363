import { median } from '../core/stats.js';
import { hingeFit, optimiseKnots } from './hingeFit.js';
import {
  bestDecreasingPartition, bestPartitions, costTable, partitionRss, prefixSums, rangeLine, segmentSlopes, separateLines,
  MIN_VELOCITY_CONTRAST, type Partition,
} from './partitionSearch.js';

/** Options for a segmented (piecewise linear) regression of time on offset. */
export interface SegmentedOptions {
  /** Largest number of segments tried; 1 to 4, default 4. */
  maxSegments?: number;
  /** Fix the number of segments instead of choosing it by the criterion. */
  segments?: number;
  /**
   * Fix the breakpoints: offsets, in metres, at which a new segment starts (a pick at or beyond a
   * breakpoint belongs to the next segment). Implies the segment count.
   */
  breakpoints?: number[];
  /** Force the first segment through the origin (the direct wave; common practice). */
  firstThroughOrigin?: boolean;
  /** Never keep a slope that increases along x, however strongly the data prefer it; default false. */
  forbidSlopeIncrease?: boolean;
  /** Treat these points as the outliers (left out, no new detection); for refits of a fixed partition. */
  presetOutliers?: number[];
  /** Who chose the breakpoints when they are given: the user (default) or an earlier fit. */
  breakpointsFrom?: 'user' | 'criterion';
  /** Refit the chosen lines jointly through hinges (default true); false keeps each segment's own line. */
  continuous?: boolean;
  /** Fewest points in one segment; default 3 (two points leave no residual for a standard error). */
  minPoints?: number;
  /**
   * Floor on the residual variance per point, in s², so that noise-free data do not make the
   * criterion infinite; default (0.02 ms)².
   */
  varianceFloor?: number;
}

export interface LineSegment {
  /** Index range [start, end) into the data. */
  start: number;
  end: number;
  slope: number;
  slopeSe: number;
  intercept: number;
  interceptSe: number;
  throughOrigin: boolean;
  /** Offset where this segment's line meets the previous one (the fitted crossover distance). */
  knot?: number;
}

export interface SegmentedFit {
  segments: LineSegment[];
  /** Indices of points left out as outliers. */
  outliers: number[];
  /** Pooled residual standard deviation of the chosen fit. */
  residualSd: number;
  /** BIC for each segment count tried (index 0 = one segment); undefined where none fits. */
  bic: (number | undefined)[];
  /** True when the least-squares optimum had a slope increasing with offset and the data insisted on it. */
  slopeIncreaseKept: boolean;
  chosenBy: 'criterion' | 'user';
}

/**
 * How much better, in BIC units, an order with a slope increasing with offset (a velocity
 * decreasing with depth) must fit than the best decreasing-slope order before it is kept:
 * 10 is "very strong" evidence on the scale of Kass & Raftery (1995), J. Am. Stat. Assoc. 90, 773.
 */
const INVERSION_EVIDENCE_BIC = 10;

export { MIN_VELOCITY_CONTRAST } from './partitionSearch.js';

/** Parameters of one straight line: slope and intercept. */
const PARAMETERS_PER_LINE = 2;
/**
 * Parameters charged for one breakpoint. A breakpoint chosen as the best of many positions buys
 * more fit than one free parameter would (the criterion under-penalises change points), so each
 * is charged as three. Calibrated on forward-model lines with 0.3 ms pick noise (flat, dipping,
 * three-layer, sloping ground; 20 seeds each): charged as one, 30 of 80 lines gained a spurious
 * layer; as three, 1 of 80. See DEVELOPERS.md.
 */
const PARAMETERS_PER_BREAKPOINT = 3;

/** Least t statistic of the slope change at a breakpoint for the criterion to keep it (about p < 0.0001 for one test; the search makes many). */
const MIN_BREAK_T = 4;

/**
 * Modified z-score beyond which a residual is an outlier. Iglewicz & Hoaglin (1993) suggest 3.5
 * to screen data for a look; picks beyond it are left out of the fit here, so a stricter 5 is
 * used (a normal residual exceeds it about once in two million picks; a mispick of a few
 * milliseconds at 0.25 ms noise scores well above 10).
 */
const OUTLIER_Z = 5;

/** A slowing segment kept because the data insist must have at least this many picks. */
const MIN_INVERSION_PICKS = 6;

/**
 * Segmented regression of y on x (x sorted ascending) by an exact search: for each segment
 * count the breakpoints minimising the total squared residual are found by dynamic programming
 * over all contiguous partitions (Bellman 1961), with slopes required to decrease along x by at
 * least MIN_VELOCITY_CONTRAST (velocity increasing with depth) unless the unconstrained optimum
 * is better by very strong evidence. The segment count (1 to maxSegments) is the one with the
 * lowest Bayesian information criterion, BIC = n ln(RSS/n) + k ln n (Schwarz 1978, Ann. Stat. 6,
 * 461), with k = 2 per line and 3 per breakpoint, among the counts whose every slope change is
 * significant (t > 4). The chosen lines are then refitted jointly as a continuous hinge model
 * (the lines meet at the crossover distances, as first-arrival times do), knots searched near
 * the breakpoints, with ml-regression; standard errors come from that fit's covariance. Outliers
 * are flagged where the modified z-score of the residual, 0.6745 (r − median) / MAD, exceeds 5
 * (Iglewicz & Hoaglin 1993; see OUTLIER_Z), and the fit is repeated without them.
 *
 * @param x - offsets, in metres, ascending
 * @param y - times, in seconds
 * @returns undefined when there are fewer than minPoints points (no line with a standard error)
 * @throws RangeError for a maxSegments outside 1 to 4 or breakpoints that leave a segment too short
 * @example
 * segmentedRegression([0,1,2,3,4,5,6,7,8], [0,1,2,3,3.5,4,4.5,5,5.5])!.segments.length // 2
 */
export function segmentedRegression(x: number[], y: number[], options: SegmentedOptions = {}): SegmentedFit | undefined {
  const minPoints = options.minPoints ?? 3;
  if (x.length < minPoints) return undefined;
  const maxSegments = options.maxSegments ?? 4;
  if (!(maxSegments >= 1 && maxSegments <= 4)) throw new RangeError(`maxSegments must be 1 to 4, got ${maxSegments}`);
  const all = x.map((_, i) => i);
  if (options.presetOutliers !== undefined) {
    const preset = options.presetOutliers;
    const refit = fitSubset(x, y, all.filter((i) => !preset.includes(i)), options, maxSegments, minPoints);
    return refit && { ...refit, outliers: [...preset] };
  }
  // Outliers are found one at a time on each segment's own lines (cheap fits): the worst
  // residual beyond the modified z-score bound is left out and the fit repeated, until none is
  // beyond it. One at a time, because a gross mispick can hide a short segment from a fit that
  // still holds it, and flagging every large residual at once would then condemn that segment's
  // honest picks. At most a tenth of the points (and ten) are left out.
  const quick = { ...options, continuous: false };
  const outliers: number[] = [];
  const most = Math.min(10, Math.floor(x.length / 10));
  let current = fitSubset(x, y, all, quick, maxSegments, minPoints);
  if (current === undefined) return undefined;
  while (outliers.length < most) {
    const kept = all.filter((i) => !outliers.includes(i));
    const worst = worstOutlier(x, y, kept, current.segments);
    if (worst === undefined) break;
    outliers.push(worst);
    const refit = fitSubset(x, y, all.filter((i) => !outliers.includes(i)), quick, maxSegments, minPoints);
    if (refit === undefined) { outliers.pop(); break; }
    current = refit;
  }
  outliers.sort((a, b) => a - b);
  if (options.continuous === false) return { ...current, outliers };
  const fit = fitSubset(x, y, all.filter((i) => !outliers.includes(i)), options, maxSegments, minPoints);
  return fit && { ...fit, outliers };
}

function fitSubset(
  xAll: number[], yAll: number[], keep: number[], options: SegmentedOptions, maxSegments: number, minPoints: number,
): Omit<SegmentedFit, 'outliers'> | undefined {
  const x = keep.map((i) => xAll[i]);
  const y = keep.map((i) => yAll[i]);
  const n = x.length;
  const sums = prefixSums(x, y);
  const origin = options.firstThroughOrigin ?? false;
  const floor = (options.varianceFloor ?? (0.02e-3) ** 2) * n;
  const bicOf = (rss: number, m: number) => n * Math.log((rss + floor) / n) + (PARAMETERS_PER_LINE * m + PARAMETERS_PER_BREAKPOINT * (m - 1) - (origin ? 1 : 0)) * Math.log(n);

  if (options.breakpoints !== undefined) {
    const bps = [...options.breakpoints].sort((a, b) => a - b);
    const cuts = bps.map((b) => x.findIndex((xi) => xi >= b)).map((c) => (c < 0 ? n : c));
    const bounds = [0, ...cuts, n];
    for (let k = 0; k + 1 < bounds.length; k++) {
      if (bounds[k + 1] - bounds[k] < minPoints) {
        throw new RangeError(`breakpoints ${bps.join(', ')} m leave segment ${k + 1} with ${bounds[k + 1] - bounds[k]} picks; expected at least ${minPoints}`);
      }
    }
    const partition = { cuts, rss: partitionRss(sums, cuts, n, origin) };
    return finish(x, y, keep, partition, origin, [bicOf(partition.rss, cuts.length + 1)], false, options.breakpointsFrom ?? 'user', bps, options.breakpointsFrom === 'criterion', options.continuous !== false);
  }
  const fixed = options.segments;
  if (fixed !== undefined && !(Number.isInteger(fixed) && fixed >= 1 && fixed <= 4)) {
    throw new RangeError(`the segment count must be 1 to 4, got ${fixed}`);
  }
  const top = fixed ?? maxSegments;
  const bic: (number | undefined)[] = [];
  const chosen: ({ partition: Partition; inverted: boolean } | undefined)[] = [];
  const table = costTable(sums, n, origin);
  const partitions = bestPartitions(table, n, Math.min(top, Math.floor(n / minPoints)), minPoints);
  for (let m = 1; m <= top; m++) {
    if (m * minPoints > n) break;
    const free = partitions[m];
    let choice: { partition: Partition; inverted: boolean } | undefined = { partition: free, inverted: false };
    const slopes = segmentSlopes(sums, free.cuts, n, origin);
    if (!contrasted(slopes, false)) {
      const constrained = bestDecreasingPartition(table, n, m, minPoints);
      const longEnough = [0, ...free.cuts, n].slice(1).every((end, k) => end - [0, ...free.cuts][k] >= MIN_INVERSION_PICKS);
      const insists = !options.forbidSlopeIncrease && longEnough && contrasted(slopes, true)
        && (constrained === undefined || bicOf(constrained.rss, m) - bicOf(free.rss, m) > INVERSION_EVIDENCE_BIC);
      choice = insists ? { partition: free, inverted: true } : constrained && { partition: constrained, inverted: false };
    }
    if (choice === undefined) continue;
    bic[m - 1] = bicOf(choice.partition.rss, m);
    chosen[m - 1] = choice;
  }
  if (fixed !== undefined && chosen[fixed - 1] === undefined) {
    throw new RangeError(fixed * minPoints > n
      ? `${fixed} segments need at least ${fixed * minPoints} picks; the branch has ${n}`
      : `no split into ${fixed} segments gives apparent velocities each at least ${Math.round((MIN_VELOCITY_CONTRAST - 1) * 100)} % faster than the one before; fix the breakpoints instead`);
  }
  const continuous = options.continuous !== false;
  if (fixed !== undefined) return finish(x, y, keep, chosen[fixed - 1]!.partition, origin, bic, chosen[fixed - 1]!.inverted, 'user', undefined, true, continuous);
  const order = chosen
    .map((c, m) => ({ c, m }))
    .filter(({ c, m }) => c !== undefined && (m === 0 || significantBreaks(x, y, c.partition, origin)))
    .sort((a, b) => bic[a.m]! - bic[b.m]!);
  // The joint (hinge) refit can turn a short segment's slope to zero or less on a bent branch:
  // such a count does not describe first arrivals, so the next best count is taken.
  for (const { c, m } of order) {
    const result = finish(x, y, keep, c!.partition, origin, bic, c!.inverted, 'criterion', undefined, true, continuous);
    if (m === 0 || result.segments.every((segment) => segment.slope > 0)) return result;
  }
  return undefined;
}

function significantBreaks(x: number[], y: number[], partition: Partition, origin: boolean): boolean {
  const n = x.length;
  const bounds = [0, ...partition.cuts, n];
  const m = bounds.length - 1;
  const dof = n - 2 * m;
  if (dof <= 0) return false;
  const sd = Math.sqrt(partition.rss / dof);
  const lines = bounds.slice(1).map((end, k) => {
    const xs = x.slice(bounds[k], end);
    const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
    const spread = origin && k === 0 ? xs.reduce((a, b) => a + b * b, 0) : xs.reduce((a, b) => a + (b - mean) ** 2, 0);
    const sums = prefixSums(xs, y.slice(bounds[k], end));
    return { slope: rangeLine(sums, 0, xs.length, origin && k === 0).slope, se: sd / Math.sqrt(spread) };
  });
  for (let k = 1; k < m; k++) {
    const t = Math.abs(lines[k - 1].slope - lines[k].slope) / Math.hypot(lines[k - 1].se, lines[k].se);
    if (!(t > MIN_BREAK_T)) return false;
  }
  return true;
}

/**
 * True when every slope is positive and each differs from the one before by the minimum contrast:
 * decreasing along x, or (with eitherWay) decreasing or increasing.
 */
function contrasted(slopes: number[], eitherWay: boolean): boolean {
  if (!slopes.every((sl) => sl > 0)) return false;
  for (let k = 1; k < slopes.length; k++) {
    const ratio = slopes[k - 1] / slopes[k];
    if (!(ratio >= MIN_VELOCITY_CONTRAST || (eitherWay && ratio <= 1 / MIN_VELOCITY_CONTRAST))) return false;
  }
  return true;
}

/** Residual sum of squares of the line through points [i, j), for every i < j (the first segment's with the origin option). */
function finish(
  x: number[], y: number[], keep: number[], partition: Partition, origin: boolean,
  bic: (number | undefined)[], slopeIncreaseKept: boolean, chosenBy: 'criterion' | 'user', userKnots?: number[],
  knotsEstimated = userKnots === undefined, continuous = true,
): Omit<SegmentedFit, 'outliers'> {
  const n = x.length;
  const bounds = [0, ...partition.cuts, n];
  const m = bounds.length - 1;
  let knots: number[] = [];
  if (userKnots !== undefined) knots = userKnots;
  else if (m > 1 && continuous) {
    const sums = prefixSums(x, y);
    const free = bounds.slice(1).map((end, k) => {
      const line = rangeLine(sums, bounds[k], end, origin && k === 0);
      const count = end - bounds[k];
      const meanX = (sums.sx[end] - sums.sx[bounds[k]]) / count;
      const meanY = (sums.sy[end] - sums.sy[bounds[k]]) / count;
      return { slope: line.slope, intercept: origin && k === 0 ? 0 : meanY - line.slope * meanX };
    });
    const intervals: [number, number][] = partition.cuts.map((cut, k) => {
      // The knot lies between the picks either side of the breakpoint, or one pick further where
      // the segment on that side keeps at least two picks (with the hinge, two fix its line): the
      // partition search often hands the pick nearest a corner to the wrong side.
      const left = cut - 1 - bounds[k] >= 2 ? cut - 2 : cut - 1;
      const right = bounds[k + 2] - (cut + 1) >= 2 ? cut + 1 : cut;
      return [x[left], x[right]];
    });
    for (let k = 1; k < intervals.length; k++) intervals[k][0] = Math.max(intervals[k][0], intervals[k - 1][1]);
    const start = partition.cuts.map((_, k) => {
      const crossing = (free[k + 1].intercept - free[k].intercept) / (free[k].slope - free[k + 1].slope);
      const [lo, hi] = intervals[k];
      return Number.isFinite(crossing) ? Math.min(hi, Math.max(lo, crossing)) : (lo + hi) / 2;
    });
    knots = optimiseKnots(x, y, start, intervals, origin);
  }
  if (!continuous) {
    const ends = [...partition.cuts, n];
    const own = separateLines(x, y, ends, origin);
    const bounds = [0, ...ends];
    const rssTotal = partitionRss(prefixSums(x, y), partition.cuts, n, origin);
    return {
      segments: own.map((line, k) => ({ start: keep[bounds[k]], end: keep[bounds[k + 1] - 1] + 1, ...line, throughOrigin: origin && k === 0, knot: undefined })),
      residualSd: Math.sqrt(rssTotal / Math.max(1, n - 2 * own.length)), bic, slopeIncreaseKept, chosenBy,
    };
  }
  const hinge = hingeFit(x, y, knots, origin, knotsEstimated);
  // Picks before a knot belong to the segment ending there.
  const ends = [...knots.map((knot) => x.findIndex((xi) => xi >= knot)).map((i) => (i < 0 ? n : i)), n];
  // A short segment on a bent branch can come out of the joint fit with a slope of zero or less;
  // its own least-squares line (the discontinuous fit) is then the better description.
  const lines = hinge.lines.some((l) => !(l.slope > 0)) ? separateLines(x, y, ends, origin) : hinge.lines;
  const segments: LineSegment[] = lines.map((line, k) => {
    const first = k === 0 ? 0 : ends[k - 1];
    const last = ends[k] - 1;
    return {
      start: keep[first],
      end: keep[Math.max(first, last)] + 1,
      slope: line.slope,
      slopeSe: line.slopeSe,
      intercept: line.intercept,
      interceptSe: line.interceptSe,
      throughOrigin: origin && k === 0,
      knot: k === 0 ? undefined : knots[k - 1],
    };
  });
  return { segments, residualSd: hinge.sd, bic, slopeIncreaseKept, chosenBy };
}

/** The point with the largest modified z-score, when it is above OUTLIER_Z. */
function worstOutlier(x: number[], y: number[], keep: number[], segments: LineSegment[]): number | undefined {
  const flagged = flagOutliers(x, y, keep, segments, true);
  return flagged[0];
}

/** Points whose residual from their segment's line has a modified z-score above OUTLIER_Z (worst first when sorted). */
function flagOutliers(x: number[], y: number[], keep: number[], segments: LineSegment[], worstFirst = false): number[] {
  const residuals: { index: number; r: number }[] = [];
  for (const seg of segments) {
    for (const i of keep) {
      if (i >= seg.start && i < seg.end) residuals.push({ index: i, r: y[i] - (seg.intercept + seg.slope * x[i]) });
    }
  }
  const med = median(residuals.map((e) => e.r)) ?? 0;
  // Floor the spread at 0.05 ms so that near-exact data do not flag rounding as outliers.
  const mad = Math.max(median(residuals.map((e) => Math.abs(e.r - med))) ?? 0, 0.05e-3);
  const flagged = residuals.filter((e) => (0.6745 * Math.abs(e.r - med)) / mad > OUTLIER_Z);
  if (worstFirst) flagged.sort((a, b) => Math.abs(b.r - med) - Math.abs(a.r - med));
  return flagged.map((e) => e.index);
}
