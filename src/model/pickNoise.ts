import { median } from '../core/stats.js';
import type { BranchFit } from '../core/types.js';

/** Pick noise, in seconds, from evidence that a layer model cannot inflate. */
export interface PickNoise {
  /** The estimate used, in seconds. */
  sigma: number;
  /** Where it came from. */
  source: 'second differences' | 'reciprocal times' | 'line fits';
  /** Second differences of neighbouring picks along the branches: estimate and number of triples. */
  secondDifferences?: { sigma: number; count: number };
  /** Reciprocal-time differences: estimate and number of pairs. */
  reciprocal?: { sigma: number; count: number };
  /** Pick confidences given with the table (0-1): their median and how many picks had one. */
  confidence?: { median: number; count: number };
}

/** Triples needed before the second-difference estimate is used. */
export const MIN_TRIPLES = 30;
/** Reciprocal pairs needed before their estimate is used (when the triples are too few). */
export const MIN_RECIPROCAL_PAIRS = 3;
/** Normal consistency factor of the median absolute deviation, 1 / Φ⁻¹(3/4). */
const MAD_TO_SD = 1.4826;

/**
 * The pick noise σ from the picks themselves, not from how well a layer model fits them
 * (relief, a missed layer or a wrong assignment inflate a model's residuals, never these):
 *
 * 1. Second differences of neighbouring picks along each branch, inside one arrival (one segment,
 *    so no crossover kink): for picks at offsets x₀ < x₁ < x₂ with gaps h₁, h₂ (at most 1.5
 *    spacings), e = (t₂ − t₁) − (h₂/h₁)(t₁ − t₀) has variance σ²(1 + (1 + h₂/h₁)² + (h₂/h₁)²)
 *    for independent picks, and vanishes on a straight branch; a gently curving branch (relief of
 *    the refractor) adds little next to the noise, and the median absolute deviation
 *    (σ ≈ 1.4826 MAD; Hampel 1974, J. Am. Stat. Assoc. 69, 383-393) ignores the few triples at a
 *    sharp bend or a mispick. Used when there are MIN_TRIPLES triples or more.
 * 2. Reciprocal-time differences: tAB − tBA is the difference of two picks, variance 2σ²;
 *    σ ≈ 1.4826 · median |tAB − tBA| / √2 (the MAD of a difference centred on zero).
 * 3. Otherwise the line-fit residual deviation given.
 *
 * Pick confidences, when the table has them, are reported beside the estimate: they rank picks
 * but carry no time scale, so they do not enter σ.
 *
 * @param fits - branch fits whose segments are the arrivals (the joint model's)
 * @param reciprocalDifferences - tAB − tBA of the reciprocal pairs, in seconds
 * @param lineFitSd - fallback, in seconds
 * @param confidences - confidence of each pick, where the table gives one
 */
export function pickNoise(fits: BranchFit[], spacing: number, reciprocalDifferences: number[], lineFitSd: number, confidences: number[] = []): PickNoise {
  const normalised: number[] = [];
  for (const f of fits) {
    const outliers = new Set(f.outlierRows);
    for (const segment of f.segments) {
      const xs: number[] = [];
      const ts: number[] = [];
      for (let i = segment.start; i < segment.end; i++) {
        if (outliers.has(f.branch.picks[i].row) || f.branch.offsets[i] === 0) continue;
        xs.push(f.branch.offsets[i]);
        ts.push(f.branch.times[i]);
      }
      for (let i = 1; i + 1 < xs.length; i++) {
        const h1 = xs[i] - xs[i - 1];
        const h2 = xs[i + 1] - xs[i];
        if (!(h1 > 0 && h2 > 0) || h1 > 1.5 * spacing || h2 > 1.5 * spacing) continue;
        const ratio = h2 / h1;
        const e = ts[i + 1] - ts[i] - ratio * (ts[i] - ts[i - 1]);
        normalised.push(e / Math.sqrt(1 + (1 + ratio) ** 2 + ratio ** 2));
      }
    }
  }
  const result: Omit<PickNoise, 'sigma' | 'source'> = {};
  if (normalised.length > 0) {
    const centre = median(normalised)!;
    result.secondDifferences = { sigma: MAD_TO_SD * median(normalised.map((e) => Math.abs(e - centre)))!, count: normalised.length };
  }
  if (reciprocalDifferences.length > 0) {
    result.reciprocal = { sigma: (MAD_TO_SD * median(reciprocalDifferences.map(Math.abs))!) / Math.SQRT2, count: reciprocalDifferences.length };
  }
  if (confidences.length > 0) result.confidence = { median: median(confidences)!, count: confidences.length };
  if (result.secondDifferences && result.secondDifferences.count >= MIN_TRIPLES) return { sigma: result.secondDifferences.sigma, source: 'second differences', ...result };
  if (result.reciprocal && result.reciprocal.count >= MIN_RECIPROCAL_PAIRS) return { sigma: result.reciprocal.sigma, source: 'reciprocal times', ...result };
  return { sigma: lineFitSd, source: 'line fits', ...result };
}
