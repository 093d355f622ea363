import type { BranchFit, Layer, RefractorPoint } from '../core/types.js';
import { maxOf, minOf } from '../core/extent.js';
import { sampleSection, sectionTimes } from './sectionTimes.js';

export interface ForwardCheck {
  /** RMS of pick minus computed first arrival, in seconds, over the picks used in the fits. */
  rms: number;
  /** Largest absolute difference, in seconds, and where. */
  worst: { difference: number; sourceId: string; receiverX: number };
  picks: number;
}

/**
 * The forward check of an interpretation: first-arrival times computed through the interpreted
 * section (the recommended refractor depths under the geophones, the layer velocities) for every
 * source, compared with the picks. A misfit well above the pick noise means the section does not
 * explain the data (a missed layer, a wrong layer assignment, a lateral change). Sources off the
 * ends of the spread are left out: their rays go down beyond the geophones.
 *
 * @returns undefined when there is no refractor to build a section from
 */
export function forwardCheck(fits: BranchFit[], layers: Layer[], refractors: { points: RefractorPoint[] }[], ground: (x: number) => number, spacing: number): ForwardCheck | undefined {
  if (refractors.length === 0 || refractors.some((r) => r.points.length === 0)) return undefined;
  const section = {
    ground,
    refractors: refractors.map((r) => r.points.map((p) => ({ x: p.x, elev: p.elev }))),
    velocities: layers.slice(0, refractors.length + 1).map((l) => l.velocity),
  };
  const all = fits.flatMap((f) => f.branch.picks.map((p) => p.receiverX).concat(f.branch.sourceX));
  const span: [number, number] = [minOf(all) - 2 * spacing, maxOf(all) + 2 * spacing];
  // Refractors sampled at half the geophone spacing (at most 400 samples): the check is against
  // picks a tenth of a millisecond apart, and the least time over samples errs far less.
  const step = Math.max(spacing / 2, (span[1] - span[0]) / 400);
  const sampled = sampleSection(section, span, step);
  let sum = 0;
  let count = 0;
  let worst = { difference: 0, sourceId: '', receiverX: 0 };
  const bySource = new Map<string, BranchFit[]>();
  for (const f of fits) {
    if (!bySource.has(f.branch.sourceId)) bySource.set(f.branch.sourceId, []);
    bySource.get(f.branch.sourceId)!.push(f);
  }
  const receiverXs = fits.flatMap((f) => f.branch.picks.map((p) => p.receiverX));
  const first = minOf(receiverXs);
  const last = maxOf(receiverXs);
  for (const [sourceId, sourceFits] of bySource) {
    // A source off the ends sends its rays down where the section is not known (beyond the
    // geophones the refractors are only held flat), so it is left out of the check.
    const sx = sourceFits[0].branch.sourceX;
    if (sx < first - spacing / 2 || sx > last + spacing / 2) continue;
    const picks = sourceFits.flatMap((f) => f.branch.picks.filter((p) => !f.outlierRows.includes(p.row)));
    const times = sectionTimes(sampled, sourceFits[0].branch.sourceX, picks.map((p) => p.receiverX));
    picks.forEach((p, i) => {
      const difference = p.time - times[i];
      sum += difference * difference;
      count++;
      if (Math.abs(difference) > Math.abs(worst.difference)) worst = { difference, sourceId, receiverX: p.receiverX };
    });
  }
  if (count === 0) return undefined;
  return { rms: Math.sqrt(sum / count), worst, picks: count };
}

/**
 * Floor of the forward-misfit threshold, in seconds: the interpreted section is built from depths
 * at the geophones joined by straight lines and velocities with their own errors, so even a sound
 * interpretation leaves a few tenths of a millisecond over the pick noise (measured on
 * forward-model lines, test/reference/sweep).
 */
export const MISFIT_FLOOR = 0.3e-3;
/** The RMS may reach this multiple of the pick noise on a sound interpretation (same sweep). */
export const MISFIT_RATIO = 2;

/**
 * Whether the forward check shows a misfit: its RMS above max(MISFIT_RATIO σ, σ + MISFIT_FLOOR),
 * σ the pick noise measured from the picks themselves (model/pickNoise.ts), never from a model's
 * residuals, which relief or a wrong layer inflate.
 *
 * @param rms - forward-check RMS, in seconds
 * @param noise - pick noise σ, in seconds
 */
export function isForwardMisfit(rms: number, noise: number): boolean {
  return rms > Math.max(MISFIT_RATIO * noise, noise + MISFIT_FLOOR);
}
