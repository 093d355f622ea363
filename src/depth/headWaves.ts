import type { BranchFit } from '../core/types.js';

/** Head-wave first breaks of one branch from one refractor: receiver positions (ascending) and times. */
export interface HeadCurve {
  sourceId: string;
  sourceX: number;
  side: 'forward' | 'reverse';
  xs: number[];
  times: number[];
}

/**
 * The picks of each branch on the segment(s) assigned to `layer` (the head wave from refractor
 * layer − 1), outliers excluded, sorted by receiver position.
 */
export function headCurves(fits: BranchFit[], layer: number): HeadCurve[] {
  const curves: HeadCurve[] = [];
  for (const fit of fits) {
    const segment = fit.segments.find((s) => s.layer === layer);
    if (segment === undefined) continue;
    const points: [number, number][] = [];
    for (let i = segment.start; i < segment.end; i++) {
      const pick = fit.branch.picks[i];
      if (fit.outlierRows.includes(pick.row) || pick.receiverX === pick.sourceX) continue;
      points.push([pick.receiverX, pick.time]);
    }
    if (points.length < 2) continue;
    points.sort((a, b) => a[0] - b[0]);
    curves.push({ sourceId: fit.branch.sourceId, sourceX: fit.branch.sourceX, side: fit.branch.side, xs: points.map((p) => p[0]), times: points.map((p) => p[1]) });
  }
  return curves;
}

/** Linear interpolation of a curve at x, only inside its range (undefined outside). */
export function timeAt(curve: { xs: number[]; times: number[] }, x: number): number | undefined {
  const { xs, times } = curve;
  const last = xs.length - 1;
  if (last < 0 || x < xs[0] - 1e-9 || x > xs[last] + 1e-9) return undefined;
  const i = intervalIndex(xs, x);
  if (i === last || Math.abs(xs[i] - x) < 1e-9) return times[i];
  const t = (x - xs[i]) / (xs[i + 1] - xs[i]);
  return times[i] * (1 - t) + times[i + 1] * t;
}

/**
 * Index i of the interval [xs[i], xs[i+1]] holding x in ascending positions: the first i with
 * xs[i+1] ≥ x (the last index when there is none), by binary search, so that looking up every
 * geophone of a long line costs n log n, not n².
 */
export function intervalIndex(xs: ArrayLike<number>, x: number): number {
  const last = xs.length - 1;
  let lo = 1;
  let hi = last + 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (xs[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return Math.min(lo - 1, Math.max(0, last));
}

/** A head-wave time curve made of one source's own picks and phantomed picks of other sources. */
export interface CompositeCurve {
  sourceId: string;
  sourceX: number;
  xs: number[];
  times: number[];
  /** Receiver positions whose time was phantomed from another source. */
  phantomXs: number[];
  /** Number of picks in the overlap each shift was measured on (its standard error scales with 1/√n). */
  shiftOverlaps: number[];
}

/**
 * Fills the head-wave curve of a master source where its own first breaks are not head waves
 * (near the source, inside the crossover distance) with the picks of other sources on the same
 * side, shifted in time by the median difference over the receivers where both are head waves:
 * head waves from one refractor recorded at the same receivers are parallel (phantoming; common
 * practice). At least three common receivers are required for a shift.
 */
export function compositeCurve(master: HeadCurve, others: HeadCurve[]): CompositeCurve {
  const byX = new Map<number, number>();
  master.xs.forEach((x, i) => byX.set(x, master.times[i]));
  const phantomXs: number[] = [];
  const shiftOverlaps: number[] = [];
  // Nearest sources first: their picks are most like the master's.
  const candidates = others
    .filter((c) => c.side === master.side && c !== master)
    .sort((a, b) => Math.abs(a.sourceX - master.sourceX) - Math.abs(b.sourceX - master.sourceX));
  for (const other of candidates) {
    const differences: number[] = [];
    other.xs.forEach((x, i) => { const own = byX.get(x); if (own !== undefined) differences.push(other.times[i] - own); });
    if (differences.length < 3) continue;
    differences.sort((a, b) => a - b);
    const shift = differences[differences.length >> 1];
    let added = 0;
    other.xs.forEach((x, i) => {
      if (byX.has(x)) return;
      // Only beyond the master source, on the side its branch runs.
      if (master.side === 'forward' ? x <= master.sourceX : x >= master.sourceX) return;
      byX.set(x, other.times[i] - shift);
      phantomXs.push(x);
      added++;
    });
    if (added > 0) shiftOverlaps.push(differences.length);
  }
  const xs = [...byX.keys()].sort((a, b) => a - b);
  return { sourceId: master.sourceId, sourceX: master.sourceX, xs, times: xs.map((x) => byX.get(x)!), phantomXs, shiftOverlaps };
}
