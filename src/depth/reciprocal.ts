import type { BranchFit } from '../core/types.js';
import type { WarningLog } from '../core/warnings.js';
import { timeAt } from './headWaves.js';

/** Reciprocal-time check of one pair of reversed sources. */
export interface ReciprocalCheck {
  sourceA: string;
  sourceB: string;
  /** First-break time from A at B's position and from B at A's position, in seconds. */
  timeAB: number;
  timeBA: number;
  /** |timeAB − timeBA|, in seconds. */
  difference: number;
  /** Tolerance applied, in seconds. */
  tolerance: number;
  ok: boolean;
}

/**
 * Reciprocal tolerance: 1 ms, the usual agreement of reversed picks on a hammer line (common
 * practice), or three standard deviations of the difference of two picks, 3·√2·σ, when the pick
 * noise σ is larger.
 */
export function reciprocalTolerance(pickNoise: number): number {
  return Math.max(1e-3, 3 * Math.SQRT2 * pickNoise);
}

/**
 * A branch's first-break times by receiver position: every pick, outliers too (a mispick at the
 * far end is what the check is for), any arrival (reciprocity holds for every first arrival).
 */
function branchCurve(fit: BranchFit) {
  const points = fit.branch.picks.map((p) => [p.receiverX, p.time] as const).sort((a, b) => a[0] - b[0]);
  return { xs: points.map((p) => p[0]), times: points.map((p) => p[1]) };
}

/**
 * Reciprocal times of every pair of sources A < B whose branches reach each other's positions:
 * the time from A at B must equal the time from B at A (reciprocity). A large difference points
 * at a mispick, a trigger delay or a wrong source position. Times at a source position between
 * receivers are interpolated linearly.
 */
export function reciprocalChecks(fits: BranchFit[], pickNoise: number, warnings: WarningLog): ReciprocalCheck[] {
  const tolerance = reciprocalTolerance(pickNoise);
  const forward = fits.filter((f) => f.branch.side === 'forward');
  const reverse = fits.filter((f) => f.branch.side === 'reverse');
  // Each branch's curve once, and only the pairs that can reach each other: a reverse source
  // inside the reach of the forward branch (so a long line costs per source, not per pair).
  const forwardCurves = forward.map(branchCurve);
  const reverseCurves = reverse.map(branchCurve);
  const byPosition = reverse.map((_, i) => i).sort((i, j) => reverse[i].branch.sourceX - reverse[j].branch.sourceX);
  const positions = byPosition.map((i) => reverse[i].branch.sourceX);
  const checks: ReciprocalCheck[] = [];
  forward.forEach((a, ai) => {
    const curveA = forwardCurves[ai];
    if (curveA.xs.length === 0) return;
    const reach = curveA.xs[curveA.xs.length - 1] + 1e-9;
    // First reverse source east of A (binary search), then every one up to A's reach.
    let lo = 0;
    let hi = positions.length;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (positions[mid] > a.branch.sourceX) hi = mid;
      else lo = mid + 1;
    }
    const partners: number[] = [];
    for (let k = lo; k < positions.length && positions[k] <= reach; k++) partners.push(byPosition[k]);
    partners.sort((i, j) => i - j);
    for (const bi of partners) {
      const b = reverse[bi];
      const timeAB = timeAt(curveA, b.branch.sourceX);
      const timeBA = timeAt(reverseCurves[bi], a.branch.sourceX);
      if (timeAB === undefined || timeBA === undefined) continue;
      const difference = Math.abs(timeAB - timeBA);
      const check = { sourceA: a.branch.sourceId, sourceB: b.branch.sourceId, timeAB, timeBA, difference, tolerance, ok: difference <= tolerance };
      checks.push(check);
      if (!check.ok) {
        warnings.add('reciprocal-time',
          `reciprocal times of sources ${check.sourceA} and ${check.sourceB} differ by ${(difference * 1e3).toFixed(2)} ms (${(timeAB * 1e3).toFixed(2)} and ${(timeBA * 1e3).toFixed(2)} ms), more than the ${(tolerance * 1e3).toFixed(2)} ms tolerance: check the picks near both sources, the trigger, and the source positions`);
      }
    }
  });
  return checks;
}
