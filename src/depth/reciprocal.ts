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
  const checks: ReciprocalCheck[] = [];
  for (const a of forward) {
    for (const b of reverse) {
      if (!(b.branch.sourceX > a.branch.sourceX)) continue;
      const timeAB = timeAt(branchCurve(a), b.branch.sourceX);
      const timeBA = timeAt(branchCurve(b), a.branch.sourceX);
      if (timeAB === undefined || timeBA === undefined) continue;
      const difference = Math.abs(timeAB - timeBA);
      const check = { sourceA: a.branch.sourceId, sourceB: b.branch.sourceId, timeAB, timeBA, difference, tolerance, ok: difference <= tolerance };
      checks.push(check);
      if (!check.ok) {
        warnings.add('reciprocal-time',
          `reciprocal times of sources ${check.sourceA} and ${check.sourceB} differ by ${(difference * 1e3).toFixed(2)} ms (${(timeAB * 1e3).toFixed(2)} and ${(timeBA * 1e3).toFixed(2)} ms), more than the ${(tolerance * 1e3).toFixed(2)} ms tolerance: check the picks near both sources, the trigger, and the source positions`);
      }
    }
  }
  return checks;
}
