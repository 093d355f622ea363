import { InputError } from '../core/errors.js';
import { linearWithin } from '../core/interpolate.js';
import { median } from '../core/stats.js';
import type { Branch, BranchFit } from '../core/types.js';
import type { WarningLog } from '../core/warnings.js';
import { delayTime } from '../depth/delayTime.js';
import type { HeadCurve } from '../depth/headWaves.js';
import { startsAtSource } from './branches.js';
import { branchFit, branchName, isUserFixed, segmentLimit, type BranchChoices } from './fitBranches.js';
import { segmentedRegression } from './segmentedRegression.js';

/**
 * Segments the branches of an irregular refractor. An undulating refractor bends every head-wave
 * branch by the delay times under the receivers, and a segmented regression then takes the bends
 * for new layers. The bends are the same at a receiver whatever the source, so they can be
 * removed first (refraction statics, common practice): (1) take as refracted every pick that
 * arrives clearly before the direct wave would (t < d / V₁ − max(1 ms, 4σ), V₁ from the first
 * segments of the branches that start at their source); (2) solve the delay-time model over
 * all refracted arrivals (Gardner 1939) for a delay time per receiver; (3) subtract each
 * receiver's delay, less the mean, from the refracted arrivals and segment the straightened
 * branches, whose slopes are then the refractor's mean apparent velocities; (4) add the
 * correction at the source back to each refracted segment's intercept, so that it is the local
 * intercept time under the source. The branches keep their original times, from which the depth
 * methods work.
 *
 * Branches whose segments or breakpoints the user fixed are fitted as the user said.
 *
 * @returns the fits, or undefined where too few refracted arrivals exist to solve for delays
 */
export function staticsCorrectedFits(branches: Branch[], choices: BranchChoices, file: string, spacing: number, warnings: WarningLog): BranchFit[] | undefined {
  const curves: HeadCurve[] = [];
  const first = new Map(branches.map((b) => [b, segmentedRegression(b.offsets, b.times, { firstThroughOrigin: choices.directThroughOrigin, maxSegments: choices.maxSegments, forbidSlopeIncrease: true })]));
  // Branches that start at their source see the direct wave first; its slowness tells whether an
  // off-end branch starts with the direct wave too or is refracted throughout.
  const nearSource = (b: Branch) => startsAtSource(b, spacing);
  const directSlowness = median(branches.filter(nearSource).map((b) => first.get(b)).filter((f) => f !== undefined && f.segments.length > 1).map((f) => f!.segments[0].slope));
  if (directSlowness === undefined) return undefined;
  const noise = median([...first.values()].filter((f) => f !== undefined).map((f) => f!.residualSd)) ?? 0;
  // A pick is refracted where it arrives clearly before the direct wave would (t < x / V1 − margin).
  const margin = Math.max(1e-3, 4 * noise);
  const refracted = new Map<Branch, boolean[]>();
  for (const branch of branches) {
    const fit = first.get(branch);
    if (fit === undefined) continue;
    const flags = branch.times.map((t, i) => t < branch.distances[i] * directSlowness - margin);
    refracted.set(branch, flags);
    const points: [number, number][] = [];
    flags.forEach((isRefracted, i) => { if (isRefracted && !fit.outliers.includes(i)) points.push([branch.picks[i].receiverX, branch.times[i]]); });
    if (points.length < 2) continue;
    points.sort((a, b) => a[0] - b[0]);
    curves.push({ sourceId: branch.sourceId, sourceX: branch.sourceX, side: branch.side, xs: points.map((p) => p[0]), times: points.map((p) => p[1]) });
  }
  const delays = delayTime(curves, 1, undefined, false);
  if (delays === undefined) return undefined;
  const mean = delays.stations.reduce((a, s) => a + s.delay, 0) / delays.stations.length;
  const correction = new Map(delays.stations.map((s) => [s.x, s.delay - mean]));
  // A branch the straightened times leave without a fit (no segments of positive slowness) ends
  // the statics attempt: the plain fits stand.
  let unfitted = false;
  const fits = branches.map((branch) => {
    if (unfitted) return undefined;
    const name = branchName(branch);
    const options = {
      segments: choices.segments?.[name] ?? choices.segments?.['*'],
      breakpoints: choices.breakpoints?.[name],
      firstThroughOrigin: choices.directThroughOrigin,
      maxSegments: segmentLimit(choices, name),
    };
    try {
      const flags = refracted.get(branch);
      if (isUserFixed(choices, branch) || flags === undefined || !flags.some(Boolean)) {
        const plain = segmentedRegression(branch.offsets, branch.times, options);
        if (plain === undefined) { unfitted = true; return undefined; }
        return branchFit(branch, plain, file, warnings);
      }
      const straightened = branch.times.map((t, i) => (flags[i] ? t - (correction.get(branch.picks[i].receiverX) ?? 0) : t));
      const shape = segmentedRegression(branch.offsets, straightened, options);
      if (shape === undefined) { unfitted = true; return undefined; }
      // The straightened lines describe the refractor's mean depth plus this source's own delay; adding
      // back the receiver correction at the source makes a refracted segment's intercept the local one
      // again (twice the delay time under the source), as the intercept-time method needs.
      const atSource = linearWithin(delays.stations.map((d) => d.x), delays.stations.map((d) => d.delay), branch.sourceX);
      const adjusted = shape.segments.map((segment) => {
        let refractedPicks = 0;
        for (let i = segment.start; i < segment.end; i++) if (flags[i]) refractedPicks++;
        const isRefracted = refractedPicks * 2 > segment.end - segment.start;
        return isRefracted && atSource !== undefined ? { ...segment, intercept: segment.intercept + (atSource - mean) } : segment;
      });
      return branchFit(branch, { ...shape, segments: adjusted }, file, warnings);
    } catch (error) {
      if (error instanceof RangeError) throw new InputError({ file, source: branch.sourceId }, `${branch.side} branch: ${error.message}`);
      throw error;
    }
  });
  return unfitted ? undefined : (fits as BranchFit[]);
}

